"""Harmonic phase comparison against closed-form Debye and Einstein free energies (mpmath)."""

from __future__ import annotations

from functools import lru_cache

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from tests.phases.references import crossing, debye_free_energy, einstein_free_energy
from tests.spectra import debye_table, dos_text, gaussian
from thermo.phases import Phase, compare_phases, energy_in_ev
from thermo.preparation.loading import load_dos

KJ_PER_MOL_EV = sc.kilo / (sc.N_A * sc.electron_volt)     # eV per kJ/mol (CODATA via scipy.constants)
T_GRID = np.arange(0.0, 1000.0 + 1e-9, 5.0)


def debye_phase(name, theta, atoms, static_ev, points=2001):
    return Phase(name, load_dos(dos_text(*debye_table(theta, atoms, points)), name=f"{name}.dat"),
                 static_ev=static_ev, atoms=atoms)


def test_debye_pair_transition_temperature_against_mpmath():
    # Closed-form Debye F (Debye 1912) with mpmath; θ 400 K (1 atom/fu) vs 300 K (2 atoms/fu), beta 6 kJ/mol higher
    alpha = debye_phase("alpha", 400.0, 1, 0.0)
    beta = debye_phase("beta", 300.0, 2, 6.0 * KJ_PER_MOL_EV)
    result = compare_phases([alpha, beta], T_GRID)
    [tr] = result.transitions
    with mp.workdps(30):
        truth = crossing(lambda t: (debye_free_energy(300, t) + mp.mpf(3.0 * KJ_PER_MOL_EV))
                         - debye_free_energy(400, t), 300.0)
    assert (tr["low_phase"], tr["high_phase"]) == ("alpha", "beta")
    assert abs(tr["temperature_K"] - truth) < 0.5
    assert abs(tr["temperature_K"] - truth) <= tr["uncertainty_K"]
    assert tr["converged"] and not result.no_crossing
    # ΔS at T* against the closed form: S_Debye per atom = 3 k [4 D3(x)/3 - ln(1-e^-x)]... via dF/dT (mpmath.diff)
    with mp.workdps(30):
        ds = -mp.diff(lambda t: debye_free_energy(300, t) - debye_free_energy(400, t), truth)
    assert tr["entropy_difference_kB_per_atom"] == pytest.approx(float(ds) / (sc.k / sc.electron_volt), rel=1e-4)


def test_rows_carry_uncertainty_and_the_stable_phase():
    alpha = debye_phase("alpha", 400.0, 1, 0.0)
    beta = debye_phase("beta", 300.0, 2, 6.0 * KJ_PER_MOL_EV)
    table = compare_phases([alpha, beta], T_GRID).table
    dg = table["helmholtz_energy_difference_meV_per_atom"].to_numpy()
    u = table["helmholtz_energy_difference_error_meV_per_atom"].to_numpy()
    assert np.all(u > 0)
    np.testing.assert_array_equal(table["stable_phase_decided"].to_numpy(), np.abs(dg) > u)
    assert set(table["stable_phase"][dg > u]) == {"alpha"} and set(table["stable_phase"][dg < -u]) == {"beta"}
    # closed form at every 50th row (mpmath): per atom, beta - alpha
    with mp.workdps(25):
        for t, d, e in zip(T_GRID[::50], dg[::50], u[::50]):
            truth = 1e3 * float(debye_free_energy(300, t) + 3.0 * KJ_PER_MOL_EV - debye_free_energy(400, t))
            assert abs(d - truth) <= e


K_PER_THZ = sc.h * 1e12 / sc.k                             # CODATA via scipy.constants
SIGMA_THZ = 0.01                                            # width of the invented Gaussian peaks


def smeared_einstein(theta, t):
    """Einstein F (closed form, Einstein 1907) averaged over the continuous Gaussian peak (mpmath quadrature)."""
    nu0 = theta / K_PER_THZ
    lo, hi = nu0 - 12 * SIGMA_THZ, nu0 + 12 * SIGMA_THZ

    def weight(nu):
        return mp.exp(-(nu - nu0) ** 2 / (2 * SIGMA_THZ ** 2))
    return (mp.quad(lambda nu: weight(nu) * einstein_free_energy(nu * K_PER_THZ, t), [lo, nu0, hi])
            / mp.quad(weight, [lo, nu0, hi]))


@lru_cache(maxsize=None)
def einstein_truth(static, guess):
    with mp.workdps(20):
        return crossing(lambda t: smeared_einstein(200.0, t) + static - smeared_einstein(350.0, t), guess)


