"""A page's download equals its command's output, to the written digits (headless Chromium, port 8091).

The command runs in-process (``thermo.cli.main.main``) on the file uploaded to the page; both
files are read back with the export readers; their numbers must be equal as written (same
significant digits), and their provenance must name the same input (SHA-256 by ``hashlib``)
and settings.  Only the creation time may differ.
"""

from __future__ import annotations

import hashlib
import json
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from selenium.webdriver.common.by import By

from tests.browser.test_dashboard import PLAIN, no_console_errors, upload_then_open, wait_drawn
from tests.browser.waits import click, until
from thermo.cli.main import main
from thermo.io.readback import read_exported_csv
from webapp.app import create_app

pytestmark = pytest.mark.browser
PORT = 8091


@pytest.fixture
def page(dash_duo, tmp_path):
    good = tmp_path / "debye_download.dat"
    good.write_text(PLAIN)
    dash_duo.start_server(create_app(), port=PORT)
    dash_duo.driver.set_window_size(1280, 1000)
    return dash_duo, good


def _download(duo, prefix, fmt, name=None):
    """Click the page's download in ``fmt``; the file (``name``, else the one the note names) once written."""
    duo.driver.find_element(By.CSS_SELECTOR, f"#{prefix}-dl-format input[value='{fmt}']").click()
    duo.find_element(f"#{prefix}-dl-btn").click()
    def prepared():
        text = duo.find_element(f"#{prefix}-dl-note").text
        return text.startswith("prepared ") and text.endswith(f".{fmt}") and text
    shown = until(prepared)[len("prepared "):]
    assert name is None or shown == name
    target = Path(duo.download_path) / shown
    until(lambda: target.exists() and target.stat().st_size > 0)
    return target


def _same_provenance(page_meta, cli_meta, source):
    digest = hashlib.sha256(source.read_bytes()).hexdigest()
    assert [i["sha256"] for i in page_meta["inputs"]] == [i["sha256"] for i in cli_meta["inputs"]] == [digest]
    assert page_meta["settings"] == cli_meta["settings"]
    assert page_meta["warnings"] == cli_meta["warnings"]


def test_thermodynamics_download_equals_table_command(page, tmp_path):
    duo, good = page
    upload_then_open(duo, good, "/thermodynamics")
    wait_drawn(duo.driver, ["th-cv-graph"])
    duo.driver.find_element(By.CSS_SELECTOR, "#th-per input[value='atom']").click()
    until(lambda: "k_B/atom" in duo.find_element("#th-keys").text or "/atom" in duo.find_element("#th-keys").text)
    target = _download(duo, "th", "csv", "debye_download-atom.csv")
    cli = tmp_path / "cli.csv"
    assert main(["table", str(good), "--temperatures", "0:1500:5", "--per", "atom", "--errors", "--output", str(cli)]) == 0
    ours, meta = read_exported_csv(target)
    theirs, cli_meta = read_exported_csv(cli)
    assert list(ours.columns) == list(theirs.columns) and len(ours) == 301
    pd.testing.assert_frame_equal(ours, theirs, check_exact=True)     # the same 8 written digits, same flags
    assert int(meta["significant_digits"]) == int(cli_meta["significant_digits"]) == 8
    _same_provenance(meta, cli_meta, good)
    no_console_errors(duo)


def test_models_download_equals_models_command(page, tmp_path):
    duo, good = page
    upload_then_open(duo, good, "/models")
    wait_drawn(duo.driver, ["mod-values-graph"])
    target = _download(duo, "mod", "json", "debye_download-models.json")
    cli = tmp_path / "cli.json"
    assert main(["models", str(good), "--temperatures", "0:800:5", "--optical-terms", "1",
                 "--output", str(cli)]) == 0
    ours, theirs = json.loads(target.read_text()), json.loads(cli.read_text())
    page_meta, cli_meta = ours.pop("provenance"), theirs.pop("provenance")
    assert ours == theirs and len(ours["temperature_K"]) == 161
    _same_provenance(page_meta, cli_meta, good)
    table = _download(duo, "mod", "csv", "debye_download-models.csv")
    cli_csv = tmp_path / "cli.csv"
    assert main(["models", str(good), "--temperatures", "0:800:5", "--format", "csv", "--output", str(cli_csv)]) == 0
    ours_t, meta = read_exported_csv(table)
    theirs_t, cli_meta = read_exported_csv(cli_csv)
    assert list(ours_t.columns) == list(theirs_t.columns)
    np.testing.assert_array_equal(ours_t.to_numpy(), theirs_t.to_numpy())
    assert meta["debye_theta_K"] == cli_meta["debye_theta_K"]
    no_console_errors(duo)


