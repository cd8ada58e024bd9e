"""The usual ways of computing a table, for comparison with ``tabulate``.

Both integrate the tabulated DOS as given (no low-frequency treatment), one
temperature at a time: a vectorised numpy sum over frequencies (about three
``np.exp``-like passes per temperature, as such code is usually written),
and ``scipy.integrate.quad``.
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc

H_OVER_K_THZ = sc.h * 1e12 / sc.k


def loop_table(nu, g, temperatures):
    """C_v, S [J/mol/K], U, F [J/mol] by a per-temperature loop of numpy sums."""
    r = sc.R
    pos = nu > 0
    nu, g = nu[pos], g[pos]
    zpe = sc.N_A * sc.h * 1e12 * np.trapezoid(g * nu / 2, nu)
    rows = []
    with np.errstate(over="ignore", divide="ignore", invalid="ignore"):
        for t in temperatures:
            x = H_OVER_K_THZ * nu / t
            ex = np.exp(x)                                   # three transcendental passes:
            em1 = ex - 1.0                                   # exp(x), exp(-x), log
            cv = r * np.trapezoid(g * x * x * ex / (em1 * em1), nu)
            u = zpe + r * t * np.trapezoid(g * x / em1, nu)
            log_term = np.trapezoid(g * np.log(1.0 - np.exp(-x)), nu)
            s = (u - zpe) / t - r * log_term
            rows.append((cv, s, u, zpe + r * t * log_term))
    return np.array(rows)


def quad_table(nu, g, temperatures):
    """The same with ``scipy.integrate.quad`` on the linearly interpolated DOS."""
    import warnings

    from scipy.integrate import IntegrationWarning, quad
    warnings.simplefilter("ignore", IntegrationWarning)
    r = sc.R
    top = float(nu[-1])

    def dos(v):
        return np.interp(v, nu, g)

    zpe = sc.N_A * sc.h * 1e12 * quad(lambda v: dos(v) * v / 2, 0, top, limit=200)[0]
    rows = []
    for t in temperatures:
        b = H_OVER_K_THZ / t
        cv = quad(lambda v: dos(v) * (b * v) ** 2 * np.exp(-b * v) / np.expm1(-b * v) ** 2, 0, top, limit=200)[0]
        en = quad(lambda v: dos(v) * b * v / np.expm1(b * v) if v > 0 else dos(v), 0, top, limit=200)[0]
        lg = quad(lambda v: dos(v) * np.log1p(-np.exp(-b * v)) if v > 0 else 0.0, 0, top, limit=200)[0]
        rows.append((r * cv, r * (en - lg), zpe + r * t * en, zpe + r * t * lg))
    return np.array(rows)
