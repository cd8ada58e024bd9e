"""C_p model terms, held parameters, correlation warnings and the dilation hooks."""

import numpy as np
import pytest
from scipy import constants as sc

from thermo.calorimetry import (HeatCapacityModel, MeasuredHeatCapacity, dilation_from_expansion,
                                fit_measured_heat_capacity, nernst_lindemann_cp, parse_fixed)
from thermo.calorimetry.report import analyse, parse_model
from thermo.errors import OptionError
from thermo.models.debye import debye_spectrum

from .test_external import _debye_cv_mpmath


def test_scaled_dos_lattice_recovers_the_frequency_scale():
    # A Debye spectrum with θ_D = 300 K scaled by s has θ_D = 300 s (frequencies scale);
    # the "measured" data are an mpmath Debye solid with θ_D = 330 K, so s = 1.1.
    t = np.linspace(10.0, 400.0, 25)
    c = np.array([_debye_cv_mpmath(x, 330.0) for x in t])
    model = HeatCapacityModel(atoms=1, lattice="dos", electronic=False, dilation="none", dos=debye_spectrum(300.0))
    fit = fit_measured_heat_capacity(MeasuredHeatCapacity(t, c, None, "J/(mol K)", "x"), model)
    assert fit.values["scale"] == pytest.approx(1.1, rel=1e-6)
    assert fit.max_relative_residual < 1e-6


def test_nernst_lindemann_root_satisfies_its_equation():
    # C_p − C_v = A C_p² T (Nernst & Lindemann, Z. Elektrochem. 17, 817 (1911)).
    cv = np.array([5.0, 20.0, 24.9])
    t = np.array([50.0, 300.0, 900.0])
    cp = nernst_lindemann_cp(cv, t, 6e-6)
    assert cp - cv == pytest.approx(6e-6 * cp ** 2 * t, rel=1e-12)
    assert nernst_lindemann_cp(cv, t, 0.0) == pytest.approx(cv)


def test_dilation_hook_alpha2_b_v_t():
    # C_p − C_v = α²B_T V T (thermodynamic identity; Wallace, Thermodynamics of Crystals, 1972, §2).
    # Copper near 300 K, values from memory: α_V ≈ 4.95e-5 1/K, B_T ≈ 137 GPa, V ≈ 7.11 cm³/mol → ≈ 0.72 J/(mol K).
    dc = dilation_from_expansion(4.95e-5, 137e9, 7.11e-6, 300.0)
    assert float(dc) == pytest.approx(0.717, rel=0.01)
    t = np.array([100.0, 200.0, 300.0])
    table = (t, dilation_from_expansion(np.full(3, 4.95e-5), np.full(3, 137e9), np.full(3, 7.11e-6), t))
    model = HeatCapacityModel(atoms=1, electronic=False, dilation="values", dilation_table=table)
    parts = model.parts([150.0], {"theta_D_K": 343.0})
    assert parts["dilation"][0] == pytest.approx(0.5 * (table[1][0] + table[1][1]))
    with pytest.raises(OptionError, match="end at 300 K"):
        model.parts([400.0], {"theta_D_K": 343.0})
    assert model.parts([50.0], {"theta_D_K": 343.0})["dilation"][0] == pytest.approx(0.5 * table[1][0])


def test_held_parameter_and_unknown_names():
    assert parse_fixed(["A=4e-6"]) == {"dilation_A_mol_per_J": 4e-6}
    with pytest.raises(OptionError, match="unknown parameter"):
        parse_fixed(["zeta=1"])
    with pytest.raises(OptionError, match="NAME=VALUE"):
        parse_fixed(["gamma"])
    with pytest.raises(OptionError, match="outside its physical range"):
        parse_fixed(["scale=0"])
    t = np.linspace(20.0, 300.0, 12)
    data = MeasuredHeatCapacity(t, 1e-3 * t + 1.0, None, "J/(mol K)", "x")
    with pytest.raises(OptionError, match="cannot fix dilation_A_mol_per_J"):
        fit_measured_heat_capacity(data, HeatCapacityModel(atoms=1, dilation="none"), {"A": 1e-6})


