"""Dashboard figures: p5 (browser upload until plots are drawn), p6 (callback time).

p5 starts the real server (``python -m webapp``) and drives Debian's headless
Chromium (``/usr/bin/chromium`` + ``/usr/bin/chromedriver``, nothing
downloaded): upload a 10,000-line DOS on the Spectrum page, stop the clock when
both graphs of the page hold the new spectrum and Plotly has drawn its line.
p6 calls page callbacks in this process after a control change, with
parameters that miss the result caches (a real recomputation).
"""

from __future__ import annotations

import contextlib
import os
import socket
import statistics
import subprocess
import sys
import tempfile
import time
import urllib.request
from pathlib import Path

from . import cases

CHROMIUM = os.environ.get("MODEHEAT_CHROMIUM", "/usr/bin/chromium")
UPLOAD_POINTS = 10_000

_GRAPH_JS = """
function graphDiv(id) {
    const box = document.getElementById(id);
    return box && (box.classList.contains('js-plotly-plot') ? box : box.querySelector('.js-plotly-plot'));
}
"""

#: Remember the figures shown before the upload (the demo dataset, if any).
_MARK_JS = _GRAPH_JS + """
window.__benchBefore = {};
for (const id of ['sp-dos-graph', 'sp-reduced-graph']) {
    const gd = graphDiv(id);
    window.__benchBefore[id] = gd ? gd.data : null;
}
"""

#: Resolves when both Spectrum graphs show new data with a drawn line, the DOS
#: graph with every point of the upload.
_DRAWN_JS = _GRAPH_JS + """
const done = arguments[arguments.length - 1];
const points = arguments[0];
const t0 = performance.now();
function drawn(id, atLeast) {
    const gd = graphDiv(id);
    if (!gd || !gd._fullData || !gd._fullData.length || gd.data === window.__benchBefore[id]) { return false; }
    const path = gd.querySelector('.scatterlayer .trace path.js-line');
    return path !== null && (path.getAttribute('d') || '').length > 0 && gd._fullData[0].x.length >= atLeast;
}
function poll() {
    if (drawn('sp-dos-graph', points) && drawn('sp-reduced-graph', 1)) { done(true); return; }
    if (performance.now() - t0 > 60000) { done(false); return; }
    requestAnimationFrame(poll);
}
poll();
"""


def _free_port():
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def _wait_for_server(url, proc, timeout=60.0):
    end = time.time() + timeout
    while time.time() < end:
        if proc.poll() is not None:
            raise RuntimeError(f"the dashboard exited with {proc.returncode}")
        try:
            with urllib.request.urlopen(url, timeout=2) as reply:
                if reply.status == 200:
                    return
        except OSError:
            time.sleep(0.2)
    raise RuntimeError("the dashboard did not answer within 60 s")


@contextlib.contextmanager
def served_dashboard(port=None):
    """The real server (``python -m webapp``) and a headless Chromium: yields (base URL, driver)."""
    repo = Path(__file__).resolve().parents[1]
    port = port or _free_port()
    proc = subprocess.Popen([sys.executable, "-m", "webapp", "--port", str(port)], cwd=repo,
                            stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL,
                            env={**os.environ, "PYTHONPATH": str(repo)})
    driver = None
    try:
        base = f"http://127.0.0.1:{port}"
        _wait_for_server(base + "/", proc)
        driver = _browser()
        yield base, driver
    finally:
        if driver is not None:
            driver.quit()
        proc.terminate()
        try:
            proc.wait(timeout=10)
        except subprocess.TimeoutExpired:
            proc.kill()


def _browser():
    from webapp.browser import start
    driver = start()
    driver.set_script_timeout(90)
    return driver