def test_quasiharmonic_download_equals_quasiharmonic_command(page, tmp_path):
    from webapp.pages.quasiharmonic import _GRAPHS, DEMO_MANIFEST
    duo, _ = page
    duo.driver.get(duo.server_url + "/quasiharmonic")
    wait_drawn(duo.driver, list(_GRAPHS))
    target = _download(duo, "qh", "csv")
    cli = tmp_path / "cli.csv"
    # the page's default grid (0 to 1000 K every 10 K with 298.15 K) is the command's default
    assert main(["quasiharmonic", str(DEMO_MANIFEST), "--errors", "--output", str(cli)]) == 0
    ours, meta = read_exported_csv(target)
    theirs, cli_meta = read_exported_csv(cli)
    assert list(ours.columns) == list(theirs.columns) and 298.15 in ours["temperature_K"].to_numpy()
    np.testing.assert_array_equal(ours.select_dtypes("number").to_numpy(), theirs.select_dtypes("number").to_numpy())
    assert [i["sha256"] for i in meta["inputs"]] == [i["sha256"] for i in cli_meta["inputs"]]
    assert meta["settings"] == cli_meta["settings"]
    no_console_errors(duo)


def test_calorimetry_download_equals_calorimetry_command(page, tmp_path, monkeypatch):
    import shutil

    from webapp.pages.calorimetry import _GRAPHS, DEMO_DOS, DEMO_FILE
    from webapp.demo import demo_file
    duo, _ = page
    duo.driver.get(duo.server_url + "/calorimetry")
    wait_drawn(duo.driver, list(_GRAPHS))
    until(lambda: "electronic" in (duo.driver.execute_script(
        "return Array.from(document.querySelectorAll('#cal-terms input:checked')).map(e => e.value);") or []))
    target = _download(duo, "cal", "json")
    # the same files under the names the page shows, so the notes naming them read the same
    for source in (DEMO_FILE, demo_file(DEMO_DOS), demo_file("electronic", "springium_edos.dat")):
        shutil.copy(source, tmp_path / Path(source).name)
    monkeypatch.chdir(tmp_path)
    assert main(["calorimetry", DEMO_FILE.name, "--dos", DEMO_DOS, "--model", "dos+electronic+nernst-lindemann",
                 "--electronic", "springium_edos.dat", "--output", "cli.json"]) == 0
    ours, theirs = json.loads(target.read_text()), json.loads((tmp_path / "cli.json").read_text())
    page_meta, cli_meta = ours.pop("provenance"), theirs.pop("provenance")
    assert ours == theirs and "electronic_dos_comparison" in ours and len(ours["residuals"]) > 0
    assert [i["sha256"] for i in page_meta["inputs"]] == [i["sha256"] for i in cli_meta["inputs"]]
    assert len(page_meta["inputs"]) == 3
    assert page_meta["warnings"] == cli_meta["warnings"] and page_meta["settings"] == cli_meta["settings"]
    no_console_errors(duo)


def test_quasiharmonic_cp_sent_to_polynomials_fits_as_the_polynomial_command(page, tmp_path):
    from webapp.pages.quasiharmonic import _GRAPHS
    duo, _ = page
    duo.driver.get(duo.server_url + "/quasiharmonic")
    wait_drawn(duo.driver, list(_GRAPHS))
    table = _download(duo, "qh", "csv")
    duo.find_element("#qh-send-polynomials").click()
    until(lambda: duo.find_element("#qh-send-polynomials-note").text.startswith("sent "))
    click(duo.driver, "#qh-send-polynomials-note a[href='/polynomials']")     # the note may be redrawn once more
    until(lambda: duo.driver.execute_script(
        "const e = document.querySelector('#po-source input[value=sent]'); return e && e.checked;"))
    box = duo.find_element("#po-tmax")
    box.clear()
    box.send_keys("1000\n")           # the quasi-harmonic table ends at 1000 K
    until(lambda: '"T_max_K": 1000.0' in duo.find_element("#po-block").text)
    duo.find_element("#po-download-btn").click()
    target = Path(duo.download_path) / f"{table.stem}-shomate.json"
    until(lambda: target.exists() and target.stat().st_size > 0)
    cli = tmp_path / "cli.json"
    assert main(["polynomial", str(table), "--cp-table", "--range", "298.15:1000", "--output", str(cli)]) == 0
    ours, theirs = json.loads(target.read_text()), json.loads(cli.read_text())
    assert [r["coefficients"] for r in ours["ranges"]] == [r["coefficients"] for r in theirs["ranges"]]
    assert ours["ranges"][0]["coefficients"]["A"] != 0
    assert ours["provenance"]["inputs"][0]["role"] == theirs["provenance"]["inputs"][0]["role"] == "heat-capacity table"
    no_console_errors(duo)
