"""Headless Chromium against the real server: reading options apply to the next upload, and a
refused file is read again in place once the option its message names is set.

Test spectra are invented (a Debye ν² spectrum, normalised to 1 mode or without a unit).
"""

import numpy as np
import pytest
from dash.testing.wait import until
from selenium.webdriver.common.by import By
from selenium.webdriver.common.keys import Keys

from webapp.app import create_app

from .test_dashboard import active_name, no_console_errors, upload, wait_drawn

pytestmark = pytest.mark.browser
PORT = 8073
NU = np.linspace(0, 5, 201)
BARE = "\n".join(f"{a} {9 * a * a / 125}" for a in NU) + "\n"                       # no unit anywhere
ONE_MODE = "# frequency (THz) dos\n" + "\n".join(f"{a} {3 * a * a / 125}" for a in NU) + "\n"   # integrates to 1


@pytest.fixture
def duo(dash_duo):
    dash_duo.start_server(create_app(), port=PORT)
    dash_duo.driver.set_window_size(1280, 1000)
    dash_duo.driver.get(dash_duo.server_url + "/spectrum")
    wait_drawn(dash_duo.driver, ["sp-dos-graph"])
    return dash_duo


def _listed_atoms(driver, name):
    rows = driver.find_elements(By.CSS_SELECTOR, "#sp-list tr")
    cells = [r.find_elements(By.TAG_NAME, "td") for r in rows]
    return next((c[1].text for c in cells if c and c[0].text == name), None)


def test_atoms_typed_before_the_upload_are_used(duo, tmp_path):
    path = tmp_path / "one_mode.dat"
    path.write_text(ONE_MODE)
    box = duo.find_element("#sp-atoms")
    box.clear()
    box.send_keys("2" + Keys.ENTER)
    upload(duo.driver, path)
    until(lambda: active_name(duo.driver) == path.name, 20)
    until(lambda: _listed_atoms(duo.driver, path.name) == "2", 20)
    assert "integrates to 1 mode" not in duo.find_element("#sp-messages").text
    no_console_errors(duo)


def test_refused_file_is_read_again_with_the_named_option(duo, tmp_path):
    path = tmp_path / "bare.dat"
    path.write_text(BARE)
    upload(duo.driver, path)
    duo.wait_for_contains_text("#sp-messages", "choose the Frequency unit", timeout=20)
    retry = duo.find_element("#sp-retry-btn")
    until(lambda: retry.is_displayed(), 10)
    duo.select_dcc_dropdown("#sp-unit", value="THz")
    retry.click()
    until(lambda: active_name(duo.driver) == path.name, 20)
    duo.wait_for_contains_text("#sp-messages", "loaded bare.dat", timeout=20)
    until(lambda: not duo.find_element("#sp-retry-btn").is_displayed(), 10)
    no_console_errors(duo)
