"""Model route: a discrepancy term from structured residuals, γT only for a metal, a known γ with its ± (issue 24)."""

import json

import numpy as np
import pytest

from thermo.calorimetry import HeatCapacityModel, MeasuredHeatCapacity, fit_measured_heat_capacity
from thermo.calorimetry.report import analyse
from thermo.cli.main import main

from .test_coverage import GRID, _solid
from .test_external import _debye_cv_mpmath


def _insulator_file(tmp_path, sigma=False):
    # A Debye solid (θ_D = 320 K, mpmath) with a small Nernst–Lindemann term and no electronic part.
    t = np.arange(15.0, 400.0, 10.0)
    cv = np.array([_debye_cv_mpmath(x, 320.0) for x in t])
    cp = 2 * cv / (1 + np.sqrt(1 - 4 * 4e-6 * t * cv))       # root of C_p − C_v = A C_p² T
    path = tmp_path / "insulator.csv"
    rows = "".join(f"{a},{b:.10g}" + (f",{1e-3 * b:.4g}" if sigma else "") + "\n" for a, b in zip(t, cp))
    path.write_text("T (K),Cp (J/(mol K))" + (",u" if sigma else "") + "\n" + rows)
    return path


def test_structured_residuals_add_a_discrepancy_and_a_warning():
    # A Debye lattice of 3n modes cannot describe a Debye + Einstein compound (mpmath truth, no noise, no σ
    # column): on main the χ² test was skipped without σ and the model route's ± held the parameters only.
    cv, s_true, h_true = _solid(400.0, 700.0)
    data = MeasuredHeatCapacity(GRID, cv, None, "J/(mol K)", "compound")
    report, fit, _ = analyse(data, HeatCapacityModel(atoms=2, dilation="none"))
    structure = report["residual_structure"]
    assert structure["structured"] and structure["discrepancy"] > 0.01
    assert any("residuals are structured" in n for n in report["notes"])
    parts = report["uncertainty_parts_model_route"]
    assert parts["entropy_model_discrepancy"] > parts["entropy_parameters"]
    s, h = report["entropy_298_15_J_per_mol_K"], report["enthalpy_298_15_minus_0_kJ_per_mol"]
    assert abs(s["value"] - s_true) <= 2 * s["uncertainty"]
    assert abs(h["value"] - h_true / 1e3) <= 2 * h["uncertainty"]
    # the parameters alone would not cover it
    assert abs(s["value"] - s_true) > 2 * parts["entropy_parameters"]


def test_structure_with_stated_uncertainties_uses_birge_ratio_and_runs():
    cv, _, _ = _solid(400.0, 700.0)
    noisy = cv + np.random.default_rng(5).normal(0.0, 0.003 * cv)
    data = MeasuredHeatCapacity(GRID, noisy, 0.003 * cv, "J/(mol K)", "compound")
    report, _, _ = analyse(data, HeatCapacityModel(atoms=2, dilation="none"))
    reasons = " ".join(report["residual_structure"]["reasons"])
    assert "Birge ratio" in reasons and "runs test" in reasons


def test_no_false_alarm_on_data_the_model_describes():
    # Debye data with stated 0.3 % noise fitted by the Debye model: the structure tests have 5 % (runs)
    # and 1 % (χ²) false-alarm rates by construction; over 20 seeds at most 4 alarms.
    t = np.arange(10.0, 330.0, 8.0)
    cv = np.array([_debye_cv_mpmath(x, 280.0) for x in t])
    alarms = 0
    for seed in range(20):
        noisy = cv + np.random.default_rng(seed).normal(0.0, 0.003 * cv)
        fit = fit_measured_heat_capacity(MeasuredHeatCapacity(t, noisy, 0.003 * cv, "J/(mol K)", "x"),
                                         HeatCapacityModel(atoms=1, dilation="none"))
        alarms += fit.structure["structured"]
    assert alarms <= 4


