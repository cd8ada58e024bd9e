"""The Vinet fit: Levenberg–Marquardt over all temperatures at once, a checked fallback per temperature.

Every solver result is checked: a temperature whose vectorised iteration
did not settle is fitted again by :func:`scipy.optimize.least_squares`, and
one whose fallback reports failure (or gives B_0 <= 0, B_0' <= 1) gets NaN
parameters, which the caller states as a warning (never a silent value).

References
----------
.. [1] P. Vinet, J. Ferrante, J. H. Rose, J. R. Smith, "Compressibility of
   solids", J. Geophys. Res. 92, 9319-9325 (1987).
.. [2] D. W. Marquardt, "An algorithm for least-squares estimation of
   nonlinear parameters", J. Soc. Ind. Appl. Math. 11, 431-441 (1963).
"""

from __future__ import annotations

import numpy as np
from scipy.optimize import least_squares

_ITERATIONS = 60
_STEP_TOLERANCE = 1e-12        # largest parameter step (in units of the start values) that counts as settled
_STUCK_DAMPING = 1e12          # damping at which no step lowers the misfit any more (a minimum to rounding)
_MAX_RETRIES = 200             # temperatures refitted one by one when the batch fit did not settle (others: NaN)
_MAX_EVALUATIONS = 400         # misfit evaluations of one such refit


def vinet_energy(volume, e0, v0, b0, b0_prime):
    r"""Vinet (universal) energy.

    Parameters
    ----------
    volume, e0, v0, b0, b0_prime : array_like
        As :func:`thermo.quasiharmonic.eos.birch_murnaghan_energy`.

    Returns
    -------
    numpy.ndarray
        Energy [eV].

    Notes
    -----
    With :math:`\eta = (V/V_0)^{1/3}` and :math:`\xi = \tfrac32(B_0'-1)` [1]_:

    .. math:: E = E_0 + \frac{4B_0V_0}{(B_0'-1)^2}\left[1-(1+\xi(\eta-1))e^{\xi(1-\eta)}\right],
              \qquad P = 3B_0\frac{1-\eta}{\eta^2}e^{\xi(1-\eta)}

    Examples
    --------
    >>> float(vinet_energy(20.0, -1.0, 20.0, 0.6, 4.0))
    -1.0
    """
    eta = (np.asarray(volume, float) / v0) ** (1.0 / 3.0)
    xi = 1.5 * (b0_prime - 1.0)
    return e0 + 4.0 * b0 * v0 / (b0_prime - 1.0) ** 2 * (1.0 - (1.0 + xi * (eta - 1.0)) * np.exp(xi * (1.0 - eta)))


def vinet_pressure(volume, v0, b0, b0_prime):
    """P = -dE/dV of :func:`vinet_energy` [eV/Å³]."""
    eta = (volume / v0) ** (1.0 / 3.0)
    xi = 1.5 * (b0_prime - 1.0)
    return 3.0 * b0 * (1.0 - eta) / eta ** 2 * np.exp(xi * (1.0 - eta))


def vinet_bulk_modulus(volume, v0, b0, b0_prime):
    """B = -V dP/dV of :func:`vinet_energy` [eV/Å³]."""
    eta = (volume / v0) ** (1.0 / 3.0)
    xi = 1.5 * (b0_prime - 1.0)
    return b0 / eta ** 2 * np.exp(xi * (1.0 - eta)) * (2.0 - eta + xi * eta * (1.0 - eta))


def vinet_weights(volumes, params, volume):
    r"""First-order weights of the K fitted F values in F, dF/dV, d²F/dV² of the Vinet fit at ``volume``.

    Parameters
    ----------
    volumes : numpy.ndarray, shape (K,)
        Sampled volumes [Å³].
    params : numpy.ndarray, shape (4, M)
        Fitted E_0, V_0, B_0, B_0'.
    volume : numpy.ndarray, shape (M,)
        Where the weights are wanted [Å³].

    Returns
    -------
    tuple of numpy.ndarray, each (M, K)

    Notes
    -----
    The least-squares parameters move by :math:`\delta p = (J^TJ)^{-1}J^T\delta F`
    (J: derivatives of the K fitted energies by the parameters, at the
    solution); each derivative of F at V moves by its own derivative by p
    times :math:`\delta p` [2]_.  Parameter derivatives by central differences.

    Examples
    --------
    >>> v = np.linspace(17.0, 23.0, 9)
    >>> p = np.array([[-2.0], [20.0], [0.55], [4.7]])
    >>> w0, w1, w2 = vinet_weights(v, p, np.array([20.0]))
    >>> round(float(w0.sum()), 9)      # adding a constant to every F moves E_0 by that constant
    1.0
    """
    p = np.asarray(params, dtype=float)
    step = 1e-6 * (np.abs(p) + np.array([1.0, 0.0, 0.0, 0.0])[:, None])
    vol = np.asarray(volume, dtype=float)

    def local(q):
        e0, v0, b0, bp = q
        return np.stack([vinet_energy(vol, e0, v0, b0, bp), -vinet_pressure(vol, v0, b0, bp),
                         vinet_bulk_modulus(vol, v0, b0, bp) / vol])           # (3, M)

    jac, dlocal = [], []
    for i in range(4):
        delta = np.zeros_like(p)
        delta[i] = step[i]
        jac.append((vinet_energy(volumes[:, None], *(p + delta)) - vinet_energy(volumes[:, None], *(p - delta)))
                   / (2 * step[i]))                                                 # (K, M)
        dlocal.append((local(p + delta) - local(p - delta)) / (2 * step[i]))        # (3, M)
    j = np.moveaxis(np.array(jac), (0, 1, 2), (2, 1, 0))                            # (M, K, 4)
    with np.errstate(all="ignore"):
        gain = np.linalg.pinv(j)                                                    # (M, 4, K)
    d = np.moveaxis(np.array(dlocal), (0, 1, 2), (2, 0, 1))                         # (3, M, 4)
    return tuple(np.einsum("mi,mik->mk", d[n], gain) for n in range(3))


