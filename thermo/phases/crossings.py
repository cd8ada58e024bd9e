r"""Where ΔG(T) changes sign: transition temperatures, their uncertainty and the closest approach.

ΔG = G_b − G_a of two phases on a temperature grid, with ΔS = S_b − S_a
(so d ΔG/dT = −ΔS) and u(ΔG) per row.  A crossing is bracketed by a sign
change between grid rows, or hidden inside one step (two crossings between
rows of the same sign) — found from the cubic Hermite interpolant built from
ΔG and its slope −ΔS at both ends, then checked by evaluating ΔG exactly at
the interpolant's extremum.  Each bracket is refined by Brent's method on
the exact ΔG (status checked).

References
----------
.. [1] R. P. Brent, *Algorithms for Minimization without Derivatives*
   (Prentice-Hall, 1973), ch. 4.
.. [2] C. de Boor, *A Practical Guide to Splines* (Springer, 1978), ch. IV
   (cubic Hermite interpolation).
"""

from __future__ import annotations

import numpy as np
from scipy.optimize import brentq

#: Relative temperature tolerance of the root refinement.
ROOT_RTOL = 1e-12
#: Absolute temperature tolerance of the root refinement [K].
ROOT_XTOL = 1e-9
ROOT_MAXITER = 100


def _hermite_extremum(t0, t1, d0, d1, m0, m1):
    """Stationary points inside (t0, t1) of the cubic Hermite interpolant (values d, slopes m)."""
    h = t1 - t0
    # p(s) = h00 d0 + h10 h m0 + h01 d1 + h11 h m1, s in [0, 1]; p'(s) = a s² + b s + c
    a = 6 * d0 + 3 * h * m0 - 6 * d1 + 3 * h * m1
    b = -6 * d0 - 4 * h * m0 + 6 * d1 - 2 * h * m1
    c = h * m0
    if abs(a) < 1e-300:
        roots = [-c / b] if abs(b) > 1e-300 else []
    else:
        disc = b * b - 4 * a * c
        if disc < 0:
            return []
        q = -0.5 * (b + np.copysign(np.sqrt(disc), b))
        roots = [q / a] + ([c / q] if q != 0 else [])
    return [t0 + s * h for s in roots if 0.0 < s < 1.0]


def brackets(t, dg, ds, evaluate):
    """Temperature intervals holding exactly one sign change of ΔG.

    Parameters
    ----------
    t : numpy.ndarray, shape (M,)
        Temperatures [K], ascending.
    dg, ds : numpy.ndarray, shape (M,)
        ΔG [eV/atom] and ΔS [eV/(K atom)] (NaN rows are skipped).
    evaluate : callable
        ``evaluate(T) -> ΔG`` exactly at one temperature [eV/atom].

    Returns
    -------
    list of (float, float, bool)
        ``(low, high, hidden)``: a bracket and whether it was hidden inside a
        grid step (ΔG of one sign at both rows).

    Examples
    --------
    >>> t = np.array([0.0, 10.0])
    >>> f = lambda x: (x - 4.0) * (x - 6.0)   # two crossings inside one step, ΔG > 0 at both rows
    >>> [(float(a), float(b), hidden) for a, b, hidden in brackets(t, f(t), -(2 * t - 10.0), f)]
    [(0.0, 5.0, True), (5.0, 10.0, True)]
    """
    out = []
    ok = np.isfinite(dg)
    both = ok[:-1] & ok[1:]
    d0, d1 = dg[:-1], dg[1:]
    m0, m1 = -ds[:-1], -ds[1:]
    with np.errstate(invalid="ignore"):
        # a step without a sign change can hide two crossings only if ΔG heads towards 0 at its left row and
        # away from it at its right row (an extremum inside); only those steps are examined
        towards = both & (d0 * d1 > 0) & np.isfinite(m0) & np.isfinite(m1) & (m0 * d0 < 0) & (m1 * d1 > 0)
    steps = np.flatnonzero(both & ((d0 * d1 <= 0) | towards))
    for i in steps:
        a, b = dg[i], dg[i + 1]
        if a == 0.0:
            if i == 0 or not ok[i - 1] or dg[i - 1] * b < 0:
                out.append((float(t[i]), float(t[i]), False))
            continue
        if a * b < 0:
            out.append((float(t[i]), float(t[i + 1]), False))
            continue
        if b == 0.0:
            continue
        h = t[i + 1] - t[i]
        for tm in _hermite_extremum(t[i], t[i + 1], a, b, m0[i], m1[i]):
            q = (tm - t[i]) / h
            cubic = ((2 * q ** 3 - 3 * q ** 2 + 1) * a + (q ** 3 - 2 * q ** 2 + q) * h * m0[i]
                     + (-2 * q ** 3 + 3 * q ** 2) * b + (q ** 3 - q ** 2) * h * m1[i])
            if cubic * a > 0.5 * min(a * a, b * b):      # the cubic stays well clear of zero: no crossing here
                continue
            value = float(evaluate(tm))                  # close approach: look at the exact ΔG
            if value * a < 0:
                out += [(float(t[i]), float(tm), True), (float(tm), float(t[i + 1]), True)]
                break
            if value == 0.0:
                out.append((float(tm), float(tm), True))
                break
    return out


