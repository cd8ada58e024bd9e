"""A source's uncertainty carried into polynomial coefficients, next to the fit's own error.

Truth: the quasi-harmonic Debye solid of tests/quasiharmonic/debye_solid.py (γ = 3, Morse static
energy), its C_p minimised directly in mpmath.  The chain is quasi-harmonic table with `_error_`
columns -> Shomate fit -> fitted C_p, which must lie within (fit error + propagated data
uncertainty) of the truth.  The bound itself is checked by refitting perturbed sources: no
perturbation inside the stated data errors may move the fitted C_p or a coefficient further
than the reported uncertainty.
"""

from __future__ import annotations

import json

import numpy as np
import pytest

from tests.quasiharmonic.debye_solid import V0, Solid
from tests.quasiharmonic.test_volume_set import write_set
from thermo.cli.main import main
from thermo.polynomials import fit_polynomial, heat_capacity_source, source_from_table
from thermo.quasiharmonic import quasiharmonic_table

from .test_independent_formulas import shomate

SOLID = Solid(gamma=3.0, static="morse")
CHECK_K = np.array([300.0, 600.0, 900.0, 1200.0])


@pytest.fixture(scope="module")
def table():
    grid = np.union1d(np.arange(250.0, 1201.0, 25.0), [298.15])
    return quasiharmonic_table(SOLID.entries(V0 * np.linspace(0.9, 1.1, 11)), grid, errors=True)


def test_fitted_cp_lies_within_fit_error_plus_data_uncertainty_of_the_truth(table):
    source = source_from_table(table, label="quasi-harmonic table")
    fit = fit_polynomial(source, "shomate", (298.15, 1200.0))
    record = fit.to_dict()
    truth = SOLID.references(CHECK_K)["cp"]           # mpmath, J/(mol K)
    fitted = fit.properties(CHECK_K)["heat_capacity_p"]
    allowed = fit.errors["heat_capacity_p"]["max_relative"] * fitted + record["uncertainty"]["heat_capacity_p"]["max_absolute"]
    assert np.all(np.abs(fitted - truth) <= allowed), (fitted - truth, allowed)
    # reported side by side: the fit's own error and the data's, and their sum
    total = record["uncertainty"]["total_max_relative"]["heat_capacity_p"]
    assert total == pytest.approx(record["errors"]["heat_capacity_p"]["max_relative"]
                                  + record["uncertainty"]["heat_capacity_p"]["max_relative"])
    s298 = record["uncertainty"]["at_298_15_K"]["entropy"]
    assert set(s298) == {"value", "uncertainty"} and s298["uncertainty"] > 0
    assert set(record["ranges"][0]["coefficient_uncertainties"]) == set("ABCDEFGH")


def test_no_perturbation_inside_the_data_errors_moves_the_fit_further_than_reported(table):
    source = source_from_table(table)
    fit = fit_polynomial(source, "shomate", (298.15, 1200.0))
    t = source.temperature
    u = source.uncertainty["heat_capacity"]
    bound = fit.uncertainty["heat_capacity_p"]["max_absolute"]
    coefficient_bound = fit.uncertainty["coefficients"][0]
    rng = np.random.default_rng(24)
    patterns = [np.ones_like(u), -np.ones_like(u), np.sign(t - 700.0)] + \
        [rng.choice([-1.0, 1.0], u.size) for _ in range(20)]
    s298 = float(np.interp(298.15, t, source.entropy))
    for sign in patterns:
        moved = heat_capacity_source(t, source.heat_capacity + sign * u, entropy_298=s298)
        refit = fit_polynomial(moved, "shomate", (298.15, 1200.0))
        inside = t[t >= 298.15]
        change = refit.properties(inside)["heat_capacity_p"] - fit.properties(inside)["heat_capacity_p"]
        assert np.max(np.abs(change)) <= bound * (1 + 1e-9)
        for key, value in refit.ranges[0].coefficients.items():
            assert abs(value - fit.ranges[0].coefficients[key]) <= coefficient_bound[key] * (1 + 1e-6) + 1e-12, key


def test_command_line_reports_both_in_json_and_csv(tmp_path, capsys):
    # quasiharmonic --errors -> polynomial --cp-table: the JSON carries the fit error and the
    # propagated uncertainty; the CSV has one uncertainty per coefficient.
    manifest = write_set(tmp_path)
    qh = tmp_path / "qh.csv"
    assert main(["quasiharmonic", str(manifest), "--temperatures", "250:1000:10,298.15", "--errors",
                 "--output", str(qh)]) == 0
    capsys.readouterr()
    assert main(["polynomial", str(qh), "--cp-table", "--form", "shomate", "--range", "298.15:900"]) == 0
    record = json.loads(capsys.readouterr().out)
    assert record["errors"]["heat_capacity_p"]["max_relative"] < 1e-3
    assert record["uncertainty"]["heat_capacity_p"]["max_absolute"] > 0
    c = record["ranges"][0]["coefficients"]
    cp298 = record["uncertainty"]["at_298_15_K"]["heat_capacity_p"]
    assert shomate(c, 298.15)[0] == pytest.approx(cp298["value"], rel=1e-9)    # WebBook Shomate form, re-typed
    assert main(["polynomial", str(qh), "--cp-table", "--form", "nasa7", "--range", "298.15:900",
                 "--format", "csv"]) == 0
    rows = [line.split(",") for line in capsys.readouterr().out.splitlines() if not line.startswith("#")]
    assert rows[0][-1] == "uncertainty" and all(float(r[-1]) >= 0 for r in rows[1:])


def test_source_reads_error_columns_and_says_what_it_assumes():
    import pandas as pd
    t = np.array([250.0, 298.15, 400.0, 600.0, 800.0, 1000.0])
    base = {"temperature_K": t, "heat_capacity_p_J_per_mol_K": 20.0 + 0.01 * t,
            "heat_capacity_p_error_J_per_mol_K": np.full(t.size, 0.2), "entropy_J_per_mol_K": 30.0 + 0.02 * t}
    source = source_from_table(pd.DataFrame(base))
    np.testing.assert_allclose(source.uncertainty["heat_capacity"], 0.2)
    assert any("taken as exact" in n for n in source.notes)
    # ∫ 0.2 dT from 298.15 K to 1000 K = 140.37 J/mol (worst case: one sign throughout)
    assert source.uncertainty["enthalpy_increment"][-1] == pytest.approx(0.2 * (1000.0 - 298.15))
    with_s = source_from_table(pd.DataFrame({**base, "entropy_error_J_per_mol_K": np.full(t.size, 0.5)}))
    np.testing.assert_allclose(with_s.uncertainty["entropy"], 0.5)
    assert source_from_table(pd.DataFrame({k: v for k, v in base.items() if "error" not in k})).uncertainty is None


def test_range_beyond_the_source_is_stated():
    t = np.linspace(250.0, 900.0, 40)
    source = heat_capacity_source(t, 24.0 + 0.004 * t, entropy_298=30.0, heat_capacity_uncertainty=np.full(40, 0.1))
    fit = fit_polynomial(source, "shomate", (298.15, 1200.0))
    assert any("covers 298.15-900 K of the range 298.15-1200 K" in w for w in fit.warnings)
    assert not any("covers" in w for w in fit_polynomial(source, "shomate", (298.15, 900.0)).warnings)
