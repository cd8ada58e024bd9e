"""Characteristic temperatures and θ_D(T) against published identities and mpmath.

Outside references: Barron, Berg & Morrison, Proc. R. Soc. Lond. A 242, 478
(1957) — all moment Debye temperatures equal θ_D for a Debye spectrum, θ_D(T)
tends to θ_D(−3) (elastic) as T → 0 and to θ_D(2) as T → ∞; moments of a
non-Debye spectrum by mpmath quadrature; CODATA h/k_B via scipy.constants.
"""

from __future__ import annotations

import math

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from tests.spectra import band_plus_peaks, debye_spectrum, peak_dos, theta_of, write_text
from thermo import load_dos
from thermo.models.debye import debye_heat_capacity_fraction
from thermo.models import (THETA_KEYS, debye_moment_temperature, debye_y_from_fraction, einstein_entropy_temperature,
                           equivalent_debye_temperature, fit_einstein_theta, frequency_moment,
                           invert_debye_heat_capacity, theta_definitions)
from thermo.models.debye import debye_heat_capacity

R = sc.R
H_OVER_K = sc.h * 1e12 / sc.k  # K per THz, CODATA


def test_debye_spectrum_gives_every_debye_definition_equal_to_theta():
    # Barron et al. 1957: θ_D(n) = θ_D for every n on a Debye spectrum; also the elastic limit and the fit.
    nu_d = 5.0
    rows = {r["key"]: r for r in theta_definitions(debye_spectrum(nu_d, atoms=2), fit_range=(5.0, 300.0))}
    assert set(rows) == set(THETA_KEYS)
    for key, row in rows.items():
        if key.startswith("debye"):
            assert row["value_K"] == pytest.approx(nu_d * H_OVER_K, rel=1e-9), key
    assert rows["debye_theta_fit_K"]["uncertainty_K"] < 1e-6
    assert rows["debye_theta_fit_K"]["fit_range_K"] == [5.0, 300.0]
    # Einstein definitions of a Debye spectrum: exp<ln ν> = ν_D e^{-1/3}, <ν> = 3ν_D/4 (closed forms).
    assert rows["einstein_theta_entropy_K"]["value_K"] == pytest.approx(nu_d * H_OVER_K * math.exp(-1 / 3), rel=1e-9)
    assert rows["einstein_theta_mean_K"]["value_K"] == pytest.approx(0.75 * nu_d * H_OVER_K, rel=1e-12)


def test_debye_spectrum_gives_flat_equivalent_debye_temperature():
    # Barron et al. 1957: θ_D(T) is constant for a Debye solid.
    nu_d = 5.0
    t = np.array([0.5, 2.0, 10.0, 50.0, 240.0, 1000.0, 1e4])
    np.testing.assert_allclose(equivalent_debye_temperature(debye_spectrum(nu_d), t), nu_d * H_OVER_K, rtol=1e-9)


def test_tabulated_debye_file_through_the_loader(tmp_path):
    # Same identity on a tabulated Debye spectrum read from text (grid step 0.01 THz): agreement to 1e-4.
    nu = np.linspace(0.0, 5.0, 501)
    dos = load_dos(str(write_text(tmp_path / "debye.dat", nu, 9 / 125 * nu ** 2)))
    for row in theta_definitions(dos):
        if row["key"].startswith("debye"):
            assert row["value_K"] == pytest.approx(5.0 * H_OVER_K, rel=1e-4), row["key"]
    np.testing.assert_allclose(equivalent_debye_temperature(dos, [1.0, 30.0, 300.0]), 5.0 * H_OVER_K, rtol=1e-4)


