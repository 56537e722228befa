// Sweeps page: re-reads /api/sweeps every 5 s and redraws the table body (no full reload).
(function () {
    "use strict";
    const table = document.getElementById("sweeps");
    if (!table) { return; }
    const body = table.tBodies[0];
    const source = table.dataset.source;
    const svgNs = "http://www.w3.org/2000/svg";
    const count = (n) => Number(n).toLocaleString("en-US");

    function cell(text, field, value, numeric) {
        const td = document.createElement("td");
        if (numeric) { td.className = "num"; }
        if (field) { td.dataset.field = field; }
        if (value !== undefined && value !== null) { td.dataset.value = String(value); }
        td.textContent = text;
        return td;
    }

    function bar(s) {
        const svg = document.createElementNS(svgNs, "svg");
        svg.setAttribute("class", "bar");
        svg.setAttribute("viewBox", "0 0 100 10");
        svg.setAttribute("preserveAspectRatio", "none");
        const share = (n) => (s.total === 0 ? 0 : (100 * n) / s.total);
        let x = 0;
        const parts = [["bar-bg", 100, true], ["bar-done", share(s.done)], ["bar-unstable", share(s.unstable)], ["bar-failed", share(s.failed)],
            ["bar-cancelled", share(s.cancelled)], ["bar-running", share(s.running)]];
        for (const [cls, width, background] of parts) {
            const rect = document.createElementNS(svgNs, "rect");
            rect.setAttribute("class", cls);
            rect.setAttribute("x", background ? "0" : String(x));
            rect.setAttribute("y", "0");
            rect.setAttribute("width", String(width));
            rect.setAttribute("height", "10");
            svg.appendChild(rect);
            if (!background) { x += width; }
        }
        return svg;
    }

    function row(s) {
        const tr = document.createElement("tr");
        tr.dataset.sweepId = s.sweep_id;
        const name = document.createElement("td");
        const link = document.createElement("a");
        link.className = "strong";
        link.href = s.url;
        link.textContent = s.name;
        const id = document.createElement("div");
        id.className = "sub mono";
        id.textContent = s.sweep_id;
        name.append(link, id);
        const state = document.createElement("td");
        const badge = document.createElement("span");
        badge.className = "state state-" + s.state;
        badge.dataset.field = "state";
        badge.textContent = s.state;
        state.appendChild(badge);
        const progress = document.createElement("td");
        progress.className = "progress-col";
        const finished = document.createElement("div");
        finished.className = "sub";
        finished.dataset.field = "finished";
        finished.textContent = s.text.finished + " finished";
        progress.append(bar(s), finished);
        tr.append(name, state, progress,
            cell(count(s.total), "total", s.total, true),
            cell(count(s.done), "done", s.done, true),
            cell(count(s.unstable), "unstable", s.unstable, true),
            cell(count(s.failed), "failed", s.failed, true),
            cell(count(s.running), "running", s.running, true),
            cell(count(s.waiting), "waiting", s.waiting, true),
            cell(s.text.rate_number, "rate", s.rate_points_per_min, true),
            cell(s.text.eta, "eta", s.eta_s, true),
            cell(s.text.started, "started"),
            cell(s.text.finished_at, "finished_at"));
        return tr;
    }

    async function refresh() {
        try {
            const response = await fetch(source, { headers: { Accept: "application/json" }, credentials: "same-origin" });
            if (!response.ok) { return; }
            const list = await response.json();
            body.replaceChildren(...list.sweeps.map(row));
            const updated = document.getElementById("updated");
            if (updated) { updated.textContent = new Date(list.generated_at).toISOString().replace("T", " ").slice(0, 19) + " UTC"; }
            table.dataset.refreshed = String((Number(table.dataset.refreshed) || 0) + 1);
        } catch (e) {
            // The server may be restarting; the next tick tries again.
        }
    }

    setInterval(refresh, 5000);
    window.latticeSweepRefresh = refresh;
})();
