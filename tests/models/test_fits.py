"""Least-squares fits: recovery of known parameters, and uncertainties that cover the truth.

Outside references: the data are generated from the closed-form Einstein and
Debye heat capacities (Einstein 1907; Debye 1912) with Gaussian noise of known
σ; a correct standard uncertainty (JCGM 100:2008 §5; Numerical Recipes 3rd ed.
§15.4) makes |fit − truth| ≤ 1σ in about 68.3 % of repeats (normal
distribution, common-practice fact).
"""

from __future__ import annotations

import numpy as np
import pytest

from tests.spectra import band_plus_peaks, theta_of
from thermo.errors import OptionError
from thermo.models import (CompositeModel, composite_model, fit_heat_capacity_data, least_squares_fit)
from thermo.models.composite import composite_sums
from thermo.models.debye import debye_heat_capacity
from thermo.models.einstein import einstein_heat_capacity
from scipy import constants as sc

T = np.linspace(15.0, 600.0, 60)


@pytest.mark.parametrize("kind,model", [("einstein", einstein_heat_capacity), ("debye", debye_heat_capacity)])
def test_exact_data_recovers_theta_with_vanishing_uncertainty(kind, model):
    fit = fit_heat_capacity_data(kind, T, model(T, 321.0, 6), 6)
    assert fit.value == pytest.approx(321.0, rel=1e-9)
    assert fit.uncertainty < 1e-6
    assert fit.fit_range_K == (15.0, 600.0) and fit.points == 60


@pytest.mark.parametrize("kind,model", [("einstein", einstein_heat_capacity), ("debye", debye_heat_capacity)])
def test_noisy_data_uncertainty_covers_the_truth(kind, model):
    rng = np.random.default_rng(20260)
    truth, sigma = 300.0, 0.05
    clean = model(T, truth, 6)
    inside_1, inside_3 = 0, 0
    repeats = 300
    for _ in range(repeats):
        fit = fit_heat_capacity_data(kind, T, clean + rng.normal(0.0, sigma, T.size), 6)
        inside_1 += abs(fit.value - truth) <= fit.uncertainty
        inside_3 += abs(fit.value - truth) <= 3 * fit.uncertainty
    # 68.3 % expected within 1σ; binomial sd for 300 repeats is 2.7 %, so ±8 % is a 3-sd band.
    assert 0.603 <= inside_1 / repeats <= 0.763
    assert inside_3 / repeats >= 0.98


def test_absolute_sigma_uses_the_given_uncertainty():
    rng = np.random.default_rng(7)
    sigma = 0.1
    y = einstein_heat_capacity(T, 250.0, 3) + rng.normal(0.0, sigma, T.size)
    scaled = fit_heat_capacity_data("einstein", T, y, 3)
    absolute = fit_heat_capacity_data("einstein", T, y, 3, sigma=sigma, absolute_sigma=True)
    assert absolute.value == pytest.approx(scaled.value, rel=1e-9)
    # ratio of the two is the reduced χ^{1/2}, which for correct σ is close to 1 (60 points: within ±30 %)
    assert 0.7 < scaled.uncertainty / absolute.uncertainty < 1.3
    assert abs(absolute.value - 250.0) <= 3 * absolute.uncertainty


def test_composite_fit_on_noisy_data_covers_both_parameters():
    # Two parameters fitted at once: each must be within 3σ of the truth.
    rng = np.random.default_rng(11)
    truth = CompositeModel(150.0, (420.0,), (3.0,))

    def model(t, p):
        return sc.R * composite_sums(CompositeModel(p[0], (p[1],), (3.0,)), t)["heat_capacity"]

    y = model(T, [truth.debye_theta_K, truth.einstein_thetas_K[0]]) + rng.normal(0.0, 0.05, T.size)
    fit = least_squares_fit(model, T, y, [120.0, 500.0])
    for value, error, exact in zip(fit.parameters, fit.uncertainties, (150.0, 420.0)):
        assert 0 < error < 5.0
        assert abs(value - exact) <= 3 * error


