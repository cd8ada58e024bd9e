"""Volume sets and measured sets are kept in the workspace: listed and reopened after a reload and
after a server restart (issue 25, item 7), and the same bytes uploaded again select the set kept.

Real ``python -m webapp`` processes with a workspace file, driven by headless Chromium.  The files
are cut from the invented demo data (sample_dos/volumes, sample_dos/measured): six of the eleven
volumes, the measured points up to 100 K.  The checks are the page's own statements (names, point
and volume counts) against the files written here.
"""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest
from tests.browser.waits import until
from selenium.webdriver.common.by import By

from .test_workspace import URL, _serve, _stop, browsers, text_of  # noqa: F401  (browsers is a fixture)

pytestmark = pytest.mark.browser
DEMO = Path(__file__).resolve().parents[2] / "sample_dos"


def _my_files(tmp_path):
    lines = (DEMO / "volumes" / "springium_volumes.csv").read_text().splitlines()
    rows = [line for line in lines if line.endswith(".dat")][2:8]
    manifest = tmp_path / "my_volumes.csv"
    manifest.write_text("# six volumes cut from the invented demo set\nvolume_A3,energy_eV,dos_file\n"
                        + "\n".join(rows) + "\n")
    doses = []
    for row in rows:
        name = row.split(",")[2]
        doses.append(Path(shutil.copy(DEMO / "volumes" / name, tmp_path / name)))
    measured_lines = (DEMO / "measured" / "springium_cp.csv").read_text().splitlines()
    kept = [line for line in measured_lines[3:] if float(line.split(",")[0]) <= 100.0]
    measured = tmp_path / "my_cp.csv"
    measured.write_text("\n".join(measured_lines[:3] + kept) + "\n")
    return manifest, doses, measured, len(kept)


def _chosen(driver, control):
    return text_of(driver, f"#{control}").strip()


def _volume_page_shows(driver, count):
    return (_chosen(driver, "qh-set-choice") == "my_volumes.csv" and f"{count} DOS file(s)" in text_of(driver, "#qh-set-note")
            and f"{count} (" in text_of(driver, "#qh-keys"))


def _measured_page_shows(driver, points):
    return _chosen(driver, "cal-set-choice") == "my_cp.csv" and f"my_cp.csv — {points} points" in \
        text_of(driver, "#cal-file")


def test_sets_are_listed_and_reopened_after_reload_and_restart(tmp_path, browsers):  # noqa: F811
    manifest, doses, measured, points = _my_files(tmp_path)
    w = tmp_path / "w.sqlite"
    server = _serve(w)
    try:
        driver = browsers()
        # the measured points are compared with the active DOS: make it the demo's own spring model
        driver.get(URL + "/spectrum")
        until(lambda: "springium_fcc.dat" in text_of(driver, "#sp-list"), 30)
        driver.find_element(By.CSS_SELECTOR, "#sp-dataset").click()
        until(lambda: "springium_fcc.dat" in text_of(driver, ".dash-dropdown-options"), 10)
        next(o for o in driver.find_elements(By.CSS_SELECTOR, ".dash-dropdown-options .dash-dropdown-option")
             if o.text == "springium_fcc.dat").click()
        until(lambda: text_of(driver, "#sp-list .mh-active-row").startswith("springium_fcc.dat"), 30)
        driver.get(URL + "/quasiharmonic")
        until(lambda: "springium_volumes.csv" in text_of(driver, "#qh-set-note"), 30)
        driver.find_element(By.CSS_SELECTOR, "#qh-upload input[type=file]").send_keys(
            "\n".join(str(p) for p in [manifest, *doses]))
        until(lambda: _volume_page_shows(driver, 6), 60)
        assert "kept in the workspace as my_volumes.csv" in text_of(driver, "#qh-set-note")

        driver.get(URL + "/calorimetry")
        until(lambda: "springium_cp.csv" in text_of(driver, "#cal-file"), 60)
        driver.find_element(By.CSS_SELECTOR, "#cal-upload input[type=file]").send_keys(str(measured))
        until(lambda: _measured_page_shows(driver, points), 60)

        for restart in (False, True):
            if restart:
                _stop(server)
                server = _serve(w)
            driver.get(URL + "/quasiharmonic")
            until(lambda: _volume_page_shows(driver, 6), 60)
            driver.get(URL + "/calorimetry")
            until(lambda: _measured_page_shows(driver, points), 60)

        # the same bytes again select the kept set; nothing is listed twice
        driver.find_element(By.CSS_SELECTOR, "#cal-upload input[type=file]").send_keys(str(measured))
        until(lambda: _measured_page_shows(driver, points), 30)
        driver.find_element(By.CSS_SELECTOR, "#cal-set-choice").click()
        until(lambda: "my_cp.csv" in text_of(driver, ".dash-dropdown-options"), 10)
        listed = [o.text for o in driver.find_elements(By.CSS_SELECTOR, ".dash-dropdown-options .dash-dropdown-option")]
        assert listed == ["invented demo measurement (springium)", "my_cp.csv"]
    finally:
        _stop(server)


def _cell(driver, row, column):
    return driver.find_element(By.CSS_SELECTOR, f'#qh-rows td[data-dash-row="{row}"][data-dash-column="{column}"]')


def _typed(driver, row):
    try:
        return _cell(driver, row, "volume_A3").text.strip(), _cell(driver, row, "energy_eV").text.strip()
    except Exception:  # noqa: BLE001 - table not drawn yet
        return None


def _datasets_source(driver):
    driver.get(URL + "/quasiharmonic")
    until(lambda: "springium_volumes.csv" in text_of(driver, "#qh-set-note"), 60)
    next(e for e in driver.find_elements(By.CSS_SELECTOR, "#qh-source label")
         if e.text.startswith("loaded datasets")).click()
    until(lambda: _typed(driver, 0) is not None, 30)


def test_values_typed_beside_loaded_datasets_survive_reload_and_restart(tmp_path, browsers):  # noqa: F811
    """Issue 25, item 7: a volume set built on the page from loaded datasets is kept as typed.

    The values typed are the check: they must read back the same after a reload and after a restart.
    """
    from selenium.webdriver.common.action_chains import ActionChains
    from selenium.webdriver.common.keys import Keys
    w = tmp_path / "w.sqlite"
    server = _serve(w)
    try:
        driver = browsers()
        _datasets_source(driver)
        for column, value in (("volume_A3", "16.5"), ("energy_eV", "-0.25")):
            _cell(driver, 0, column).click()
            ActionChains(driver).send_keys(value).send_keys(Keys.ENTER).perform()
        until(lambda: _typed(driver, 0) == ("16.5", "-0.25"), 30)
        until(lambda: "kept in the workspace" in text_of(driver, "#qh-rows-kept"), 30)
        for restart in (False, True):
            if restart:
                _stop(server)
                server = _serve(w)
            _datasets_source(driver)
            until(lambda: _typed(driver, 0) == ("16.5", "-0.25"), 30)
            assert _typed(driver, 1) == ("", "")          # nothing typed there, nothing invented
    finally:
        _stop(server)
