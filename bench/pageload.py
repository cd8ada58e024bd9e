"""Page-load figure p11: cold first page and page-to-page navigation in headless Chromium.

The real server (``python -m webapp``, demo data) is driven by Debian's Chromium.
A page counts as loaded when its own heading is shown (not the heading of the
page before), no Dash callback is requested, pending or running (Dash's store)
and no element carries ``data-dash-is-loading``, and every graph of the page has
been drawn by Plotly, on two animation frames in a row.  "Cold" means a browser whose cache and storage were just
cleared, opening the home page; "navigation" is a click on a menu link of the
page shell, timed until the next page is loaded.  Both are medians.
"""

from __future__ import annotations

import os
import statistics
import time

from .dashboard import CHROMIUM, served_dashboard

#: Resolves with true when the page showing ``arguments[0]`` (its path) is loaded:
#: its heading differs from ``arguments[1]`` (the heading before the click), no
#: callback is requested, pending or running in Dash's store, no element is
#: loading and every graph is drawn, on two animation frames in a row (so the
#: gap between a new layout and the callbacks it triggers is not taken for the end).
_LOADED_JS = """
const done = arguments[arguments.length - 1];
const want = arguments[0];
const before = arguments[1];
const t0 = performance.now();
function idle() {
    const state = window.store && window.store.getState();
    if (!state) { return false; }
    const queues = Object.assign({}, state.callbacks);
    delete queues.stored;
    delete queues.completed;
    return Object.values(queues).every(q => !q || !q.length);
}
function loaded() {
    if (window.location.pathname !== want) { return false; }
    const h = document.querySelector('.mh-page h1');
    if (!h || !h.textContent || h.textContent === before) { return false; }
    if (!idle() || document.querySelector('[data-dash-is-loading="true"]')) { return false; }
    const graphs = Array.from(document.querySelectorAll('.mh-page .dash-graph'));
    return graphs.every(g => { const p = g.querySelector('.js-plotly-plot'); return p && p._fullLayout; });
}
let streak = 0;
function poll() {
    streak = loaded() ? streak + 1 : 0;
    if (streak >= 2) { done(true); return; }
    if (performance.now() - t0 > 60000) { done(false); return; }
    requestAnimationFrame(poll);
}
poll();
"""


def _heading(driver):
    return driver.execute_script("const h = document.querySelector('.mh-page h1'); return h ? h.textContent : null;")


def _timed(driver, action, path):
    before = _heading(driver)
    start = time.perf_counter()
    action()
    if not driver.execute_async_script(_LOADED_JS, path, before):
        raise RuntimeError(f"{path} did not finish loading within 60 s")
    return time.perf_counter() - start


def _cold(driver, base):
    driver.get("about:blank")
    driver.execute_cdp_cmd("Network.clearBrowserCache", {})
    driver.execute_cdp_cmd("Storage.clearDataForOrigin", {"origin": base, "storageTypes": "all"})
    return _timed(driver, lambda: driver.get(base + "/"), "/")


def _navigate(driver, path):
    from selenium.webdriver.common.by import By
    link = driver.find_element(By.CSS_SELECTOR, f"a.mh-nav-link[href='{path}']")
    return _timed(driver, link.click, path)


def p11(repeat=5, port=None):
    """Median seconds of a cold first page and of a page-to-page navigation."""
    if not os.path.exists(CHROMIUM):
        return {"p11_first_page_s": None, "p11_navigation_s": None, "p11_note": "Chromium not installed"}
    from webapp.pages import PAGES
    port = port or int(os.environ.get("MODEHEAT_BENCH_PORT", 0)) or None
    with served_dashboard(port) as (base, driver):
        paths = [m.PATH for m in sorted(PAGES, key=lambda m: m.ORDER) if m.PATH != "/"] + ["/"]
        _cold(driver, base)                                  # warm-up of server and browser
        first = [_cold(driver, base) for _ in range(repeat)]
        rounds = [[_navigate(driver, p) for p in paths] for _ in range(max(2, repeat // 2))]
        moves = [t for r in rounds for t in r]
        return {"p11_first_page_s": statistics.median(first), "p11_navigation_s": statistics.median(moves),
                "p11_case": f"home page after clearing cache and storage (median of {repeat}); menu clicks "
                            f"through {len(paths)} pages, {len(rounds)} rounds (median of {len(moves)}; the first "
                            f"round is each page's first visit on a fresh server)",
                "contrast": {"p11_first_visit_navigation_s": statistics.median(rounds[0]),
                             "p11_first_page_times_s": [round(t, 3) for t in first],
                             "p11_navigation_times_s": {p: [round(r[k], 3) for r in rounds]
                                                        for k, p in enumerate(paths)}}}