def test_strong_correlation_is_reported_by_name():
    # Over 400-700 K alone γT and the Nernst–Lindemann term are both nearly linear in T:
    # the fit cannot separate them (common practice: fix γ from low-temperature data).
    t = np.linspace(400.0, 700.0, 30)
    model = HeatCapacityModel(atoms=1, electronic=True)
    truth = {"theta_D_K": 400.0, "gamma_J_per_mol_K2": 1.3e-3, "dilation_A_mol_per_J": 5e-6}
    cp = model.heat_capacity_p(t, truth)
    noisy = cp * (1 + 0.002 * np.random.default_rng(1).standard_normal(t.size))
    fit = fit_measured_heat_capacity(MeasuredHeatCapacity(t, noisy, 0.002 * cp, "J/(mol K)", "x"), model)
    assert any("gamma_J_per_mol_K2 and dilation_A_mol_per_J are strongly correlated" in w for w in fit.warnings)
    r = fit.correlation[fit.free.index("gamma_J_per_mol_K2"), fit.free.index("dilation_A_mol_per_J")]
    assert abs(r) > 0.95


def test_report_keys_and_data_versus_model_entropy():
    # A Debye + γT solid (θ_D 350 K, γ 1 mJ/(mol K²)) measured from 3 K: S° from the
    # data and from the model agree, and both with the mpmath Debye entropy + γT.
    from .test_external import _debye_entropy_mpmath
    t = np.concatenate([np.linspace(3.0, 30.0, 10), np.linspace(40.0, 320.0, 29)])
    c = np.array([_debye_cv_mpmath(x, 350.0) for x in t]) + 1e-3 * t
    data = MeasuredHeatCapacity(t, c, 0.001 * c, "J/(mol K)", "synthetic")
    report, fit, third = analyse(data, HeatCapacityModel(atoms=1, electronic=True, dilation="none"))
    exact = _debye_entropy_mpmath(298.15, 350.0) + 1e-3 * 298.15
    assert report["entropy_298_15_J_per_mol_K"]["value"] == pytest.approx(exact, rel=1e-5)
    assert report["entropy_298_15_from_data_J_per_mol_K"]["value"] == pytest.approx(exact, rel=5e-4)
    assert report["fit"]["theta_D_K"]["value"] == pytest.approx(350.0, rel=1e-4)
    assert report["low_temperature_analysis"]["gamma_J_per_mol_K2"]["value"] == pytest.approx(1e-3, rel=0.02)
    assert "dilation_A_mol_per_J" not in report["fit"]
    assert list(third.columns)[:3] == ["temperature_K", "heat_capacity_p_measured_J_per_mol_K",
                                       "entropy_third_law_J_per_mol_K"]
    assert report["max_relative_residual"] < 1e-4


def test_model_text():
    # γT only for a declared metal (issue 24): an insulator's default model has no electronic term.
    assert parse_model(None, False) == {"lattice": "debye", "electronic": False, "dilation": "nernst-lindemann"}
    assert parse_model(None, True, metal=True) == {"lattice": "dos", "electronic": True, "dilation": "nernst-lindemann"}
    with pytest.raises(OptionError, match="one lattice term"):
        parse_model("debye+dos", True)
    with pytest.raises(OptionError, match="unknown model term"):
        parse_model("einstein", True)
    assert sc.R > 8.3


def test_results_do_not_jump_when_the_data_are_merely_resampled():
    # The same smooth Debye + γT + Nernst–Lindemann curve sampled on 40 and on 131 points
    # (noise-free): the start-value scan is a heuristic, the fitted values must not depend on it.
    model = HeatCapacityModel(atoms=2, electronic=True)
    truth = {"theta_D_K": 512.0, "gamma_J_per_mol_K2": 0.8e-3, "dilation_A_mol_per_J": 2e-6}
    results = []
    for t in (np.linspace(12.0, 800.0, 40), np.geomspace(12.0, 800.0, 131)):
        data = MeasuredHeatCapacity(t, model.heat_capacity_p(t, truth), None, "J/(mol K)", "x")
        results.append(fit_measured_heat_capacity(data, model).values)
    for key, value in truth.items():
        assert results[0][key] == pytest.approx(value, rel=1e-6)
        assert results[1][key] == pytest.approx(value, rel=1e-6)
