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
import pytest
from selenium.webdriver.common.by import By

from tests.browser.test_dashboard import PLAIN, no_console_errors, upload_then_open, wait_drawn
from tests.browser.waits import until
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


def _download(duo, prefix, fmt, name):
    duo.driver.find_element(By.CSS_SELECTOR, f"#{prefix}-dl-format input[value='{fmt}']").click()
    duo.find_element(f"#{prefix}-dl-btn").click()
    target = Path(duo.download_path) / name
    until(lambda: target.exists() and target.stat().st_size > 0 and duo.find_element(f"#{prefix}-dl-note").text
          == f"prepared {name}")
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
    assert main(["table", str(good), "--temperatures", "0:1500:5", "--per", "atom", "--output", str(cli)]) == 0
    ours, meta = read_exported_csv(target)
    theirs, cli_meta = read_exported_csv(cli)
    assert list(ours.columns) == list(theirs.columns) and len(ours) == 301
    np.testing.assert_array_equal(ours.to_numpy(), theirs.to_numpy())     # the same 8 written digits
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
