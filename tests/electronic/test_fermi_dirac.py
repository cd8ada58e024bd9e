"""Fermi–Dirac integrals and the exact segment sums against independent references."""

from __future__ import annotations

import math
import warnings

import mpmath as mp
import numpy as np
import pytest

from thermo.electronic import fermi_dirac_state, make_electronic_dos
from thermo.electronic.fermi import fermi_dirac_integral
from thermo.electronic.segments import thermal_sums

KB = 8.617333262e-5   # k_B [eV/K], CODATA 2018 (scipy.constants gives the same to 10 digits)


def _fd_quadrature(j, eta):
    # Definition F_j(η) = (1/Γ(j+1)) ∫_0^∞ t^j/(e^{t−η}+1) dt (DLMF 25.12.14), mpmath quadrature at 30 digits.
    mp.mp.dps = 30
    eta = mp.mpf(eta)
    pts = [0, eta, eta + 90] if eta > 0 else [0, 90]
    return mp.quad(lambda t: t ** j / (mp.exp(t - eta) + 1), pts) / mp.gamma(j + 1)


@pytest.mark.parametrize("order", [0, 1, 2])
def test_fermi_dirac_integrals_against_mpmath(order):
    etas = [-60.0, -35.0, -20.0, -3.0, -0.7, -0.69, -1e-6, 0.0, 1e-6, 0.5, 0.7, 2.0, 12.0, 45.0]
    got = fermi_dirac_integral(order, etas)
    for eta, value in zip(etas, got):
        ref = float(_fd_quadrature(order, eta))
        assert value == pytest.approx(ref, rel=2e-14, abs=0), eta


def test_flat_band_entropy_and_heat_capacity():
    # A&M ch. 2: for a constant DOS g, S = C = (π²/3) g k_B² T exactly (no higher Sommerfeld terms), μ = E_F.
    d = make_electronic_dos([-20.0, 20.0], [3.0, 3.0])
    t = np.array([1e-3, 1.0, 300.0, 3000.0])
    s = fermi_dirac_state(d, t)
    expected = math.pi ** 2 / 3 * 3.0 * KB ** 2 * t
    np.testing.assert_allclose(s.entropy_ev_per_k, expected, rtol=1e-9)
    np.testing.assert_allclose(s.heat_capacity_ev_per_k, expected, rtol=1e-9)
    np.testing.assert_allclose(s.chemical_potential_ev, 0.0, atol=1e-13)
    # U = (π²/6) g (k_BT)², F = U − TS = −U
    np.testing.assert_allclose(s.internal_energy_ev, math.pi ** 2 / 6 * 3.0 * (KB * t) ** 2, rtol=1e-9)
    np.testing.assert_allclose(s.helmholtz_energy_ev, -s.internal_energy_ev, rtol=1e-9)


def test_resampling_a_linear_dos_changes_nothing():
    # The same piecewise-linear function on 4 and on 4,001 points: the sums are exact, so they agree
    # at solver tolerance whether k_BT is far below or far above the spacing (no quadrature rule involved).
    coarse_e = np.array([-6.0, -1.0, 0.5, 4.0])
    coarse_g = np.array([0.0, 2.0, 1.0, 3.0])
    fine_e = np.linspace(-6.0, 4.0, 4001)
    fine_g = np.interp(fine_e, coarse_e, coarse_g)
    t = [0.5, 5.0, 50.0, 500.0, 5000.0]
    a = fermi_dirac_state(make_electronic_dos(coarse_e, coarse_g), t)
    b = fermi_dirac_state(make_electronic_dos(fine_e, fine_g), t)
    for name in ("chemical_potential_ev", "heat_capacity_ev_per_k", "entropy_ev_per_k", "internal_energy_ev"):
        np.testing.assert_allclose(getattr(a, name), getattr(b, name), rtol=1e-9, atol=1e-15, err_msg=name)


def test_gap_midpoint_and_no_floating_point_warnings():
    # Mirror-symmetric valence and conduction bands: μ stays at mid-gap by symmetry (common practice),
    # C_el is exponentially small at low T; nothing overflows from 1e-6 K to 2e4 K.
    e = np.array([-6.0, -3.0, -0.4, -0.2, 0.6, 0.8, 3.4, 6.4])
    g = np.array([0.0, 2.0, 1.0, 0.0, 0.0, 1.0, 2.0, 0.0])
    d = make_electronic_dos(e, g)
    assert d.gap_ev == (-0.2, 0.6)
    t = [1e-6, 1.0, 50.0, 300.0, 3000.0, 2e4]
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        with np.errstate(all="raise", under="ignore"):
            s = fermi_dirac_state(d, t)
    np.testing.assert_allclose(s.chemical_potential_ev[:5], 0.2, atol=1e-9)
    assert s.heat_capacity_ev_per_k[1] == 0.0 or s.heat_capacity_ev_per_k[1] < 1e-100
    assert np.all(np.isfinite(s.heat_capacity_ev_per_k)) and np.all(s.heat_capacity_ev_per_k >= 0)
    assert "gap" in d.warnings[0]


def test_segment_sums_of_a_single_segment_against_quadrature():
    # One sloped segment far narrower than k_BT and one far wider: ∫ g σ dE by mpmath quadrature at a given μ.
    mp.mp.dps = 25
    e, g = np.array([-0.3, 0.2]), np.array([1.0, 4.0])
    for kt, mu in ((0.5, 0.05), (0.01, -0.02)):
        s = thermal_sums(e, g, np.array([mu]), np.array([kt]))
        gl = lambda x: 1.0 + 6.0 * (x + 0.3)
        f = lambda x: 1 / (mp.exp((x - mu) / kt) + 1)
        sigma = lambda x: -(f(x) * mp.log(f(x)) + (1 - f(x)) * mp.log(1 - f(x)))
        ref = mp.quad(lambda x: gl(x) * sigma(x), [-0.3, mu, 0.2])
        assert float(s["entropy"][0]) == pytest.approx(float(ref), rel=1e-12)
