"""Headless Chromium against the real server: reading options apply to the next upload, and a
refused file is read again in place once the option its message names is set.

Test spectra are invented (a Debye ν² spectrum, normalised to 1 mode or without a unit).
"""

import numpy as np
import pytest
from tests.browser.waits import text, until
from selenium.common.exceptions import StaleElementReferenceException
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


def _listed(driver, name, column):
    """Cell ``column`` (0 name, 1 atoms, 2 unit) of the datasets list row of ``name``."""
    try:
        rows = driver.find_elements(By.CSS_SELECTOR, "#sp-list tr")
        cells = [r.find_elements(By.TAG_NAME, "td") for r in rows]
        return next((c[column].text for c in cells if c and c[0].text == name), None)
    except StaleElementReferenceException:       # the list was redrawn meanwhile: not there yet
        return None


def _typed(driver, css, value):
    """Type ``value`` + Enter into the input at ``css``; true once the box holds it (retried if redrawn)."""
    box = driver.find_element(By.CSS_SELECTOR, css)
    box.clear()
    box.send_keys(value + Keys.ENTER)
    return driver.find_element(By.CSS_SELECTOR, css).get_attribute("value") == value


def test_atoms_typed_before_the_upload_are_used(duo, tmp_path):
    # the list and messages re-render while the upload is read: every read goes through
    # waits.until / waits.text (a redrawn element is "not yet", never a stale-element failure)
    path = tmp_path / "one_mode.dat"
    path.write_text(ONE_MODE)
    until(lambda: _typed(duo.driver, "#sp-atoms", "2"))
    upload(duo.driver, path)
    until(lambda: active_name(duo.driver) == path.name)
    until(lambda: _listed(duo.driver, path.name, 1) == "2")
    assert "integrates to 1 mode" not in text(duo.driver, "#sp-messages")
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


def test_after_read_again_in_mev_the_next_file_keeps_the_unit_its_header_states(duo, tmp_path):
    # issue 25 item 1: after "Read again" with meV for a bare file, the next upload (header
    # "omega (cm^-1)", an integral that needs the typed atom count) was read as meV.
    # Spectra: invented Debye ν² spectra; 1 THz = 4.135667696 meV = 33.35640952 cm-1 (CODATA 2018).
    bare = tmp_path / "bare_mev.dat"
    bare.write_text("\n".join(f"{4.135667696 * a:.10g} {9 * a * a / 125 / 4.135667696:.10g}" for a in NU) + "\n")
    stated = tmp_path / "stated_cm.dat"
    stated.write_text("omega (cm^-1) dos\n" + "\n".join(
        f"{33.35640952 * a:.10g} {0.37 * 9 * a * a / 125 / 33.35640952:.10g}" for a in NU) + "\n")
    upload(duo.driver, bare)
    duo.wait_for_contains_text("#sp-messages", "choose the Frequency unit", timeout=20)
    duo.select_dcc_dropdown("#sp-unit", value="meV")
    duo.find_element("#sp-retry-btn").click()
    until(lambda: active_name(duo.driver) == bare.name, 20)
    until(lambda: _listed(duo.driver, bare.name, 2) == "meV", 20)
    box = duo.find_element("#sp-atoms")
    box.clear()
    box.send_keys("1" + Keys.ENTER)
    until(lambda: _listed(duo.driver, bare.name, 1) == "1", 20)
    until(lambda: "meV" in duo.find_element("#sp-unit").text, 10)          # meV is still chosen on the page
    upload(duo.driver, stated)
    until(lambda: active_name(duo.driver) == stated.name, 20)
    until(lambda: _listed(duo.driver, stated.name, 2) == "cm-1", 20)
    until(lambda: _listed(duo.driver, stated.name, 1) == "1", 10)
    duo.wait_for_contains_text("#sp-messages", "cm-1, the unit its header states", timeout=20)
    until(lambda: "as stated in file (cm-1)" in duo.find_element("#sp-unit").text, 10)
    until(lambda: "the file integrates to 1.11" in duo.find_element("#sp-warnings").text, 20)   # its checks
    assert "meV was chosen" not in duo.find_element("#sp-warnings").text
    no_console_errors(duo)

