"""Page-load figure p11: cold first page and page-to-page navigation in headless Chromium.

The real server (``python -m webapp``, demo data) is driven by Debian's Chromium.
A page counts as loaded when its heading is shown, no Dash callback is pending
(no element carries ``data-dash-is-loading``) and every graph of the page has
been drawn by Plotly.  "Cold" means a browser whose cache and storage were just
cleared, opening the home page; "navigation" is a click on a menu link of the
page shell, timed until the next page is loaded.  Both are medians.
"""

from __future__ import annotations

import os
import statistics
import time

from .dashboard import CHROMIUM, served_dashboard

#: Resolves with true when the page showing ``arguments[0]`` (its path) is loaded.
_LOADED_JS = """
const done = arguments[arguments.length - 1];
const want = arguments[0];
const t0 = performance.now();
function loaded() {
    if (window.location.pathname !== want) { return false; }
    const h = document.querySelector('.mh-page h1');
    if (!h || !h.textContent) { return false; }
    if (document.querySelector('[data-dash-is-loading="true"]')) { return false; }
    const graphs = Array.from(document.querySelectorAll('.mh-page .dash-graph'));
    return graphs.every(g => { const p = g.querySelector('.js-plotly-plot'); return p && p._fullLayout; });
}
function poll() {
    if (loaded()) { done(true); return; }
    if (performance.now() - t0 > 60000) { done(false); return; }
    requestAnimationFrame(poll);
}
poll();
"""


def _timed(driver, action, path):
    start = time.perf_counter()
    action()
    if not driver.execute_async_script(_LOADED_JS, path):
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
        moves = []
        for _ in range(max(1, repeat // len(paths) + 1)):
            moves += [_navigate(driver, p) for p in paths]
        return {"p11_first_page_s": statistics.median(first), "p11_navigation_s": statistics.median(moves),
                "p11_case": f"home page after clearing cache and storage (median of {repeat}); menu clicks "
                            f"through {len(paths)} pages (median of {len(moves)})",
                "contrast": {"p11_first_page_times_s": first, "p11_navigation_times_s": moves}}
