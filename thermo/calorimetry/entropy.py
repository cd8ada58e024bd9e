"""Third-law entropy S°(T) = ∫₀ᵀ C_p/T dT and H°(T) − H°(0) = ∫₀ᵀ C_p dT.

From data: a cubic spline through C_p/T (and C_p) between the measured
points, and below the first point T₁ the Debye law C = aT³ (optionally
γT + bT³) through C(T₁).  Both are linear in the data, so the standard
uncertainty follows exactly from the point uncertainties (taken as
independent).  From a fitted model: Gauss–Legendre quadrature from 0 K and
the parameter covariance.

Cautions: the harmonic and Debye forms assume no phase transition, magnetic
or Schottky contribution below T₁ and none between the points; S° is only as
good as the lowest measured points.

References
----------
.. [1] P. Debye, "Zur Theorie der spezifischen Wärmen", Ann. Phys. 344,
   789-839 (1912) (the T³ law).
.. [2] C. de Boor, *A Practical Guide to Splines*, rev. ed. (Springer, 2001),
   ch. IV (cubic spline interpolation).
.. [3] JCGM 100:2008, *Guide to the expression of uncertainty in measurement*
   (BIPM, 2008), §5.1 (propagation of uncertainty).
"""

from __future__ import annotations

import numpy as np
from scipy.interpolate import CubicSpline

from ..errors import OptionError

#: Standard temperature of S° [K].
STANDARD_K = 298.15
_NODES, _WEIGHTS = np.polynomial.legendre.leggauss(24)


def third_law_from_data(temperatures, heat_capacity, temperature, sigma=None, gamma=0.0):
    r"""S°(T) and H°(T) − H°(0) from measured C_p with the T³ extrapolation.

    Parameters
    ----------
    temperatures, heat_capacity : array_like, shape (N,)
        Measured T [K] (increasing, > 0) and C_p [J/(mol K)].
    temperature : float or array_like
        Where to evaluate [K], 0 <= T <= max measured T.
    sigma : array_like, optional
        Standard uncertainties of C_p [J/(mol K)]; None gives zero.
    gamma : float
        Electronic coefficient γ [J/(mol K²)] kept in the extrapolation
        (C = γT + bT³ below T₁); 0 is the plain Debye T³ law.

    Returns
    -------
    dict
        ``entropy`` [J/(mol K)], ``entropy_uncertainty``, ``enthalpy`` [J/mol],
        ``enthalpy_uncertainty``, ``extrapolated_entropy`` (the part below
        T₁) [J/(mol K)]; arrays like ``temperature``.

    Notes
    -----
    Below T₁, :math:`b = (C_1 - \gamma T_1)/T_1^3`,
    :math:`S(T) = \gamma T + bT^3/3`, :math:`H(T) = \gamma T^2/2 + bT^4/4`;
    above, :math:`S(T) = S(T_1) + \int_{T_1}^T s(C/T)` and
    :math:`H(T) = H(T_1) + \int_{T_1}^T s(C)` with s the not-a-knot cubic
    spline.  With weights :math:`w_j = \partial S/\partial C_j`,
    :math:`u(S)^2 = \sum_j w_j^2\sigma_j^2`.

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).
    .. [2] C. de Boor, *A Practical Guide to Splines* (2001), ch. IV.

    Examples
    --------
    >>> t = np.linspace(2.0, 20.0, 10)
    >>> r = third_law_from_data(t, 1e-4 * t**3, 20.0)
    >>> round(float(r["entropy"][0]) / (1e-4 * 20.0**3 / 3), 9)
    1.0
    """
    t = np.asarray(temperatures, dtype=float)
    c = np.asarray(heat_capacity, dtype=float)
    where = np.atleast_1d(np.asarray(temperature, dtype=float))
    if t.size < 2:
        raise OptionError("the third-law integral needs at least 2 measured points")
    if np.any(where < 0) or np.any(where > t[-1] * (1 + 1e-12)):
        raise OptionError(f"the third-law integral reaches only {t[-1]:g} K (the last measured point); "
                          f"asked for {where.max():g} K")
    n = t.size
    eye = np.eye(n)
    t1 = t[0]
    low = np.minimum(where, t1)
    frac = low / t1
    # Weights on each C_j (rows: targets): the T³ (+γT) part below T₁ ...
    ws = np.outer(frac ** 3 / 3.0, eye[0])
    wh = np.outer(frac ** 3 * low / 4.0, eye[0])
    cs = gamma * low * (1 - frac ** 2 / 3.0)
    ch = gamma * low ** 2 * (0.5 - frac ** 2 / 4.0)
    extrapolated = ws @ c + cs
    # ... plus the spline integrals from T₁ (zero for targets at or below T₁).
    above = where > t1
    ws[above] += _integral_weights(CubicSpline(t, eye / t[:, None]), t, where[above])
    wh[above] += _integral_weights(CubicSpline(t, eye), t, where[above])
    return {"entropy": ws @ c + cs, "entropy_uncertainty": _spread(ws, sigma),
            "enthalpy": wh @ c + ch, "enthalpy_uncertainty": _spread(wh, sigma),
            "extrapolated_entropy": extrapolated}