def _upload_once(driver, url, path):
    from selenium.webdriver.common.by import By
    from selenium.webdriver.support import expected_conditions as ec
    from selenium.webdriver.support.ui import WebDriverWait
    driver.get(url)
    driver.execute_script("window.sessionStorage.clear(); window.localStorage.clear();")
    driver.get(url)
    field = WebDriverWait(driver, 60).until(
        ec.presence_of_element_located((By.CSS_SELECTOR, "#mh-upload input[type=file]")))
    WebDriverWait(driver, 60).until(lambda drv: drv.execute_script(
        "return document.querySelector('#sp-dos-graph .js-plotly-plot') !== null"))
    driver.execute_script(_MARK_JS)
    start = time.perf_counter()
    field.send_keys(str(path))
    ok = driver.execute_async_script(_DRAWN_JS, UPLOAD_POINTS)
    elapsed = time.perf_counter() - start
    if not ok:
        raise RuntimeError("the plots were not drawn within 60 s of the upload")
    return elapsed


def p5(repeat=5):
    """Median seconds from choosing a 10,000-line DOS file to both Spectrum plots drawn."""
    if not (os.path.exists(CHROMIUM) and any(
            os.path.exists(os.path.join(d, "chromedriver")) for d in os.environ.get("PATH", "").split(os.pathsep))):
        return {"p5_upload_to_plot_s": None, "p5_note": "Chromium or chromedriver not installed"}
    with served_dashboard(int(os.environ.get("MODEHEAT_BENCH_PORT", 0)) or None) as (base, driver):
        times = []
        with tempfile.TemporaryDirectory(prefix="modeheat-bench-") as tmp:
            for k in range(repeat + 1):
                # a new file each time (different content): no server cache helps
                nu, g = cases.spring_crystal(UPLOAD_POINTS, acoustic_cutoff_thz=5.5 + 0.1 * k)
                path = Path(tmp) / f"upload_{k}.dat"
                path.write_text(cases.as_text(nu, g))
                elapsed = _upload_once(driver, base + "/spectrum", path)
                if k:                       # the first upload warms the browser and server up
                    times.append(elapsed)
        return {"p5_upload_to_plot_s": statistics.median(times),
                "p5_case": f"{UPLOAD_POINTS}-line DOS, Spectrum page, median of {repeat} uploads after one warm-up",
                "contrast": {"p5_upload_times_s": times}}


def _workspace():
    from webapp import session
    nu, g = cases.spring_crystal(UPLOAD_POINTS)
    dataset = session.new_dataset("bench.dat", cases.as_text(nu, g).encode())
    return {"datasets": [dataset], "active": dataset["id"], "rev": "bench"}


def _median_call(fn, repeat):
    times = []
    for k in range(repeat):
        start = time.perf_counter()
        fn(k)
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def p6(repeat=9):
    """Median server time of a page's callbacks after a control change [s].

    Thermodynamics: the range's upper end changes (new table, four figures).
    Spectrum: the low-frequency window changes (the DOS is read and prepared
    again, both figures redrawn).  The figure is the slower page's median.
    """
    from webapp.pages import spectrum, thermodynamics
    ws = _workspace()
    thermodynamics.draw(ws, 0, 1000, 5, "formula", [])     # load once, as after an upload
    thermo_s = _median_call(lambda k: thermodynamics.draw(ws, 0, 1000 + 10 * (k + 1), 5, "formula", []), repeat)

    def spectrum_change(k):
        values = {**spectrum.control_values(ws), "sp-lowmode": "manual",
                  "sp-low-lo": 0.3, "sp-low-hi": 1.5 + 0.05 * k}
        new, _ = spectrum.apply_edit(ws, "sp-low-hi", values)
        spectrum.draw(new)
    spectrum_s = _median_call(spectrum_change, repeat)
    return {"p6_callback_median_s": max(thermo_s, spectrum_s),
            "p6_case": f"{UPLOAD_POINTS}-point DOS; median of {repeat} control changes per page, slower page",
            "contrast": {"p6_thermodynamics_range_change_s": thermo_s,
                         "p6_spectrum_window_change_s": spectrum_s}}