@pytest.mark.parametrize("step_thz", [0.004, 0.01, 0.02])
def test_einstein_pair_uncertainty_covers_the_error(step_thz):
    # Einstein solids (closed form, Einstein 1907) as Gaussian peaks sampled ever more coarsely (the truth is the
    # closed form averaged over the continuous peak, mpmath); the tool's u must cover |T* - truth|
    rows = []
    for static, guess in ((0.022, 95.0), (0.03, 172.0), (0.07, 470.0)):
        phases = []
        for name, theta, offset in (("a", 350.0, 0.0), ("b", 200.0, static)):
            nu0 = theta / K_PER_THZ
            nu = np.arange(nu0 - 12 * SIGMA_THZ, nu0 + 12 * SIGMA_THZ + 1e-12, step_thz)
            dos = load_dos(dos_text(nu, gaussian(nu, nu0, SIGMA_THZ, 3.0)), name=f"{name}.dat", low_frequency="off")
            phases.append(Phase(name, dos, static_ev=offset))
        [tr] = compare_phases(phases, np.arange(0.0, 1000.1, 10.0)).transitions
        truth = einstein_truth(static, guess)
        rows.append((truth, abs(tr["temperature_K"] - truth), tr["uncertainty_K"]))
    print("Einstein T*, |err|, u:", [tuple(float(f"{v:.4g}") for v in r) for r in rows])
    for truth, err, u in rows:
        assert err <= u, (truth, err, u)
    assert max(err for _, err, _ in rows) < 0.01


@pytest.mark.parametrize("low_frequency", ["off", "auto"])
def test_same_phase_with_one_and_two_formula_units_per_cell_gives_zero(low_frequency):
    # Per-atom bookkeeping (common practice): a cell of two formula units has twice the modes and energy.
    # Without the nu^2 fit the sums are identical; the fitted nu^2 form differs at 1e-11 eV/atom (its least squares)
    nu, g = debye_table(350.0, 1, 1501)
    one = Phase("one", load_dos(dos_text(nu, g), name="one.dat", low_frequency=low_frequency), static_ev=-3.2, atoms=1)
    two = Phase("two", load_dos(dos_text(nu, 2 * g), name="two.dat", low_frequency=low_frequency), static_ev=-6.4,
                atoms=2)
    table = compare_phases([one, two], T_GRID).table
    assert np.max(np.abs(table["helmholtz_energy_difference_meV_per_atom"].to_numpy())) * 1e-3 < 1e-9   # eV/atom
    per_fu = compare_phases([one, two], T_GRID, per_formula="SiO2").table      # 3 atoms in the common unit
    assert np.max(np.abs(per_fu["helmholtz_energy_difference_kJ_per_mol"].to_numpy())) * KJ_PER_MOL_EV < 3e-9


def test_common_formula_unit_scales_the_per_atom_values():
    alpha = debye_phase("alpha", 400.0, 1, 0.0)
    beta = debye_phase("beta", 300.0, 2, 6.0 * KJ_PER_MOL_EV)
    per_atom = compare_phases([alpha, beta], T_GRID).table
    per_fu = compare_phases([alpha, beta], T_GRID, per_formula="MgF2").table
    mev = per_atom["helmholtz_energy_difference_meV_per_atom"].to_numpy()
    kj = per_fu["helmholtz_energy_difference_kJ_per_mol"].to_numpy()
    np.testing.assert_allclose(kj, 3 * mev * 1e-3 / KJ_PER_MOL_EV, rtol=1e-12)   # CODATA N_A e


def test_no_crossing_reports_the_closest_approach():
    alpha = debye_phase("alpha", 400.0, 1, 0.0)
    beta = debye_phase("beta", 300.0, 2, 0.5)          # 0.25 eV/atom higher: never stable below 1000 K
    result = compare_phases([alpha, beta], T_GRID)
    assert result.transitions == []
    [none] = result.no_crossing
    assert none["stable_phase"] == "alpha"
    assert none["closest_approach"]["temperature_K"] == 1000.0


def test_energy_units_codata():
    # CODATA via scipy.constants: 1 Ry = 13.605693... eV, 1 Ha = 2 Ry
    assert energy_in_ev(1.0, "Ha") == pytest.approx(2 * energy_in_ev(1.0, "Ry"), rel=1e-12)
    assert energy_in_ev(1.0, "Ry") == pytest.approx(13.605693122994, rel=1e-11)
