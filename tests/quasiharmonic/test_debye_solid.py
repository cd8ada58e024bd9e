"""modeheat's quasi-harmonic step against a directly minimised Debye solid (see debye_solid.py)."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import constants as sc

from tests.quasiharmonic import debye_solid as ds
from thermo.quasiharmonic import quasiharmonic_table

TEMPERATURES = [100.0, 200.0, 300.0, 400.0, 500.0, 600.0]
R_PER_KB_EV = sc.N_A * sc.electron_volt     # J/mol/K per eV/K


@pytest.fixture(scope="module")
def entries():
    return ds.volume_entries()


@pytest.fixture(scope="module")
def references():
    return [ds.reference(t) for t in TEMPERATURES]


@pytest.mark.parametrize("eos", ["birch-murnaghan", "vinet"])
def test_matches_direct_minimisation(entries, references, eos):
    # Issue 16 tolerances: V to 2e-4, α to 1 %, B_T to 0.5 %, C_p to 1 % at 100-600 K.
    df = quasiharmonic_table(entries, TEMPERATURES, eos=eos)
    for row, ref in zip(df.itertuples(), references):
        assert abs(row.volume_A3 / ref["V"] - 1) < 2e-4, (row.temperature_K, row.volume_A3, ref["V"])
        assert abs(row.thermal_expansion_per_K / ref["alpha"] - 1) < 0.01, row.temperature_K
        assert abs(row.bulk_modulus_T_GPa / ref["B"] - 1) < 0.005, row.temperature_K
        assert abs(row.heat_capacity_p_J_per_mol_K / (ref["cp"] * R_PER_KB_EV) - 1) < 0.01, row.temperature_K
        assert not row.outside_volume_range


def test_gruneisen_relation(entries):
    # Grüneisen relation α = γ C_v / (B_T V) (Grüneisen, Ann. Phys. 344, 257 (1912)); γ = 1.6 by construction.
    df = quasiharmonic_table(entries, TEMPERATURES)
    b_ev = df.bulk_modulus_T_GPa / ds.GPA
    cv_ev = df.heat_capacity_v_J_per_mol_K / R_PER_KB_EV
    predicted = ds.GAMMA * cv_ev / (b_ev * df.volume_A3)
    np.testing.assert_allclose(df.thermal_expansion_per_K, predicted, rtol=0.01)
    np.testing.assert_allclose(df.gruneisen_parameter, ds.GAMMA, rtol=0.01)


def test_heat_capacity_p_is_minus_t_d2g_dt2(entries):
    # Thermodynamic identity C_p = -T ∂²G/∂T² (common practice); central differences of modeheat's own G.
    t = np.arange(280.0, 321.0, 5.0)
    df = quasiharmonic_table(entries, t)
    g = df.gibbs_energy_kJ_per_mol.to_numpy() * 1e3
    d2 = (g[2:] - 2 * g[1:-1] + g[:-2]) / 25.0
    np.testing.assert_allclose(-t[1:-1] * d2, df.heat_capacity_p_J_per_mol_K[1:-1], rtol=2e-3)
    # and S = -∂G/∂T, H = G + TS
    s = -(g[2:] - g[:-2]) / 10.0
    np.testing.assert_allclose(s, df.entropy_J_per_mol_K[1:-1], rtol=1e-4)


def test_cv_at_volume_matches_debye(entries, references):
    # C_v at V(T) against the Debye C_v at the reference volume (mpmath, -T ∂²F/∂T² at fixed V).
    df = quasiharmonic_table(entries, TEMPERATURES)
    for cv, ref in zip(df.heat_capacity_v_J_per_mol_K, references):
        assert abs(cv / (ref["cv"] * R_PER_KB_EV) - 1) < 2e-3


@pytest.mark.parametrize("x", [0.05, 0.7, 3.0, 25.0, 80.0])
def test_debye_function_closed_form_matches_quadrature(x):
    # The reference solid uses D₃ in closed form (polylogarithms, Abramowitz & Stegun 27.1);
    # it must equal the defining integral, evaluated by mpmath quadrature, to 1e-20.
    import mpmath as mp
    with mp.workdps(30):   # set here: mpmath's precision is process-wide
        exact = ds.debye_d3(mp.mpf(x))
        assert abs(ds.debye_d3_closed(mp.mpf(x)) / exact - 1) < 1e-20
