"""Independent references for the electronic term (none of modeheat's code is used here).

* Free electrons, g(E) = A √(E − E_b): the Sommerfeld expansion to second order
  (N. W. Ashcroft, N. D. Mermin, *Solid State Physics*, 1976, ch. 2, eqs. 2.70–2.81)
  and, at any T, the Fermi–Dirac integrals F_{1/2}, F_{3/2} by mpmath quadrature
  with the reduced chemical potential from mpmath's root finder.
* A structured DOS (free-electron band plus a narrow Gaussian peak just above E_F):
  μ(T) by scipy's brentq on the electron count from scipy quad; S_el and C_el at that
  μ by mpmath quadrature of −k_B g [f ln f + (1−f) ln(1−f)] and of the fixed-N heat
  capacity (Ashcroft & Mermin, ch. 2, with the μ(T) term).

All parameters are invented for the tests.
"""

from __future__ import annotations

import math

import mpmath as mp
import numpy as np
from scipy import constants as sc
from scipy.integrate import quad
from scipy.optimize import brentq

KB = sc.k / sc.electron_volt                 # k_B [eV/K] (CODATA via scipy.constants)
J_PER_MOL_PER_EV = sc.N_A * sc.electron_volt

# ---- free electrons: g = A sqrt(E - E_b), E_F = 0 --------------------------------------------
A, E_B = 0.3, -5.0                           # states/eV^(3/2) per formula unit; band bottom [eV]
E_F_ABOVE_BOTTOM = -E_B


def free_electron_grid(step=0.002, top=35.0, bottom=E_B):
    e = np.arange(round((bottom) / step), round(top / step) + 1) * step
    return e, A * np.sqrt(np.clip(e - E_B, 0.0, None))


def sommerfeld(t):
    """μ − E_F [eV], U − U(0) [eV], C [eV/K] to second order in k_BT (A&M eqs. 2.77, 2.80, 2.81)."""
    kt = KB * t
    g = A * math.sqrt(E_F_ABOVE_BOTTOM)
    g1 = A / (2 * math.sqrt(E_F_ABOVE_BOTTOM))
    return -(math.pi ** 2 / 6) * kt ** 2 * g1 / g, (math.pi ** 2 / 6) * kt ** 2 * g, (math.pi ** 2 / 3) * g * kt * KB


def _fd(j, eta):
    """F_j(η) = ∫_0^∞ x^j/(e^{x−η}+1) dx (unnormalised), mpmath quadrature."""
    eta = mp.mpf(eta)
    top = max(eta, 0) + 80
    pts = [0, eta, top] if eta > 0 else [0, top]
    return mp.quad(lambda x: x ** j / (mp.exp(x - eta) + 1), pts)


@mp.workdps(22)   # precision for this reference only (mp.dps is process-wide)
def free_electron_exact(t, dt=0.5):
    """μ − E_F [eV], U − U(0) [eV], S [eV/K], C [eV/K] of the infinite √E band at fixed N (mpmath).

    C is the central difference of U over ±dt (relative error about (dt/T)², below 1e-6 here)."""
    ef = mp.mpf(E_F_ABOVE_BOTTOM)
    n0 = mp.mpf(2) / 3 * A * ef ** 1.5

    def energy(temp):
        kt = mp.mpf(KB) * temp
        eta = mp.findroot(lambda y: A * kt ** 1.5 * _fd(0.5, y) - n0, ef / kt)
        return eta * kt, A * kt ** 2.5 * _fd(1.5, eta)

    t = mp.mpf(t)
    mu, u = energy(t)
    u0 = mp.mpf(2) / 5 * A * ef ** 2.5
    s = (mp.mpf(5) / 3 * u - mu * n0) / t        # Ω = −(2/3) U for g ∝ √E, S = (U − μN − Ω)/T
    c = (energy(t + dt)[1] - energy(t - dt)[1]) / (2 * dt)
    return float(mu - ef), float(u - u0), float(s), float(c)


