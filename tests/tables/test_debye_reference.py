"""Debye solid: tables against independent references.

References used here (named beside each check):
- mpmath high-precision quadrature of the Debye integrals (independent of our
  Gauss–Legendre / trapezoid code).
- R. Pässler, "Basic moments of phonon density of states spectra and their
  applications to thermodynamic properties", Adv. Condens. Matter Phys. 2017,
  9321439, Table 7: C_D(θ/T = 1) = 0.9517321357 × 3R.
- CODATA 2018 via scipy.constants (R, h, k_B, N_A).
- Closed forms (textbook results, e.g. Ashcroft & Mermin, Solid State Physics,
  1976, ch. 23): T³ law C_v → (12π⁴/5) R (T/θ)³; zero-point energy 9Rθ/8;
  Dulong–Petit 3R.
"""

from __future__ import annotations

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from thermo import load_dos, tabulate, zero_point_energy

R = sc.R
THETA = 400.0


def _debye_reference(theta, t):
    """C_v, S [J/mol/K], U, F [kJ/mol] of a monatomic Debye solid, by mpmath."""
    mp.mp.dps = 30
    y = mp.mpf(theta) / t
    c = mp.quad(lambda x: x ** 4 * mp.exp(x) / mp.expm1(x) ** 2, [0, y])
    u = mp.quad(lambda x: x ** 3 / mp.expm1(x), [0, y])
    lf = mp.quad(lambda x: x ** 2 * mp.log(-mp.expm1(-x)), [0, y])
    k = 9 / y ** 3
    zpe = 9 * R * theta / 8
    cv = 3 * R * 3 / y ** 3 * c
    s = R * k * (u - lf)
    uu = zpe + R * t * k * u
    ff = zpe + R * t * k * lf
    return float(cv), float(s), float(uu) / 1e3, float(ff) / 1e3


@pytest.fixture(scope="module")
def debye(request):
    from tests.spectra import dos_text, debye_table
    return load_dos(dos_text(*debye_table(THETA, points=2001)))


def test_debye_table_matches_mpmath_from_theta_over_50_to_3_theta(debye):
    # Source: mpmath high-precision integration of the Debye integrals.
    temps = np.geomspace(THETA / 50, 3 * THETA, 25)
    table = tabulate(debye, temps)
    ref = np.array([_debye_reference(THETA, t) for t in temps])
    got = table.iloc[:, 1:].to_numpy()
    rel = np.abs(got - ref) / np.abs(ref)
    assert rel.max() < 1e-4, rel.max()


def test_published_debye_heat_capacity_at_theta(debye):
    # Source: Pässler 2017, Table 7: C_D(θ/T = 1)/3R = 0.9517321357.
    cv = tabulate(debye, [THETA]).heat_capacity_v_J_per_mol_K[0]
    assert cv / (3 * R) == pytest.approx(0.9517321357, rel=1e-5)


def test_t_cubed_law_at_low_temperature(debye):
    # Source: Debye T³ law, C_v = (12π⁴/5) R (T/θ)³ for T ≪ θ (textbook closed form).
    temps = np.array([THETA / 1000, THETA / 400, THETA / 200, THETA / 100])
    cv = tabulate(debye, temps).heat_capacity_v_J_per_mol_K.to_numpy()
    law = 12 * np.pi ** 4 / 5 * R * (temps / THETA) ** 3
    assert np.allclose(cv / law, 1.0, rtol=1e-6)


def test_zero_point_energy_is_nine_eighths_r_theta(debye):
    # Source: closed form E0 = 9Rθ/8 for a Debye spectrum (integral of hν/2).
    assert zero_point_energy(debye) == pytest.approx(9 * R * THETA / 8, rel=1e-6)


def test_dulong_petit_limit(debye):
    # Source: Dulong–Petit 3R (R from CODATA); Debye high-T series
    # C_v/3R = 1 - (θ/T)²/20 + ... (common-practice expansion).
    t = 50 * THETA
    cv = tabulate(debye, [t]).heat_capacity_v_J_per_mol_K[0]
    assert cv / (3 * R) == pytest.approx(1 - (THETA / t) ** 2 / 20, abs=1e-8)


def test_zero_kelvin_is_exact(debye):
    # Third law: C_v = S = 0 at T = 0; U = F = zero-point energy (definition).
    row = tabulate(debye, [0.0]).iloc[0]
    assert row.heat_capacity_v_J_per_mol_K == 0.0 and row.entropy_J_per_mol_K == 0.0
    assert row.internal_energy_kJ_per_mol == pytest.approx(9 * R * THETA / 8 / 1e3, rel=1e-6)
    assert row.helmholtz_energy_kJ_per_mol == row.internal_energy_kJ_per_mol


def test_thermodynamic_identities_hold(debye):
    # Identities F = U - TS and C_v = dU/dT (definitions; finite difference).
    temps = np.linspace(20.0, 800.0, 40)
    df = tabulate(debye, temps)
    f = df.internal_energy_kJ_per_mol - temps * df.entropy_J_per_mol_K / 1e3
    assert np.allclose(f, df.helmholtz_energy_kJ_per_mol, rtol=1e-10, atol=1e-12)
    h = 1e-3
    up = tabulate(debye, temps + h).internal_energy_kJ_per_mol.to_numpy()
    dn = tabulate(debye, temps - h).internal_energy_kJ_per_mol.to_numpy()
    assert np.allclose((up - dn) / (2 * h) * 1e3, df.heat_capacity_v_J_per_mol_K, rtol=1e-6)


def test_no_warnings_at_extreme_temperatures(debye):
    # Overflow-safe kernels: 0.1 K and 1e4 K give finite values and no RuntimeWarning
    # (pytest is configured to turn RuntimeWarning into errors).
    df = tabulate(debye, [0.1, 1e4])
    assert np.all(np.isfinite(df.to_numpy()))


def test_per_atom_and_per_gram_bases(debye):
    # Conversions with CODATA constants: k_B per atom = (J/mol/K)/R; meV per atom.
    per_mol = tabulate(debye, [300.0]).iloc[0]
    per_atom = tabulate(debye, [300.0], per="atom").iloc[0]
    assert per_atom.heat_capacity_v_kB_per_atom == pytest.approx(per_mol.heat_capacity_v_J_per_mol_K / R)
    mev = per_mol.internal_energy_kJ_per_mol * 1e3 / sc.N_A / sc.electron_volt * 1e3
    assert per_atom.internal_energy_meV_per_atom == pytest.approx(mev)
    per_gram = tabulate(debye, [300.0], per="gram", formula="Al").iloc[0]
    # Standard atomic weight of Al: 26.9815384 (IUPAC 2021).
    assert per_gram.heat_capacity_v_J_per_g_K == pytest.approx(per_mol.heat_capacity_v_J_per_mol_K / 26.9815384, rel=1e-6)


def test_gram_basis_rejects_formula_with_other_atom_count(debye):
    from thermo import OptionError
    with pytest.raises(OptionError, match="atoms"):
        tabulate(debye, [300.0], per="gram", formula="MgO")
