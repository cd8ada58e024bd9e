"""Calorimetry page in headless Chromium against the real server: upload, refit, errors."""

import numpy as np
import pytest
from tests.browser.waits import until
from selenium.common.exceptions import NoSuchElementException, StaleElementReferenceException
from selenium.webdriver.common.by import By

from webapp.app import create_app

from .test_dashboard import js_graph, no_console_errors, wait_drawn

pytestmark = pytest.mark.browser
PORT = 8074


@pytest.fixture
def duo(dash_duo):
    dash_duo.start_server(create_app(), port=PORT)
    dash_duo.driver.set_window_size(1280, 1100)
    return dash_duo


def _messages(driver):
    return driver.find_element(By.ID, "cal-messages").text


def _text(driver, selector):
    """Text of an element, or "" while the page replaces it (a stale reference is not a failure)."""
    try:
        return driver.find_element(By.CSS_SELECTOR, selector).text
    except (StaleElementReferenceException, NoSuchElementException):
        return ""


def test_upload_fit_and_error_message(duo, tmp_path):
    # A Debye-like solid with γT, written in mJ/(mol K): the page must read the unit from the header.
    t = np.linspace(5.0, 320.0, 64)
    theta = 280.0
    cv = 3 * 8.314462618 * (t / theta) ** 3 * 77.927 / (1 + 77.927 * (t / theta) ** 3)   # smooth, -> 3R
    good = tmp_path / "measured_mJ.csv"
    good.write_text("T (K),Cp (mJ/(mol K))\n" + "".join(f"{a},{1e3 * (b + 1e-3 * a)}\n" for a, b in zip(t, cv)))
    bad = tmp_path / "broken.csv"
    bad.write_text("T,Cp\n10,1\n20,banana\n")
    duo.driver.get(duo.server_url + "/calorimetry")
    wait_drawn(duo.driver, ["cal-overlay-graph", "cal-residual-graph", "cal-lowt-graph"])
    until(lambda: "springium_cp.csv" in duo.driver.find_element(By.ID, "cal-file").text, 20)
    duo.driver.find_element(By.CSS_SELECTOR, "#cal-upload input[type=file]").send_keys(str(good))
    until(lambda: "measured_mJ.csv" in duo.driver.find_element(By.ID, "cal-file").text, 30)
    assert "read in mJ/(mol K)" in duo.driver.find_element(By.ID, "cal-file").text
    until(lambda: js_graph(duo.driver, "cal-overlay-graph", "gd._fullData[0].x.length") == 64, 20)
    y = np.array(js_graph(duo.driver, "cal-overlay-graph", "Array.from(gd._fullData[0].y)"), dtype=float)
    assert y[-1] == pytest.approx(cv[-1] + 1e-3 * t[-1], rel=1e-6)    # converted to J/(mol K)
    # An upload is compared with the active DOS (scale s); switching to Debye refits with θ_D.
    until(lambda: "frequency scale s" in _text(duo.driver, "#cal-param-table"), 20)
    duo.driver.find_element(By.CSS_SELECTOR, "#cal-lattice input[value=debye]").click()
    until(lambda: _text(duo.driver, "#cal-param-table tbody td") == "θ_D", 20)
    duo.driver.find_element(By.CSS_SELECTOR, "#cal-upload input[type=file]").send_keys(str(bad))
    until(lambda: "'banana' is not a number" in _messages(duo.driver), 20)
    assert "Traceback" not in _messages(duo.driver)
    no_console_errors(duo)
