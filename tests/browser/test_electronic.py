"""Electronic page in headless Chromium against the real server: the demo draws, an upload replaces it."""

import math

import numpy as np
import pytest
from tests.browser.waits import until
from scipy import constants as sc
from selenium.webdriver.common.by import By

from webapp.app import create_app

from .test_dashboard import js_graph, no_console_errors, wait_drawn

pytestmark = pytest.mark.browser
PORT = 8083
GRAPHS = ["el-dos-graph", "el-ct-graph", "el-s-graph"]


@pytest.fixture
def duo(dash_duo):
    dash_duo.start_server(create_app(), port=PORT)
    dash_duo.driver.set_window_size(1280, 1100)
    return dash_duo


def test_demo_draws_and_an_upload_replaces_it(duo, tmp_path):
    duo.driver.get(duo.server_url + "/electronic")
    wait_drawn(duo.driver, GRAPHS)
    until(lambda: "springium_edos.dat" in duo.driver.find_element(By.ID, "el-file").text, 20)
    assert js_graph(duo.driver, "el-dos-graph", "gd._fullData.length") == 3       # total + two projections
    assert "mJ/(mol K²)" in duo.driver.find_element(By.ID, "el-keys").text
    # A flat band of 3 states/eV in meV units: C_el/T = (π²/3) k_B² g at every T (A&M ch. 2).
    e = np.linspace(-4000.0, 4000.0, 81)
    flat = tmp_path / "flat_meV.dat"
    flat.write_text("E-E_F (meV)  DOS (states/meV)\n" + "".join(f"{a:g} 0.003\n" for a in e))
    duo.driver.find_element(By.CSS_SELECTOR, "#el-upload input[type=file]").send_keys(str(flat))
    until(lambda: "flat_meV.dat" in duo.driver.find_element(By.ID, "el-file").text, 30)
    until(lambda: js_graph(duo.driver, "el-dos-graph", "gd._fullData.length") == 1, 20)
    expected = math.pi ** 2 / 3 * (sc.k / sc.electron_volt) ** 2 * 3.0 * sc.N_A * sc.electron_volt * 1e3
    y = np.array(js_graph(duo.driver, "el-ct-graph", "Array.from(gd._fullData[0].y)"), dtype=float)
    np.testing.assert_allclose(y, expected, rtol=1e-6)
    # the Calorimetry page compares its fitted γ with the band γ of the chosen electronic DOS
    duo.driver.find_element(By.CSS_SELECTOR, "a[href='/calorimetry'].mh-nav-link").click()
    until(lambda: "flat_meV.dat" in _text(duo.driver, "cal-band-gamma"), 40)
    assert f"{expected * 1e-3:.6g}" in _text(duo.driver, "cal-band-gamma")
    no_console_errors(duo)


def _text(driver, element_id):
    found = driver.find_elements(By.ID, element_id)
    return found[0].text if found else ""
