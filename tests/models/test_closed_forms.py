"""Einstein and Debye model functions against closed forms and mpmath integrals.

Outside references: closed forms of the Einstein (1907) and Debye (1912) models
as given in G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
1999), ch. 6; Debye integrals evaluated independently with mpmath at 30 digits;
CODATA constants via scipy.constants.
"""

from __future__ import annotations

import math

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from thermo.models import (debye_heat_capacity_fraction, debye_table, einstein_heat_capacity,
                           einstein_table)
from thermo.tables import COLUMNS

R = sc.R  # CODATA molar gas constant
mp.mp.dps = 30


def _debye_integral(n, y, kernel):
    return float(mp.quad(lambda x: x ** n * kernel(x), [0, y]))


def _mp_debye_values(theta, modes, t):
    """C_v, S, U, F [J/mol/K, J/mol/K, J/mol, J/mol] of a Debye solid by mpmath quadrature."""
    y = mp.mpf(theta) / t
    cv_int = _debye_integral(4, y, lambda x: mp.exp(x) / mp.expm1(x) ** 2)
    u_int = _debye_integral(3, y, lambda x: 1 / mp.expm1(x))
    f_int = _debye_integral(2, y, lambda x: mp.log(-mp.expm1(-x)))
    pref = 3 * modes / float(y) ** 3
    zpe = 3 * modes * R * theta / 8
    u = zpe + R * t * pref * u_int
    f = zpe + R * t * pref * f_int
    return R * pref * cv_int, (u - f) / t, u, f


def test_einstein_heat_capacity_at_theta_is_0_9207_of_3R():
    # Closed form: c(1) = e/(e-1)^2 = 0.920674 (Einstein 1907; Grimvall 1999 ch. 6).
    cv = einstein_heat_capacity([300.0], 300.0, 3)[0]
    assert cv == pytest.approx(3 * R * math.e / (math.e - 1) ** 2, rel=1e-13)
    assert cv / (3 * R) == pytest.approx(0.9207, abs=5e-5)


def test_einstein_low_temperature_limit_is_exponential():
    # Closed form asymptote C_v -> 3R x^2 e^{-x} (x = θ/T >> 1), relative correction (1-e^{-x})^{-2}.
    for x in (20.0, 50.0, 200.0):
        cv = einstein_heat_capacity([1.0], x, 3)[0]
        assert cv == pytest.approx(3 * R * x * x * math.exp(-x), rel=3 * math.exp(-x) + 1e-13)
    # and it falls faster than any power: C_v(T)/T^3 -> 0 (contrast with the Debye T^3 law).
    t = np.array([2.0, 4.0, 8.0])
    ratio = einstein_heat_capacity(t, 100.0, 3) / t ** 3
    assert ratio[0] < 1e-3 * ratio[2]


def test_debye_low_temperature_limit_is_t_cubed():
    # Closed form: C_v -> (12 π^4 / 5) R (T/θ)^3 per 3 modes (Debye 1912), exact to e^{-θ/T}.
    theta = 400.0
    df = debye_table(theta, 3, [0.5, 2.0, 4.0])
    expected = 12 * math.pi ** 4 / 5 * R * (df.temperature_K.to_numpy() / theta) ** 3
    np.testing.assert_allclose(df[COLUMNS["formula"][1]], expected, rtol=1e-12)


@pytest.mark.parametrize("t", [3.0, 30.0, 100.0, 250.0, 1000.0, 20000.0])
def test_debye_table_matches_mpmath_integrals(t):
    # Independent 30-digit quadrature of the Debye integrals (mpmath).
    theta, modes = 250.0, 6
    cv, s, u, f = _mp_debye_values(theta, modes, t)
    row = debye_table(theta, modes, [t]).iloc[0]
    assert row.heat_capacity_v_J_per_mol_K == pytest.approx(cv, rel=1e-11)
    assert row.entropy_J_per_mol_K == pytest.approx(s, rel=1e-10)
    assert row.internal_energy_kJ_per_mol * 1e3 == pytest.approx(u, rel=1e-11)
    assert row.helmholtz_energy_kJ_per_mol * 1e3 == pytest.approx(f, rel=1e-10, abs=1e-9 * abs(u))


def test_debye_zero_point_energy_is_nine_eighths_n_r_theta():
    # Closed form E_0 = (9/8) n R θ_D for 3n modes (Grimvall 1999, ch. 6); U(0) = F(0) = E_0.
    df = debye_table(300.0, 6, [0.0])
    assert df.attrs["zero_point_energy_J_per_mol"] == pytest.approx(9 / 8 * 2 * R * 300.0, rel=1e-14)
    assert df.internal_energy_kJ_per_mol[0] == df.helmholtz_energy_kJ_per_mol[0]
    assert df.heat_capacity_v_J_per_mol_K[0] == 0.0 and df.entropy_J_per_mol_K[0] == 0.0


