"""Least-squares fits of model heat capacities to C_v(T) data or to a DOS.

References
----------
.. [1] W. H. Press, S. A. Teukolsky, W. T. Vetterling, B. P. Flannery,
   *Numerical Recipes*, 3rd ed. (Cambridge University Press, 2007), §15.4-15.5
   (covariance of least-squares parameters from the Jacobian).
.. [2] JCGM 100:2008, *Evaluation of measurement data — Guide to the
   expression of uncertainty in measurement* (BIPM, 2008), §5.1 (standard
   uncertainty).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from scipy import optimize

from ..errors import FitError, OptionError
from ..columns import column_name
from ..tables import tabulate
from .debye import debye_heat_capacity
from .einstein import einstein_heat_capacity

#: Model heat capacities C_v(T, θ, modes) [J/(mol K)] by name.
HEAT_CAPACITY_MODELS = {"einstein": einstein_heat_capacity, "debye": debye_heat_capacity}
#: Temperatures in a DOS fit range when none are given.
FIT_POINTS = 60
_CV = column_name("heat_capacity_v")


@dataclass(frozen=True)
class FitResult:
    """Outcome of a least-squares fit.

    Attributes
    ----------
    value : float
        The (first) fitted parameter, a temperature [K].
    uncertainty : float
        Its standard uncertainty [K] (0 for exact data).
    fit_range_K : tuple of float
        Lowest and highest temperature fitted [K].
    parameters, uncertainties : tuple of float
        All fitted parameters and their standard uncertainties [K].
    rms_residual_J_per_mol_K : float
        Root-mean-square misfit of C_v [J/(mol K)].
    points : int
        Number of temperatures fitted.
    """

    value: float
    uncertainty: float
    fit_range_K: tuple
    parameters: tuple = field(default=())
    uncertainties: tuple = field(default=())
    rms_residual_J_per_mol_K: float = 0.0
    points: int = 0


#: Most residual evaluations a least-squares call may spend (per call, all parameters).
MAX_EVALUATIONS = 2000


def checked_least_squares(residual, start, what, **options):
    r""":func:`scipy.optimize.least_squares` whose outcome is checked.

    Parameters
    ----------
    residual : callable
        ``residual(x) -> array`` of weighted residuals [1].
    start : array_like
        Starting point.
    what : str
        The fit in words, for the message (``"θ_D, γ, A of Debye + γT"``).
    **options
        Passed on (method, bounds, tolerances, ``max_nfev`` — default
        :data:`MAX_EVALUATIONS`).

    Returns
    -------
    scipy.optimize.OptimizeResult

    Raises
    ------
    FitError
        The solver stopped without meeting a convergence criterion
        (``status <= 0``: evaluation budget spent, or improper input) or
        returned non-finite parameters or residuals; one line saying which fit,
        after how many evaluations and the solver's reason.

    Notes
    -----
    Statuses 1-4 of MINPACK/trust-region (gradient, cost, step or both small)
    count as converged; 0 (maximum number of evaluations) and -1 do not.

    References
    ----------
    .. [1] J. J. Moré, "The Levenberg-Marquardt algorithm: implementation and
       theory", in *Numerical Analysis* (Dundee 1977), ed. G. A. Watson, vol. 630
       (Springer, 1978), pp. 105-116.

    Examples
    --------
    >>> r = checked_least_squares(lambda x: x - 2.0, [1.0], "a test")
    >>> round(float(r.x[0]), 9)
    2.0
    >>> checked_least_squares(lambda x: (x - 2.0) ** 2 + 1.0, [1e6], "a test", max_nfev=2)
    Traceback (most recent call last):
    ...
    thermo.errors.FitError: the fit of a test did not converge after 2 evaluations (The maximum number of function evaluations is exceeded.); fix a parameter, narrow the range or simplify the model
    """
    options.setdefault("max_nfev", MAX_EVALUATIONS)
    try:
        with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
            result = optimize.least_squares(residual, np.asarray(start, dtype=float), **options)
    except ValueError as exc:
        if "finite" not in str(exc):
            raise
        raise FitError(f"the fit of {what} cannot start: the model is not finite at the start values") from None
    if result.status <= 0:
        raise FitError(f"the fit of {what} did not converge after {result.nfev} evaluations "
                       f"({' '.join(str(result.message).split())}); fix a parameter, narrow the range or "
                       "simplify the model")
    if not (np.all(np.isfinite(result.x)) and np.all(np.isfinite(result.fun))):
        raise FitError(f"the fit of {what} ended on non-finite values; check the data and the start values")
    return result


def least_squares_fit(model, temperatures, values, initial, sigma=None, absolute_sigma=False):
    r"""Fit positive parameters p of ``model(T, p)`` to values at T.

    Parameters
    ----------
    model : callable
        ``model(t, params) -> array`` like ``values``.
    temperatures : array_like, shape (M,)
        Temperatures [K].
    values : array_like, shape (M,)
        Data (e.g. C_v [J/(mol K)]).
    initial : sequence of float
        Starting parameters, > 0.
    sigma : array_like or float, optional
        Standard uncertainties of ``values`` (weights 1/σ); by default all
        points weigh the same (σ = max|values|, so that the result does not
        depend on the scale of the data).
    absolute_sigma : bool
        If True the covariance uses σ as given; otherwise it is scaled by
        the reduced χ² (residual variance), as when σ is unknown.

    Returns
    -------
    FitResult
        ``value``/``uncertainty`` of the first parameter, and all of them.

    Notes
    -----
    Minimises :math:`\chi^2 = \sum_j r_j^2`, :math:`r_j = (f(T_j;p) - y_j)/\sigma_j`
    (trust-region reflective, bounds :math:`p > 0`).  Covariance
    :math:`\mathrm{cov}(p) = (J^TJ)^{-1} s^2` with :math:`s^2 = \chi^2/(M-P)`
    (or 1 with ``absolute_sigma``); a parameter the data do not determine
    (rank-deficient J) gets an infinite uncertainty.

    References
    ----------
    .. [1] W. H. Press et al., *Numerical Recipes*, 3rd ed. (2007), §15.4.

    Examples
    --------
    >>> t = np.linspace(1.0, 10.0, 10)
    >>> r = least_squares_fit(lambda t, p: p[0] * t, t, 2.5 * t, [1.0])
    >>> round(r.value, 9), r.uncertainty < 1e-9
    (2.5, True)
    """
    t = np.asarray(temperatures, dtype=float)
    y = np.asarray(values, dtype=float)
    p0 = np.asarray(initial, dtype=float)
    if t.size <= p0.size:
        raise OptionError(f"a fit of {p0.size} parameter(s) needs more than {p0.size} temperatures, got {t.size}")
    s = _weights(y, sigma)
    result = checked_least_squares(lambda p: (model(t, p) - y) / s, p0, "the model parameters",
                                   bounds=(1e-9 * p0, np.inf), x_scale=p0, method="trf", jac="3-point",
                                   xtol=1e-14, ftol=1e-14, gtol=1e-14)
    chi2 = float(np.sum(result.fun ** 2))
    scale = 1.0 if absolute_sigma else chi2 / (t.size - p0.size)
    errors = _standard_errors(result.jac, scale)
    rms = float(np.sqrt(np.mean((model(t, result.x) - y) ** 2)))
    return FitResult(value=float(result.x[0]), uncertainty=float(errors[0]),
                     fit_range_K=(float(t.min()), float(t.max())),
                     parameters=tuple(float(v) for v in result.x),
                     uncertainties=tuple(float(v) for v in errors),
                     rms_residual_J_per_mol_K=rms, points=int(t.size))


def _weights(y, sigma):
    """σ of each point; without σ the data scale, so that tiny C_v still fit."""
    if sigma is not None:
        return np.broadcast_to(np.asarray(sigma, dtype=float), y.shape)
    size = float(np.max(np.abs(y))) if y.size else 0.0
    if not size > 0:
        raise OptionError("the data are all zero over the fit range; choose higher temperatures")
    return np.full(y.shape, size)


def _standard_errors(jac, scale):
    """√diag((JᵀJ)⁻¹ s²); ``inf`` for parameters the data do not determine."""
    if np.linalg.matrix_rank(jac) < jac.shape[1]:
        return np.full(jac.shape[1], np.inf)
    cov = np.linalg.inv(jac.T @ jac) * scale
    return np.sqrt(np.clip(np.diag(cov), 0.0, None))


def _initial_theta(model, t, y, s, modes):
    """Best θ on a logarithmic scan 1 K ... 1e5 K (a safe start)."""
    grid = np.geomspace(1.0, 1e5, 41)
    cost = [np.sum(((model(t, th, modes) - y) / s) ** 2) for th in grid]
    return float(grid[int(np.argmin(cost))])


def fit_heat_capacity_data(kind, temperatures, heat_capacity, modes, sigma=None, absolute_sigma=False):
    r"""Fit θ of an Einstein or Debye model to C_v(T) data.

    Parameters
    ----------
    kind : {'einstein', 'debye'}
        Model.
    temperatures : array_like, shape (M,)
        Temperatures [K], > 0.
    heat_capacity : array_like, shape (M,)
        C_v per mole of formula units [J/(mol K)].
    modes : float
        Modes per formula unit carried by the model (3n) [1].
    sigma : array_like or float, optional
        Standard uncertainties of the data [J/(mol K)].
    absolute_sigma : bool
        Use σ as absolute (True) or scale by the residual variance (False).

    Returns
    -------
    FitResult
        θ [K], its standard uncertainty [K] and the fit range.

    Notes
    -----
    Model :math:`C_v(T;\theta)` from :func:`einstein_heat_capacity` or
    :func:`debye_heat_capacity`, minimised in the least-squares sense (see
    :func:`least_squares_fit`), starting from the best θ of a log scan.

    References
    ----------
    .. [1] W. H. Press et al., *Numerical Recipes*, 3rd ed. (2007), §15.4.

    Examples
    --------
    >>> t = np.linspace(20.0, 400.0, 30)
    >>> r = fit_heat_capacity_data("einstein", t, einstein_heat_capacity(t, 250.0, 3), 3)
    >>> round(r.value, 6)
    250.0
    """
    if kind not in HEAT_CAPACITY_MODELS:
        raise OptionError(f"unknown model {kind!r}; choose einstein or debye")
    model = HEAT_CAPACITY_MODELS[kind]
    t = np.asarray(temperatures, dtype=float)
    y = np.asarray(heat_capacity, dtype=float)
    if t.shape != y.shape or t.ndim != 1:
        raise OptionError("temperatures and heat capacities must be 1-D arrays of the same length")
    if np.any(t <= 0) or not np.all(np.isfinite(y)):
        raise OptionError("fitted temperatures must be > 0 K and heat capacities finite")
    start = _initial_theta(model, t, y, _weights(y, sigma), modes)
    return least_squares_fit(lambda tt, p: model(tt, p[0], modes), t, y, [start], sigma, absolute_sigma)


def default_fit_range(dos):
    """Default temperature range of DOS fits: θ_D(0)/20 to θ_D(0) [K].

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.

    Returns
    -------
    tuple of float
        (T_min, T_max) [K].

    Notes
    -----
    θ_D(0) is the logarithmic-moment Debye temperature (see
    :func:`thermo.models.moments.debye_moment_temperature`); the range spans
    the rise of C_v from about 5 % to 95 % of 3nR (a choice of ours).

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> [round(v, 6) for v in default_fit_range(debye_spectrum(300.0))]
    [15.0, 300.0]
    """
    from .moments import debye_moment_temperature
    theta = debye_moment_temperature(dos, 0)
    if not np.isfinite(theta):
        theta = debye_moment_temperature(dos, 1)
    return (theta / 20.0, theta)


def check_fit_range(fit_range):
    """Validate a (T_min, T_max) pair [K].

    Examples
    --------
    >>> check_fit_range((10, 300))
    (10.0, 300.0)
    """
    try:
        low, high = (float(v) for v in fit_range)
    except (TypeError, ValueError):
        raise OptionError(f"fit range {fit_range!r} must be two temperatures TMIN:TMAX in K") from None
    if not (np.isfinite(low) and np.isfinite(high) and 0 <= low < high):
        raise OptionError(f"fit range {low:g}:{high:g} K needs 0 <= TMIN < TMAX")
    return (low, high)


def fit_temperatures(dos, fit_range=None, points=FIT_POINTS):
    """Temperatures of a DOS fit and the DOS heat capacity there.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    fit_range : tuple of float, optional
        (T_min, T_max) [K]; :func:`default_fit_range` when None.
    points : int
        Number of evenly spaced temperatures (T = 0 is skipped).

    Returns
    -------
    t : numpy.ndarray
        Temperatures [K].
    cv : numpy.ndarray
        DOS C_v per mole of formula units [J/(mol K)].

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> d = PhononDOS(np.array([0.0, 1.0]), np.array([0.0, 6.0]), atoms=1)
    >>> fit_temperatures(d, (0.0, 20.0), points=3)[0].tolist()
    [10.0, 20.0]
    """
    low, high = check_fit_range(default_fit_range(dos) if fit_range is None else fit_range)
    t = np.linspace(low, high, int(points))
    t = t[t > 0]
    cv = tabulate(dos, t)[_CV].to_numpy()
    return t, cv


def fit_dos_theta(dos, kind, fit_range=None):
    r"""θ_E or θ_D by least squares on the DOS's C_v(T) over a temperature range.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS with n atoms per formula unit.
    kind : {'einstein', 'debye'}
        Model carrying all 3n modes.
    fit_range : tuple of float, optional
        (T_min, T_max) [K]; :func:`default_fit_range` when None.

    Returns
    -------
    FitResult
        θ [K], standard uncertainty [K] (from the misfit), fit range.

    Notes
    -----
    Minimises :math:`\sum_j [C_v^{model}(T_j;\theta) - C_v^{DOS}(T_j)]^2`
    on 60 evenly spaced temperatures.  The uncertainty reflects how badly
    one parameter describes the spectrum, not noise.

    References
    ----------
    .. [1] A. Einstein, Ann. Phys. 327, 180 (1907); P. Debye, Ann. Phys. 344,
       789 (1912).
    .. [2] W. H. Press et al., *Numerical Recipes*, 3rd ed. (2007), §15.4.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.kernels.planck import H_OVER_K_THZ
    >>> nu = np.linspace(4.9, 5.1, 201)
    >>> g = 3 * np.exp(-0.5 * ((nu - 5) / 0.01) ** 2) / (0.01 * np.sqrt(2 * np.pi))
    >>> d = PhononDOS(nu, g, atoms=1)     # 3 modes in a narrow peak at 5 THz
    >>> round(fit_dos_theta(d, "einstein", (20, 400)).value / (5 * H_OVER_K_THZ), 4)
    1.0
    """
    t, cv = fit_temperatures(dos, fit_range)
    return fit_heat_capacity_data(kind, t, cv, 3 * dos.atoms)


def fit_einstein_theta(dos, fit_range=None):
    """θ_E fitted to the DOS's C_v(T): ``fit_dos_theta(dos, 'einstein', fit_range)``.

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> fit_einstein_theta(debye_spectrum(300.0), (10, 300)).value < 300.0
    True
    """
    return fit_dos_theta(dos, "einstein", fit_range)


def fit_debye_theta(dos, fit_range=None):
    """θ_D fitted to the DOS's C_v(T): ``fit_dos_theta(dos, 'debye', fit_range)``.

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> round(fit_debye_theta(debye_spectrum(300.0)).value, 6)
    300.0
    """
    return fit_dos_theta(dos, "debye", fit_range)
