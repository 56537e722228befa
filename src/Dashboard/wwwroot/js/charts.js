// Shared Chart.js set-up of the dashboard's plots (Chart.js itself is served from /lib/chartjs):
// one palette, titled axes with units, logarithmic axes on request, and a registry of the charts
// drawn (window.latticeSweepCharts) that the browser tests read.
(function () {
    "use strict";
    if (typeof Chart === "undefined") { return; }
    const palette = ["#1f4e79", "#e07b39", "#2e9d62", "#8e5bb5", "#d0453b", "#2f9fb5", "#b5962f", "#6b7a8f",
        "#c2417f", "#4f7f2a", "#7a5230", "#3b5fd0"];
    const charts = window.latticeSweepCharts || {};
    window.latticeSweepCharts = charts;

    Chart.defaults.font.family = getComputedStyle(document.body).fontFamily;
    Chart.defaults.color = "#3b4559";

    const withUnit = (label, unit) => (unit ? label + " (" + unit + ")" : label);

    // About four significant digits, as the pages show numbers.
    const format = (v) => {
        if (v === null || v === undefined || !Number.isFinite(Number(v))) { return "—"; }
        const n = Number(v);
        const a = Math.abs(n);
        return a !== 0 && (a < 1e-3 || a >= 1e6) ? n.toExponential(3).replace(/\.?0+e/, "e") : String(Number(n.toPrecision(4)));
    };

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

    // A logarithmic axis labels its powers of ten (and 2 and 5 within a decade when it spans few decades).
    function logTicks(value, index, ticks) {
        const decades = Math.log10(ticks[ticks.length - 1].value / ticks[0].value);
        const mantissa = value / Math.pow(10, Math.floor(Math.log10(value) + 1e-9));
        const round = (m) => Math.abs(mantissa - m) < 1e-6;
        return round(1) || (decades < 3 && (round(2) || round(5))) ? format(value) : "";
    }

    function axis(title, log) {
        return log
            ? { type: "logarithmic", title: { display: true, text: title }, ticks: { autoSkip: false, maxRotation: 0, callback: logTicks } }
            : { type: "linear", title: { display: true, text: title } };
    }

    // Draws a line chart on the canvas with that id (if there is one) and registers it under its data-chart name.
    function draw(canvasId, datasets, xTitle, yTitle, extra) {
        const canvas = document.getElementById(canvasId);
        if (!canvas) { return null; }
        const options = {
            animation: false,
            responsive: true,
            maintainAspectRatio: false,
            interaction: { mode: "nearest", intersect: false },
            plugins: {
                legend: { display: datasets.length > 1 && datasets.length <= 14, labels: { boxWidth: 14 } },
                tooltip: { callbacks: { label: (c) => c.dataset.label + ": " + format(c.parsed.y) } },
            },
            scales: { x: axis(xTitle, false), y: axis(yTitle, false) },
        };
        if (extra) { extra(options); }
        const chart = new Chart(canvas, { type: "line", data: { datasets: datasets }, options: options });
        charts[canvas.dataset.chart] = chart;
        return chart;
    }

    function ready() {
        document.body.dataset.chartsReady = String(Object.keys(charts).length);
    }

    window.LatticeCharts = { palette: palette, withUnit: withUnit, format: format, series: series, axis: axis, draw: draw, ready: ready };
})();
