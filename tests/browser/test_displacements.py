"""Displacements page in headless Chromium against the real server (invented demo data).

The plotted ⟨u²⟩ must be the library's numbers for the same file (whose own checks are the
Debye closed form of Willis and Pryor, tests/vibration); the Lindemann caution must appear
when the neighbour distance makes √⟨u²⟩/d exceed 0.1 (common practice).
"""

import numpy as np
import pytest
from tests.browser.waits import until
from selenium.webdriver.common.keys import Keys

from selenium.webdriver.common.by import By

from tests.browser.test_dashboard import drawn, heading, js_graph, no_console_errors, values
from thermo import load_dos
from thermo.vibration.displacements import mean_square_displacement
from webapp.app import create_app
from webapp.demo import DEMO_DIR

pytestmark = pytest.mark.browser
PORT = 8076


def test_displacements_page_draws_demo_and_warns(dash_duo):
    dash_duo.start_server(create_app(), port=PORT)
    dash_duo.driver.set_window_size(1280, 1000)
    dash_duo.driver.get(dash_duo.server_url + "/displacements")
    until(lambda: heading(dash_duo.driver) == "Displacements", 15)
    graphs = ("dw-msd-graph", "dw-b-graph", "dw-theta-graph", "dw-lindemann-graph")
    until(lambda: all(drawn(dash_duo.driver, g) > 0 for g in graphs), 40)
    until(lambda: "invented demo species" in dash_duo.find_element("#dw-messages").text, 10)

    dos = load_dos(DEMO_DIR / "lightheavy_rocksalt.tsv")
    want = mean_square_displacement(dos, np.arange(0.0, 1001.0, 10.0), masses={"Ly": 12.4, "Hv": 88.6})
    np.testing.assert_allclose(values(dash_duo.driver, "dw-msd-graph", 0), want["Ly"]["msd"], rtol=1e-9)

    for g in graphs:   # titled axes, as on every page
        assert js_graph(dash_duo.driver, g, "gd.layout.xaxis.title.text") == "temperature T [K]"
    unnamed = [e.get_attribute("id") for e in dash_duo.driver.find_elements(
        By.CSS_SELECTOR, ".mh-page input, .mh-page button") if e.is_displayed() and not e.accessible_name.strip()]
    assert unnamed == []

    field = dash_duo.find_element("#dw-distance")
    field.send_keys("1.5", Keys.ENTER)
    until(lambda: "Lindemann ratio" in dash_duo.find_element("#dw-messages").text, 20)
    no_console_errors(dash_duo)