def refine(low, high, evaluate):
    """The root of ΔG in [low, high] by Brent's method: (T* [K], converged, bracket width [K])."""
    if low == high:
        return low, True, 0.0
    try:
        root, info = brentq(evaluate, low, high, xtol=ROOT_XTOL, rtol=ROOT_RTOL, maxiter=ROOT_MAXITER,
                            full_output=True, disp=False)
    except ValueError:          # no sign change after all (ΔG evaluated differently from the grid)
        return 0.5 * (low + high), False, high - low
    if not info.converged:
        return 0.5 * (low + high), False, high - low
    return float(root), True, high - low


def undecided_half_width(t, dg, u, t_star, u_star):
    """Largest distance from T* to an end of the interval around it where |ΔG| <= u(ΔG) [K].

    |ΔG| − u is taken as piecewise linear between the rows and T* (where it
    is −u(T*)); an interval that runs to the end of the grid (or to a row
    without a value) ends there.
    """
    c = int(np.searchsorted(t, t_star))
    tt = np.insert(t, c, t_star)
    mm = np.insert(np.abs(dg) - u, c, -u_star)
    ends = []
    for step in (-1, 1):
        j = c
        while 0 <= j + step < tt.size and np.isfinite(mm[j + step]) and mm[j + step] <= 0:
            j += step
        i = j + step
        if not 0 <= i < tt.size or not np.isfinite(mm[i]):
            ends.append(tt[j])
            continue
        ends.append(tt[j] + (tt[i] - tt[j]) * (0.0 - mm[j]) / (mm[i] - mm[j]))
    return float(max(t_star - ends[0], ends[1] - t_star, 0.0))


def hermite_root(t, dg, ds, low, high):
    """Root in [low, high] of the cubic Hermite interpolant of ΔG (slope −ΔS) over the grid step holding it.

    Brent's method on the cubic (status checked); returns (T [K], converged).
    """
    i = int(np.clip(np.searchsorted(t, 0.5 * (low + high)) - 1, 0, t.size - 2))
    t0, t1 = t[i], t[i + 1]
    h = t1 - t0
    d0, d1, m0, m1 = dg[i], dg[i + 1], -ds[i], -ds[i + 1]

    def cubic(x):
        q = (x - t0) / h
        return ((2 * q ** 3 - 3 * q ** 2 + 1) * d0 + (q ** 3 - 2 * q ** 2 + q) * h * m0
                + (-2 * q ** 3 + 3 * q ** 2) * d1 + (q ** 3 - q ** 2) * h * m1)
    if low == high:
        return low, True
    if cubic(low) * cubic(high) > 0:        # the cubic misses the sign change the exact ΔG showed
        return 0.5 * (low + high), False
    root, info = brentq(cubic, low, high, xtol=ROOT_XTOL, rtol=ROOT_RTOL, maxiter=ROOT_MAXITER, full_output=True,
                        disp=False)
    return (float(root), True) if info.converged else (0.5 * (low + high), False)


def transition(t, dg, ds, u, root, converged, width, ds_star, hidden, step=0.0):
    r"""One crossing of ΔG: T*, its uncertainty and ΔS there.

    Parameters
    ----------
    t, dg, ds, u : numpy.ndarray, shape (M,)
        Grid [K], ΔG [eV/atom], ΔS [eV/(K atom)], u(ΔG) [eV/atom].
    root : float
        T* [K] from :func:`refine` (exact ΔG) or a Newton step from :func:`hermite_root`.
    converged : bool
        Whether the root search converged.
    width : float
        Width of the bracket [K].
    ds_star : float
        ΔS at T* [eV/(K atom)].
    hidden : bool
        The bracket lies inside one grid step.
    step : float
        Size of the last Newton correction [K] (0 for Brent on the exact ΔG): added to u.

    Returns
    -------
    dict
        ``temperature_K``, ``uncertainty_K``, ``delta_gibbs_uncertainty_eV``,
        ``delta_entropy_eV_per_K``, ``converged``, ``hidden`` and ``sign``
        (+1: ΔG rises through zero, so phase b is stable below T*).

    Notes
    -----
    .. math:: u(T^*) = \frac{u(\Delta G)}{|\Delta S|}\Big|_{T^*}

    (u(ΔG) interpolated linearly between rows) plus the root tolerance and the
    last Newton correction, widened to the interval where |ΔG| <= u(ΔG) on the
    grid when that is wider, and to half the bracket when the root did not converge.
    """
    ds_star = float(ds_star)
    u_dg = float(np.interp(root, t, np.where(np.isfinite(u), u, np.nanmax(u))))
    u_t = u_dg / abs(ds_star) if ds_star != 0 else np.inf
    u_t += ROOT_XTOL + ROOT_RTOL * abs(root) + abs(step)     # Brent's guarantee, the last correction
    if not hidden:
        u_t = max(u_t, undecided_half_width(t, dg, u, root, u_dg))
    if not converged:
        u_t = max(u_t, 0.5 * width)
    return {"temperature_K": root, "uncertainty_K": float(u_t), "delta_gibbs_uncertainty_eV": u_dg,
            "delta_entropy_eV_per_K": ds_star, "converged": bool(converged), "hidden": bool(hidden),
            "sign": 1 if ds_star < 0 else -1}


def closest_approach(t, dg, u):
    """Where |ΔG| is smallest on the grid when it never changes sign.

    Returns
    -------
    dict
        ``temperature_K``, ``delta_gibbs_eV`` (signed, b − a) and its
        ``uncertainty_eV``; None when every row is NaN.
    """
    finite = np.isfinite(dg)
    if not finite.any():
        return None
    i = int(np.nanargmin(np.where(finite, np.abs(dg), np.nan)))
    return {"temperature_K": float(t[i]), "delta_gibbs_eV": float(dg[i]), "uncertainty_eV": float(u[i])}
