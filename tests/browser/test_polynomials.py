"""Polynomials page end to end in headless Chromium against the real server (port 8075).

The DOS is an invented Debye ν² spectrum; the downloaded Cantera YAML is loaded
by Cantera 3.2 (https://cantera.org, an independent library) and must give the
C_p, H, S of the fit computed here in-process from the same file.
"""

from pathlib import Path

import numpy as np
import pytest
from tests.browser.waits import until
from selenium.webdriver.common.by import By

from tests.browser.test_dashboard import PLAIN, active_name, no_console_errors, upload, wait_drawn
from thermo import load_dos
from thermo.polynomials import fit_polynomial, harmonic_source
from webapp.app import create_app

pytestmark = pytest.mark.browser
PORT = 8075


def test_nasa7_yaml_download_loads_in_cantera(dash_duo, tmp_path):
    ct = pytest.importorskip("cantera")
    good = tmp_path / "debye_for_fit.dat"
    good.write_text(PLAIN)
    dash_duo.start_server(create_app(), port=PORT)
    driver = dash_duo.driver
    driver.set_window_size(1280, 1000)
    driver.get(dash_duo.server_url + "/spectrum")
    upload(driver, good)
    until(lambda: active_name(driver) == good.name, 20)
    driver.find_element(By.CSS_SELECTOR, "a[href='/polynomials'].mh-nav-link").click()
    wait_drawn(driver, ["po-fit-graph", "po-error-graph"])
    driver.find_element(By.CSS_SELECTOR, "#po-form input[value='nasa7']").click()
    box = dash_duo.find_element("#po-formula")
    box.send_keys("Cu\n")
    driver.find_element(By.CSS_SELECTOR, "#po-output input[value='yaml']").click()
    dash_duo.wait_for_contains_text("#po-block", "model: \"NASA7\"", timeout=30)
    assert "Cu(cr)" in dash_duo.find_element("#po-block").text
    dash_duo.find_element("#po-download-btn").click()
    target = Path(dash_duo.download_path) / "debye_for_fit-nasa7.yaml"
    until(lambda: target.exists() and target.stat().st_size > 0, 20)
    species = ct.Species.list_from_yaml(target.read_text(), section="species")[0]
    fit = fit_polynomial(harmonic_source(load_dos(good), 298.15, 1500.0), "nasa7", (298.15, 1500.0))
    t = np.array([300.0, 600.0, 1000.0, 1500.0])
    ours = fit.properties(t)
    for i, temperature in enumerate(t):
        assert species.thermo.cp(temperature) / 1e3 == pytest.approx(ours["heat_capacity_p"][i], rel=1e-6)
        assert species.thermo.h(temperature) / 1e3 == pytest.approx(ours["enthalpy"][i], rel=1e-6, abs=1e-6)
        assert species.thermo.s(temperature) / 1e3 == pytest.approx(ours["entropy"][i], rel=1e-6)
    no_console_errors(dash_duo)
