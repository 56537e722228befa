// Point page: draws the point's curves (data from the JSON block the server embedded in the page).
// The partial densities of states get a panel of their own (under the total they would hide), and
// conductivity components that coincide (a cubic crystal) are drawn once, named together.
(function () {
    "use strict";
    const block = document.getElementById("point-curves");
    const C = window.LatticeCharts;
    if (!block || !C) { return; }
    const curves = JSON.parse(block.textContent);
    const xy = (curve) => curve.x.map((x, i) => ({ x: x, y: curve.y[i] }));
    const zeroBased = (o) => { o.scales.y.beginAtZero = true; };

    if (curves.dos) {
        const d = curves.dos;
        const xTitle = C.withUnit("Frequency", d.frequency_unit);
        const yTitle = C.withUnit("Density of states", d.density_unit);
        const total = d.curves.filter((c) => c.name === "total");
        const sites = d.curves.filter((c) => c.name !== "total");
        C.draw("chart-dos", total.map((c) => C.series(c.name, xy(c), C.palette[0], { borderWidth: 2.2, pointRadius: 0 })), xTitle, yTitle, zeroBased);
        C.draw("chart-dos-sites", sites.map((c, i) => C.series(c.name, xy(c), C.palette[(i + 1) % C.palette.length], { borderWidth: 1.6, pointRadius: 0 })),
            xTitle, yTitle, (o) => { zeroBased(o); o.plugins.legend.display = true; });
    }

    if (curves.thermal) {
        const t = curves.thermal;
        const against = (values) => t.temperature_k.map((x, i) => ({ x: x, y: values[i] }));
        C.draw("chart-cv", [C.series("Heat capacity", against(t.heat_capacity_j_per_mol_k), C.palette[0])],
            "Temperature (K)", "Heat capacity (J/(mol K))", zeroBased);
        C.draw("chart-debye", [C.series("Debye temperature", against(t.debye_temperature_k), C.palette[1])],
            "Temperature (K)", "Debye temperature (K)");
        if (t.kappa_w_per_m_k) {
            C.draw("chart-kappa", [C.series("mean over directions", against(t.kappa_w_per_m_k), C.palette[2])],
                "Temperature (K)", "Thermal conductivity (W/(m K))", zeroBased);
            // Components equal to round-off share one line and one name ("along x = along y = along z").
            const groups = [];
            (t.kappa_components || []).forEach((c) => {
                const same = groups.find((g) => g.curve.y.every((v, i) => v === c.y[i] || (v !== null && c.y[i] !== null && Math.abs(v - c.y[i]) <= 1e-9 * Math.max(Math.abs(v), Math.abs(c.y[i])))));
                if (same) { same.names.push(c.name); } else { groups.push({ curve: c, names: [c.name] }); }
            });
            C.draw("chart-kappa-directions", groups.map((g, i) => C.series(g.names.join(" = "), xy(g.curve), C.palette[(i + 3) % C.palette.length])),
                "Temperature (K)", "Thermal conductivity (W/(m K))", (o) => { zeroBased(o); o.plugins.legend.display = true; });
        }
    }

    if (curves.dispersion) {
        const p = curves.dispersion;
        const corners = p.corners || [];
        const cornerTicks = (o) => {
            if (corners.length === 0) { return; }
            o.scales.x.min = Math.min(...corners.map((c) => c.position));
            o.scales.x.max = Math.max(...corners.map((c) => c.position));
            o.scales.x.afterBuildTicks = (axis) => { axis.ticks = corners.map((c) => ({ value: c.position })); };
            o.scales.x.ticks = { callback: (value) => (corners.find((c) => Math.abs(c.position - value) < 1e-9) || {}).label || "" };
            o.scales.x.grid = { color: "#c9d1de" };
        };
        const xTitle = C.withUnit("Position along the path", p.position_unit);
        C.draw("chart-dispersion", p.frequencies.map((c, i) => C.series(c.name, xy(c), C.palette[i % C.palette.length], { borderWidth: 1.6, pointRadius: 0 })),
            xTitle, "Frequency (THz)", (o) => { cornerTicks(o); zeroBased(o); });
        if (p.group_speeds) {
            C.draw("chart-group-speed", p.group_speeds.map((c, i) => C.series(c.name, xy(c), C.palette[i % C.palette.length], { borderWidth: 1.6, pointRadius: 0 })),
                xTitle, "Group velocity |v| (m/s)", (o) => { cornerTicks(o); zeroBased(o); });
        }
    }

    C.ready();
})();
