"""Third-law entropy S°(T) = ∫₀ᵀ C_p/T dT and H°(T) − H°(0) = ∫₀ᵀ C_p dT, each with its uncertainty.

From data: the integral between the measured points
(:mod:`.integration`: spline value, propagated point uncertainties and an
interpolation term, all at cost linear in the number of points) plus S and H
below the first point T₁ from the admissible low-temperature forms
(:mod:`.extrapolation`: their middle and the uncertainty of their spread).
From a fitted model: Gauss–Legendre quadrature from 0 K, the parameter
covariance, a model-discrepancy term when the residuals are structured
(:mod:`.discrepancy`) and the spread of the forms below T₁.

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

from ..errors import DosInputError, OptionError
from .extrapolation import combine_forms, distance_to_forms, t3_form
from .fitted_forms import debye_form, dos_form, optical_form
from .debye_interpolation import debye_interpolated_integrals
from .integration import cumulative_integral
from .models import STARTS as _STARTS

#: Standard temperature of S° [K].
STANDARD_K = 298.15
_NODES, _WEIGHTS = np.polynomial.legendre.leggauss(24)


def low_temperature_forms(temperatures, heat_capacity, sigma=None, gamma=0.0, gamma_uncertainty=0.0,
                          atoms=None, dos=None):
    """The forms below the first point that the data alone give (T³; Debye, acoustic + optical with atoms; the DOS).

    Parameters
    ----------
    temperatures, heat_capacity : array_like
        Measured T [K] (increasing) and C_p [J/(mol K)].
    sigma : array_like, optional
        Standard uncertainties of C_p; None: relative weights, scale from the scatter.
    gamma, gamma_uncertainty : float
        γ [J/(mol K²)] and its standard uncertainty (0 for an insulator).
    atoms : int, optional
        Atoms per formula unit; enables the Debye form (3n modes).
    dos : PhononDOS, optional
        Enables the scaled-DOS form.

    Returns
    -------
    list of LowTemperatureForm

    Examples
    --------
    >>> t = np.array([5.0, 6.0, 7.0, 20.0])
    >>> [f.name for f in low_temperature_forms(t, 1e-4 * t ** 3, atoms=1)]
    ['debye T³', 'debye']
    """
    t = np.asarray(temperatures, dtype=float)
    c = np.asarray(heat_capacity, dtype=float)
    absolute = sigma is not None
    s = np.asarray(sigma, dtype=float) if absolute else c
    forms = [t3_form(t, c, s, gamma, gamma_uncertainty, absolute)]
    if atoms is not None:
        for make in (debye_form, optical_form):
            form = make(t, c, s, atoms, gamma, gamma_uncertainty, absolute)
            if form is not None:
                forms.append(form)
    if dos is not None:
        form = dos_form(dos, t, c, s, gamma, gamma_uncertainty, absolute)
        if form is not None:
            forms.append(form)
    return forms


def third_law_from_data(temperatures, heat_capacity, temperature, sigma=None, gamma=0.0, atoms=None,
                        forms=(), gamma_uncertainty=0.0, dos=None, data_forms=None, non_lattice=None):
    r"""S°(T) and H°(T) − H°(0) from measured C_p, with the part below the first point and its spread.

    Parameters
    ----------
    temperatures, heat_capacity : array_like, shape (N,)
        Measured T [K] (increasing, > 0) and C_p [J/(mol K)].
    temperature : float or array_like
        Where to evaluate [K], first measured T <= T <= last.
    sigma : array_like, optional
        Standard uncertainties of C_p [J/(mol K)]; None: no propagated part.
    gamma : float
        Electronic coefficient γ [J/(mol K²)] kept in the low-T forms; 0 for
        an insulator.
    atoms : int, optional
        Atoms per formula unit (enables the Debye form below T₁).
    forms : sequence of LowTemperatureForm
        Further admissible forms (e.g. the fitted model's, from
        :func:`model_form`).
    gamma_uncertainty : float
        Standard uncertainty of γ.
    dos : PhononDOS, optional
        Enables the scaled-DOS form below T₁.
    data_forms : list of LowTemperatureForm, optional
        The forms of the data if already made (default
        :func:`low_temperature_forms` of these data, σ, γ, atoms, DOS).
    non_lattice : callable, optional
        ``non_lattice(T)`` [J/(mol K)], the non-lattice part of C_p (γT and
        C_p − C_v of a fitted model) for the θ(T) interpolation; default γT.

    Returns
    -------
    dict
        ``entropy`` [J/(mol K)], ``entropy_uncertainty``, ``enthalpy``
        [J/mol], ``enthalpy_uncertainty`` (arrays like ``temperature``);
        ``extrapolated_entropy``, ``extrapolated_entropy_uncertainty``,
        ``extrapolated_enthalpy``, ``extrapolated_enthalpy_uncertainty``
        (below T₁, floats); ``below_first_point`` (:func:`combine_forms` and
        ``temperature_K`` T₁, for :func:`third_law_from_model`); ``parts`` (each uncertainty part, arrays) and
        ``forms`` (see :func:`thermo.calorimetry.extrapolation.combine_forms`).

    Raises
    ------
    DosInputError
        The data give a negative or non-finite S or H (they oscillate between
        points, or hold unphysical values).

    Notes
    -----
    :math:`S(T) = S_{ext}(T_1) + \int_{T_1}^T C/T` and
    :math:`H(T) = H_{ext}(T_1) + \int_{T_1}^T C`, C between the points
    from the interpolated equivalent Debye temperature
    (:mod:`.debye_interpolation`, with ``atoms``, below the classical
    limit) and else from the not-a-knot cubic spline;
    :math:`u^2 = \sum_j w_j^2\sigma_j^2 + u_{interp}^2 + u_{ext}^2`
    (point uncertainties through the local-rule weights w; the difference
    of the two interpolations, or of the spline and its half grids; the
    spread of the forms below T₁).

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).
    .. [2] C. de Boor, *A Practical Guide to Splines* (2001), ch. IV.
    .. [3] JCGM 100:2008 (GUM), §5.1.

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
    _check_data(t, c, sigma)
    if np.any(where < t[0] * (1 - 1e-12)) or np.any(where > t[-1] * (1 + 1e-12)):
        raise OptionError(f"S° from data is given between the first and last measured points, "
                          f"{t[0]:g}-{t[-1]:g} K; asked for {where.min():g}-{where.max():g} K")
    where = np.clip(where, t[0], t[-1])
    if data_forms is None:
        data_forms = low_temperature_forms(t, c, sigma, gamma, gamma_uncertainty, atoms, dos)
    below = combine_forms(list(data_forms) + list(forms))
    sig = None if sigma is None else np.asarray(sigma, dtype=float)
    s_int = cumulative_integral(t, c / t, where, None if sig is None else sig / t)
    h_int = cumulative_integral(t, c, where, sig)
    if atoms is not None:
        _debye_interpolation(t, c, where, atoms, non_lattice or (lambda x: gamma * np.asarray(x)), s_int, h_int)
    entropy = below["entropy"] + s_int["value"]
    enthalpy = below["enthalpy"] + h_int["value"]
    parts = {"entropy_points": s_int["propagated"], "entropy_interpolation": s_int["interpolation"],
             "entropy_below_first_point": np.full(where.shape, below["entropy_uncertainty"]),
             "enthalpy_points": h_int["propagated"], "enthalpy_interpolation": h_int["interpolation"],
             "enthalpy_below_first_point": np.full(where.shape, below["enthalpy_uncertainty"])}
    us, uh = _combined(parts, "entropy"), _combined(parts, "enthalpy")
    bad = ~(np.isfinite(entropy) & np.isfinite(enthalpy) & (entropy >= 0) & (enthalpy >= 0))
    if np.any(bad):
        k = int(np.flatnonzero(bad)[0])
        raise DosInputError(f"the measured C_p give S = {entropy[k]:.4g} J/(mol K), H - H(0) = "
                            f"{enthalpy[k]:.4g} J/mol at {where[k]:g} K: a third-law entropy is >= 0; the data "
                            "oscillate between points or hold unphysical values")
    return {"entropy": entropy, "entropy_uncertainty": us, "enthalpy": enthalpy, "enthalpy_uncertainty": uh,
            "extrapolated_entropy": below["entropy"], "extrapolated_entropy_uncertainty": below["entropy_uncertainty"],
            "extrapolated_enthalpy": below["enthalpy"],
            "extrapolated_enthalpy_uncertainty": below["enthalpy_uncertainty"],
            "below_first_point": {**below, "temperature_K": float(t[0])},
            "parts": parts, "forms": below["forms"]}


