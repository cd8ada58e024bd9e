"""End-to-end tests: the real dashboard in headless Chromium (Debian chromium + chromedriver).

Run: ``pytest tests/browser --headless``.  Test DOS files are invented
(a Debye ν² spectrum); physical references come from scipy.constants (CODATA).
"""

import json
from pathlib import Path

import numpy as np
import pytest
from tests.browser.waits import until
from scipy import constants as sc
from selenium.webdriver.common.by import By

from thermo import load_dos, tabulate
from thermo.io.readback import read_exported_csv
from webapp import demo, session
from webapp.app import create_app
from webapp.pages import PAGES

pytestmark = pytest.mark.browser
N_POINTS = 241
PLAIN = "# frequency (THz) dos\n" + "\n".join(f"{a} {9 * a * a / 125}" for a in np.linspace(0, 5, N_POINTS)) + "\n"
GARBAGE = "# frequency (THz) dos\n0 0\n1 0.1\n2 banana\n3 0.5\n"


@pytest.fixture
def files(tmp_path):
    good = tmp_path / "uploaded_debye.dat"
    good.write_text(PLAIN)
    bad = tmp_path / "broken.dat"
    bad.write_text(GARBAGE)
    return good, bad


@pytest.fixture
def duo(dash_duo):
    dash_duo.start_server(create_app())
    dash_duo.driver.set_window_size(1280, 1000)
    return dash_duo


def js_graph(driver, graph_id, expr="gd.data.map(t => t.type).length"):
    return driver.execute_script(
        f"const gd = document.querySelector('#{graph_id} .js-plotly-plot');"
        f"if (!gd || !gd.data) return null; try {{ return {expr}; }} catch (e) {{ return null; }}")


def drawn(driver, graph_id):
    """Number of traces drawn in a graph (0 while it shows a placeholder)."""
    return js_graph(driver, graph_id) or 0


def wait_drawn(driver, graph_ids, timeout=30):
    try:
        until(lambda: all(drawn(driver, g) > 0 for g in graph_ids), timeout)
    except TimeoutError as exc:          # name the page, the graphs left empty and what the browser logged
        empty = [g for g in graph_ids if not drawn(driver, g)]
        logs = [e.get("message", "")[:300] for e in driver.get_log("browser")]
        said = driver.execute_script("return Array.from(document.querySelectorAll('[id$=-messages], .gtitle, "
                                     ".annotation-text')).map(e => e.textContent).join(' | ');")
        raise TimeoutError(f"{driver.current_url}: not drawn {empty}; page says {said!r}; browser log {logs}") from exc


def page_graph_ids(driver):
    return driver.execute_script(
        "return Array.from(document.querySelectorAll('.dash-graph')).map(e => e.id);")


def heading(driver):
    return driver.execute_script("const h = document.querySelector('.mh-page h1'); return h ? h.textContent : '';")


def active_name(driver):
    """Text of the active-dataset selector ('' while the page is being drawn)."""
    return driver.execute_script(
        "const e = document.getElementById('sp-dataset'); return e ? e.textContent.trim() : '';")


def values(driver, graph_id, trace=0):
    """y values of a drawn trace (plotly's full data, typed arrays unpacked)."""
    return np.array(js_graph(driver, graph_id, f"Array.from(gd._fullData[{trace}].y)"), dtype=float)


def upload(driver, *paths):
    """Send ``paths`` to the upload field once the page has drawn it (right after ``get`` it may not be)."""
    field = until(lambda: driver.find_element(By.CSS_SELECTOR, "#mh-upload input[type=file]"))
    field.send_keys("\n".join(str(p) for p in paths))


def upload_then_open(duo, path, page):
    """Upload ``path`` on the Spectrum page, then follow the navigation link to ``page``."""
    duo.driver.get(duo.server_url + "/spectrum")
    upload(duo.driver, path)
    until(lambda: active_name(duo.driver) == path.name, 20)
    duo.driver.find_element(By.CSS_SELECTOR, f"a[href='{page}'].mh-nav-link").click()


def no_console_errors(duo):
    logs = [e for e in duo.get_logs() or [] if e.get("level") == "SEVERE"]
    assert logs == [], logs


def test_every_page_renders_plots_with_demo(duo):
    registered = set(duo.driver.execute_script("return Object.keys(Plotly.PlotSchema.get().traces);"))
    for module in PAGES:
        duo.driver.find_element(By.CSS_SELECTOR, f"a[href='{module.PATH}'].mh-nav-link").click()
        until(lambda: heading(duo.driver) == module.NAME, 10)
        ids = page_graph_ids(duo.driver)
        assert ids, module.PATH
        wait_drawn(duo.driver, ids)
        for graph_id in ids:   # titled axes everywhere
            assert js_graph(duo.driver, graph_id, "gd.layout.xaxis.title.text") or \
                js_graph(duo.driver, graph_id, "gd.layout.xaxis.visible === false"), graph_id
            # every trace type the page sends is one the served plot bundle knows
            types = js_graph(duo.driver, graph_id, "gd.data.map(t => t.type || 'scatter')")
            assert set(types) <= registered, (graph_id, set(types) - registered)
        assert "harmonic approximation" in duo.find_element("#mh-caution").text
    # the cartesian bundle drew every page: plotly's full 4.8 MB bundle was never fetched
    fetched = duo.driver.execute_script("return performance.getEntriesByType('resource').map(e => e.name);")
    assert any("vendor/plotly-cartesian.min.js" in name for name in fetched)
    assert not any("package_data/plotly.min.js" in name for name in fetched)
    no_console_errors(duo)