def test_gamma_is_zero_unless_a_metal_is_declared(tmp_path, capsys):
    # Issue 24: the default fitted γT even for an insulator (3.3 mJ/(mol K²) of spurious γ leaking into the
    # extrapolation).  Now γ = 0 and the output says so; --metal fits it.
    path = _insulator_file(tmp_path)
    assert main(["calorimetry", str(path), "--atoms", "1"]) == 0
    out = json.loads(capsys.readouterr().out)
    assert out["electronic_term"].startswith("none: γ = 0")
    assert "gamma_J_per_mol_K2" not in out["fit"] and "γT" not in out["model"]
    assert any("--metal" in n for n in out["notes"])
    assert main(["calorimetry", str(path), "--atoms", "1", "--metal"]) == 0
    metal = json.loads(capsys.readouterr().out)
    assert metal["electronic_term"].startswith("fitted") and "gamma_J_per_mol_K2" in metal["fit"]
    gamma = metal["fit"]["gamma_J_per_mol_K2"]       # an insulator's γ is 0 within its ±, or held at 0 if < 0
    assert gamma["value"] <= 2 * gamma["uncertainty"] or any("held at 0" in n for n in metal["notes"])
    assert main(["calorimetry", str(path), "--atoms", "1", "--fix", "gamma=1e-4"]) == 0
    held = json.loads(capsys.readouterr().out)
    assert held["electronic_term"].startswith("held") and held["fit"]["gamma_J_per_mol_K2"]["fixed"] is True


def test_every_entropy_enthalpy_and_parameter_is_a_value_uncertainty_pair(tmp_path, capsys):
    path = _insulator_file(tmp_path, sigma=True)
    assert main(["calorimetry", str(path), "--atoms", "1"]) == 0
    out = json.loads(capsys.readouterr().out)
    pairs = [out[k] for k in out if k.startswith(("entropy_", "enthalpy_")) and isinstance(out[k], dict)]
    pairs += list(out["fit"].values())
    below = out["below_first_point"]
    pairs += [below["entropy_J_per_mol_K"], below["enthalpy_kJ_per_mol"]]
    pairs += [f[k] for f in below["forms"].values() for k in ("entropy_J_per_mol_K", "enthalpy_kJ_per_mol")]
    assert len(pairs) >= 10
    for pair in pairs:
        assert {"value", "uncertainty"} <= set(pair) and pair["uncertainty"] is not None and pair["uncertainty"] >= 0


def test_known_gamma_with_its_uncertainty_is_propagated():
    # The hook for an electronic DOS: γ held at a value with a standard uncertainty moves θ_D and S°.
    t = np.arange(20.0, 320.0, 10.0)
    model = HeatCapacityModel(atoms=1, electronic=True, dilation="none")
    cp = model.heat_capacity_p(t, {"theta_D_K": 330.0, "gamma_J_per_mol_K2": 1.2e-3})
    data = MeasuredHeatCapacity(t, cp * (1 + 0.002 * np.random.default_rng(2).standard_normal(t.size)),
                                0.002 * cp, "J/(mol K)", "metal")
    exact, _, _ = analyse(data, model, {"gamma": 1.2e-3})
    known, _, _ = analyse(data, model, {"gamma": (1.2e-3, 0.3e-3)})
    assert known["fit"]["gamma_J_per_mol_K2"] == {"value": 1.2e-3, "uncertainty": 0.3e-3, "fixed": True}
    assert known["fit"]["theta_D_K"]["uncertainty"] > 2 * exact["fit"]["theta_D_K"]["uncertainty"]
    # ∂S°/∂γ ≈ 298.15 K (γT integrated over T'/T'), less what θ_D takes up: at least +0.05 J/(mol K) in u
    assert known["entropy_298_15_J_per_mol_K"]["uncertainty"] > exact["entropy_298_15_J_per_mol_K"]["uncertainty"] + 0.02
    with pytest.raises(Exception, match="outside its physical range"):
        analyse(data, model, {"gamma": (-1.0, 0.1)})
