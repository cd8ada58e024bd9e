"""Warnings appear once, beside the result they concern (headless Chromium, port 8092).

The demo volume set's eleven DOS files each carry the same caution with other numbers (their
integrals are rescaled to 3n by slightly different factors); the Quasi-harmonic page must show it
once, naming how many files and the range of the factor, which must bracket every file's own
factor (computed here in-process with the library).
"""

from __future__ import annotations

import re

import pytest
from selenium.webdriver.common.by import By

from tests.browser.test_dashboard import PLAIN, no_console_errors, upload_then_open, wait_drawn
from tests.browser.waits import until
from thermo import load_dos
from thermo.quasiharmonic import read_manifest
from webapp.app import create_app

pytestmark = pytest.mark.browser
PORT = 8092


@pytest.fixture
def duo(dash_duo):
    dash_duo.start_server(create_app(), port=PORT)
    dash_duo.driver.set_window_size(1280, 1000)
    return dash_duo


def _lines(driver, panel):
    return [e.text for e in driver.find_elements(By.CSS_SELECTOR, f"#{panel} .mh-msg")]


def test_quasiharmonic_shows_a_shared_caution_once_with_its_range(duo):
    from webapp.pages.quasiharmonic import _GRAPHS, DEMO_MANIFEST
    duo.driver.get(duo.server_url + "/quasiharmonic")
    wait_drawn(duo.driver, list(_GRAPHS))
    lines = until(lambda: _lines(duo.driver, "qh-messages"))
    rescaled = [line for line in lines if "rescaled by" in line]
    assert len(rescaled) == 1, lines
    vs = read_manifest(str(DEMO_MANIFEST))
    factors = [float(re.search(r"×([0-9.]+)", w).group(1)) for d in vs.doses for w in d.warnings if "rescaled" in w]
    assert len(factors) == len(vs.doses) == 11 and rescaled[0].startswith("11 inputs")
    lo, hi = map(float, re.search(r"×([0-9.]+)–([0-9.]+)", rescaled[0]).groups())
    assert lo == min(factors) and hi == max(factors) and lo < hi
    no_console_errors(duo)


def test_thermodynamics_shows_the_dataset_warnings_once(duo, tmp_path):
    good = tmp_path / "plain_debye.dat"
    good.write_text(PLAIN)
    expected = load_dos(good).warnings
    assert expected        # the file's integral is rescaled: there is a warning to show
    upload_then_open(duo, good, "/thermodynamics")
    wait_drawn(duo.driver, ["th-cv-graph"])
    lines = until(lambda: _lines(duo.driver, "th-messages"))
    assert len(lines) == len(expected)
    for warning in expected:
        assert sum(warning in line for line in lines) == 1, (warning, lines)
    no_console_errors(duo)
