"""The reading-options panel in headless Chromium (port 8094): a formula typed on one page is the dataset's,
shown on every page that has the panel, and per-gram values use it (molar mass of Cu 63.546 g/mol,
IUPAC standard atomic weight)."""

from __future__ import annotations

import pytest
from selenium.webdriver.common.by import By

from tests.browser.test_dashboard import PLAIN, no_console_errors, upload_then_open, wait_drawn
from tests.browser.waits import text, until
from thermo import load_dos, tabulate
from webapp.app import create_app

pytestmark = pytest.mark.browser
PORT = 8094


def test_formula_typed_once_is_used_on_every_page(dash_duo, tmp_path):
    good = tmp_path / "panel_debye.dat"
    good.write_text(PLAIN)
    dash_duo.start_server(create_app(), port=PORT)
    driver = dash_duo.driver
    driver.set_window_size(1280, 1000)
    upload_then_open(dash_duo, good, "/thermodynamics")
    wait_drawn(driver, ["th-cv-graph"])
    until(lambda: "formula not given" in dash_duo.find_element("#th-rd-summary").text)
    driver.find_element(By.CSS_SELECTOR, "#th-rd summary").click()
    box = dash_duo.find_element("#th-rd-formula")
    box.send_keys("Cu\n")
    until(lambda: "formula Cu" in dash_duo.find_element("#th-rd-summary").text)
    driver.find_element(By.CSS_SELECTOR, "#th-per input[value='gram']").click()
    expected = tabulate(load_dos(good), [298.15], per="gram", formula="Cu")
    s_gram = expected[[c for c in expected.columns if c.startswith("entropy")][0]].iloc[0]
    until(lambda: f"{s_gram:.5g}" in dash_duo.find_element("#th-keys").text)
    driver.find_element(By.CSS_SELECTOR, "a[href='/models'].mh-nav-link").click()
    until(lambda: "formula Cu" in dash_duo.find_element("#mod-rd-summary").text)
    # the Polynomials page shows the same panel, and its Cantera block takes the formula from it
    driver.find_element(By.CSS_SELECTOR, "a[href='/polynomials'].mh-nav-link").click()
    until(lambda: "formula Cu" in dash_duo.find_element("#po-rd-summary").text)
    driver.find_element(By.CSS_SELECTOR, "#po-output input[value='yaml']").click()
    until(lambda: 'name: "Cu(cr)"' in text(driver, "#po-block"))
    no_console_errors(dash_duo)
