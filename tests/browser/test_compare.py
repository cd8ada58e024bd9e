"""Compare page as a convergence tool in headless Chromium (port 8093): runs chosen by workspace group,
relative differences with units and each run's error estimate beside them.

The runs are the same invented Debye spectrum (θ_D = 300 K) tabulated on a coarse and a fine
frequency grid; the page's numbers must be those of :func:`thermo.convergence.compare_runs` computed
here in-process from the same files (the function ``modeheat compare`` uses), as the page writes them.
"""

from __future__ import annotations

import numpy as np
import pytest
from selenium.webdriver.common.by import By

from tests.browser.test_dashboard import active_name, no_console_errors, upload
from tests.browser.waits import until
from tests.spectra import debye_table
from thermo import load_dos
from thermo.columns import column_name, error_key
from thermo.convergence import compare_runs
from webapp.app import create_app

pytestmark = pytest.mark.browser
PORT = 8093


def _write(path, points):
    nu, g = debye_table(300.0, points=points)
    path.write_text("# frequency (THz) dos\n" + "\n".join(f"{float(a)!r} {float(b)!r}" for a, b in zip(nu, g)) + "\n")
    return path


def _choose(driver, dropdown, text):
    """Open a dcc.Dropdown and click its option ``text``."""
    driver.find_element(By.CSS_SELECTOR, dropdown).click()
    until(lambda: driver.find_elements(By.CSS_SELECTOR, ".dash-dropdown-options"))

    def option():
        shown = driver.find_elements(By.CSS_SELECTOR, ".dash-dropdown-options .dash-dropdown-option")
        return next((o for o in shown if o.text.strip() == text), None)
    until(option, msg=f"option {text!r} of {dropdown}").click()


def _nav(driver, page):
    driver.find_element(By.CSS_SELECTOR, f"a[href='{page}'].mh-nav-link").click()


def test_compare_by_group_shows_relative_differences_and_errors(dash_duo, tmp_path):
    coarse, fine = _write(tmp_path / "mesh_coarse.dat", 31), _write(tmp_path / "mesh_fine.dat", 2001)
    dash_duo.start_server(create_app(), port=PORT)
    driver = dash_duo.driver
    driver.set_window_size(1280, 1100)
    driver.get(dash_duo.server_url + "/spectrum")
    upload(driver, coarse, fine)
    until(lambda: active_name(driver) in (coarse.name, fine.name))
    _nav(driver, "/workspace")
    for path in (coarse, fine):
        _choose(driver, "#ws-dataset", path.name)
        until(lambda: driver.find_element(By.ID, "ws-name").get_attribute("value") == path.name)
        group = driver.find_element(By.ID, "ws-group")
        group.clear()
        group.send_keys("convergence: mesh")
        driver.find_element(By.ID, "ws-save").click()
        until(lambda: dash_duo.find_element("#ws-list").text.count("convergence: mesh")
              == 1 + (path == fine))
    _nav(driver, "/compare")
    _choose(driver, "#cmp-group", "convergence: mesh")
    table = until(lambda: "(reference)" in dash_duo.find_element("#cmp-table").text
                  and dash_duo.find_element("#cmp-table").text)
    # the group's two runs, and no other dataset of the workspace (the demo's are there too)
    assert coarse.name in table and fine.name in table and "springium" not in table
    assert "ΔS/S [%]" in table and "S ± error [k_B/atom]" in table     # the page starts per atom
    # the reference is the first run of the group; the other's S(5 K) relative difference as compare_runs gives it
    names = [n for n in (coarse.name, fine.name)]
    rows = [line for line in table.splitlines() if line.startswith(names[1]) or line.startswith(names[0])]
    expected = compare_runs([load_dos(coarse), load_dos(fine)], [5.0, 20.0, 298.15], names=names, per="atom")
    other = expected[~expected["reference"]]
    for t, rel in zip(other["temperature_K"], other["entropy_relative_difference"]):
        assert any(f"{100 * rel:+.3g}" in line for line in rows if f" {t:g} " in f" {line} "), (t, rel, rows)
    # where a difference exceeds the run's own error estimate the page marks it, so it cannot go unseen
    ref = expected[expected["reference"]]
    s_col, e_col = column_name("entropy", "atom"), column_name(error_key("entropy"), "atom")
    beyond = np.abs(other[s_col].to_numpy() - ref[s_col].to_numpy()) > other[e_col].to_numpy()
    assert beyond.any() and "⚑" in table
    no_console_errors(dash_duo)
