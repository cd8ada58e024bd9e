"""Free electrons g ∝ √(E − E_b) against the Sommerfeld expansion and mpmath Fermi–Dirac integrals."""

from __future__ import annotations

import math

import numpy as np
import pytest

from tests.electronic import references as ref
from thermo.electronic import fermi_dirac_state, make_electronic_dos, sommerfeld_gamma
from thermo.electronic.thermodynamics import J_PER_MOL_PER_EV


@pytest.fixture(scope="module")
def band():
    return make_electronic_dos(*ref.free_electron_grid())          # 2 meV grid, E_F 5 eV above the bottom


@pytest.mark.parametrize("t", [1.0, 10.0, 100.0, 300.0])
def test_sommerfeld_expansion_at_low_temperature(band, t):
    # Ashcroft & Mermin (1976) ch. 2, eqs. 2.77-2.81: μ, U − U(0), C to second order in k_BT/E_F.
    # The next order is ~3 (k_BT/E_F)² relative (see the test below), so 4 (k_BT/E_F)² bounds the difference.
    s = fermi_dirac_state(band, [t])
    mu, u, c = ref.sommerfeld(t)
    bound = 4 * (ref.KB * t / ref.E_F_ABOVE_BOTTOM) ** 2 + 1e-7
    assert s.chemical_potential_ev[0] == pytest.approx(mu, rel=bound)
    assert s.internal_energy_ev[0] == pytest.approx(u, rel=bound)
    assert s.heat_capacity_ev_per_k[0] == pytest.approx(c, rel=bound)


def test_next_sommerfeld_order_of_the_heat_capacity(band):
    # For g ∝ √E: C = γT [1 − (3π²/10)(k_BT/E_F)² + …] (the T³ term of the free-electron gas; coefficient from
    # memory, it follows from the next term of the Sommerfeld expansion).  At 150 K the residual of the
    # second-order form must carry this coefficient, which a first-order-only or a wrong μ(T) would not.
    t = 150.0
    c = fermi_dirac_state(band, [t]).heat_capacity_ev_per_k[0]
    coefficient = (c / ref.sommerfeld(t)[2] - 1) / (ref.KB * t / ref.E_F_ABOVE_BOTTOM) ** 2
    assert coefficient == pytest.approx(-3 * math.pi ** 2 / 10, rel=0.02)


def test_gamma_is_the_sommerfeld_coefficient(band):
    # γ = (π²/3) k_B² g(E_F) (A&M eq. 2.80) with CODATA constants; g(E_F) = A √E_F on a grid node.
    expected = math.pi ** 2 / 3 * ref.KB ** 2 * ref.A * math.sqrt(ref.E_F_ABOVE_BOTTOM) * J_PER_MOL_PER_EV
    assert sommerfeld_gamma(band) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("t", [1000.0, 5000.0])
def test_high_temperature_against_fermi_dirac_integrals(band, t):
    # mpmath: N = A (k_BT)^{3/2} F_{1/2}(η) fixed, U = A (k_BT)^{5/2} F_{3/2}(η), S = (5U/3 − μN)/T (since
    # Ω = −2U/3 for g ∝ √E), C = dU/dT; see references.py.  The table reaches 35 eV above E_F (81 k_BT at 5000 K).
    mu, u, s_ref, c = ref.free_electron_exact(t)
    s = fermi_dirac_state(band, [t])
    assert s.chemical_potential_ev[0] == pytest.approx(mu, rel=1e-6)
    assert s.internal_energy_ev[0] == pytest.approx(u, rel=1e-6)
    assert s.entropy_ev_per_k[0] == pytest.approx(s_ref, rel=1e-6)
    assert s.heat_capacity_ev_per_k[0] == pytest.approx(c, rel=1e-5)
    assert s.helmholtz_energy_ev[0] == pytest.approx(u - t * s_ref, rel=1e-6)


def test_grid_far_coarser_than_kt(band):
    # The same band on a 0.25 eV grid (300 times k_BT at 10 K): C/T must still be γ of that grid's
    # g(E_F), which here is exact (E_F on a node) -- a rule that samples f at the nodes would give 0 or nonsense.
    e = np.arange(-5.0, 35.01, 0.25)
    coarse = make_electronic_dos(e, ref.A * np.sqrt(np.clip(e - ref.E_B, 0, None)))
    s = fermi_dirac_state(coarse, [1.0, 10.0])
    mu, u, c = ref.sommerfeld(10.0)
    assert s.heat_capacity_ev_per_k[1] == pytest.approx(c, rel=1e-4)
    assert s.heat_capacity_ev_per_k[0] == pytest.approx(c / 10.0, rel=1e-4)
