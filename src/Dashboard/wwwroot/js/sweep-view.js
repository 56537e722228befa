// Sweep page: draws the two plots of the filtered points (data from the JSON block the server
// embedded in the page, or, when the page answered before its plots were drawn, from the plots'
// fragment fetched here and put in place), redraws on a changed plot choice (the view form is sent,
// so the address keeps the choice), and gathers points to compare: ticked in the table or picked on a plot.
(function () {
    "use strict";
    const form = document.getElementById("view");
    const compare = document.getElementById("compare");
    const MAX_COMPARED = 10;

    // A changed plot choice draws the plot again (the page without scripts has its Draw buttons).
    document.querySelectorAll(".plot-controls select").forEach((select) => {
        select.addEventListener("change", () => {
            const button = select.closest(".plot-controls").querySelector("button[name='at']");
            if (form && button) { form.requestSubmit(button); }
        });
    });

    // ---- points to compare: the table's ticks plus the points picked on a plot ----
    const picked = new Map();
    const count = document.getElementById("compare-count");
    const button = document.getElementById("compare-button");
    const pickedBox = document.getElementById("picked");
    const pickedList = document.getElementById("picked-list");
    const ticked = () => Array.from(document.querySelectorAll("input[form='compare'][name='p']:checked")).map((i) => i.value);

    function chosen() {
        const ids = new Set(ticked());
        picked.forEach((_, id) => ids.add(id));
        return Array.from(ids);
    }

    function update() {
        const n = chosen().length;
        if (count) {
            count.textContent = n === 0 ? "tick up to " + MAX_COMPARED
                : n + " chosen" + (n > MAX_COMPARED ? ": only the first " + MAX_COMPARED + " are compared" : "");
        }
        if (button) { button.disabled = n === 0; }
        if (pickedBox) {
            pickedBox.hidden = picked.size === 0;
            pickedList.replaceChildren(...Array.from(picked.keys()).map((id) => {
                const chip = document.createElement("span");
                chip.className = "chip mono";
                chip.textContent = id;
                return chip;
            }));
        }
    }

    function pick(id) {
        if (picked.has(id)) { return; }
        const box = document.querySelector("input[form='compare'][name='p'][value='" + CSS.escape(id) + "']");
        if (box) {
            box.checked = true;
        } else if (compare) {
            const hidden = document.createElement("input");
            hidden.type = "hidden";
            hidden.name = "p";
            hidden.value = id;
            compare.appendChild(hidden);
        }
        picked.set(id, true);
        update();
    }

    document.querySelectorAll("input[form='compare'][name='p']").forEach((box) => box.addEventListener("change", update));
    update();

    // ---- the plots ----
    const C = window.LatticeCharts;
    if (!C) { return; }
    const pickMode = document.getElementById("pick-mode");
    const unstableColor = "#8e44ad";

    // A click on a point opens its page, or (pick mode) adds it to the comparison.
    function onClick(event, elements, chart) {
        const hit = chart.getElementsAtEventForMode(event, "nearest", { intersect: true }, true)[0];
        if (!hit) { return; }
        const p = chart.data.datasets[hit.datasetIndex].data[hit.index];
        if (!p || !p.url) { return; }
        if (pickMode && pickMode.checked) { pick(p.id); } else { window.location.href = p.url; }
    }

    const asData = (points, pointUrl) => points.map((p) => ({ x: p.x, y: p.y, id: p.point_id, url: pointUrl + encodeURIComponent(p.point_id), unstable: p.unstable, floppy: p.floppy }));
    // Points shrink as they grow many; a marked point (unstable, floppy) keeps its size.
    const marks = (points, color, total) => ({
        pointStyle: points.map((p) => (p.unstable ? "crossRot" : p.floppy ? "triangle" : "circle")),
        pointRadius: points.map((p) => (p.unstable || p.floppy ? 6 : total <= 60 ? 4 : total <= 600 ? 2.5 : 1.5)),
        pointBorderColor: points.map((p) => (p.unstable ? unstableColor : color)),
        pointBackgroundColor: points.map((p) => (p.unstable ? unstableColor : color)),
        pointBorderWidth: points.map((p) => (p.unstable ? 2 : 1)),
    });

    function axisOf(options, key, a) {
        const title = C.withUnit(a.label, a.unit);
        options.scales[key] = C.axis(title, a.log);
        if (a.categorical) {
            const labels = a.categories;
            options.scales[key].min = -0.5;
            options.scales[key].max = labels.length - 0.5;
            options.scales[key].afterBuildTicks = (axis) => { axis.ticks = labels.map((_, i) => ({ value: i })); };
            options.scales[key].ticks = { autoSkip: true, callback: (value) => labels[value] || "" };
        }
    }

    function tooltip(x, y) {
        return {
            callbacks: {
                title: (items) => (items[0] && items[0].raw && items[0].raw.id) || "",
                label: (c) => {
                    const p = c.raw;
                    const xText = x.categorical ? x.categories[p.x] : C.format(p.x);
                    return c.dataset.label + ": " + x.label + " " + xText + ", " + y.label + " " + C.format(p.y)
                        + (p.unstable ? " (unstable)" : "") + (p.floppy ? " (floppy)" : "");
                },
            },
        };
    }

    // Both plots: titled axes (log or categories as the server chose), a click on a point, a tooltip naming it.
    function drawPlot(canvasId, plot, sets, legend) {
        C.draw(canvasId, sets, "", "", (o) => {
            axisOf(o, "x", plot.x);
            axisOf(o, "y", plot.y);
            o.interaction = { mode: "nearest", intersect: true };
            o.onClick = onClick;
            o.plugins.tooltip = tooltip(plot.x, plot.y);
            legend(o.plugins.legend);
        });
    }

    function drawAll(plots) {
        const parameter = plots.parameter;
        if (parameter) {
            const total = parameter.series.reduce((n, s) => n + s.points.length, 0);
            // Many lines (a dense grid) run from blue to orange in the order of their values; few get the palette and a legend.
            const gradient = (i, n) => "hsl(" + Math.round(215 - 190 * (n === 1 ? 0 : i / (n - 1))) + ", 65%, 45%)";
            const many = parameter.series.length > 12;
            const sets = parameter.series.map((s, i) => {
                const color = many ? gradient(i, parameter.series.length) : C.palette[i % C.palette.length];
                return Object.assign(C.series(s.name, asData(s.points, parameter.point_url), color, { showLine: s.lines, borderWidth: many ? 1.2 : 1.8 }), marks(s.points, color, total));
            });
            drawPlot("chart-parameter", parameter, sets, (legend) => {
                legend.display = sets.length > 1 && sets.length <= 14;
                if (parameter.group_label) { legend.title = { display: true, text: parameter.group_label }; }
            });
        }

        const scatter = plots.scatter;
        if (scatter) {
            const sets = scatter.series.filter((s) => s.points.length > 0).map((s, i) => {
                const color = s.name.startsWith("unstable") ? unstableColor : "#8a98ad";
                return Object.assign(C.series(s.name, asData(s.points, scatter.point_url), color, { showLine: false }), marks(s.points, color, scatter.plotted));
            });
            if (scatter.front.length > 0) {
                // The front drawn on top: a line through its points, best x first.
                sets.unshift(C.series("Pareto front", asData(scatter.front, scatter.point_url), C.palette[1],
                    { showLine: true, borderWidth: 2, pointRadius: 6, pointHoverRadius: 8, pointStyle: "rectRot", order: -1 }));
            }
            drawPlot("chart-scatter", scatter, sets, (legend) => { legend.display = true; });
        }
    }

    // The plots' facts (counts, notes, the front's rows) and data from the fragment put in place of the page's notes that they are being drawn.
    function putInPlace(html) {
        const fragment = document.createElement("template");
        fragment.innerHTML = html;
        fragment.content.querySelectorAll("[data-plot-facts]").forEach((facts) => {
            const pending = document.querySelector("#plots [data-plot-facts='" + facts.dataset.plotFacts + "']");
            if (!pending) { return; }
            pending.closest("figure").dataset.plotted = facts.dataset.plotted || "0";
            pending.replaceWith(facts);
        });
        const data = fragment.content.getElementById("sweep-plots");
        if (data) { document.body.appendChild(data); }
        return data;
    }

    const section = document.getElementById("plots");
    const block = document.getElementById("sweep-plots");
    if (block) {
        drawAll(JSON.parse(block.textContent));
        C.ready();
    } else if (section && section.dataset.plotsSource) {
        fetch(section.dataset.plotsSource, { headers: { "X-LatticeSweep-Fragment": "1" }, credentials: "same-origin" })
            .then((response) => {
                if (!response.ok) { throw new Error("HTTP " + response.status); }
                return response.text();
            })
            .then((html) => {
                const data = putInPlace(html);
                if (!data) { throw new Error("no plots in the answer"); }
                drawAll(JSON.parse(data.textContent));
                C.ready();
            })
            .catch((e) => {
                section.querySelectorAll(".plot-pending p").forEach((p) => {
                    p.prepend("The plots could not be drawn here (" + e.message + "). ");
                });
                document.body.dataset.plotsFailed = String(e.message);
            });
    }
})();
