// Point page: draws the point's curves with Chart.js (served from /lib/chartjs). The data come from
// the JSON block the server embedded in the page; every axis is titled with its unit.
(function () {
    "use strict";
    const block = document.getElementById("point-curves");
    if (!block || typeof Chart === "undefined") { return; }
    const curves = JSON.parse(block.textContent);
    const palette = ["#1f4e79", "#e07b39", "#2e9d62", "#8e5bb5", "#d0453b", "#2f9fb5", "#b5962f", "#6b7a8f"];
    const charts = {};
    window.latticeSweepCharts = charts;

    Chart.defaults.font.family = getComputedStyle(document.body).fontFamily;
    Chart.defaults.color = "#3b4559";

    const withUnit = (label, unit) => (unit ? label + " (" + unit + ")" : label);
    const xy = (curve) => curve.x.map((x, i) => ({ x: x, y: curve.y[i] }));

    function line(canvasId, datasets, xTitle, yTitle, extra) {
        const canvas = document.getElementById(canvasId);
        if (!canvas) { return; }
        const options = {
            animation: false,
            responsive: true,
            maintainAspectRatio: false,
            interaction: { mode: "nearest", intersect: false },
            plugins: {
                legend: { display: datasets.length > 1 && datasets.length <= 12, labels: { boxWidth: 14 } },
                tooltip: { callbacks: { label: (c) => c.dataset.label + ": " + Number(c.parsed.y).toPrecision(4) } },
            },
            scales: {
                x: { type: "linear", title: { display: true, text: xTitle } },
                y: { type: "linear", title: { display: true, text: yTitle } },
            },
        };
        if (extra) { extra(options); }
        charts[canvas.dataset.chart] = new Chart(canvas, { type: "line", data: { datasets: datasets }, options: options });
    }

    function series(label, points, color, opts) {
        return Object.assign({
            label: label,
            data: points,
            borderColor: color,
            backgroundColor: color,
            borderWidth: 2,
            pointRadius: points.length <= 40 ? 3 : 0,
            spanGaps: false,
        }, opts || {});
    }

    if (curves.dos) {
        const d = curves.dos;
        const sets = d.curves.map((c, i) => series(c.name, xy(c), palette[i % palette.length],
            i === 0 ? { borderWidth: 2.2, pointRadius: 0 } : { borderWidth: 1.4, borderDash: [6, 3], pointRadius: 0 }));
        line("chart-dos", sets, withUnit("Frequency", d.frequency_unit), withUnit("Density of states", d.density_unit),
            (o) => { o.scales.y.beginAtZero = true; });
    }

    if (curves.thermal) {
        const t = curves.thermal;
        const against = (values) => t.temperature_k.map((x, i) => ({ x: x, y: values[i] }));
        line("chart-cv", [series("Heat capacity", against(t.heat_capacity_j_per_mol_k), palette[0])],
            "Temperature (K)", "Heat capacity (J/(mol K))", (o) => { o.scales.y.beginAtZero = true; });
        line("chart-debye", [series("Debye temperature", against(t.debye_temperature_k), palette[1])],
            "Temperature (K)", "Debye temperature (K)");
        if (t.kappa_w_per_m_k) {
            const sets = [series("mean over directions", against(t.kappa_w_per_m_k), palette[2])];
            (t.kappa_components || []).forEach((c, i) => sets.push(series(c.name, xy(c), palette[(i + 3) % palette.length], { borderWidth: 1.4, borderDash: [6, 3] })));
            line("chart-kappa", sets, "Temperature (K)", "Thermal conductivity (W/(m K))", (o) => { o.scales.y.beginAtZero = true; });
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
        const xTitle = withUnit("Position along the path", p.position_unit);
        line("chart-dispersion", p.frequencies.map((c, i) => series(c.name, xy(c), palette[i % palette.length], { borderWidth: 1.6, pointRadius: 0 })),
            xTitle, "Frequency (THz)", (o) => { cornerTicks(o); o.scales.y.beginAtZero = true; });
        if (p.group_speeds) {
            line("chart-group-speed", p.group_speeds.map((c, i) => series(c.name, xy(c), palette[i % palette.length], { borderWidth: 1.6, pointRadius: 0 })),
                xTitle, "Group velocity |v| (m/s)", (o) => { cornerTicks(o); o.scales.y.beginAtZero = true; });
        }
    }

    document.body.dataset.chartsReady = String(Object.keys(charts).length);
})();
