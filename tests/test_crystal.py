"""Checks of the spring-model test crystals (tests/crystal.py) against results outside the module.

Sources: the Debye T³ law with the direction-averaged 1/c³ (N. W. Ashcroft and
N. D. Mermin, *Solid State Physics*, 1976, ch. 23); the high-temperature
moment expansion C_v/R = 3 − (ħ/k_BT)²⟨Σω²⟩/12 + … with the exact second
moment ⟨Σ_j ω_j²⟩ = ⟨Tr D⟩ = Σ_r k_r/M (E. W. Montroll, J. Chem. Phys. 10, 218
(1942); the zone average of cos q·r vanishes for a lattice vector r ≠ 0);
long-wave sound speeds of central springs worked by hand from D(q) (A&M
ch. 22); exponential convergence of mesh sums of analytic periodic functions
(L. N. Trefethen and J. A. C. Weideman, SIAM Rev. 56, 385 (2014)); constants:
CODATA via scipy.constants.
"""

import numpy as np
import pytest
from scipy import constants as sc

from tests import crystal as C

CRYSTALS = (C.BCC, C.FCC)


@pytest.mark.parametrize("crystal", CRYSTALS, ids=lambda c: c.name)
def test_low_temperature_limit_is_the_debye_law_of_the_sound_speeds(crystal):
    theta = crystal.debye_temperature()
    t = np.array([0.5, 1.0])
    ref = C.reference(crystal, t)
    ratio = ref["heat_capacity_v"] / (12 * np.pi ** 4 / 5 * sc.R * (t / theta) ** 3)
    assert abs(ratio[0] - 1) < 3e-4
    # the first correction goes as T² (dispersion), so it quarters when T halves
    assert (ratio[1] - 1) / (ratio[0] - 1) == pytest.approx(4.0, rel=0.05)
    # T³ regime: S = ∫ C/T dT = C/3
    assert ref["entropy"][0] / ref["heat_capacity_v"][0] == pytest.approx(1 / 3, rel=2e-4)


@pytest.mark.parametrize("crystal", CRYSTALS, ids=lambda c: c.name)
def test_high_temperature_second_moment(crystal):
    r, k = crystal.neighbours()
    second = float(np.sum(k)) / (crystal.mass_amu * sc.atomic_mass)       # ⟨Σ_j ω_j²⟩ [rad²/s²]
    t = np.array([2000.0, 3000.0])
    ref = C.reference(crystal, t)
    y = (sc.hbar / (sc.k * t)) ** 2 * second
    assert ref["heat_capacity_v"] / sc.R == pytest.approx(3 - y / 12, abs=2e-5)
    # U/(RT) = Σ⟨(x/2) coth(x/2)⟩ = 3 + y/12 − …  (zero-point energy included)
    assert ref["internal_energy"] * 1e3 / (sc.R * t) == pytest.approx(3 + y / 12, abs=2e-5)


def test_bcc_long_wave_sound_speeds_along_a_cube_edge():
    c = C.BCC
    k1, k2 = c.springs_N_per_m
    m = c.mass_amu * sc.atomic_mass
    a = c.a_A * 1e-10
    v = c.sound_velocities(np.array([1.0, 0.0, 0.0]))
    # by hand: c_T² = k1 a²/(3M) (twice), c_L² = (k1/3 + k2) a²/M
    assert v == pytest.approx(np.sqrt([k1 / 3, k1 / 3, k1 / 3 + k2]) * a / np.sqrt(m), rel=1e-10)


@pytest.mark.parametrize("crystal", CRYSTALS, ids=lambda c: c.name)
def test_reference_agrees_with_a_plain_fine_mesh_where_the_sum_converges_fast(crystal):
    t = np.array([100.0, 298.15])
    ref = C.reference(crystal, t)
    plain = C.mesh_table(crystal, 32, t)
    assert plain["heat_capacity_v"] == pytest.approx(ref["heat_capacity_v"], rel=2e-5)
    assert plain["internal_energy"] == pytest.approx(ref["internal_energy"], rel=2e-5)


def test_files_carry_three_modes_per_atom():
    nu, g = C.histogram_dos(C.BCC, 8, 0.05)
    assert np.sum(g) * 0.05 == pytest.approx(3.0, rel=1e-12)
    text = C.mode_list_text(C.BCC, 4)
    rows = np.loadtxt(text.splitlines()[3:])
    assert rows.shape == (3 * 64, 5) and np.sum(rows[:, 0]) == pytest.approx(3.0)
    assert f"# cell volume: {C.BCC.cell_volume_A3:.12g} A^3" in text
    # the smallest Monkhorst–Pack q is folded to the shortest image
    assert np.min(np.linalg.norm(rows[:, 2:], axis=1)) < 0.5 * C.BCC.inscribed_radius
