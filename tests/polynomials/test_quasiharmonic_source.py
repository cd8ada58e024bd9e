"""A quasi-harmonic C_p table (the invented demo volume set) as the source of a Shomate fit.

The fitted coefficients are evaluated with the Shomate formulas re-typed in
``test_independent_formulas`` (NIST Chemistry WebBook, SRD 69, "Shomate
equation") against the quasi-harmonic C_p and S they came from; the 1e-3
tolerance is the polynomial issue's check.  The 0 K row (C_p/T undefined) and
rows outside the sampled volumes must be left out with a note, not fitted.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from thermo.polynomials import fit_polynomial
from thermo.polynomials.sources import source_from_table
from thermo.quasiharmonic import quasiharmonic_table

from .test_independent_formulas import shomate

MANIFEST = Path(__file__).resolve().parents[2] / "sample_dos" / "volumes" / "springium_volumes.csv"


def test_shomate_fit_of_quasiharmonic_cp_reproduces_cp_and_entropy():
    table = quasiharmonic_table(str(MANIFEST), np.arange(0.0, 901.0, 10.0))
    source = source_from_table(table, label="quasi-harmonic table")
    assert any("T <= 0 K left out" in n for n in source.notes)
    fit = fit_polynomial(source, "shomate", (298.15, 900.0))
    coefficients = fit.to_dict()["ranges"][0]["coefficients"]
    rows = table[(table.temperature_K >= 298.15) & (table.temperature_K <= 900.0)]
    for t, cp, s in zip(rows.temperature_K, rows.heat_capacity_p_J_per_mol_K, rows.entropy_J_per_mol_K):
        cp_fit, _, s_fit = shomate(coefficients, float(t))
        assert abs(cp_fit / cp - 1) < 1e-3, t
        assert abs(s_fit / s - 1) < 1e-3, t
    # C_p, not C_v: the quasi-harmonic dilation term is inside the fitted values (at 900 K it is > 0.5 %)
    hot = rows.iloc[-1]
    assert hot.heat_capacity_p_J_per_mol_K > 1.005 * hot.heat_capacity_v_J_per_mol_K


def test_rows_outside_the_sampled_volumes_are_left_out():
    table = quasiharmonic_table(str(MANIFEST), np.arange(10.0, 901.0, 10.0))
    table = table.copy()
    table.loc[table.index[-3:], "outside_volume_range"] = True
    source = source_from_table(table)
    assert source.temperature.max() < table.temperature_K.iloc[-3]
    assert any("outside the sampled volumes" in n for n in source.notes)


def test_calorimetry_fit_table_as_source(tmp_path):
    # the invented demo measurement, fitted by `calorimetry`, then turned into Shomate coefficients
    import json

    import pandas as pd

    from thermo.cli.main import main
    measured = MANIFEST.parents[1] / "measured" / "springium_cp.csv"
    table_path, coefficients_path = tmp_path / "cal.csv", tmp_path / "shomate.json"
    assert main(["calorimetry", str(measured), "--format", "csv", "--output", str(table_path)]) == 0
    assert main(["polynomial", str(table_path), "--cp-table", "--form", "shomate", "--range", "298.15:350",
                 "--format", "json", "--output", str(coefficients_path)]) == 0
    record = json.loads(coefficients_path.read_text())
    c = record["ranges"][0]["coefficients"]
    table = pd.read_csv(table_path, comment="#")
    rows = table[table.temperature_K >= 300]
    for t, cp in zip(rows.temperature_K, rows.heat_capacity_p_model_J_per_mol_K):
        assert abs(shomate(c, float(t))[0] / cp - 1) < 1e-3, t
    s298 = np.interp(298.15, table.temperature_K, table.entropy_third_law_J_per_mol_K)
    assert abs(shomate(c, 298.15)[2] / s298 - 1) < 1e-4
    assert any("calorimetry" in w for w in record["warnings"])
