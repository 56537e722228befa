// Sweep page: re-reads the sweep's JSON every 5 s while it is active and updates the progress numbers in place.
(function () {
    "use strict";
    const section = document.getElementById("progress");
    if (!section) { return; }
    const count = (n) => Number(n).toLocaleString("en-US") + (Number(n) === 1 ? " point" : " points");

    function set(field, text, value) {
        const el = section.querySelector('[data-field="' + field + '"]');
        if (!el) { return; }
        el.textContent = text;
        if (value !== undefined) { el.dataset.value = value === null ? "" : String(value); }
    }

    function bar(s) {
        const share = (n) => (s.total === 0 ? 0 : (100 * n) / s.total);
        let x = 0;
        for (const part of ["done", "unstable", "failed", "cancelled", "running"]) {
            const rect = section.querySelector('rect[data-part="' + part + '"]');
            const width = share(s[part]);
            if (rect) { rect.setAttribute("x", String(x)); rect.setAttribute("width", String(width)); }
            x += width;
        }
    }

    async function refresh() {
        const state = document.getElementById("sweep-state");
        if (state && !["queued", "running"].includes(state.textContent.trim())) { return; }
        try {
            const response = await fetch(section.dataset.source, { headers: { Accept: "application/json" }, credentials: "same-origin" });
            if (!response.ok) { return; }
            const detail = await response.json();
            const s = detail.sweep;
            for (const f of ["total", "done", "unstable", "failed", "running", "waiting", "cancelled"]) { set(f, count(s[f]), s[f]); }
            if (detail.stability) { set("floppy", count(detail.stability.floppy), detail.stability.floppy); }
            set("finished", s.text.finished);
            set("rate", s.text.rate, s.rate_points_per_min);
            set("eta", s.text.eta, s.eta_s);
            set("elapsed", s.text.elapsed);
            set("started", s.text.started);
            set("finished_at", s.text.finished_at);
            bar(s);
            if (state) { state.textContent = s.state; state.className = "state state-" + s.state; }
        } catch (e) {
            // Try again at the next tick.
        }
    }

    setInterval(refresh, 5000);
})();