def test_upload_updates_plots_and_survives_reload(duo, files):
    good, _ = files
    duo.driver.get(duo.server_url + "/spectrum")
    wait_drawn(duo.driver, ["sp-dos-graph"])
    before = js_graph(duo.driver, "sp-dos-graph", "gd._fullData[0].x.length")
    upload(duo.driver, good)
    until(lambda: active_name(duo.driver) == good.name, 20)
    until(lambda: js_graph(duo.driver, "sp-dos-graph", "gd._fullData[0].x.length") == N_POINTS, 20)
    assert before != N_POINTS
    duo.driver.refresh()   # the workspace lives in the tab's session storage
    duo.wait_for_element("#sp-dataset", timeout=10)
    until(lambda: active_name(duo.driver) == good.name, 20)
    until(lambda: js_graph(duo.driver, "sp-dos-graph", "gd._fullData[0].x.length") == N_POINTS, 20)
    no_console_errors(duo)


def test_garbage_upload_shows_error_and_keeps_dataset(duo, files):
    _, bad = files
    duo.driver.get(duo.server_url + "/spectrum")
    wait_drawn(duo.driver, ["sp-dos-graph"])
    name = active_name(duo.driver)
    x_before = js_graph(duo.driver, "sp-dos-graph", "gd._fullData[0].x.length")
    upload(duo.driver, bad)
    duo.wait_for_contains_text("#sp-messages", "broken.dat", timeout=20)
    text = duo.find_element("#sp-messages").text
    assert "line 4" in text and "Traceback" not in text
    assert active_name(duo.driver) == name
    assert js_graph(duo.driver, "sp-dos-graph", "gd._fullData[0].x.length") == x_before
    no_console_errors(duo)


def test_changing_the_basis_changes_numbers(duo, files):
    good, _ = files
    upload_then_open(duo, good, "/thermodynamics")
    wait_drawn(duo.driver, ["th-cv-graph"])
    until(lambda: good.name in duo.find_element(".mh-active-note").text, 10)
    per_formula = values(duo.driver, "th-cv-graph")
    duo.driver.find_element(By.CSS_SELECTOR, "#th-per input[value='atom']").click()
    until(lambda: "k_B/atom" in (js_graph(duo.driver, "th-cv-graph", "gd.layout.yaxis.title.text") or ""), 20)
    per_atom = values(duo.driver, "th-cv-graph")
    # one atom per formula unit: C_v per atom [k_B] = C_v per mole [J/(mol K)] / R (CODATA, scipy.constants)
    np.testing.assert_allclose(per_atom, per_formula / sc.R, rtol=1e-9)
    assert "k_B/atom" in duo.find_element("#th-keys").text
    no_console_errors(duo)


def test_export_download_equals_tabulate(duo, files):
    good, _ = files
    upload_then_open(duo, good, "/export")
    box = duo.find_element("#ex-temperatures")
    box.clear()
    box.send_keys("0:900:15\n")
    duo.wait_for_contains_text("#ex-preview", "temperature_K", timeout=20)
    duo.driver.find_element(By.CSS_SELECTOR, "#ex-per input[value='atom']").click()
    duo.wait_for_contains_text("#ex-preview", '"basis": "atom"', timeout=20)
    duo.find_element("#ex-download-btn").click()
    target = Path(duo.download_path) / "uploaded_debye-atom.csv"
    temperatures = np.arange(0.0, 901.0, 15.0)
    until(lambda: target.exists() and target.read_text(encoding="utf-8").count("\n") > temperatures.size, 20)
    df, meta = read_exported_csv(target)
    ref = tabulate(load_dos(good), temperatures, per="atom")
    assert list(df.columns) == list(ref.columns)
    # the page writes 8 significant digits (provenance says so): rounding moves a value by <= 5e-8 relative
    np.testing.assert_allclose(df.to_numpy(), ref.to_numpy(), rtol=5e-8, atol=0)
    assert int(meta["significant_digits"]) == 8
    assert [i["name"] for i in meta["inputs"]] == [good.name] and meta["settings"]["basis"] == "atom"
    no_console_errors(duo)


