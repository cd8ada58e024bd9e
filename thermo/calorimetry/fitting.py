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
from scipy import constants as sc

from ..columns import column_name
from ..errors import FitError, OptionError
from ..models.debye import debye_heat_capacity_fraction
from ..models.fitting import checked_least_squares
from .discrepancy import residual_structure
from .models import LIMITS, MAY_BE_ZERO, STARTS, parameter_name
from .reading import MeasuredHeatCapacity

#: |r| above which two fitted parameters are reported as strongly correlated.
STRONG_CORRELATION = 0.95
#: Evaluation budget of the least-squares solver, per free parameter.
EVALUATIONS_PER_PARAMETER = 400


@dataclass(frozen=True)
class CalorimetryFit:
    """Outcome of :func:`fit_measured_heat_capacity`.

    Attributes
    ----------
    model : HeatCapacityModel
    values, uncertainties : dict
        Every model parameter [their units]; held ones carry the uncertainty
        they were given (0 when none).
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
    fit_range_K : tuple of float
    warnings : list of str
    propagated : tuple of str
        Free parameters, then held parameters given with an uncertainty: the
        order of ``propagated_covariance``.
    propagated_covariance : numpy.ndarray
        Covariance of ``propagated``: a held parameter's uncertainty moves the
        fitted ones through the fit (first-order sensitivity).
    structure : dict
        :func:`thermo.calorimetry.discrepancy.residual_structure` of the residuals.
    evaluations : int
        Model evaluations the least-squares solver spent.
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
    propagated: tuple = ()
    propagated_covariance: np.ndarray = field(default_factory=lambda: np.zeros((0, 0)))
    structure: dict = field(default_factory=dict)
    evaluations: int = 0

    def heat_capacity_p(self, temperatures):
        """Fitted C_p(T) [J/(mol K)]."""
        return self.model.heat_capacity_p(temperatures, self.values)


def parse_fixed(items):
    """``["gamma=1.35e-3", "A=4e-6±1e-6", ...]`` → ``{"gamma_J_per_mol_K2": 0.00135, ...}``.

    A value may carry its standard uncertainty after ``±`` or ``+-``; it is
    then returned as ``(value, uncertainty)`` and propagated into the fitted
    parameters and S°, H°.  Values outside the parameter's physical range
    (:data:`thermo.calorimetry.models.LIMITS`) are refused.

    Examples
    --------
    >>> parse_fixed(["gamma=1.35e-3", "theta_D=400"])
    {'gamma_J_per_mol_K2': 0.00135, 'theta_D_K': 400.0}
    >>> parse_fixed(["gamma=1.35e-3+-0.05e-3"])
    {'gamma_J_per_mol_K2': (0.00135, 5e-05)}
    """
    out = {}
    for item in items or ():
        name, sep, text = str(item).partition("=")
        if not sep:
            raise OptionError(f"--fix {item!r} must be NAME=VALUE, e.g. gamma=1.35e-3")
        parts = text.replace("+-", "±").split("±")
        try:
            numbers = [float(p) for p in parts]
        except ValueError:
            raise OptionError(f"--fix {item!r}: {text!r} is not a number (or VALUE±UNCERTAINTY)") from None
        if len(numbers) > 2:
            raise OptionError(f"--fix {item!r}: give VALUE or VALUE±UNCERTAINTY")
        key = parameter_name(name.strip())
        out[key] = numbers[0] if len(numbers) == 1 else (numbers[0], numbers[1])
        _held({key: out[key]}, f"--fix {item!r}: ")
    return out


def _held(fixed, where=""):
    """Held parameters as ``{name: (value, uncertainty)}``, checked against :data:`LIMITS`."""
    held = {}
    for name, given in (fixed or {}).items():
        key = parameter_name(name)
        value, u = (given if isinstance(given, (tuple, list)) else (given, 0.0))
        try:
            value, u = float(value), float(u)
        except (TypeError, ValueError):
            raise OptionError(f"{where}{key} must be a number") from None
        low, high = LIMITS[key]
        if not (np.isfinite(value) and low <= value <= high and (value > 0 or key in MAY_BE_ZERO)):
            raise OptionError(f"{where}{key} = {value:g} lies outside its physical range {low:g} to {high:g}")
        if not (np.isfinite(u) and u >= 0 and u <= high):
            raise OptionError(f"{where}the uncertainty of {key} must be finite and >= 0, got {u:g}")
        held[key] = (value, u)
    return held


def _start_theta(model, t, y, s, fixed):
    """Best θ_D of a log grid 20-3000 K with the other parameters at their starts (one vectorised pass
    over at most 200 of the points: a start needs no more, and memory stays bounded)."""
    grid = np.geomspace(20.0, 3000.0, 48)
    base = {**STARTS, **fixed}
    pick = np.unique(np.linspace(0, t.size - 1, min(t.size, 200)).astype(int))
    t, y, s = t[pick], y[pick], s[pick]
    y_of_grid = (grid[:, None] / t[None, :]).ravel()
    lattice = 3 * int(model.atoms) * sc.R * debye_heat_capacity_fraction(y_of_grid).reshape(grid.size, t.size)
    cp = model.completed(np.broadcast_to(t, lattice.shape), lattice, base)["heat_capacity_p"]
    cost = np.sum(((cp - y) / s) ** 2, axis=1)
    return float(grid[int(np.argmin(cost))])


def fit_measured_heat_capacity(measured: MeasuredHeatCapacity, model, fixed=None, fit_range=None, initial=None):
    r"""Fit the free parameters of ``model`` to measured C_p(T).

    Parameters
    ----------
    measured : MeasuredHeatCapacity
    model : HeatCapacityModel
    fixed : dict, optional
        Parameters held at a value, by name or alias; a value may be
        ``(value, standard uncertainty)`` — e.g. γ known from an electronic
        DOS — whose uncertainty is propagated into the fitted parameters and
        into S°, H° of the model.
    fit_range : tuple of float, optional
        (T_min, T_max) [K]; default all points.
    initial : dict, optional
        Starting values of free parameters.

    Returns
    -------
    CalorimetryFit

    Raises
    ------
    FitError
        The least-squares solver did not converge, or a parameter ran out of
        its physical range (:data:`thermo.calorimetry.models.LIMITS`).

    Notes
    -----
    Minimises :math:`\chi^2 = \sum_j [(C_p^{model}(T_j) - C_j)/\sigma_j]^2`
    with the given standard uncertainties σ_j, else σ_j = C_j (relative
    weights), by Levenberg–Marquardt in ln θ_D (ln s) and in γ, A on a
    linear scale; a γ or A that comes out below 0 is held at 0 (stated in
    ``warnings``).  Covariance :math:`(J^TJ)^{-1}` (J by central
    differences) times the Birge factor :math:`\max(1, \chi^2_\nu)` with
    given σ, times :math:`\chi^2_\nu` with relative weights.  A held
    parameter h with uncertainty u_h moves the free ones by
    :math:`G = -(J_f^TJ_f)^{-1}J_f^TJ_h`, adding :math:`G u_h^2 G^T`.
    Correlation :math:`r_{ij} = \Sigma_{ij}/\sqrt{\Sigma_{ii}\Sigma_{jj}}`.

    References
    ----------
    .. [1] W. H. Press et al., *Numerical Recipes*, 3rd ed. (2007), §15.4-15.5.
    .. [2] R. T. Birge, Phys. Rev. 40, 207 (1932).
    .. [3] JCGM 100:2008 (GUM), §5.1-5.2.

    Examples
    --------
    >>> from thermo.calorimetry.models import HeatCapacityModel
    >>> m = HeatCapacityModel(atoms=1, electronic=False, dilation="none")
    >>> t = np.linspace(20.0, 300.0, 15)
    >>> data = MeasuredHeatCapacity(t, m.heat_capacity_p(t, {"theta_D_K": 350.0}), None, "J/(mol K)", "x")
    >>> round(fit_measured_heat_capacity(data, m).values["theta_D_K"], 6)
    350.0
    """
    held = _held(fixed)
    unknown = [k for k in held if k not in model.parameters]
    if unknown:
        raise OptionError(f"cannot fix {', '.join(unknown)}: not a parameter of {model.description} "
                          f"(parameters: {', '.join(model.parameters)})")
    data = measured if fit_range is None else measured.restricted(*fit_range)
    t, y = data.temperature_K, data.heat_capacity_J_per_mol_K
    given = data.uncertainty_J_per_mol_K is not None
    s = data.uncertainty_J_per_mol_K if given else y
    warnings = []
    fixed_values = {k: v for k, (v, _) in held.items()}
    free = tuple(p for p in model.parameters if p not in held)
    start = {**STARTS, **fixed_values}
    if "theta_D_K" in free:
        start["theta_D_K"] = _start_theta(model, t, y, s, fixed_values)
    start.update({parameter_name(k): float(v) for k, v in (initial or {}).items()})
    if len(free) and t.size <= len(free):
        raise OptionError(f"{t.size} points in the fit range cannot determine {len(free)} parameters")
    values = {k: start[k] for k in model.parameters}
    evaluations = 0
    while free:
        best, spent = _minimise(model, values, free, t, y, s)
        evaluations += spent
        negative = [k for k in free if k in MAY_BE_ZERO and best[k] < 0]
        if not negative:
            values.update(best)
            break
        for k in negative:
            warnings.append(f"{k} came out below 0 ({best[k]:.3g}); held at 0")
            held[k] = (0.0, 0.0)
            values[k] = 0.0
        free = tuple(p for p in free if p not in negative)
    for k in free:
        low, high = LIMITS[k]
        if not low <= values[k] <= high:
            raise FitError(f"the fit drove {k} to {values[k]:.3g}, outside its physical range {low:g} to "
                           f"{high:g}: the data do not determine it; hold it with --fix or change the model")
    uncertain = tuple(k for k, (_, u) in held.items() if u > 0)
    cp = model.heat_capacity_p(t, values)
    p = len(free)
    chi2 = float(np.sum(((cp - y) / s) ** 2))
    chi2_nu = chi2 / (t.size - p) if t.size > p else float("nan")
    factor = max(1.0, chi2_nu) if given else chi2_nu
    full = _covariance(model, values, free, uncertain, held, t, s, factor)
    cov = full[:p, :p]
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
    uncertainties = {k: held[k][1] if k in held else 0.0 for k in model.parameters}
    uncertainties.update({k: float(np.sqrt(max(full[i, i], 0.0))) for i, k in enumerate(free)})
    residuals = residual_table(model, values, data)
    rel = residuals[column_name("relative_residual")].to_numpy()
    structure = residual_structure(rel, None if not given else s / y, p, t)
    return CalorimetryFit(model, values, uncertainties, free, corr, cov, chi2_nu, residuals,
                          float(np.max(np.abs(rel))), "given uncertainties" if given else
                          "relative (no uncertainties given)", (float(t.min()), float(t.max())), warnings,
                          free + uncertain, full, structure, evaluations)


def _minimise(model, values, free, t, y, s):
    """Free parameters minimising χ² (dict) and the evaluations spent.

    θ_D and s are fitted as ln(p/start) (positive, any scale), γ and A as
    p/start (linear, may pass 0); Levenberg–Marquardt with forward-difference
    Jacobian, status checked by :func:`thermo.models.fitting.checked_least_squares`.
    """
    start = np.array([values[k] if values[k] > 0 else STARTS[k] for k in free])
    linear = np.array([k in MAY_BE_ZERO for k in free])

    def parameters(x):
        return np.where(linear, x, np.exp(np.clip(x, -30.0, 30.0))) * start

    def residual(x):
        return (model.heat_capacity_p(t, {**values, **dict(zip(free, parameters(x)))}) - y) / s

    x0 = np.where(linear, np.array([values[k] for k in free]) / start, 0.0)
    what = f"{', '.join(free)} of {model.description}"
    result = checked_least_squares(residual, x0, what, method="lm", xtol=1e-12, ftol=1e-12, gtol=1e-12,
                                   max_nfev=EVALUATIONS_PER_PARAMETER * len(free))
    return dict(zip(free, (float(v) for v in parameters(result.x)))), int(result.nfev)


def _jacobian(model, values, names, t, s):
    """∂r/∂p of the weighted residuals by central differences, columns in ``names`` order."""
    jac = np.empty((t.size, len(names)))
    for k, name in enumerate(names):
        step = 1e-6 * max(abs(values[name]), 1e-3 * STARTS[name])
        up = model.heat_capacity_p(t, {**values, name: values[name] + step})
        down = model.heat_capacity_p(t, {**values, name: values[name] - step})
        jac[:, k] = (up - down) / (2 * step) / s
    return jac


def _covariance(model, values, free, uncertain, held, t, s, factor):
    """Covariance of the free + uncertain held parameters (see Notes of the fit).

    ``inf`` where the data do not determine the free parameters (rank-deficient J).
    """
    p, q = len(free), len(uncertain)
    full = np.zeros((p + q, p + q))
    u2 = np.diag([held[k][1] ** 2 for k in uncertain])
    full[p:, p:] = u2
    if not p:
        return full
    jac = _jacobian(model, values, free, t, s)
    if np.linalg.matrix_rank(jac) < p:
        full[:p, :] = np.inf
        full[:, :p] = np.inf
        return full
    inverse = np.linalg.inv(jac.T @ jac)
    full[:p, :p] = inverse * factor
    if q:
        g = -inverse @ jac.T @ _jacobian(model, values, uncertain, t, s)
        full[:p, :p] += g @ u2 @ g.T
        full[:p, p:] = g @ u2
        full[p:, :p] = (g @ u2).T
    return full


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