def test_narrow_peak_gives_einstein_theta_by_entropy_and_by_fit():
    # Issue requirement: 3 modes at ν₀ -> θ_E = hν₀/k_B. A Gaussian of width σ shifts exp<ln ν> by
    # -σ²/(2ν₀²) = -2e-6 here (second-order expansion, common practice).
    nu0 = 5.0
    dos = peak_dos(nu0, width_thz=0.01)
    assert einstein_entropy_temperature(dos) == pytest.approx(theta_of(nu0), rel=1e-5)
    fit = fit_einstein_theta(dos, (10.0, 600.0))
    assert fit.value == pytest.approx(theta_of(nu0), rel=1e-5)
    assert fit.fit_range_K == (10.0, 600.0)
    assert abs(fit.value - theta_of(nu0)) <= 3 * fit.uncertainty + 1e-4 * theta_of(nu0)


def test_moments_of_a_two_band_spectrum_match_mpmath():
    # Exact spectrum: 9/ν_a³ ν² on [0, ν_a] plus a Gaussian of 3 modes; moments by mpmath quadrature.
    nu_a, peak, width = 3.0, 8.0, 0.05
    dos = band_plus_peaks(nu_a, [peak], width_thz=width)
    mp.mp.dps = 25
    gauss = lambda v: 3 * mp.exp(-((v - peak) / width) ** 2 / 2) / (width * mp.sqrt(2 * mp.pi))

    def moment(f):
        band = mp.quad(lambda v: 9 / nu_a ** 3 * v ** 2 * f(v), [0, nu_a])
        opt = mp.quad(lambda v: gauss(v) * f(v), [peak - 12 * width, peak, peak + 12 * width])
        return float((band + opt) / 6)

    for n in (-2, -1, 1, 2):
        assert frequency_moment(dos, n) == pytest.approx(moment(lambda v: v ** n), rel=1e-7), n
        ref = H_OVER_K * ((n + 3) / 3 * moment(lambda v: v ** n)) ** (1 / n)
        assert debye_moment_temperature(dos, n) == pytest.approx(ref, rel=1e-7), n
    ref0 = H_OVER_K * math.exp(1 / 3 + moment(mp.log))
    assert debye_moment_temperature(dos, 0) == pytest.approx(ref0, rel=1e-7)


def test_equivalent_debye_temperature_limits_of_a_two_band_spectrum():
    # Barron et al. 1957: θ_D(T -> 0) = elastic θ_D = (h/k_B)(9n/A)^{1/3}; θ_D(T -> ∞) = θ_D(2).
    dos = band_plus_peaks(3.0, [8.0], width_thz=0.05)
    elastic = H_OVER_K * (9 * dos.atoms / dos.low_frequency.coefficient) ** (1 / 3)
    theta2 = debye_moment_temperature(dos, 2)
    low, high = equivalent_debye_temperature(dos, [1.0, 100 * theta2])
    assert low == pytest.approx(elastic, rel=1e-9)
    assert high == pytest.approx(theta2, rel=2e-4)
    # the structured spectrum is not flat in between
    middle = equivalent_debye_temperature(dos, [50.0])[0]
    assert abs(middle - elastic) > 0.05 * elastic


def test_inversion_against_mpmath_and_undefined_points():
    # Debye C_v by mpmath at θ/T = 2.5 inverted back; undefined at T = 0, C_v <= 0 and at the classical limit.
    mp.mp.dps = 30
    y = mp.mpf("2.5")
    frac = float(3 / y ** 3 * mp.quad(lambda x: x ** 4 * mp.exp(x) / mp.expm1(x) ** 2, [0, y]))
    t = np.array([100.0, 0.0, 100.0, 100.0, 100.0])
    cv = np.array([frac, 0.5, 0.0, 1.0, 1.0 - 1e-13]) * 3 * R
    out = invert_debye_heat_capacity(t, cv, 3)
    assert out[0] == pytest.approx(250.0, rel=1e-11)
    assert np.isnan(out[1:]).all()
    # deep T^3 region (y > 60) via the closed-form inversion, Debye 1912
    t3 = np.array([0.5])
    assert invert_debye_heat_capacity(t3, debye_heat_capacity(t3, 300.0, 3), 3)[0] == pytest.approx(300.0, rel=1e-12)


