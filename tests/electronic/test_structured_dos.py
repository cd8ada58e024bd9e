"""A DOS with a narrow peak near E_F against direct quadrature (scipy μ, mpmath S and C); error estimates."""

from __future__ import annotations

import math

import pytest

from tests.electronic import references as ref
from thermo.electronic import fermi_dirac_state, make_electronic_dos, numerical_errors, sommerfeld_gamma
from thermo.electronic.thermodynamics import J_PER_MOL_PER_EV

TEMPERATURES = [10.0, 100.0, 300.0, 1000.0, 2000.0]


@pytest.fixture(scope="module")
def references():
    return {t: ref.structured_entropy_heat_capacity(t) for t in TEMPERATURES}


@pytest.fixture(scope="module")
def mus():
    return {t: ref.structured_mu(t) for t in (10.0, 1000.0)}


def test_two_mev_grid_meets_the_stated_tolerances(references, mus):
    # Issue 28: C_el, S_el within 0.3 % at 100-2,000 K and 1 % at 10 K on a 2 meV grid; grid offset so that
    # E_F is not a node.
    d = make_electronic_dos(*ref.structured_grid(0.002, offset=0.0007))
    s = fermi_dirac_state(d, TEMPERATURES)
    for k, t in enumerate(TEMPERATURES):
        s_ref, c_ref = references[t]
        tol = 0.01 if t < 50 else 0.003
        assert s.entropy_ev_per_k[k] == pytest.approx(s_ref, rel=tol), t
        assert s.heat_capacity_ev_per_k[k] == pytest.approx(c_ref, rel=tol), t
    for t, mu in mus.items():
        assert s.chemical_potential_ev[TEMPERATURES.index(t)] == pytest.approx(mu, abs=2e-5)


def test_gamma_on_a_two_mev_grid():
    # γ = (π²/3) k_B² g(E_F) of the analytic DOS (A&M eq. 2.80), within 0.5 % (issue 28).
    d = make_electronic_dos(*ref.structured_grid(0.002, offset=0.0007))
    exact = math.pi ** 2 / 3 * ref.KB ** 2 * float(ref.structured_dos(0.0)) * J_PER_MOL_PER_EV
    assert sommerfeld_gamma(d) == pytest.approx(exact, rel=0.005)


def test_error_estimate_covers_the_true_error(references):
    # Coverage on cases whose truth is known: grids of 2, 20 and 50 meV at three offsets each, five
    # temperatures, C_el and S_el (90 cases).  The half-grid estimate must cover every one (share inside 1u = 1),
    # and not be absurdly large on the fine grid.
    inside = total = 0
    for step in (0.002, 0.02, 0.05):
        for offset in (0.0, 0.37 * step, 0.71 * step):
            d = make_electronic_dos(*ref.structured_grid(step, offset=offset))
            s = fermi_dirac_state(d, TEMPERATURES)
            err = numerical_errors(d, TEMPERATURES, s)
            for k, t in enumerate(TEMPERATURES):
                s_ref, c_ref = references[t]
                for value, truth, u in ((s.entropy_ev_per_k[k], s_ref, err["entropy"][k]),
                                        (s.heat_capacity_ev_per_k[k], c_ref, err["heat_capacity"][k])):
                    total += 1
                    inside += abs(value - truth) <= u
                    if step == 0.002:
                        assert u < 0.01 * truth
    assert inside / total == 1.0, f"{inside} of {total} inside 1u"


def test_gamma_uncertainty_covers_the_grid_error():
    exact = float(ref.structured_dos(0.0))
    for step in (0.002, 0.02, 0.05):
        for offset in (0.0, 0.37 * step, 0.71 * step):
            d = make_electronic_dos(*ref.structured_grid(step, offset=offset))
            err = numerical_errors(d, [0.0])["dos_at_fermi_level"]
            assert abs(d.dos_at_fermi_level - exact) <= err, (step, offset)
