"""Calorimetry with an electronic DOS: the fitted γ beside the band γ, on the command line and the page."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from scipy import constants as sc

from tests.calorimetry.test_external import _debye_cv_quad
from tests.test_provenance import check_record
from thermo.cli.main import main

GAMMA_PER_STATE = math.pi ** 2 / 3 * sc.k ** 2 * sc.N_A / sc.electron_volt   # A&M ch. 2, CODATA constants
BAND_G, ENHANCEMENT, THETA = 0.5, 1.4, 300.0        # states/eV, 1 + λ, K (invented)


@pytest.fixture
def files(tmp_path):
    # Debye C_v (scipy quadrature) + γT with γ = (1 + λ) γ_band, 0.2 % noise (fixed seed), 2-60 K.
    gamma = ENHANCEMENT * BAND_G * GAMMA_PER_STATE
    t = np.linspace(2.0, 60.0, 59)
    cp = np.array([_debye_cv_quad(x, THETA) for x in t]) + gamma * t
    noisy = cp * (1 + 0.002 * np.random.default_rng(28).standard_normal(t.size))
    measured = tmp_path / "cp.csv"
    measured.write_text("T (K),Cp (J/(mol K)),u (J/(mol K))\n"
                        + "".join(f"{a},{b},{0.002 * c}\n" for a, b, c in zip(t, noisy, cp)))
    edos = tmp_path / "band.dat"
    edos.write_text("E-E_F (eV) total\n" + "".join(f"{e:g} {BAND_G}\n" for e in np.linspace(-6, 6, 121)))
    return measured, edos


def test_cli_reports_the_band_gamma_and_the_enhancement(files, capsys):
    measured, edos = files
    assert main(["calorimetry", str(measured), "--atoms", "1", "--model", "debye+electronic",
                 "--electronic", str(edos)]) == 0
    captured = capsys.readouterr()
    out = json.loads(captured.out)
    compared = out["electronic_dos_comparison"]
    assert compared["gamma_from_electronic_dos_J_per_mol_K2"]["value"] == pytest.approx(BAND_G * GAMMA_PER_STATE,
                                                                                         rel=1e-12)
    ratio = compared["ratios"]["fitted"]
    assert 0 < ratio["uncertainty"] < 0.1
    assert abs(ratio["value"] - ENHANCEMENT) <= 3 * ratio["uncertainty"]      # the stated ± covers the truth
    assert "enhancement 1 + λ" in captured.err
    check_record(out["provenance"], [measured, edos])
    assert out["provenance"]["inputs"][-1]["role"] == "electronic DOS"


def test_page_shows_the_band_gamma_beside_the_fitted_one():
    from webapp.app import create_app
    create_app()
    from webapp import demo, session
    from webapp.pages import calorimetry as page
    ws = demo.demo_workspace()
    spring = next(d for d in ws["datasets"] if d["name"] == "springium_fcc.dat")
    ws = session.activated(ws, spring["id"])
    # the demo measurement is paired with the demo electronic DOS when none was chosen
    out = page.draw(page.demo_measurement(), ws, "dos", ["electronic", "nernst-lindemann"], "", "", 1, "header",
                    "", None, None)
    table = str(out[4])
    assert "cal-band-gamma" in table and "springium_edos.dat" in table and "(1 + λ)" in table
    # an unreadable electronic DOS gives a note, the fit still shows
    broken = {"name": "x.dat", "contents": "data:text/plain;base64,LTEgMQoxIDEK", "fields": {}}
    out = page.draw(page.demo_measurement(), ws, "dos", ["electronic"], "", "", 1, "header", "", broken, None)
    assert "the electronic DOS is not compared: x.dat: the energy unit is not stated" in str(out[-1])
    assert "cal-param-table" in str(out[4]) and "cal-band-gamma" not in str(out[4])
