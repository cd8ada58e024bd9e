"""Phases page in headless Chromium against the real server (port 8087): the invented demo pair shows its
transitions; two uploaded Debye DOS chosen as phases give the transition of the closed-form Debye free energy
(Debye 1912, mpmath); the CSV download carries the provenance of both inputs (hashlib)."""

import hashlib
from pathlib import Path

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc
from selenium.webdriver.common.action_chains import ActionChains
from selenium.webdriver.common.by import By
from selenium.webdriver.common.keys import Keys

from tests.browser.waits import until
from tests.phases.references import crossing, debye_free_energy
from tests.spectra import debye_table, dos_text
from thermo.io.readback import read_exported_csv
from thermo.phases import Phase, compare_phases
from thermo.quasiharmonic import read_manifest
from webapp.app import create_app
from webapp.demo import demo_file

from .test_dashboard import active_name, no_console_errors, upload, wait_drawn

pytestmark = pytest.mark.browser
PORT = 8087


def _cell(driver, row, column):
    found = driver.find_elements(By.CSS_SELECTOR, f'#ph-rows td[data-dash-row="{row}"][data-dash-column="{column}"]')
    return found[0].text.strip() if found else None


def text_of(driver, selector):
    found = driver.find_elements(By.CSS_SELECTOR, selector)
    return found[0].text if found else ""


def _sources(driver):
    """The 'from' column of the phase rows."""
    return [e.text.strip() for e in driver.find_elements(By.CSS_SELECTOR, '#ph-rows td[data-dash-column="label"]')]


def _toggle(driver, label, shown):
    """Click the chooser's option ``label`` and wait until the rows show (or no longer show) ``shown``."""
    wanted = shown not in _sources(driver)
    if not driver.find_elements(By.CSS_SELECTOR, ".dash-dropdown-options"):
        driver.find_element(By.CSS_SELECTOR, "#ph-choice").click()
    until(lambda: label in text_of(driver, ".dash-dropdown-options"), 20)
    option = next(o for o in driver.find_elements(By.CSS_SELECTOR, ".dash-dropdown-options .dash-dropdown-option")
                  if o.text.strip() == label)
    driver.execute_script("arguments[0].scrollIntoView({block: 'center'}); arguments[0].click();", option)
    until(lambda: (shown in _sources(driver)) == wanted)


def test_choose_two_phases_see_the_transition_and_download(dash_duo, tmp_path):
    dash_duo.start_server(create_app(), port=PORT)
    driver = dash_duo.driver
    driver.set_window_size(1280, 1200)
    driver.get(dash_duo.server_url + "/phases")
    # the invented demo pair: the page shows what the library gives for the same manifests
    demo = compare_phases([Phase("alpha", read_manifest(demo_file("volumes", "springium_volumes.csv"))),
                           Phase("beta", read_manifest(demo_file("phases", "springium_beta_volumes.csv")))],
                          np.arange(0.0, 1000.1, 10.0), pressures_gpa=[0.0, 1.0, 2.0], boundary=True)
    first = demo.transitions[0]
    until(lambda: f"{first['temperature_K']:.5g} ± {first['uncertainty_K']:.2g}" in text_of(driver, "#ph-transitions"))
    wait_drawn(driver, ["ph-delta-graph", "ph-boundary-graph"])
    # two Debye DOS uploaded as datasets, chosen as the phases instead of the demo pair
    paths = []
    for name, theta, atoms in (("hard.dat", 400.0, 1), ("soft.dat", 300.0, 2)):
        path = tmp_path / name
        path.write_text(dos_text(*debye_table(theta, atoms, 2001)))
        paths.append(path)
    driver.get(dash_duo.server_url + "/spectrum")
    upload(driver, *paths)
    until(lambda: active_name(driver) in ("hard.dat", "soft.dat") and "soft.dat" in text_of(driver, "#sp-list"))
    driver.find_element(By.CSS_SELECTOR, "a[href='/phases'].mh-nav-link").click()
    until(lambda: text_of(driver, "#ph-transitions"))
    for label, shown in (("dataset hard.dat (harmonic)", "dataset hard.dat"),
                         ("dataset soft.dat (harmonic)", "dataset soft.dat")) + tuple((label, label) for label in (
                             "springium α (invented demo, fcc, 11 volumes)",
                             "springium β (invented demo, simple cubic, 11 volumes)")):
        _toggle(driver, label, shown)
    ActionChains(driver).send_keys(Keys.ESCAPE).perform()
    assert _sources(driver) == ["dataset hard.dat", "dataset soft.dat"]
    # type beta's static energy: 6 kJ/mol per formula unit (2 atoms)
    driver.find_element(By.CSS_SELECTOR, "#ph-unit input[value='kJ/mol']").click()
    driver.find_element(By.CSS_SELECTOR, '#ph-rows td[data-dash-row="1"][data-dash-column="static"]').click()
    ActionChains(driver).send_keys("6").send_keys(Keys.ENTER).perform()
    with mp.workdps(30):
        truth = crossing(lambda t: debye_free_energy(300, t) + mp.mpf(3.0 * sc.kilo / (sc.N_A * sc.electron_volt)) - debye_free_energy(400, t),
                         300.0)
    until(lambda: f"{truth:.5g}" in text_of(driver, "#ph-transitions"))
    assert "hard" in text_of(driver, "#ph-transitions")
    # download the comparison (CSV) with its provenance
    dash_duo.find_element("#ph-download-btn").click()
    target = Path(dash_duo.download_path) / "phases-hard-soft.csv"
    until(lambda: target.exists() and target.stat().st_size > 0)
    table, meta = read_exported_csv(target)
    assert {i["sha256"] for i in meta["inputs"]} == {hashlib.sha256(p.read_bytes()).hexdigest() for p in paths}
    assert abs(meta["transitions"][0]["temperature_K"] - truth) < 0.5
    assert "stable_phase_decided" in table.columns
    no_console_errors(dash_duo)