def test_inversion_of_many_fractions_at_once_against_mpmath():
    # Debye D_c(y) = 3y^-3 ∫0^y x^4 e^x/(e^x-1)^2 dx by mpmath quadrature (Debye 1912), from y = 0.05
    # (C_v within 1e-4 of 3R) to the T³ region; all inverted in one vectorised call.
    mp.mp.dps = 30
    ys = ["0.05", "0.5", "2.5", "10", "40", "59.9", "80"]
    frac = [float(3 / mp.mpf(y) ** 3 * mp.quad(lambda x: x ** 4 * mp.exp(x) / mp.expm1(x) ** 2, [0, mp.mpf(y)]))
            for y in ys]
    got = debye_y_from_fraction(np.array(frac + [0.0, np.nan, 1.0]))
    assert got[:len(ys)] == pytest.approx([float(y) for y in ys], rel=1e-11)
    assert np.isnan(got[len(ys):]).all()


def test_inversion_residual_at_rounding_level_over_the_whole_range():
    # Newton steps inside the bracket (issue 30: 10⁶ temperatures): D_c(y) of the answer reproduces each
    # fraction to a few ulp, from near the classical limit (y = 1e-5) to the T³ switch (y = 60)
    y = np.concatenate([np.geomspace(1e-5, 60.0, 20_000), np.random.default_rng(5).uniform(0.01, 60.0, 20_000)])
    f = debye_heat_capacity_fraction(y)
    got = debye_y_from_fraction(f)
    assert np.all(np.abs(debye_heat_capacity_fraction(got) / f - 1) <= 1e-14)
    well = y > 0.1                        # conditioned: dD_c/dy not small
    assert np.all(np.abs(got[well] / y[well] - 1) <= 1e-12)


def test_low_frequency_theta_is_undefined_without_a_nu2_fit():
    rows = {r["key"]: r for r in theta_definitions(peak_dos(5.0))}
    assert rows["debye_theta_low_frequency_K"]["value_K"] is None
    assert "no low-frequency" in rows["debye_theta_low_frequency_K"]["note"]
    assert rows["einstein_theta_entropy_K"]["note"] is None
    assert all(r["definition"] and r["reference"] for r in rows.values())


def test_log_moment_of_a_dos_that_does_not_vanish_at_zero_frequency():
    # Smeared Einstein-like spectrum with g(0) > 0 and no ν² treatment: <ln ν> is still finite.
    # Reference: mpmath quadrature of the same piecewise-linear spectrum's exact Gaussian form
    # (grid fine enough that interpolation error is below 1e-4).
    from thermo.spectrum import PhononDOS
    from tests.spectra import gaussian
    nu = np.linspace(0.0, 12.0, 6001)
    g = gaussian(nu, 5.0, 1.5, 3.0)
    dos = PhononDOS(nu, g * 3.0 / np.trapezoid(g, nu), atoms=1)
    mp.mp.dps = 20
    gg = lambda v: mp.exp(-((v - 5) / 1.5) ** 2 / 2)
    ref = mp.quad(lambda v: gg(v) * mp.log(v), [0, 5, 12]) / mp.quad(gg, [0, 5, 12])
    assert einstein_entropy_temperature(dos) == pytest.approx(H_OVER_K * math.exp(float(ref)), rel=1e-4)
    rows = {r["key"]: r["value_K"] for r in theta_definitions(dos)}
    assert rows["debye_theta_moment_0_K"] == pytest.approx(H_OVER_K * math.exp(1 / 3 + float(ref)), rel=1e-4)
    # <1/ν> and <1/ν²> diverge when g(0) > 0: reported as undefined, not as a number
    assert rows["debye_theta_moment_m1_K"] is None and rows["debye_theta_moment_m2_K"] is None
