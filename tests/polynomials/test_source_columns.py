"""Which columns of a (T, C_p) table a polynomial is fitted to: chosen by quantity, said aloud (issue 25, item 4).

A calorimetry table made with ``--dos`` holds two entropies: the third-law S° integrated from the
measured C_p and the harmonic S of the DOS.  S°(298.15 K) of the polynomial must be the third-law one.

External reference for the synthetic table: the Debye functions by mpmath quadrature
(C_v/3R = (3/y³)∫₀^y x⁴eˣ/(eˣ−1)² dx, S as in tests/spectra.py; P. Debye, Ann. Phys. 39, 789 (1912)),
R from CODATA via scipy.constants.  The demo files are invented.
"""

from __future__ import annotations

import io
import json
from pathlib import Path

import mpmath as mp
import numpy as np
import pandas as pd
import pytest
from scipy import constants as sc

from tests.spectra import debye_entropy
from thermo.cli.main import main
from thermo.io.readback import read_exported_csv
from thermo.polynomials import fit_polynomial
from thermo.polynomials.sources import source_from_table

DEMO = Path(__file__).resolve().parents[2] / "sample_dos"


def _debye_heat_capacity(theta, t):
    with mp.workdps(20):
        y = mp.mpf(theta) / t
        return float(3 * sc.R * 3 / y ** 3 * mp.quad(lambda x: x ** 4 * mp.exp(x) / mp.expm1(x) ** 2, [0, y]))


def _calorimetry_like(theta_measured=320.0, theta_dos=360.0):
    t = np.linspace(250.0, 900.0, 66)
    return pd.DataFrame({
        "temperature_K": t,
        "heat_capacity_p_measured_J_per_mol_K": [_debye_heat_capacity(theta_measured, x) for x in t],
        "entropy_third_law_J_per_mol_K": [debye_entropy(theta_measured, x) for x in t],
        "entropy_J_per_mol_K": [debye_entropy(theta_dos, x) for x in t],        # the harmonic S of another DOS
        "heat_capacity_p_model_J_per_mol_K": [_debye_heat_capacity(theta_measured, x) for x in t],
    })


def test_the_third_law_entropy_is_taken_over_the_harmonic_one():
    source = source_from_table(_calorimetry_like())
    fit = fit_polynomial(source, "shomate", (298.15, 900.0))
    s298 = float(fit.properties([298.15])["entropy"][0])
    assert s298 == pytest.approx(debye_entropy(320.0, 298.15), rel=1e-4)
    assert s298 != pytest.approx(debye_entropy(360.0, 298.15), rel=1e-2)
    said = " ".join(source.notes) + source.label
    assert "entropy_third_law_J_per_mol_K" in said and "entropy_J_per_mol_K (" in said


def test_the_source_says_which_columns_it_used_even_when_there_is_no_choice():
    table = _calorimetry_like().drop(columns=["entropy_third_law_J_per_mol_K", "heat_capacity_p_model_J_per_mol_K",
                                              "heat_capacity_p_measured_J_per_mol_K"])
    table["heat_capacity_p_J_per_mol_K"] = [_debye_heat_capacity(360.0, x) for x in table["temperature_K"]]
    source = source_from_table(table)
    assert "heat_capacity_p_J_per_mol_K" in source.label and "entropy_J_per_mol_K" in source.label


def test_a_calorimetry_table_made_with_a_dos_anchors_s298_to_the_third_law_column(tmp_path, capsys):
    table_path = tmp_path / "cal.csv"
    assert main(["calorimetry", str(DEMO / "measured" / "springium_cp.csv"), "--dos",
                 str(DEMO / "springium_fcc.dat"), "--format", "csv", "--output", str(table_path)]) == 0
    table, _ = read_exported_csv(table_path.read_bytes())
    t = table["temperature_K"].to_numpy()
    third = float(np.interp(298.15, t, table["entropy_third_law_J_per_mol_K"].to_numpy()))
    harmonic = float(np.interp(298.15, t, table["entropy_J_per_mol_K"].to_numpy()))
    assert abs(third - harmonic) > 0.3                 # the demo's two entropies differ (32.8 vs 31.9)
    capsys.readouterr()
    assert main(["polynomial", str(table_path), "--cp-table", "--range", "298.15:350"]) == 0
    out, err = capsys.readouterr()
    record = json.loads(out)
    assert "entropy_third_law_J_per_mol_K" in record["source"]
    from thermo.polynomials import shomate_properties
    coefficients = record["ranges"][0]["coefficients"]
    s298 = float(shomate_properties(coefficients, [298.15])["entropy"][0])
    # the table's rows are a few kelvin apart: linear interpolation there is good to ~0.05 J/(mol K)
    assert s298 == pytest.approx(third, abs=0.05)
    assert "entropy_third_law_J_per_mol_K" in err
