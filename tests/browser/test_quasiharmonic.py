"""The Quasi-harmonic page in headless Chromium against the real server (port 8077).

Run: ``pytest tests/browser/test_quasiharmonic.py --headless``.  The demo volume
set is invented (sample_dos/volumes); the uploaded set is the invented Debye
solid of tests/quasiharmonic/debye_solid.py.
"""

from __future__ import annotations

import numpy as np
import pytest
from tests.browser.waits import until
from selenium.webdriver.common.by import By

from tests.browser.test_dashboard import drawn, js_graph, no_console_errors, values, wait_drawn
from tests.quasiharmonic import debye_solid as ds
from tests.quasiharmonic.test_volume_set import write_set
from thermo.quasiharmonic import quasiharmonic_table
from webapp.app import create_app
from webapp.pages.quasiharmonic import _GRAPHS, DEMO_MANIFEST

pytestmark = pytest.mark.browser
PORT = 8077
GRID = np.union1d(np.arange(0.0, 1001.0, 10.0), [298.15])


@pytest.fixture
def duo(dash_duo):
    dash_duo.start_server(create_app(), port=PORT)
    dash_duo.driver.set_window_size(1280, 1000)
    dash_duo.driver.get(dash_duo.server_url + "/quasiharmonic")
    wait_drawn(dash_duo.driver, list(_GRAPHS), timeout=60)
    return dash_duo


def messages(driver):
    return driver.find_element(By.ID, "qh-messages").text


def upload(driver, paths):
    field = until(lambda: driver.find_element(By.CSS_SELECTOR, "#qh-upload input[type=file]"))
    driver.execute_script("arguments[0].value = '';", field)   # chromedriver appends to a multiple input
    field.send_keys("\n".join(str(p) for p in paths))


def test_demo_set_plots_match_library(duo):
    # The page must show what the library computes for the same manifest (0-1000 K every 10 K and 298.15 K).
    expected = quasiharmonic_table(str(DEMO_MANIFEST), GRID)
    np.testing.assert_allclose(values(duo.driver, "qh-v-graph"), expected.volume_A3, rtol=1e-9)
    np.testing.assert_allclose(values(duo.driver, "qh-cp-graph", 0), expected.heat_capacity_p_J_per_mol_K, rtol=1e-9)
    assert js_graph(duo.driver, "qh-fv-graph", "gd.layout.xaxis.title.text").startswith("volume V")
    # the estimated error is drawn as a band under V(T) and B_T(T), and quoted at 298.15 K
    for graph in ("qh-v-graph", "qh-b-graph"):
        assert js_graph(duo.driver, graph, "gd.data.filter(t => t.fill === 'toself').length") == 1
    assert "V at 298.15 K" in duo.driver.find_element(By.ID, "qh-keys").text
    assert "melting" in duo.driver.find_element(By.CSS_SELECTOR, ".mh-caution").text
    no_console_errors(duo)


def test_upload_refusal_then_valid_set_and_pressure(duo, tmp_path):
    small = tmp_path / "small"
    small.mkdir()
    manifest = write_set(small, volumes=ds.VOLUMES[:4])
    upload(duo.driver, [manifest, *sorted(small.glob("d*.dat"))])
    until(lambda: "at least 5" in messages(duo.driver), 30)

    good = tmp_path / "good"
    good.mkdir()
    manifest = write_set(good)
    upload(duo.driver, [manifest, *sorted(good.glob("d*.dat"))])
    until(lambda: "at least 5" not in messages(duo.driver) and drawn(duo.driver, "qh-v-graph") > 0, 30)
    expected = quasiharmonic_table(str(manifest), GRID)
    until(lambda: np.allclose(values(duo.driver, "qh-v-graph"), expected.volume_A3, rtol=1e-9), 30)
    # the Debye solid leaves the sampled range at high T: rows marked, warning shown
    assert expected.outside_volume_range.any() == ("leaves the sampled range" in messages(duo.driver))

    box = duo.driver.find_element(By.ID, "qh-pressure")
    box.clear()
    box.send_keys("5\n")
    squeezed = quasiharmonic_table(str(manifest), GRID, pressure_gpa=5.0)
    until(lambda: np.allclose(values(duo.driver, "qh-v-graph"), squeezed.volume_A3, rtol=1e-9), 30)
    assert np.all(squeezed.volume_A3 < expected.volume_A3)
    no_console_errors(duo)