def test_two_browsers_stay_isolated(duo, files, second_browser):
    good, _ = files
    duo.driver.get(duo.server_url + "/spectrum")
    wait_drawn(duo.driver, ["sp-dos-graph"])
    demo_name = active_name(duo.driver)
    other = second_browser
    other.get(duo.server_url + "/spectrum")
    until(lambda: active_name(other) == demo_name, 20)
    upload(duo.driver, good)
    until(lambda: active_name(duo.driver) == good.name, 20)
    other.get(duo.server_url + "/spectrum")   # reload: still its own workspace
    until(lambda: active_name(other) == demo_name, 20)
    until(lambda: "springium" in other.find_element(By.CSS_SELECTOR, "#sp-list").text, 20)
    assert good.name not in other.find_element(By.CSS_SELECTOR, "#sp-list").text
    no_console_errors(duo)


def test_oversize_upload_is_refused_with_a_clear_message(dash_duo, files):
    good, _ = files   # about 5 kB, above a 0.001 MB limit
    dash_duo.start_server(create_app(max_upload_mb=0.001))
    dash_duo.driver.get(dash_duo.server_url + "/spectrum")
    wait_drawn(dash_duo.driver, ["sp-dos-graph"])
    name = active_name(dash_duo.driver)
    upload(dash_duo.driver, good)
    dash_duo.wait_for_contains_text("#sp-messages", "upload limit is 0.001 MB", timeout=20)
    assert good.name in dash_duo.find_element("#sp-messages").text
    assert active_name(dash_duo.driver) == name
    no_console_errors(dash_duo)


def test_plain_links_reach_every_page_whose_controls_have_accessible_names(duo):
    """Every page opened by its address (no navigation link) draws, and every visible control has a name."""
    missing, checked = [], 0
    for module in PAGES:
        duo.driver.get(duo.server_url + module.PATH)
        until(lambda: heading(duo.driver) == module.NAME, 10)
        wait_drawn(duo.driver, page_graph_ids(duo.driver))
        for element in duo.driver.find_elements(
                By.CSS_SELECTOR, ".mh-page input, .mh-page button, .mh-page select, .mh-page [role=combobox]"):
            if not element.is_displayed():
                continue
            checked += 1
            if not element.accessible_name.strip():
                missing.append(f"{module.PATH}: <{element.tag_name} id={element.get_attribute('id')!r} "
                               f"class={element.get_attribute('class')!r}>")
    assert missing == [] and checked > 30, (missing, checked)
    # every page opened and drawn, no button clicked: nothing was sent on (it used to reach the Phases page)
    assert not json.loads(duo.driver.execute_script("return sessionStorage.getItem('mh-sent');") or "null")
    no_console_errors(duo)


def test_figure_image_format_choice_reaches_the_plots(duo):
    duo.driver.get(duo.server_url + "/export")
    wait_drawn(duo.driver, ["ex-preview-graph"])
    fmt = "gd._context.toImageButtonOptions.format"
    assert js_graph(duo.driver, "ex-preview-graph", fmt) == "png"
    duo.driver.find_element(By.CSS_SELECTOR, "#ex-image input[value='svg']").click()
    until(lambda: '"svg"' in (duo.driver.execute_script("return sessionStorage.getItem('mh-prefs');") or ""))
    duo.driver.find_element(By.CSS_SELECTOR, "a[href='/thermodynamics'].mh-nav-link").click()
    wait_drawn(duo.driver, ["th-cv-graph"])
    until(lambda: js_graph(duo.driver, "th-cv-graph", fmt) == "svg", 10)
    assert "mh-nav-here" in duo.find_element("a[href='/thermodynamics'].mh-nav-link").get_attribute("class")
    no_console_errors(duo)


def test_workspace_too_large_for_session_storage_is_kept_until_reload(dash_duo, tmp_path):
    good = tmp_path / "long_debye.dat"   # larger than any demo file: the first to be left out
    good.write_text("# frequency (THz) dos\n" + "\n".join(f"{a} {9 * a * a / 125}" for a in np.linspace(0, 5, 6001)))
    demo_size = len(json.dumps(demo.demo_workspace()))
    dash_duo.start_server(create_app(saved_limit_chars=demo_size + 200))   # the demo fits, the upload not
    dash_duo.driver.get(dash_duo.server_url + "/spectrum")
    wait_drawn(dash_duo.driver, ["sp-dos-graph"])
    demo_name = active_name(dash_duo.driver)
    upload(dash_duo.driver, good)
    dash_duo.wait_for_contains_text("#sp-messages", "too large to keep across a page reload", timeout=20)
    until(lambda: js_graph(dash_duo.driver, "sp-dos-graph", "gd._fullData[0].x.length") == 6001, 20)
    no_console_errors(dash_duo)   # nothing overflowed the browser's storage
    dash_duo.driver.refresh()
    until(lambda: active_name(dash_duo.driver) == demo_name, 20)
    no_console_errors(dash_duo)
