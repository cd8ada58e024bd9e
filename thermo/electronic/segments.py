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

from .fermi import AT_ZERO, occupation_tails

#: Segments further than this many k_BT from μ are dropped (their share is below e^-80).
WINDOW_KT = 80.0
#: Most segment × temperature elements handled at once (bounds the memory of a call).
BLOCK = 200_000


def _primitives(y, f, l1, l2, l3, full):
    """Antiderivatives at y ≥ 0 of y^n f (n ≤ 2), y^n h (n ≤ 3), L1 and y L1 (see module notes)."""
    y2 = y * y
    p = {"f0": -l1, "f1": -y * l1 - l2, "h0": -f}
    if full:
        p["f2"] = -y2 * l1 - 2 * y * l2 - 2 * l3
        p["h1"] = -y * f - l1
        p["h2"] = -y2 * f - 2 * y * l1 - 2 * l2
        p["h3"] = -y2 * y * f - 3 * y2 * l1 - 6 * y * l2 - 6 * l3
        p["L0"] = -l2
        p["L1"] = -y * l2 - l3
    else:
        p["h1"] = -y * f - l1
    return p


def _piece(lo, hi, slope_p, slope_q, full):
    """∫ (P + Q y) K(y) dy over [a, b] ⊂ [0, ∞) for the kernels K, from primitives at both ends."""
    j = {k: hi[k] - lo[k] for k in hi}
    out = {"n": slope_p * j["f0"] + slope_q * j["f1"], "b0": slope_p * j["h0"] + slope_q * j["h1"]}
    if full:
        out["u"] = slope_p * j["f1"] + slope_q * j["f2"]
        out["b1"] = slope_p * j["h1"] + slope_q * j["h2"]
        out["b2"] = slope_p * j["h2"] + slope_q * j["h3"]
        out["s"] = slope_p * (j["L0"] + j["f1"]) + slope_q * (j["L1"] + j["f2"])
    return out


def _block_sums(e, g, mu, kt, full):
    """Sums for one block: e, g (K,) nodes; mu, kt (M,)."""
    x = (e[:, None] - mu[None, :]) / kt[None, :]
    ax = np.abs(x)
    tails = occupation_tails(ax, 3 if full else 2)
    if not full:
        tails = tails + (np.zeros_like(ax),)
    zero = [np.full_like(ax[:-1], v) for v in AT_ZERO]
    xa, xb = x[:-1], x[1:]
    slope = ((g[1:] - g[:-1]) / (e[1:] - e[:-1]))[:, None]
    p = g[:-1, None] + slope * (mu[None, :] - e[:-1, None])      # g at μ, extrapolated along the segment
    q = slope * kt[None, :]

    def ends(node, use_node, y):
        values = [np.where(use_node, t[node], z) for t, z in zip(tails, zero)]
        return _primitives(np.where(use_node, y, 0.0), *values, full)

    first, second = slice(None, -1), slice(1, None)
    above = _piece(ends(first, xa > 0, ax[:-1]), ends(second, xb > 0, ax[1:]), p, q, full)
    below = _piece(ends(second, xb < 0, ax[1:]), ends(first, xa < 0, ax[:-1]), p, -q, full)
    t = kt
    sums = {"count": t * (above["n"] - below["n"]).sum(0), "dcount": (above["b0"] + below["b0"]).sum(0)}
    if full:
        sums["energy"] = t * t * (above["u"] + below["u"]).sum(0)
        sums["entropy"] = t * (above["s"] + below["s"]).sum(0)
        sums["b0"] = t * sums["dcount"]
        sums["b1"] = t * (above["b1"] - below["b1"]).sum(0)
        sums["b2"] = t * (above["b2"] + below["b2"]).sum(0)
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
