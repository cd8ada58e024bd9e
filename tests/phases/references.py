"""Independent references for the phase comparison (none of modeheat's code is used here).

* Debye free energy per atom in closed form (P. Debye, Ann. Phys. 344, 789 (1912)):
  F = 9kθ/8 + kT[3 ln(1 − e^{−θ/T}) − D₃(θ/T)], D₃ by the polylogarithm closed form
  (Abramowitz & Stegun 27.1), evaluated with mpmath (tests/quasiharmonic/debye_solid.py).
* Einstein free energy per atom in closed form (A. Einstein, Ann. Phys. 327, 180 (1907)):
  F = 3kθ_E/2 + 3kT ln(1 − e^{−θ_E/T}).
* Transition temperatures: mpmath's root finder on the closed-form ΔF(T).
* Quasi-harmonic references: G(T, p) = min_V [E_BM(V) + F_Debye(θ(V), T) + pV] with
  θ(V) = θ₀ (V₀/V)^γ, minimised directly by scipy's bounded scalar minimiser (status checked),
  T* by scipy's brentq (status checked), ΔV and ΔS at T* for the Clausius–Clapeyron slope.

All parameters are invented for the tests.
"""

from __future__ import annotations

from dataclasses import dataclass

import mpmath as mp
import numpy as np
from scipy import constants as sc
from scipy.optimize import brentq, minimize_scalar

from tests.quasiharmonic.debye_solid import debye_d3_closed

KB_EV = sc.k / sc.electron_volt                      # k_B [eV/K] (CODATA via scipy.constants)
GPA = sc.electron_volt / sc.angstrom ** 3 / sc.giga  # GPa per eV/Å³ (CODATA)


def debye_free_energy(theta, t):
    """Debye F per atom [eV] (mpmath value)."""
    theta, t = mp.mpf(theta), mp.mpf(t)
    zero_point = mp.mpf(9) / 8 * KB_EV * theta
    if t == 0:
        return zero_point
    x = theta / t
    return zero_point + KB_EV * t * (3 * mp.log(-mp.expm1(-x)) - debye_d3_closed(x))


def einstein_free_energy(theta, t):
    """Einstein F per atom [eV] (mpmath value), three modes at θ_E."""
    theta, t = mp.mpf(theta), mp.mpf(t)
    return 3 * KB_EV * (theta / 2 + (t * mp.log(-mp.expm1(-theta / t)) if t > 0 else 0))


@mp.workdps(30)
def crossing(delta, guess):
    """Root of delta(T) [eV] near ``guess`` (mpmath findroot, secant; checked by |delta(T*)|)."""
    root = mp.findroot(delta, mp.mpf(guess))
    assert abs(delta(root)) < mp.mpf(10) ** -20
    return float(root)


@dataclass(frozen=True)
class QHSolid:
    """Birch–Murnaghan E(V) + Debye solid with θ = θ₀ (V₀/V)^γ; one atom per formula unit."""

    v0: float
    b0_gpa: float
    b0_prime: float
    theta0: float
    gamma: float
    e0: float = 0.0

    def theta(self, v):
        return self.theta0 * (self.v0 / v) ** self.gamma

    def static_energy(self, v):
        """Third-order Birch–Murnaghan energy [eV] (Birch, Phys. Rev. 71, 809 (1947))."""
        b0 = self.b0_gpa / GPA
        u = (self.v0 / v) ** (2.0 / 3.0)
        return self.e0 + 9 * self.v0 * b0 / 16 * ((u - 1) ** 3 * self.b0_prime + (u - 1) ** 2 * (6 - 4 * u))

    def helmholtz(self, v, t):
        with mp.workdps(20):
            return self.static_energy(v) + float(debye_free_energy(self.theta(v), t))

    def minimum(self, t, p_gpa):
        """(G [eV], V [Å³]) minimising F + pV (scipy bounded minimiser, status checked)."""
        p = p_gpa / GPA
        res = minimize_scalar(lambda v: self.helmholtz(v, t) + p * v, bounds=(0.8 * self.v0, 1.2 * self.v0),
                              method="bounded", options={"xatol": 1e-9, "maxiter": 500})
        assert res.success, res.message
        assert 0.81 * self.v0 < res.x < 1.19 * self.v0
        return float(res.fun), float(res.x)

    def entropy(self, t, p_gpa, dt=0.01):
        """S = −∂G/∂T [eV/K] by a central difference (G is smooth; error ~ dt² G''')."""
        return -(self.minimum(t + dt, p_gpa)[0] - self.minimum(t - dt, p_gpa)[0]) / (2 * dt)


def qh_transition(a, b, p_gpa, low, high):
    """T* [K] where G_a = G_b (brentq, status checked), ΔV and ΔS there (b − a)."""
    root, info = brentq(lambda t: b.minimum(t, p_gpa)[0] - a.minimum(t, p_gpa)[0], low, high, xtol=1e-6,
                        full_output=True)
    assert info.converged
    dv = b.minimum(root, p_gpa)[1] - a.minimum(root, p_gpa)[1]
    ds = b.entropy(root, p_gpa) - a.entropy(root, p_gpa)
    return root, dv, ds


def volumes(solid, count=11, low=0.9, high=1.08):
    return np.linspace(low * solid.v0, high * solid.v0, count)