def test_composite_model_recovers_acoustic_band_and_optical_peak():
    # Issue requirement: Debye band (3 acoustic modes to ν_a) + optical peak (3 modes at ν_o).
    nu_a, nu_o = 3.0, 8.0
    dos = band_plus_peaks(nu_a, [nu_o], width_thz=0.01)
    model = composite_model(dos, fit_range=(2.0, 500.0))
    assert model.initial["debye_theta_K"] == pytest.approx(theta_of(nu_a), rel=1e-12)
    assert model.initial["einstein_thetas_K"][0] == pytest.approx(theta_of(nu_o), rel=1e-5)
    assert model.debye_theta_K == pytest.approx(theta_of(nu_a), rel=1e-5)
    assert model.einstein_thetas_K[0] == pytest.approx(theta_of(nu_o), rel=1e-5)
    assert model.einstein_modes == (3.0,) and model.debye_modes == 3.0
    assert model.fit_range_K == (2.0, 500.0)
    assert CompositeModel.from_dict(model.as_dict()) == model


def test_composite_model_with_two_optical_terms():
    dos = band_plus_peaks(2.5, [6.0, 9.0], width_thz=0.01)
    model = composite_model(dos, optical_terms=2, fit_range=(2.0, 600.0))
    assert model.einstein_modes == (3.0, 3.0)
    np.testing.assert_allclose(model.initial["einstein_thetas_K"], [theta_of(6.0), theta_of(9.0)], rtol=1e-5)
    np.testing.assert_allclose(model.einstein_thetas_K, [theta_of(6.0), theta_of(9.0)], rtol=1e-4)
    assert model.debye_theta_K == pytest.approx(theta_of(2.5), rel=1e-5)


def test_composite_of_one_atom_has_no_optical_term():
    from tests.spectra import debye_spectrum
    model = composite_model(debye_spectrum(4.0), fit_range=(5.0, 300.0))
    assert model.einstein_thetas_K == () and model.debye_theta_K == pytest.approx(theta_of(4.0), rel=1e-9)


def test_fit_input_errors():
    with pytest.raises(OptionError):
        fit_heat_capacity_data("planck", T, T, 3)
    with pytest.raises(OptionError):
        fit_heat_capacity_data("einstein", [0.0, 1.0, 2.0], [0.0, 1.0, 2.0], 3)
    with pytest.raises(OptionError):
        composite_model(band_plus_peaks(3.0, [8.0]), optical_terms=0)


def test_composite_table_per_atom_infers_atoms_from_its_modes():
    # Dulong–Petit: 3 k_B per atom at high T (common-practice limit); 3 + 6 modes = 3 atoms.
    model = CompositeModel(150.0, (300.0, 500.0), (3.0, 3.0))
    from thermo.models import composite_table
    df = composite_table(model, [1e6], per="atom")
    assert df.heat_capacity_v_kB_per_atom[0] == pytest.approx(3.0, rel=1e-7)


def test_fit_over_a_frozen_range_reports_no_false_precision():
    # Below T ≈ θ/200 an Einstein C_v is ~e^{-200}: the fit cannot pin θ, so its uncertainty must not be 0.
    t = np.linspace(0.1, 1.0, 20)
    fit = fit_heat_capacity_data("einstein", t, einstein_heat_capacity(t, 240.0, 3), 3)
    assert fit.uncertainty == np.inf or abs(fit.value - 240.0) <= 3 * fit.uncertainty
    # tiny but resolvable values are fitted regardless of their scale (C_v ~ 1e-20 J/mol/K here)
    t = np.linspace(2.0, 5.0, 20)
    fit = fit_heat_capacity_data("einstein", t, einstein_heat_capacity(t, 240.0, 3), 3)
    assert fit.value == pytest.approx(240.0, rel=1e-9)
    with pytest.raises(OptionError):
        fit_heat_capacity_data("einstein", t, np.zeros_like(t), 3)