@pytest.mark.parametrize("t", [10.0, 150.0, 300.0, 5000.0])
def test_einstein_table_matches_closed_forms(t):
    # Einstein closed forms (Einstein 1907) evaluated at 30 digits with mpmath.
    theta, modes = 300.0, 3
    x = mp.mpf(theta) / t
    n = 1 / mp.expm1(x)
    cv = modes * R * float(x * x * mp.exp(x) * n * n)
    s = modes * R * float(x * n - mp.log(-mp.expm1(-x)))
    zpe = modes * R * theta / 2
    u = zpe + modes * R * float(theta * n)
    f = zpe + modes * R * t * float(mp.log(-mp.expm1(-x)))
    row = einstein_table(theta, modes, [t]).iloc[0]
    assert row.heat_capacity_v_J_per_mol_K == pytest.approx(cv, rel=1e-12)
    assert row.entropy_J_per_mol_K == pytest.approx(s, rel=1e-12)
    assert row.internal_energy_kJ_per_mol * 1e3 == pytest.approx(u, rel=1e-12)
    assert row.helmholtz_energy_kJ_per_mol * 1e3 == pytest.approx(f, rel=1e-12)


def test_einstein_zero_point_energy_is_half_h_nu_per_mode():
    # E_0 = N_A · modes · hν_E/2 with ν_E = k_B θ/h: CODATA h, k_B, N_A (scipy.constants).
    df = einstein_table(200.0, 6, [0.0])
    nu = sc.k * 200.0 / sc.h
    assert df.attrs["zero_point_energy_J_per_mol"] == pytest.approx(sc.N_A * 6 * sc.h * nu / 2, rel=1e-13)


def test_high_temperature_limits():
    # Dulong–Petit 3R per 3 modes, and the classical Einstein entropy S -> 3R[1 + ln(T/θ)] + O(x^2)
    # (common-practice high-T expansion, Grimvall 1999 ch. 6).
    t = 1e5
    e = einstein_table(100.0, 3, [t]).iloc[0]
    d = debye_table(100.0, 3, [t]).iloc[0]
    assert e.heat_capacity_v_J_per_mol_K == pytest.approx(3 * R, rel=1e-6)
    assert d.heat_capacity_v_J_per_mol_K == pytest.approx(3 * R, rel=1e-6)
    assert e.entropy_J_per_mol_K == pytest.approx(3 * R * (1 + math.log(t / 100.0)), rel=1e-7)
    # Debye: S -> 3R[4/3 + ln(T/θ)] (same expansion with <ln ν> = ln ν_D - 1/3).
    assert d.entropy_J_per_mol_K == pytest.approx(3 * R * (4 / 3 + math.log(t / 100.0)), rel=1e-7)


def test_per_atom_basis_uses_the_core_conversion():
    # 3 k_B per atom at high T (Dulong–Petit), per="atom" columns as in thermo.tables.COLUMNS.
    df = einstein_table(100.0, 6, [1e6], per="atom", atoms=2)
    assert list(df.columns) == list(COLUMNS["atom"])
    assert df.heat_capacity_v_kB_per_atom[0] == pytest.approx(3.0, rel=1e-8)


def test_debye_fraction_against_mpmath():
    # D_c(y) = 3 y^-3 ∫ x^4 e^x/(e^x-1)^2 (Abramowitz & Stegun 27.1), mpmath reference.
    for y in (0.01, 1.0, 4.0, 30.0, 59.0, 61.0, 500.0):
        ref = 3 / y ** 3 * _debye_integral(4, mp.mpf(y), lambda x: mp.exp(x) / mp.expm1(x) ** 2)
        assert debye_heat_capacity_fraction(y)[0] == pytest.approx(ref, rel=1e-12)


def test_model_tables_have_the_core_columns_and_reject_bad_theta():
    from thermo.errors import OptionError
    assert list(einstein_table(100.0, 3, [1.0]).columns) == list(COLUMNS["formula"])
    assert list(debye_table(100.0, 3, [1.0]).columns) == list(COLUMNS["formula"])
    with pytest.raises(OptionError):
        debye_table(-5.0, 3, [1.0])
    with pytest.raises(OptionError):
        einstein_table(float("nan"), 3, [1.0])