def _integrals(function, where):
    """∫₀ˣ f/T dT and ∫₀ˣ f dT at each x, composite Gauss–Legendre (one call of f for all x)."""
    x = np.atleast_1d(np.asarray(where, dtype=float))
    fractions = np.concatenate([[0.0], np.geomspace(1e-3, 1.0, 12)])
    edges = np.maximum(x, 0.0)[:, None] * fractions[None, :]                 # (M, 13)
    a, b = edges[:, :-1, None], edges[:, 1:, None]
    nodes = 0.5 * (b - a) * _NODES + 0.5 * (a + b)                            # (M, 12, 24)
    weights = 0.5 * (b - a) * _WEIGHTS
    positive = x > 0
    if not positive.any():
        return np.zeros_like(x), np.zeros_like(x)
    cp = np.zeros(nodes.shape)
    cp[positive] = function(nodes[positive].ravel()).reshape(nodes[positive].shape)
    with np.errstate(invalid="ignore", divide="ignore"):
        per_t = np.where(nodes > 0, cp / np.where(nodes > 0, nodes, 1.0), 0.0)
    return np.sum(weights * per_t, axis=(1, 2)), np.sum(weights * cp, axis=(1, 2))


def _model_integrals(fit, where):
    """S, H of the fitted model at ``where`` and their parameter standard uncertainties."""
    values = dict(fit.values)
    s, h = _integrals(lambda x: fit.model.heat_capacity_p(x, values), where)
    names = tuple(fit.propagated)
    if not names:
        return s, h, np.zeros_like(s), np.zeros_like(h)
    gs, gh = [], []
    for name in names:
        step = 1e-5 * max(abs(values[name]), 1e-3 * _STARTS[name])
        up = _integrals(lambda x: fit.model.heat_capacity_p(x, {**values, name: values[name] + step}), where)
        down = _integrals(lambda x: fit.model.heat_capacity_p(x, {**values, name: values[name] - step}), where)
        gs.append((up[0] - down[0]) / (2 * step))
        gh.append((up[1] - down[1]) / (2 * step))
    gs, gh = np.array(gs), np.array(gh)
    cov = np.asarray(fit.propagated_covariance)
    with np.errstate(invalid="ignore"):
        us = np.sqrt(np.clip(np.einsum("im,ij,jm->m", gs, cov, gs), 0, None))
        uh = np.sqrt(np.clip(np.einsum("im,ij,jm->m", gh, cov, gh), 0, None))
    return s, h, us, uh