def _integral_weights(spline, knots, targets):
    """∫_{t₁}^{x} of each basis spline (columns) at each target x (rows), from the polynomial pieces."""
    coef = spline.c                                   # (4, pieces, basis)
    powers = np.arange(4, 0, -1)                      # ∫ c_m (x−x_k)^(3−m) → c_m h^(4−m)/(4−m)
    h = np.diff(knots)
    full = np.einsum("mkj,mk->kj", coef, h[None, :] ** powers[:, None] / powers[:, None])
    cumulative = np.vstack([np.zeros(coef.shape[2]), np.cumsum(full, axis=0)])
    k = np.clip(np.searchsorted(knots, targets, side="right") - 1, 0, h.size - 1)
    dx = targets - knots[k]
    part = np.einsum("mkj,mk->kj", coef[:, k, :], dx[None, :] ** powers[:, None] / powers[:, None])
    return cumulative[k] + part


def _spread(weights, sigma):
    """√Σ_j (w_j σ_j)² for each row of weights (zeros without σ)."""
    if sigma is None:
        return np.zeros(weights.shape[0])
    return np.sqrt(np.sum((weights * np.asarray(sigma, dtype=float)) ** 2, axis=1))


def _integrals(function, where):
    """∫₀ˣ f/T dT and ∫₀ˣ f dT at each x, composite Gauss–Legendre."""
    s_out, h_out = [], []
    for x in np.atleast_1d(where):
        if x <= 0:
            s_out.append(0.0)
            h_out.append(0.0)
            continue
        edges = np.concatenate([[0.0], x * np.geomspace(1e-3, 1.0, 12)])
        a, b = edges[:-1, None], edges[1:, None]
        nodes = (0.5 * (b - a) * _NODES + 0.5 * (a + b)).ravel()
        weights = (0.5 * (b - a) * _WEIGHTS).ravel()
        cp = function(nodes)
        s_out.append(float(np.sum(weights * cp / nodes)))
        h_out.append(float(np.sum(weights * cp)))
    return np.array(s_out), np.array(h_out)


def third_law_from_model(fit, temperature):
    r"""S°(T), H°(T) − H°(0) of a fitted model, integrated from 0 K, with uncertainties.

    Parameters
    ----------
    fit : CalorimetryFit
        Result of :func:`thermo.calorimetry.fitting.fit_measured_heat_capacity`.
    temperature : float or array_like
        T [K], >= 0.

    Returns
    -------
    dict
        ``entropy`` [J/(mol K)], ``entropy_uncertainty``, ``enthalpy``
        [J/mol], ``enthalpy_uncertainty``; arrays like ``temperature``.

    Notes
    -----
    :math:`S = \int_0^T C_p^{model}/T'\,dT'` by 24-point Gauss–Legendre
    on 12 geometric sub-intervals of [0, T]; :math:`u(S)^2 = g^T\Sigma g`
    with :math:`g = \partial S/\partial p` by central differences and Σ the
    parameter covariance.  The model is used outside the fit range down to
    0 K: its low-temperature form (Debye T³ + γT, or the DOS) stands in for
    data there.

    References
    ----------
    .. [1] JCGM 100:2008 (GUM), §5.1.

    Examples
    --------
    >>> from thermo.calorimetry.models import HeatCapacityModel
    >>> from thermo.calorimetry.reading import MeasuredHeatCapacity
    >>> from thermo.calorimetry.fitting import fit_measured_heat_capacity
    >>> m = HeatCapacityModel(atoms=1, electronic=False, dilation="none")
    >>> t = np.linspace(20.0, 300.0, 15)
    >>> d = MeasuredHeatCapacity(t, m.heat_capacity_p(t, {"theta_D_K": 350.0}), None, "J/(mol K)", "x")
    >>> r = third_law_from_model(fit_measured_heat_capacity(d, m), 300.0)
    >>> bool(20.0 < r["entropy"][0] < 40.0)
    True
    """
    where = np.atleast_1d(np.asarray(temperature, dtype=float))
    values = dict(fit.values)
    s, h = _integrals(lambda x: fit.model.heat_capacity_p(x, values), where)
    gs, gh = [], []
    for name in fit.free:
        step = 1e-5 * max(abs(values[name]), 1e-12)
        up = _integrals(lambda x: fit.model.heat_capacity_p(x, {**values, name: values[name] + step}), where)
        down = _integrals(lambda x: fit.model.heat_capacity_p(x, {**values, name: values[name] - step}), where)
        gs.append((up[0] - down[0]) / (2 * step))
        gh.append((up[1] - down[1]) / (2 * step))
    us = uh = np.zeros_like(s)
    if fit.free:
        gs, gh = np.array(gs), np.array(gh)
        cov = np.asarray(fit.covariance)
        us = np.sqrt(np.clip(np.einsum("im,ij,jm->m", gs, cov, gs), 0, None))
        uh = np.sqrt(np.clip(np.einsum("im,ij,jm->m", gh, cov, gh), 0, None))
    return {"entropy": s, "entropy_uncertainty": us, "enthalpy": h, "enthalpy_uncertainty": uh}
