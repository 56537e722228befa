// Comparison page: one plot per quantity, one curve per point, each named by the swept values that
// tell it from the others (data from the JSON block the server embedded in the page).
(function () {
    "use strict";
    const block = document.getElementById("compare-data");
    const C = window.LatticeCharts;
    if (!block || !C) { return; }
    const data = JSON.parse(block.textContent);
    const order = data.points.map((p) => p.point_id);
    const color = (id) => C.palette[Math.max(0, order.indexOf(id)) % C.palette.length];
    const sets = (curves) => curves.map((c) => C.series(c.label, c.x.map((x, i) => ({ x: x, y: c.y[i] })), color(c.point_id),
        { borderWidth: 1.8, pointRadius: c.x.length <= 40 ? 3 : 0 }));
    const legend = (o) => { o.plugins.legend.display = true; o.plugins.legend.position = "bottom"; o.scales.y.beginAtZero = true; };

    C.draw("chart-compare-dos", sets(data.dos), C.withUnit("Frequency", data.frequency_unit), C.withUnit("Density of states", data.density_unit), legend);
    C.draw("chart-compare-cv", sets(data.heat_capacity), "Temperature (K)", "Heat capacity (J/(mol K))", legend);
    C.draw("chart-compare-debye", sets(data.debye_temperature), "Temperature (K)", "Debye temperature (K)", (o) => { legend(o); o.scales.y.beginAtZero = false; });
    C.draw("chart-compare-kappa", sets(data.conductivity), "Temperature (K)", "Thermal conductivity (W/(m K))", legend);
    C.ready();
})();
