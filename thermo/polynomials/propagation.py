r"""What the uncertainty of a heat-capacity source does to a polynomial fit.

A fit is linear in its data: the C_p coefficients are a weighted least-squares
solution (weights held at their fitted values) and the integration constants
are affine in those coefficients and in H, S at the reference temperature.
So every coefficient, and the fitted C_p, S and H − H(298.15) at every source
temperature, is :math:`q = \sum_j J_j d_j` over the data
:math:`d = (C_{p,1..n}, H_{ref}, S_{ref})`, and the data's estimated errors
:math:`\delta d_j` give

.. math:: \delta q = \sum_j |J_j|\,\delta d_j

— every point's error with the sign that hurts most (an estimate of the
largest change, like the source's own; errors of a table are usually
correlated between temperatures, which this bound covers).  It is reported
next to the fit's own error (fit minus source), never merged into it.

References
----------
.. [1] C. L. Lawson and R. J. Hanson, *Solving Least Squares Problems*
   (Prentice-Hall, 1974), ch. 20 (equality-constrained least squares).
"""

from __future__ import annotations

import dataclasses

import numpy as np

from ..columns import quoted
from .forms import T_STANDARD

#: Compared quantities, with the source's uncertainty key of each.
_QUANTITIES = (("heat_capacity_p", "heat_capacity"), ("enthalpy_increment", "enthalpy_increment"),
               ("entropy", "entropy"))


def _flat(ranges):
    return np.array([v for r in ranges for v in r.values()], dtype=float)


def propagated_uncertainty(fit, data, cp_map, assemble, i_ref, errors):
    r"""The source's uncertainty carried into the coefficients and the fitted C_p, S, H − H(298.15).

    Parameters
    ----------
    fit : PolynomialFit
        The fit of ``data``.
    data : HeatCapacityData
        The source points of the range, with ``uncertainty``.
    cp_map : callable
        ``cp_map(cp)`` -> C_p coefficient arrays per range, for ``cp`` of shape
        (n,) or (n, r) (linear, the fit's weights held).
    assemble : callable
        ``assemble(cps, h_ref, s_ref)`` -> coefficient dicts per range (affine).
    i_ref : int
        Index of the reference temperature in ``data``.
    errors : dict
        The fit's own errors (:func:`~thermo.polynomials.result.fit_errors`).

    Returns
    -------
    dict
        JSON-able: ``coefficients`` (per range, the estimated error of each
        coefficient; they are correlated, quote the properties instead),
        for each of C_p, H − H(298.15), S ``max_absolute`` [J/(mol·K), J/mol]
        and ``max_relative`` over the range, ``total_max_relative`` (fit error
        + data uncertainty), ``at_298_15_K`` (C_p and S as ``{value,
        uncertainty}`` when 298.15 K is in the range), ``method``.

    Notes
    -----
    :math:`\delta q = \sum_j |\partial q/\partial d_j|\,\delta d_j`; the
    derivatives of the affine constants by differences (exact up to rounding
    for an affine map).

    Examples
    --------
    >>> from thermo.polynomials.sources import heat_capacity_source
    >>> from thermo.polynomials.fitting import fit_polynomial
    >>> t = np.linspace(250.0, 1000.0, 40)
    >>> src = heat_capacity_source(t, 24.0 + 0.004 * t, entropy_298=30.0, heat_capacity_uncertainty=np.full(40, 0.1))
    >>> u = fit_polynomial(src, "shomate", (298.15, 1000.0)).uncertainty
    >>> u["heat_capacity_p"]["max_absolute"] >= 0.1, u["at_298_15_K"]["entropy"]["uncertainty"] < 1e-9
    (True, True)
    """
    u = data.uncertainty
    n = data.temperature.size
    cps = cp_map(data.heat_capacity)
    sizes = [c.size for c in cps]
    x0 = np.concatenate(cps)
    h0 = float(data.enthalpy_increment[i_ref]) + 1e3 * fit.formation_enthalpy_kJ_per_mol
    s0 = float(data.entropy[i_ref])

    def coefficients(x, h, s):
        return _flat(assemble(np.split(x, np.cumsum(sizes)[:-1]), h, s))

    base = coefficients(x0, h0, s0)
    columns = []
    for i in range(x0.size):
        step = max(abs(x0[i]), 1.0)       # the map is affine: any step is exact, a large one keeps rounding small
        x = x0.copy()
        x[i] += step
        columns.append((coefficients(x, h0, s0) - base) / step)
    by_x = np.array(columns).T                                                  # (n_f, n_x)
    by_h = (coefficients(x0, h0 + 1.0, s0) - base)[:, None]
    by_s = (coefficients(x0, h0, s0 + 1.0) - base)[:, None]
    by_cp = by_x @ np.concatenate(cp_map(np.eye(n)), axis=0)                    # (n_f, n)
    jacobian = np.hstack([by_cp, by_h, by_s])
    delta = np.concatenate([u["heat_capacity"], [u["enthalpy_increment"][i_ref], u["entropy"][i_ref]]])
    coefficient_errors = np.abs(jacobian) @ delta
    names = [(k, list(r.coefficients)) for k, r in enumerate(fit.ranges)]
    out_coefficients, position = [], 0
    for _, keys in names:
        out_coefficients.append({key: float(coefficient_errors[position + j]) for j, key in enumerate(keys)})
        position += len(keys)
    evaluated = _evaluated_jacobian(fit, base, data.temperature) @ jacobian     # (3n, n + 2)
    spread = (np.abs(evaluated) @ delta).reshape(3, n)
    values = fit.properties(data.temperature)
    record = {"coefficients": out_coefficients, "total_max_relative": {},
              "method": "each source point's estimated error with the sign that hurts most, carried "
                        "linearly through the fit (coefficients are correlated: quote the properties)"}
    for row, (key, _) in enumerate(_QUANTITIES):
        scale = np.abs(values[key])
        if key == "enthalpy_increment":
            scale = np.maximum(scale, 1e-3 * float(np.max(scale)) if np.any(scale) else 1.0)
        rel = spread[row] / scale
        record[key] = {"max_absolute": float(np.max(spread[row])), "max_relative": float(np.max(rel))}
        record["total_max_relative"][key] = float(errors[key]["max_relative"] + np.max(rel))
    at = np.flatnonzero(np.isclose(data.temperature, T_STANDARD, rtol=0, atol=1e-9))
    if at.size:
        i = int(at[0])
        record["at_298_15_K"] = {"heat_capacity_p": quoted(values["heat_capacity_p"][i], spread[0, i]),
                                 "entropy": quoted(values["entropy"][i], spread[2, i])}
    return record


def _evaluated_jacobian(fit, base, temperature):
    """d(C_p, H − H298, S at ``temperature``)/d(coefficients), stacked (3n, n_f)."""
    def properties(flat):
        ranges, position = [], 0
        for r in fit.ranges:
            keys = list(r.coefficients)
            ranges.append(dataclasses.replace(r, coefficients=dict(zip(keys, flat[position:position + len(keys)]))))
            position += len(keys)
        p = dataclasses.replace(fit, ranges=tuple(ranges)).properties(temperature)
        return np.concatenate([p[key] for key, _ in _QUANTITIES])

    reference = properties(base)
    columns = []
    for i in range(base.size):
        step = max(abs(base[i]), 1.0)     # properties are affine in the coefficients
        flat = base.copy()
        flat[i] += step
        columns.append((properties(flat) - reference) / step)
    return np.array(columns).T