# ---- structured DOS --------------------------------------------------------------------------
PEAK_STATES, PEAK_AT, PEAK_WIDTH = 1.2, 0.03, 0.04     # states, eV above E_F, Gaussian σ [eV]
BAND_A, BAND_BOTTOM = 0.25, -8.0


def structured_dos(e):
    """Free-electron-like band plus a narrow Gaussian peak just above E_F [states/eV]."""
    e = np.asarray(e, dtype=float)
    band = BAND_A * np.sqrt(np.clip(e - BAND_BOTTOM, 0.0, None))
    peak = PEAK_STATES / (PEAK_WIDTH * math.sqrt(2 * math.pi)) * np.exp(-0.5 * ((e - PEAK_AT) / PEAK_WIDTH) ** 2)
    return band + peak


def structured_grid(step=0.002, offset=0.0, low=-9.0, high=6.0):
    e = np.arange(low + offset, high, step)
    return e, structured_dos(e)


def _g(x):
    return float(structured_dos(x))


def structured_mu(t):
    """μ − E_F [eV] at fixed N: brentq on the electron count change, each part by scipy quad."""
    kt = KB * t
    breaks = [PEAK_AT - 5 * PEAK_WIDTH, PEAK_AT, PEAK_AT + 5 * PEAK_WIDTH]

    def count(mu):
        above = quad(lambda e: _g(e) / (math.exp((e - mu) / kt) + 1), mu, mu + 60 * kt,
                     points=[b for b in breaks if mu < b < mu + 60 * kt], epsabs=1e-15, epsrel=1e-13, limit=400)[0]
        below = quad(lambda e: _g(e) / (math.exp((mu - e) / kt) + 1), mu - 60 * kt, mu,
                     points=[b for b in breaks if mu - 60 * kt < b < mu], epsabs=1e-15, epsrel=1e-13, limit=400)[0]
        lo, hi = sorted((0.0, mu))
        shift = quad(_g, lo, hi, epsabs=1e-15, epsrel=1e-13)[0] * (1 if mu > 0 else -1)
        return above - below + shift

    return brentq(count, -0.5, 0.5, xtol=1e-15, rtol=1e-14)


@mp.workdps(20)   # precision for this reference only (mp.dps is process-wide)
def structured_entropy_heat_capacity(t):
    """S_el and C_el [eV/K] at fixed N (mpmath quadrature at the brentq μ)."""
    mu = mp.mpf(structured_mu(t))
    kt = mp.mpf(KB) * t

    def g(e):
        band = BAND_A * mp.sqrt(max(e - BAND_BOTTOM, 0))
        return band + PEAK_STATES / (PEAK_WIDTH * mp.sqrt(2 * mp.pi)) * mp.exp(-((e - PEAK_AT) / PEAK_WIDTH) ** 2 / 2)

    def f(e):
        return 1 / (mp.exp((e - mu) / kt) + 1)

    def sigma(e):
        p = f(e)
        q = 1 - p
        return -(p * mp.log(p) + q * mp.log(q)) if 0 < p < 1 else mp.mpf(0)

    pts = sorted({float(mu - 40 * kt), float(mu), float(mu + 40 * kt)}
                 | {float(b) for b in (PEAK_AT - 4 * PEAK_WIDTH, PEAK_AT, PEAK_AT + 4 * PEAK_WIDTH)
                    if mu - 40 * kt < b < mu + 40 * kt})
    s = mp.quad(lambda e: g(e) * sigma(e), pts)
    h = lambda e: f(e) * (1 - f(e))
    b0 = mp.quad(lambda e: g(e) * h(e), pts)
    b1 = mp.quad(lambda e: g(e) * h(e) * (e - mu), pts)
    b2 = mp.quad(lambda e: g(e) * h(e) * (e - mu) ** 2, pts)
    c = (b2 - b1 ** 2 / b0) / (kt * t)
    return float(s * KB), float(c)
