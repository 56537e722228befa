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

    // ---- the workers card: redrawn from /api/workers ----
    const workers = document.getElementById("workers");
    const clock = (t) => (t ? new Date(t).toISOString().replace("T", " ").slice(0, 19) : "—");

    function el(tag, className, text) {
        const e = document.createElement(tag);
        if (className) { e.className = className; }
        if (text !== undefined) { e.textContent = text; }
        return e;
    }

    function workerRow(w) {
        const tr = el("tr");
        tr.dataset.worker = w.name;
        tr.dataset.status = w.status;
        const status = el("td");
        const badge = el("span", "state state-worker-" + w.status, w.status);
        badge.dataset.field = "status";
        status.append(badge, el("div", "sub", w.status_text));
        const holds = el("td");
        if (w.holds.length === 0) { holds.appendChild(el("span", "muted", "nothing (idle)")); }
        for (const h of w.holds) {
            const line = el("div");
            line.dataset.holds = h.sweep_id;
            const link = el("a", "", h.sweep_name);
            link.href = h.url;
            const chunks = h.chunks.slice(0, 4).join(", ") + (h.chunks.length > 4 ? ", ..." : "");
            line.append(link, ": " + count(h.points) + (h.points === 1 ? " point" : " points") + " in " + count(h.chunks.length)
                + (h.chunks.length === 1 ? " chunk " : " chunks "), el("span", "sub mono", chunks));
            holds.appendChild(line);
        }
        tr.append(el("td", "mono", w.name), status,
            cell(w.threads === null ? "—" : String(w.threads), "threads", w.threads, true),
            cell(clock(w.last_heard_at), "last_heard"),
            cell(count(w.points_held), "points_held", w.points_held, true),
            holds);
        return tr;
    }

    async function refreshWorkers() {
        if (!workers) { return; }
        try {
            const response = await fetch(workers.dataset.source, { headers: { Accept: "application/json" }, credentials: "same-origin" });
            if (!response.ok) { return; }
            const list = await response.json();
            const body = document.getElementById("workers-body");
            if (list.workers.length === 0) {
                const none = el("p", "muted", "No worker process is running on this store, and no point is held by one.");
                none.dataset.field = "no-workers";
                body.replaceChildren(none);
            } else {
                const table = el("table", "grid");
                table.id = "workers-table";
                const head = el("thead");
                const hr = el("tr");
                for (const [text, unit, numeric] of [["Worker", "machine:process"], ["Status"], ["Threads", "", true], ["Last heard", "UTC"], ["Points held", "", true], ["Holds"]]) {
                    const th = el("th", numeric ? "num" : "", text);
                    if (unit) { th.append(" ", el("span", "unit", unit)); }
                    hr.appendChild(th);
                }
                head.appendChild(hr);
                const tbody = el("tbody");
                tbody.append(...list.workers.map(workerRow));
                table.append(head, tbody);
                body.replaceChildren(table);
            }
            workers.dataset.refreshed = String((Number(workers.dataset.refreshed) || 0) + 1);
        } catch (e) {
            // The next tick tries again.
        }
    }

    setInterval(refresh, 5000);
    setInterval(refreshWorkers, 5000);
    window.latticeSweepRefresh = refresh;
    window.latticeSweepRefreshWorkers = refreshWorkers;
})();