def model_form(fit, first_temperature):
    """The fitted model's own S and H at the first measured point, as a low-temperature form.

    Its uncertainty holds the parameter covariance and the model-discrepancy
    term δ·S (δ from :func:`thermo.calorimetry.discrepancy.residual_structure`).

    Examples
    --------
    >>> from thermo.calorimetry.models import HeatCapacityModel
    >>> from thermo.calorimetry.reading import MeasuredHeatCapacity
    >>> from thermo.calorimetry.fitting import fit_measured_heat_capacity
    >>> m = HeatCapacityModel(atoms=1, electronic=False, dilation="none")
    >>> t = np.linspace(20.0, 300.0, 15)
    >>> d = MeasuredHeatCapacity(t, m.heat_capacity_p(t, {"theta_D_K": 350.0}), None, "J/(mol K)", "x")
    >>> f = model_form(fit_measured_heat_capacity(d, m), 20.0)
    >>> f.name, bool(0 < f.entropy < 1.0)
    ('model', True)
    """
    from .extrapolation import LowTemperatureForm
    s, h, us, uh = _model_integrals(fit, [first_temperature])
    delta = fit.structure.get("discrepancy", 0.0) if fit.structure else 0.0
    return LowTemperatureForm("model", float(s[0]), float(np.hypot(us[0], delta * s[0])), float(h[0]),
                              float(np.hypot(uh[0], delta * h[0])), fit.model.description)


