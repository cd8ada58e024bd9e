"""Fitted coefficients, evaluated by the published formulas written out here, against the table they came from.

Formulas, re-typed independently of :mod:`thermo.polynomials.forms`:
- Shomate: NIST Chemistry WebBook, NIST Standard Reference Database 69,
  "Shomate equation" (t = T/1000 K; C_p, H° − H°298.15, S°).
- NASA 7-term: B. J. McBride, M. J. Zehe and S. Gordon, NASA/TP-2002-211556
  (2002), the 7-coefficient forms of C_p/R, H/RT, S/R.
- SGTE: A. T. Dinsdale, CALPHAD 15, 317 (1991): G − H_SER = a + bT + cT ln T
  + dT² + eT³ + f/T and its derivatives S = −∂G/∂T, H = G + TS, C_p = −T ∂²G/∂T².
The two-species DOS is a synthetic test spectrum (Debye band + one optical
peak, 2 atoms per formula unit; invented, tests/spectra.py).  H − H298 of the
harmonic table is U(T) − U(298.15 K) (harmonic crystal, C_p = C_v; common
practice).  Tolerance 1e-3 relative over 298.15–1500 K is the issue's check.
"""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest
from scipy import constants as sc

from tests.spectra import band_plus_peaks
from thermo.polynomials import fit_polynomial, harmonic_source, heat_capacity_source
from thermo.tables import tabulate

R = sc.R  # CODATA 2018 via scipy.constants
T_CHECK = np.linspace(298.15, 1500.0, 97)


def shomate(c, T):
    t = T / 1000.0
    cp = c["A"] + c["B"] * t + c["C"] * t * t + c["D"] * t ** 3 + c["E"] / (t * t)
    dh = (c["A"] * t + c["B"] * t * t / 2 + c["C"] * t ** 3 / 3 + c["D"] * t ** 4 / 4 - c["E"] / t
          + c["F"] - c["H"]) * 1000.0
    s = c["A"] * math.log(t) + c["B"] * t + c["C"] * t * t / 2 + c["D"] * t ** 3 / 3 - c["E"] / (2 * t * t) + c["G"]
    return cp, dh, s


def nasa7(ranges, T):
    rng = ranges[0] if T <= ranges[0]["T_max_K"] else ranges[1]
    a = [rng["coefficients"][f"a{i}"] for i in range(1, 8)]
    cp = R * sum(a[i] * T ** i for i in range(5))
    h = R * T * (sum(a[i] * T ** i / (i + 1) for i in range(5)) + a[5] / T)
    s = R * (a[0] * math.log(T) + sum(a[i] * T ** i / i for i in range(1, 5)) + a[6])
    return cp, h, s


def sgte(c, T):
    a, b, cc, d, e, f = (c[k] for k in "abcdef")
    g = a + b * T + cc * T * math.log(T) + d * T * T + e * T ** 3 + f / T
    s = -(b + cc * (math.log(T) + 1) + 2 * d * T + 3 * e * T * T - f / (T * T))
    cp = -T * (cc / T + 2 * d + 6 * e * T + 2 * f / T ** 3)
    return cp, g + T * s, s


@pytest.fixture(scope="module")
def two_species():
    dos = band_plus_peaks(4.0, [9.0])
    assert dos.atoms == 2
    table = tabulate(dos, np.union1d(T_CHECK, [298.15]))
    u298 = float(table.internal_energy_kJ_per_mol.iloc[0]) * 1e3
    cp = table.heat_capacity_v_J_per_mol_K.to_numpy()
    dh = table.internal_energy_kJ_per_mol.to_numpy() * 1e3 - u298
    return dos, cp, dh, table.entropy_J_per_mol_K.to_numpy()


def _relative(ours, ref, floor=0.0):
    return np.abs(np.asarray(ours) - ref) / np.maximum(np.abs(ref), floor)


@pytest.mark.parametrize("form", ["shomate", "nasa7", "sgte"])
def test_coefficients_reproduce_the_table(two_species, form):
    dos, cp_ref, dh_ref, s_ref = two_species
    fit = fit_polynomial(harmonic_source(dos, 298.15, 1500.0), form, (298.15, 1500.0),
                         formation_enthalpy=-250.0).to_dict()
    rng = fit["ranges"]
    h298 = -250.0e3
    values = []
    for T in T_CHECK:
        if form == "shomate":
            values.append(shomate(rng[0]["coefficients"], T))
        elif form == "nasa7":
            cp, h, s = nasa7(rng, T)
            values.append((cp, h - h298, s))
        else:
            cp, h, s = sgte(rng[0]["coefficients"], T)
            values.append((cp, h - h298, s))
    cp, dh, s = np.array(values).T
    assert np.max(_relative(cp, cp_ref)) < 1e-3
    assert np.max(_relative(s, s_ref)) < 1e-3
    assert np.max(_relative(dh, dh_ref, 1e-3 * np.max(np.abs(dh_ref)))) < 1e-3
    # H(298.15) is the formation enthalpy given (the reference-state convention)
    assert abs(dh[0]) < 1e-6 * abs(h298)
    # the reported errors are the ones measured here, to rounding of the grids
    assert fit["errors"]["heat_capacity_p"]["max_relative"] == pytest.approx(np.max(_relative(cp, cp_ref)), rel=0.3, abs=2e-6)


