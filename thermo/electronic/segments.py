r"""Exact Fermi–Dirac sums of a piecewise-linear electronic DOS, vectorised over segments × temperatures.

The DOS g(E) is linear between its tabulated energies and zero outside them.
On each segment, and on each side of the chemical potential μ, the integrals
of g against the occupation f, the thermal weight h = f(1 − f) and the entropy
kernel σ are closed forms in the tails of :mod:`thermo.electronic.fermi`, so
a grid much coarser than k_BT (or much finer) costs nothing in accuracy.

Every sum is taken relative to the ground-state occupation, never as a
difference of two large numbers: with x = (E − μ)/k_BT, the part above μ
integrates f(x) and the part below μ integrates −f(−x) = f(x) − 1 (mirrored
to x ≥ 0); the states between the Fermi level (E = 0) and μ are counted by a
plain polynomial integral (:func:`between_fermi_level_and`).

References
----------
.. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Holt, Rinehart and
   Winston, 1976), ch. 2 (Sommerfeld expansion) and ch. 8.
.. [2] NIST Digital Library of Mathematical Functions, release 1.2.1 (2024),
   §25.12 (polylogarithms).

Examples
--------
>>> e = np.array([-5.0, 5.0]); g = np.array([1.0, 1.0])    # a flat band, 1 state/eV
>>> s = thermal_sums(e, g, np.array([0.0]), np.array([0.025]))
>>> round(float(s["entropy"][0]), 10)                      # (π²/3) g k_BT
0.0822467033
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc

from .fermi import AT_ZERO, occupation_tails

#: Segments further than this many k_BT from μ are dropped (their share is below e^-80).
WINDOW_KT = 80.0
#: Most segment × temperature elements handled at once (bounds the memory of a call).
BLOCK = 200_000


def _primitives(y, f, l1, l2, l3, full):
    """Antiderivatives at y ≥ 0 of y^n f (n ≤ 2), y^n h (n ≤ 3), and of the entropy kernel σ = L1 + y f and
    y σ (keys ``s0``, ``s1``); see the module notes."""
    p = {"f0": -l1, "f1": -y * l1 - l2, "h0": -f, "h1": -y * f - l1}
    if full:
        y2 = y * y
        p["f2"] = -y2 * l1 - 2 * y * l2 - 2 * l3
        p["h2"] = -y2 * f - 2 * y * l1 - 2 * l2
        p["h3"] = -y2 * y * f - 3 * y2 * l1 - 6 * y * l2 - 6 * l3
        p["s0"] = p["f1"] - l2                     # ∫ L1 = −L2
        p["s1"] = p["f2"] - y * l2 - l3            # ∫ y L1 = −y L2 − L3
    return p


#: The primitives at y = 0 (f, L1, L2, L3 at 0; powers of y vanish).
_AT_ZERO = {"f1": -AT_ZERO[2], "h0": -AT_ZERO[0], "h2": -2 * AT_ZERO[2], "s0": -2 * AT_ZERO[2]}


def _block_sums(e, g, mu, kt, full):
    """Sums for one block: e, g (K,) nodes; mu, kt (M,).

    The primitives P are evaluated once per node at y = |x|.  The part of segment [k, k+1] above μ is
    A_{k+1} − A_k with A = P (node above μ) or P(0) (below), the mirrored part below is B_k − B_{k+1} with
    B = P (below) or P(0) (above); since A + B = P + P(0) at every node, the sum of the two parts is the
    difference of D = sign(x)(P − P(0)) and their difference that of P itself.  With g = p + q x on the
    segment, every sum is p·ΔD + q·ΔP or p·ΔP + q·ΔD, by the parity of the kernel.
    """
    x = (e[:, None] - mu[None, :]) / kt[None, :]
    y = np.abs(x)
    tails = occupation_tails(y, 3 if full else 2)
    prim = _primitives(y, *tails, full) if full else _primitives(y, *tails, None, full)
    sign = np.sign(x)
    slope = ((g[1:] - g[:-1]) / (e[1:] - e[:-1]))[:, None]
    p = g[:-1, None] + slope * (mu[None, :] - e[:-1, None])      # g at μ, extrapolated along the segment
    q = slope * kt[None, :]

    def total(first, first_signed, second, second_signed):
        a = prim[first] if not first_signed else sign * (prim[first] - _AT_ZERO[first])
        b = prim[second] if not second_signed else sign * (prim[second] - _AT_ZERO[second])
        return (p * (a[1:] - a[:-1]) + q * (b[1:] - b[:-1])).sum(0)
    t = kt
    sums = {"count": t * total("f0", False, "f1", True), "dcount": total("h0", True, "h1", False)}
    if full:
        sums["energy"] = t * t * total("f1", True, "f2", False)
        sums["entropy"] = t * total("s0", True, "s1", False)
        sums["b0"] = t * sums["dcount"]
        sums["b1"] = t * total("h1", False, "h2", True)
        sums["b2"] = t * total("h2", True, "h3", False)
    return sums


def thermal_sums(energies, dos, mu, kt, full=True):
    r"""Thermal sums of a piecewise-linear DOS about the chemical potential.

    Parameters
    ----------
    energies : numpy.ndarray, shape (K,)
        Node energies [eV], strictly increasing.
    dos : numpy.ndarray, shape (K,)
        DOS at the nodes [states/eV]; linear between nodes, zero outside.
    mu : numpy.ndarray, shape (M,)
        Chemical potential [eV] at each temperature (same zero as ``energies``).
    kt : numpy.ndarray, shape (M,)
        :math:`k_BT` [eV], > 0.
    full : bool
        False returns only ``count`` and ``dcount`` (what the μ solver needs).

    Returns
    -------
    dict of numpy.ndarray, shape (M,)
        ``count`` [states] :math:`\int g\,[f-\theta(\mu-E)]\,dE`;
        ``dcount`` [states/eV] :math:`\partial N/\partial\mu = \int g f(1-f)\,dE/k_BT`;
        with ``full``: ``energy`` [eV] :math:`\int g\,(E-\mu)[f-\theta(\mu-E)]\,dE`,
        ``entropy`` [1] :math:`S/k_B = \int g\,\sigma\,dE`, and
        ``b0``, ``b1``, ``b2`` [states] :math:`\int g\,f(1-f)\,x^n\,dE/k_BT^{\,0}`
        with :math:`x = (E-\mu)/k_BT`, so that :math:`C/k_B = b_2 - b_1^2/b_0`.

    Notes
    -----
    With :math:`\sigma(x) = -[f\ln f + (1-f)\ln(1-f)] = \mathcal{L}_1(x) + x f(x)`
    and :math:`g = P + Qy` on a piece :math:`y\in[a,b]`, every integral is a
    difference of antiderivatives such as
    :math:`\int y^2 f\,dy = -y^2\mathcal{L}_1 - 2y\mathcal{L}_2 - 2\mathcal{L}_3`
    and :math:`\int y^3 h\,dy = -y^3 f - 3y^2\mathcal{L}_1 - 6y\mathcal{L}_2 - 6\mathcal{L}_3`.
    Segments beyond :data:`WINDOW_KT` k_BT of every μ of a block are dropped.

    Examples
    --------
    >>> e = np.linspace(-3.0, 3.0, 7); g = np.full(7, 2.0)
    >>> s = thermal_sums(e, g, np.array([0.0]), np.array([0.05]))
    >>> round(float(s["b2"][0] / (2.0 * 0.05)), 10)         # ∫ x² f(1−f) dx = π²/3
    3.2898681337
    """
    e = np.asarray(energies, dtype=float)
    g = np.asarray(dos, dtype=float)
    mu = np.asarray(mu, dtype=float)
    kt = np.asarray(kt, dtype=float)
    keys = ("count", "dcount") + (("energy", "entropy", "b0", "b1", "b2") if full else ())
    out = {k: np.zeros(mu.shape) for k in keys}
    order = np.argsort(kt, kind="stable")
    step = max(1, BLOCK // max(e.size, 1))
    for start in range(0, order.size, step):
        idx = order[start:start + step]
        lo = np.min(mu[idx] - WINDOW_KT * kt[idx])
        hi = np.max(mu[idx] + WINDOW_KT * kt[idx])
        first = max(int(np.searchsorted(e, lo)) - 1, 0)
        last = min(int(np.searchsorted(e, hi)) + 1, e.size)
        if last - first < 2:
            continue
        sums = _block_sums(e[first:last], g[first:last], mu[idx], kt[idx], full)
        for k in keys:
            out[k][idx] = sums[k]
    return out


def between_fermi_level_and(energies, dos, mu):
    r"""States and energy of the DOS between the Fermi level (E = 0) and μ.

    Parameters
    ----------
    energies, dos : numpy.ndarray, shape (K,)
        Piecewise-linear DOS [eV, states/eV].
    mu : numpy.ndarray, shape (M,)
        Chemical potentials [eV].

    Returns
    -------
    count : numpy.ndarray, shape (M,)
        :math:`\int_0^\mu g\,dE` [states] (negative for μ < 0).
    energy : numpy.ndarray, shape (M,)
        :math:`-\int_{\min(0,\mu)}^{\max(0,\mu)} g(E)\,|E-\mu|\,dE` [eV] (≤ 0): the
        change of :math:`\int g(E-\mu)\,\theta\,dE` when the step moves from 0 to μ.

    Notes
    -----
    Exact for a piecewise-linear g (trapezoid and Simpson rules on each clipped segment).

    Examples
    --------
    >>> n, u = between_fermi_level_and(np.array([-1.0, 1.0]), np.array([2.0, 2.0]), np.array([0.1, -0.1]))
    >>> [round(float(v), 12) for v in n], [round(float(v), 12) for v in u]
    ([0.2, -0.2], [-0.01, -0.01])
    """
    e = np.asarray(energies, dtype=float)
    g = np.asarray(dos, dtype=float)
    mu = np.asarray(mu, dtype=float)
    low, high = np.minimum(mu, 0.0), np.maximum(mu, 0.0)
    first = max(int(np.searchsorted(e, low.min(initial=0.0))) - 1, 0)
    last = min(int(np.searchsorted(e, high.max(initial=0.0))) + 1, e.size)
    e, g = e[first:last], g[first:last]
    a = np.clip(low[None, :], e[:-1, None], e[1:, None])
    b = np.clip(high[None, :], e[:-1, None], e[1:, None])
    m = 0.5 * (a + b)
    ga, gb, gm = (np.interp(v, e, g, left=0.0, right=0.0) for v in (a, b, m))
    width = b - a
    count = np.sign(mu) * (width * (ga + gb) / 2).sum(0)
    energy = -(width / 6 * (ga * np.abs(a - mu) + 4 * gm * np.abs(m - mu) + gb * np.abs(b - mu))).sum(0)
    return count, energy


def window_work(energies, temperatures):
    r"""DOS points × temperatures a table evaluates: the points within :data:`WINDOW_KT` k_BT of E_F, summed over T.

    Parameters
    ----------
    energies : numpy.ndarray, shape (K,)
        Node energies [eV relative to E_F], increasing.
    temperatures : array_like, shape (M,)
        T [K]; T = 0 costs nothing.

    Returns
    -------
    int
        :math:`\sum_j \#\{k : |E_k| \le W k_BT_j\}` with W = :data:`WINDOW_KT` (at least 2 per hot T) —
        the size of the work of :func:`thermal_sums` at μ ≈ E_F, which a caller can hold to a budget
        before computing.

    Examples
    --------
    >>> window_work(np.linspace(-1.0, 1.0, 2001), [0.0, 1.0, 1e6])   # 1 K: ±6.9 meV; 10⁶ K: every point
    2014
    """
    e = np.asarray(energies, dtype=float)
    t = np.asarray(temperatures, dtype=float)
    half = WINDOW_KT * sc.k / sc.electron_volt * t[t > 0]
    inside = np.searchsorted(e, half, side="right") - np.searchsorted(e, -half, side="left")
    return int(np.maximum(inside, 2).sum())