def fit_vinet(v, f, start):
    """Vinet parameters (4, M) fitted to F (K, M) at volumes ``v`` (K,), from ``start`` (4, M).

    Returns
    -------
    numpy.ndarray, shape (4, M)
        E_0, V_0, B_0, B_0'; NaN columns where neither solver converged to
        admissible parameters.

    Examples
    --------
    >>> v = np.linspace(17.0, 23.0, 9)
    >>> p = fit_vinet(v, vinet_energy(v, -2.0, 20.0, 0.55, 4.7)[:, None], np.array([[-1.9], [20.3], [0.5], [4.0]]))
    >>> np.round(p[:, 0], 8).tolist()
    [-2.0, 20.0, 0.55, 4.7]
    """
    params, settled = _levenberg_marquardt(v, f, start)
    bad = ~(settled & np.all(np.isfinite(params), axis=0) & (params[2] > 0) & (params[3] > 1))
    retried = np.flatnonzero(bad)
    for j in retried[:_MAX_RETRIES]:          # at most _MAX_RETRIES one-by-one fits: bounded time
        params[:, j] = _fit_one(v, f[:, j], start[:, j])
    params[:, retried[_MAX_RETRIES:]] = np.nan
    return params


def _misfit(v, f, p):
    return vinet_energy(v[:, None], p[0], p[1], p[2], p[3]) - f


def _levenberg_marquardt(v, f, start):
    """Damped Gauss–Newton in units of the start values; returns parameters and a settled flag (M,).

    Each iteration works on the columns not yet settled or stuck only, so the
    cost follows the columns that still move (linear in M overall).
    """
    scale = np.abs(start) + np.array([1.0, 0.0, 0.0, 0.0])[:, None]
    x = start / scale
    lam = np.full(f.shape[1], 1e-3)
    done = np.zeros(f.shape[1], dtype=bool)
    with np.errstate(all="ignore"):
        r = _misfit(v, f, x * scale)
        cost = np.sum(r * r, axis=0)
        act = np.arange(f.shape[1])
        for _ in range(_ITERATIONS):
            xa, sa, fa, ra, la = x[:, act], scale[:, act], f[:, act], r[:, act], lam[act]
            jac = np.empty(ra.shape + (4,))
            for k in range(4):
                step = np.zeros_like(xa)
                step[k] = 1e-7
                jac[..., k] = (_misfit(v, fa, (xa + step) * sa) - ra) / 1e-7
            jt = np.moveaxis(jac, 0, 1)                              # (M, K, 4)
            a = np.einsum("mki,mkj->mij", jt, jt)
            g = np.einsum("mki,km->mi", jt, ra)
            a_damped = a + la[:, None, None] * np.eye(4) * np.diagonal(a, axis1=1, axis2=2)[:, :, None]
            delta = -np.linalg.solve(a_damped + 1e-300 * np.eye(4), g[..., None])[..., 0].T
            trial = xa + delta
            r_trial = _misfit(v, fa, trial * sa)
            cost_trial = np.sum(r_trial * r_trial, axis=0)
            better = np.isfinite(cost_trial) & (cost_trial <= cost[act])
            x[:, act] = np.where(better, trial, xa)
            r[:, act] = np.where(better, r_trial, ra)
            done[act] |= better & (np.max(np.abs(delta), axis=0) < _STEP_TOLERANCE)
            cost[act] = np.where(better, cost_trial, cost[act])
            lam[act] = np.where(better, la / 3, la * 4)
            act = act[~(done[act] | (lam[act] > _STUCK_DAMPING))]
            if act.size == 0:
                break
    return x * scale, done | (lam > _STUCK_DAMPING)


def _fit_one(v, col, start):
    """One temperature by scipy's Levenberg–Marquardt; NaN unless it reports success."""
    if not np.all(np.isfinite(start)):
        return np.full(4, np.nan)
    scale = np.abs(start) + np.array([1.0, 0.0, 0.0, 0.0])

    def misfit(p):
        e0, v0, b0, bp = p * scale
        return vinet_energy(v, e0, v0, b0, bp) - col

    with np.errstate(all="ignore"):
        result = least_squares(misfit, start / scale, method="lm", xtol=1e-14, ftol=1e-14, gtol=1e-14,
                               max_nfev=_MAX_EVALUATIONS)
    params = result.x * scale
    ok = result.success and np.all(np.isfinite(params)) and params[2] > 0 and params[3] > 1
    return params if ok else np.full(4, np.nan)