def third_law_from_model(fit, temperature, below_first_point=None):
    r"""S°(T), H°(T) − H°(0) of a fitted model, integrated from 0 K, with uncertainties.

    Parameters
    ----------
    fit : CalorimetryFit
        Result of :func:`thermo.calorimetry.fitting.fit_measured_heat_capacity`.
    temperature : float or array_like
        T [K], >= 0.
    below_first_point : dict, optional
        :func:`thermo.calorimetry.extrapolation.combine_forms` of the
        admissible forms below the first point T₁ (the model's own among
        them): the model's S(T₁) is then uncertain by its rms distance from a
        truth spread over their range
        (:func:`thermo.calorimetry.extrapolation.distance_to_forms`).

    Returns
    -------
    dict
        ``entropy`` [J/(mol K)], ``entropy_uncertainty``, ``enthalpy``
        [J/mol], ``enthalpy_uncertainty``; arrays like ``temperature``;
        ``parts``: ``parameters``, ``model_discrepancy``,
        ``below_first_point`` for S (``entropy_*``) and H (``enthalpy_*``).

    Notes
    -----
    :math:`S = \int_0^T C_p^{model}/T'\,dT'` by 24-point Gauss–Legendre
    on 12 geometric sub-intervals of [0, T];
    :math:`u(S)^2 = g^T\Sigma g + (\delta S)^2 + u_{ext}^2` with
    :math:`g = \partial S/\partial p` by central differences, Σ the
    covariance of the fitted (and held-with-uncertainty) parameters, δ the
    relative model discrepancy of structured residuals and u_ext the spread
    of the forms below the first point.

    References
    ----------
    .. [1] JCGM 100:2008 (GUM), §5.1.
    .. [2] M. C. Kennedy, A. O'Hagan, J. R. Statist. Soc. B 63, 425 (2001).

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
    s, h, us, uh = _model_integrals(fit, where)
    delta = fit.structure.get("discrepancy", 0.0) if fit.structure else 0.0
    below_s = below_h = 0.0
    if below_first_point is not None:
        own = below_first_point["forms"].get("model")
        if own is None:
            s1, h1, _, _ = _model_integrals(fit, [below_first_point["temperature_K"]])
            s1, h1 = float(s1[0]), float(h1[0])
        else:
            s1, h1 = own["entropy_J_per_mol_K"]["value"], own["enthalpy_J_per_mol"]["value"]
        below_s = distance_to_forms(s1, below_first_point, "entropy")
        below_h = distance_to_forms(h1, below_first_point, "enthalpy")
    parts = {"entropy_parameters": us, "entropy_model_discrepancy": delta * s,
             "entropy_below_first_point": np.full(s.shape, below_s),
             "enthalpy_parameters": uh, "enthalpy_model_discrepancy": delta * h,
             "enthalpy_below_first_point": np.full(h.shape, below_h)}
    return {"entropy": s, "entropy_uncertainty": _combined(parts, "entropy"), "enthalpy": h,
            "enthalpy_uncertainty": _combined(parts, "enthalpy"), "parts": parts}


#: Largest |C_p| and σ the integrals take [J/(mol K)] (the reader's own bound is lower, per atoms).
MAX_HEAT_CAPACITY = 1e9


def _check_data(t, c, sigma):
    """One-line errors for data no integral should see (the reader refuses them first)."""
    values = [c] if sigma is None else [c, np.asarray(sigma, dtype=float)]
    if t.shape != c.shape or not np.all(np.isfinite(t)) or np.any(t <= 0) or np.any(np.diff(t) <= 0):
        raise OptionError("temperatures must be finite, > 0 K and increasing, one per heat capacity")
    if not all(np.all(np.isfinite(v)) and np.all(v >= 0) and np.all(v <= MAX_HEAT_CAPACITY) for v in values):
        raise OptionError(f"heat capacities and uncertainties must be finite, >= 0 and <= {MAX_HEAT_CAPACITY:g} "
                          "J/(mol K)")


def _debye_interpolation(t, c, where, atoms, non_lattice, s_int, h_int):
    """Values from the θ(T) interpolation up to its reach (the spline beyond), uncertainty from the difference."""
    other = debye_interpolated_integrals(t, c, where, atoms, non_lattice)
    if other is None:
        return
    inside = where <= other["reach_K"]
    spline_reach = {"entropy": cumulative_integral(t, c / t, [other["reach_K"]])["value"][0],
                    "enthalpy": cumulative_integral(t, c, [other["reach_K"]])["value"][0]}
    for out, key in ((s_int, "entropy"), (h_int, "enthalpy")):
        shift = other[f"{key}_at_reach"] - spline_reach[key]     # beyond the reach: θ value at it + the spline on
        difference = np.where(inside, np.abs(out["value"] - np.where(inside, other[key], 0.0)), abs(shift))
        out["interpolation"] = np.where(inside, difference, np.maximum(difference, out["interpolation"]))
        out["value"] = np.where(inside, other[key], out["value"] + shift)


def _combined(parts, quantity):
    """√(sum of squares) of the uncertainty parts of ``quantity`` (independent parts)."""
    return np.sqrt(sum(v ** 2 for k, v in parts.items() if k.startswith(quantity)))
