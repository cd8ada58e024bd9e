"""Weighted least-squares fit of a :class:`HeatCapacityModel` to measured C_p.

References
----------
.. [1] W. H. Press, S. A. Teukolsky, W. T. Vetterling, B. P. Flannery,
   *Numerical Recipes*, 3rd ed. (Cambridge University Press, 2007), §15.4-15.6.
.. [2] JCGM 100:2008, *Guide to the expression of uncertainty in measurement*
   (BIPM, 2008), §5.1-5.2 (standard uncertainty, correlation).
.. [3] R. T. Birge, "The calculation of errors by the method of least
   squares", Phys. Rev. 40, 207-227 (1932) (scaling by the Birge ratio).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd
from scipy import optimize

from ..columns import column_name
from ..errors import OptionError
from .models import STARTS, parameter_name
from .reading import MeasuredHeatCapacity

#: |r| above which two fitted parameters are reported as strongly correlated.
STRONG_CORRELATION = 0.95


@dataclass(frozen=True)
class CalorimetryFit:
    """Outcome of :func:`fit_measured_heat_capacity`.

    Attributes
    ----------
    model : HeatCapacityModel
    values, uncertainties : dict
        Every model parameter (fixed ones with uncertainty 0) [their units].
    free : tuple of str
        Names of the fitted parameters, order of ``correlation``.
    correlation : numpy.ndarray, shape (P, P)
        Correlation matrix of the free parameters [1].
    covariance : numpy.ndarray, shape (P, P)
        Their covariance [units²].
    chi2_reduced : float
        χ²/(M − P) with the weights used [1].
    residuals : pandas.DataFrame
        Per fitted point: T, measured C_p, its σ, model C_p and its terms,
        residual and relative residual (column schema names).
    max_relative_residual : float
        max |C_p^model − C_p| / C_p over the fit range [1].
    weighting : str
        ``'given uncertainties'`` or ``'relative (no uncertainties given)'``.
    warnings : list of str
    """

    model: object
    values: dict
    uncertainties: dict
    free: tuple
    correlation: np.ndarray
    covariance: np.ndarray
    chi2_reduced: float
    residuals: pd.DataFrame
    max_relative_residual: float
    weighting: str
    fit_range_K: tuple
    warnings: list = field(default_factory=list)

    def heat_capacity_p(self, temperatures):
        """Fitted C_p(T) [J/(mol K)]."""
        return self.model.heat_capacity_p(temperatures, self.values)


def parse_fixed(items):
    """``["gamma=1.35e-3", ...]`` → ``{"gamma_J_per_mol_K2": 0.00135}``.

    Examples
    --------
    >>> parse_fixed(["gamma=1.35e-3", "theta_D=400"])
    {'gamma_J_per_mol_K2': 0.00135, 'theta_D_K': 400.0}
    """
    out = {}
    for item in items or ():
        name, sep, text = str(item).partition("=")
        if not sep:
            raise OptionError(f"--fix {item!r} must be NAME=VALUE, e.g. gamma=1.35e-3")
        try:
            value = float(text)
        except ValueError:
            raise OptionError(f"--fix {item!r}: {text!r} is not a number") from None
        key = parameter_name(name.strip())
        positive = key in ("theta_D_K", "scale")
        if not (np.isfinite(value) and (value > 0 if positive else value >= 0)):
            raise OptionError(f"--fix {item!r}: the value must be finite and {'> 0' if positive else '>= 0'}")
        out[key] = value
    return out


def _start_theta(model, t, y, s, fixed):
    grid = np.geomspace(20.0, 3000.0, 48)
    base = {**STARTS, **fixed}
    cost = [np.sum(((model.heat_capacity_p(t, {**base, "theta_D_K": th}) - y) / s) ** 2) for th in grid]
    return float(grid[int(np.argmin(cost))])


def fit_measured_heat_capacity(measured: MeasuredHeatCapacity, model, fixed=None, fit_range=None, initial=None):
    r"""Fit the free parameters of ``model`` to measured C_p(T).

    Parameters
    ----------
    measured : MeasuredHeatCapacity
    model : HeatCapacityModel
    fixed : dict, optional
        Parameters held at a value, by name or alias.
    fit_range : tuple of float, optional
        (T_min, T_max) [K]; default all points.
    initial : dict, optional
        Starting values of free parameters.

    Returns
    -------
    CalorimetryFit

    Notes
    -----
    Minimises :math:`\chi^2 = \sum_j [(C_p^{model}(T_j) - C_j)/\sigma_j]^2`
    with the given standard uncertainties σ_j, else σ_j = C_j (relative
    weights).  Covariance :math:`(J^TJ)^{-1}` times the Birge factor
    :math:`\max(1, \chi^2_\nu)` with given σ (a model that misses the
    data beyond their uncertainties widens the parameter uncertainties),
    times :math:`\chi^2_\nu` with relative weights.  Correlation
    :math:`r_{ij} = \Sigma_{ij}/\sqrt{\Sigma_{ii}\Sigma_{jj}}`.

    References
    ----------
    .. [1] W. H. Press et al., *Numerical Recipes*, 3rd ed. (2007), §15.4.
    .. [2] R. T. Birge, Phys. Rev. 40, 207 (1932).

    Examples
    --------
    >>> from thermo.calorimetry.models import HeatCapacityModel
    >>> m = HeatCapacityModel(atoms=1, electronic=False, dilation="none")
    >>> t = np.linspace(20.0, 300.0, 15)
    >>> data = MeasuredHeatCapacity(t, m.heat_capacity_p(t, {"theta_D_K": 350.0}), None, "J/(mol K)", "x")
    >>> round(fit_measured_heat_capacity(data, m).values["theta_D_K"], 6)
    350.0
    """
    fixed = {parameter_name(k): float(v) for k, v in (fixed or {}).items()}
    unknown = [k for k in fixed if k not in model.parameters]
    if unknown:
        raise OptionError(f"cannot fix {', '.join(unknown)}: not a parameter of {model.description} "
                          f"(parameters: {', '.join(model.parameters)})")
    data = measured if fit_range is None else measured.restricted(*fit_range)
    t, y = data.temperature_K, data.heat_capacity_J_per_mol_K
    given = data.uncertainty_J_per_mol_K is not None
    s = data.uncertainty_J_per_mol_K if given else y
    free = tuple(p for p in model.parameters if p not in fixed)
    warnings = []
    start = {**STARTS, **fixed}
    if "theta_D_K" in free:
        start["theta_D_K"] = _start_theta(model, t, y, s, fixed)
    start.update({parameter_name(k): float(v) for k, v in (initial or {}).items()})
    values = {k: start[k] for k in model.parameters}
    p = len(free)
    if p:
        if t.size <= p:
            raise OptionError(f"{t.size} points in the fit range cannot determine {p} parameters")

        def evaluate(tt, vector):
            return model.heat_capacity_p(tt, {**values, **dict(zip(free, vector))})

        best = _minimise(evaluate, t, y, s, np.array([start[k] for k in free]))
        values.update(dict(zip(free, (float(v) for v in best))))
        cov = _covariance(evaluate, t, s, np.array([values[k] for k in free]))
    else:
        cov = np.zeros((0, 0))
    cp = model.heat_capacity_p(t, values)
    chi2 = float(np.sum(((cp - y) / s) ** 2))
    chi2_nu = chi2 / (t.size - p) if t.size > p else float("nan")
    factor = max(1.0, chi2_nu) if given else chi2_nu
    cov = cov * factor
    if given and chi2_nu > 4.0:
        warnings.append(f"the model misses the data beyond their uncertainties (reduced χ² = {chi2_nu:.3g}); "
                        f"parameter uncertainties widened by √χ²_ν = {np.sqrt(chi2_nu):.3g}")
    errors = np.sqrt(np.clip(np.diag(cov), 0.0, None)) if p else np.zeros(0)
    with np.errstate(invalid="ignore", divide="ignore"):
        corr = cov / np.outer(errors, errors) if p else cov
    for i in range(p):
        for j in range(i + 1, p):
            if np.isfinite(corr[i, j]) and abs(corr[i, j]) > STRONG_CORRELATION:
                warnings.append(f"{free[i]} and {free[j]} are strongly correlated (r = {corr[i, j]:+.3f}); "
                                "fix one of them or widen the fit range")
    uncertainties = {k: 0.0 for k in model.parameters}
    uncertainties.update(dict(zip(free, (float(e) for e in errors))))
    residuals = residual_table(model, values, data)
    rel = residuals[column_name("relative_residual")].to_numpy()
    return CalorimetryFit(model, values, uncertainties, free, corr, cov, chi2_nu, residuals,
                          float(np.max(np.abs(rel))), "given uncertainties" if given else
                          "relative (no uncertainties given)", (float(t.min()), float(t.max())), warnings)


def _minimise(evaluate, t, y, s, start):
    """Parameters minimising χ², found in units of the start values.

    Positivity is kept by evaluating the model at |x|·start (smooth at any
    solution away from 0).  Unbounded trust region with central-difference
    Jacobian: with correlated parameters (γ and A) a bounded solver stopped
    short of the minimum in our tests.
    """
    def residual(x):
        return (evaluate(t, np.abs(x) * start) - y) / s

    result = optimize.least_squares(residual, np.ones_like(start), method="trf", jac="3-point",
                                    x_scale="jac", xtol=1e-13, ftol=1e-13, gtol=1e-13, max_nfev=2000)
    return np.abs(result.x) * start


def _covariance(evaluate, t, s, best):
    """(JᵀJ)⁻¹ of the weighted residuals, J by central differences at ``best``.

    (The Jacobian returned by a bounded trust-region solver is rescaled for
    its own use, so it is not taken from there.)  ``inf`` everywhere when the
    data do not determine the parameters.
    """
    jac = np.empty((t.size, best.size))
    for k in range(best.size):
        step = 1e-6 * max(abs(best[k]), 1e-300)
        up, down = best.copy(), best.copy()
        up[k] += step
        down[k] -= step
        jac[:, k] = (evaluate(t, up) - evaluate(t, down)) / (2 * step) / s
    if np.linalg.matrix_rank(jac) < best.size:
        return np.full((best.size, best.size), np.inf)
    return np.linalg.inv(jac.T @ jac)


def residual_table(model, values, measured):
    """Measured C_p, the model and its terms, residuals at the measured T.

    Returns
    -------
    pandas.DataFrame
        Columns named by :mod:`thermo.columns` (per mole of formula units).
    """
    t, y = measured.temperature_K, measured.heat_capacity_J_per_mol_K
    parts = model.parts(t, values)
    sigma = measured.uncertainty_J_per_mol_K
    table = {column_name("temperature"): t, column_name("heat_capacity_p_measured"): y,
             column_name("heat_capacity_p_uncertainty"): np.full_like(t, np.nan) if sigma is None else sigma,
             column_name("heat_capacity_p_model"): parts["heat_capacity_p"],
             column_name("heat_capacity_lattice"): parts["lattice"],
             column_name("heat_capacity_electronic"): parts["electronic"],
             column_name("heat_capacity_dilation"): parts["dilation"],
             column_name("heat_capacity_p_residual"): parts["heat_capacity_p"] - y,
             column_name("relative_residual"): (parts["heat_capacity_p"] - y) / y}
    return pd.DataFrame(table)