@pytest.mark.parametrize("form, formula", [("shomate", shomate), ("sgte", sgte)])
def test_two_range_shomate_and_sgte_are_continuous_and_reproduce_the_table(two_species, form, formula):
    dos, cp_ref, dh_ref, s_ref = two_species
    fit = fit_polynomial(harmonic_source(dos, 298.15, 1500.0), form, (298.15, 1500.0), t_mid=700.0).to_dict()
    lo, hi = fit["ranges"]
    assert lo["T_max_K"] == hi["T_min_K"] == 700.0
    for x, y in zip(formula(lo["coefficients"], 700.0), formula(hi["coefficients"], 700.0)):
        assert x == pytest.approx(y, rel=1e-10)
    values = np.array([formula((lo if T <= 700.0 else hi)["coefficients"], T) for T in T_CHECK]).T
    assert np.max(_relative(values[0], cp_ref)) < 1e-3
    assert np.max(_relative(values[2], s_ref)) < 1e-3


def test_nasa7_is_continuous_at_the_midpoint(two_species):
    dos = two_species[0]
    fit = fit_polynomial(harmonic_source(dos, 298.15, 1500.0), "nasa7", (298.15, 1500.0), t_mid=800.0).to_dict()
    lo, hi = fit["ranges"]
    assert lo["T_max_K"] == hi["T_min_K"] == 800.0
    below = nasa7([lo, lo], 800.0)
    above = nasa7([hi, hi], 800.0)
    for x, y in zip(below, above):
        assert x == pytest.approx(y, rel=1e-10)


@pytest.mark.parametrize("form", ["shomate", "nasa7", "sgte"])
def test_enthalpy_and_entropy_follow_from_cp(two_species, form):
    # independent high-precision integration (mpmath.quad) of the fitted C_p:
    # H(T) - H(T0) = ∫ C_p dT and S(T) - S(T0) = ∫ C_p/T dT (thermodynamic identities)
    fit = fit_polynomial(harmonic_source(two_species[0], 298.15, 1500.0), form, (298.15, 1500.0), t_mid=900.0)

    def cp(T):
        return float(fit.properties([float(T)])["heat_capacity_p"][0])

    p0, p1 = (fit.properties([T]) for T in (300.0, 1400.0))
    dh = mpmath.quad(cp, [300.0, 900.0, 1400.0])
    ds = mpmath.quad(lambda T: cp(T) / T, [300.0, 900.0, 1400.0])
    assert float(p1["enthalpy"][0] - p0["enthalpy"][0]) == pytest.approx(float(dh), rel=1e-10)
    assert float(p1["entropy"][0] - p0["entropy"][0]) == pytest.approx(float(ds), rel=1e-10)
    g = fit.properties([700.0])
    assert float(g["gibbs_energy"][0]) == pytest.approx(float(g["enthalpy"][0] - 700.0 * g["entropy"][0]), rel=1e-12)


def test_exact_shomate_heat_capacity_is_recovered():
    # C_p built in the Shomate form itself must be fitted exactly (least squares has a zero residual)
    t = np.linspace(250.0, 1600.0, 300)
    x = t / 1000.0
    cp = 25.0 + 8.0 * x - 3.0 * x ** 2 + 1.0 * x ** 3 + 0.2 / x ** 2
    src = heat_capacity_source(t, cp, entropy_298=40.0)
    fit = fit_polynomial(src, "shomate", (298.15, 1500.0), formation_enthalpy=-100.0)
    c = fit.ranges[0].coefficients
    for key, value in zip("ABCDE", (25.0, 8.0, -3.0, 1.0, 0.2)):
        assert c[key] == pytest.approx(value, rel=1e-6, abs=1e-6)  # 298.15 K added by the spline
    assert c["H"] == -100.0
    assert shomate(c, 298.15)[2] == pytest.approx(40.0, abs=1e-9)
    assert fit.warnings == ()


def test_warnings_for_low_range_and_large_error(two_species):
    fit = fit_polynomial(harmonic_source(two_species[0], 20.0, 1500.0), "shomate", (20.0, 1500.0))
    text = " ".join(fit.warnings)
    assert "below the 200 K" in text
    assert "deviates from the source" in text
    assert fit.errors["heat_capacity_p"]["max_relative"] > 1e-3
    assert "harmonic" in text   # the harmonic-approximation caution travels with the fit
