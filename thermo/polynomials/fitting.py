"""Fit Shomate, NASA 7-term and SGTE polynomials to a heat-capacity source.

Method (the same for every form): C_p is fitted by linear least squares in
relative error over the range; then the two integration constants (H and S)
are fixed by the source's values at the reference temperature (298.15 K when
inside the range, else the first source point in it), so that H and S are exactly
consistent with the fitted C_p.  A fit of two ranges sharing a midpoint
(always for NASA 7-term, on request for Shomate and SGTE) has C_p
constrained equal there, and the upper range's constants make H and S
continuous.

References
----------
.. [1] B. J. McBride, M. J. Zehe and S. Gordon, NASA/TP-2002-211556 (2002).
.. [2] NIST Chemistry WebBook, NIST Standard Reference Database 69 (Shomate form).
.. [3] A. T. Dinsdale, CALPHAD 15, 317-425 (1991).
.. [4] C. L. Lawson and R. J. Hanson, *Solving Least Squares Problems*
   (Prentice-Hall, 1974), ch. 20 (equality-constrained least squares).
"""

from __future__ import annotations

import dataclasses

import numpy as np
from scipy import constants as sc

from ..errors import OptionError
from .forms import BASES, KEYS, PROPERTIES, T_STANDARD
from .propagation import propagated_uncertainty
from .result import FitRange, PolynomialFit, fit_errors

#: Lowest temperature [K] each form is meant for (common practice: WebBook Shomate and NASA
#: condensed-phase ranges rarely start below 200 K; SGTE unary data start at 298.15 K).
LOWEST_INTENDED_K = {"shomate": 200.0, "nasa7": 200.0, "sgte": 298.15}
#: Relative error above which a fit is flagged.
ERROR_LIMIT = 1e-3
#: Default range [K].
DEFAULT_RANGE = (298.15, 1500.0)
_SCALE = {"shomate": 1.0, "nasa7": 1e-3, "sgte": 1e-3}


def check_range(t_range, form):
    """Validate a fit range ``(t_min, t_max)`` [K]; returns floats.

    Examples
    --------
    >>> check_range((298.15, 1000), "shomate")
    (298.15, 1000.0)
    """
    try:
        lo, hi = (float(v) for v in t_range)
    except (TypeError, ValueError):
        raise OptionError("the fit range must be two temperatures LO:HI in K") from None
    if not (np.isfinite(lo) and np.isfinite(hi)) or lo <= 0 or hi <= lo:
        raise OptionError(f"fit range {lo:g}:{hi:g} K must have 0 < LO < HI")
    if form not in KEYS:
        raise OptionError(f"unknown polynomial form {form!r}; choose shomate, nasa7 or sgte")
    return lo, hi


def default_midpoint(t_min, t_max):
    r"""Default NASA 7-term midpoint [K]: the geometric mean of the range ends, to the nearest 10 K.

    Notes
    -----
    :math:`T_m = \sqrt{T_{min}T_{max}}` puts the two ranges at equal ratios
    of temperature; for the NASA gas range 200–6000 K it gives 1095 K, near the
    1000 K of NASA common practice [1]_.  It depends only on the range, so a
    resampled input never moves it.

    Examples
    --------
    >>> default_midpoint(298.15, 1500.0)
    670.0
    """
    return float(10.0 * round(np.sqrt(t_min * t_max) / 10.0))


def _scaled_basis(form, t):
    """Basis in scaled temperature (conditioning) and the factors back to the published powers."""
    s = _SCALE[form]
    if form == "shomate":
        return BASES[form](t), np.ones(5)
    if form == "nasa7":
        return BASES[form](t * s), s ** np.arange(5.0)
    return BASES[form](t * s), np.array([1.0, s, s ** 2, s ** -2])


def _cp_fit(form, t, cp, t_mid=None, weights=None):
    """C_p coefficients in the published powers: one array per range.

    ``cp`` may be (n,) or (n, r) (r right-hand sides sharing ``weights``, default 1/|cp|).
    """
    a, back = _scaled_basis(form, t)
    target = cp / sc.R if form == "nasa7" else -cp if form == "sgte" else cp
    w = 1.0 / np.abs(cp) if weights is None else weights
    wt = w.reshape((-1,) + (1,) * (np.ndim(cp) - 1))
    back = back.reshape((-1,) + (1,) * (np.ndim(cp) - 1))
    if t_mid is None:
        p = np.linalg.lstsq(a * w[:, None], target * wt, rcond=None)[0]
        return [p * back]
    low = t <= t_mid
    n = a.shape[1]
    design = np.zeros((t.size, 2 * n))
    design[low, :n] = a[low]
    design[~low, n:] = a[~low]
    row, _ = _scaled_basis(form, np.array([t_mid]))
    constraint = np.concatenate([row[0], -row[0]])[None, :]
    dw = design * w[:, None]
    kkt = np.block([[2 * dw.T @ dw, constraint.T], [constraint, np.zeros((1, 1))]])
    rhs = np.concatenate([2 * dw.T @ (target * wt), np.zeros((1,) + np.shape(cp)[1:])])
    p = np.linalg.solve(kkt, rhs)
    return [p[:n] * back, p[n:2 * n] * back]


def _shomate(cp_coefficients, t_ref, h_ref, s_ref, formation_kj):
    a, b, c, d, e = cp_coefficients
    t = t_ref / 1000.0
    f = h_ref / 1e3 - (a * t + b * t ** 2 / 2 + c * t ** 3 / 3 + d * t ** 4 / 4 - e / t)
    g = s_ref - (a * np.log(t) + b * t + c * t ** 2 / 2 + d * t ** 3 / 3 - e / (2 * t ** 2))
    return dict(zip(KEYS["shomate"], map(float, (a, b, c, d, e, f, g, formation_kj))))


def _nasa7(cp_coefficients, t_ref, h_ref, s_ref):
    a1, a2, a3, a4, a5 = cp_coefficients
    t = t_ref
    a6 = h_ref / sc.R - (a1 * t + a2 * t ** 2 / 2 + a3 * t ** 3 / 3 + a4 * t ** 4 / 4 + a5 * t ** 5 / 5)
    a7 = s_ref / sc.R - (a1 * np.log(t) + a2 * t + a3 * t ** 2 / 2 + a4 * t ** 3 / 3 + a5 * t ** 4 / 4)
    return dict(zip(KEYS["nasa7"], map(float, (a1, a2, a3, a4, a5, a6, a7))))


def _sgte(cp_coefficients, t_ref, h_ref, s_ref):
    # -C_p = c + 2dT + 6eT^2 + 2f/T^2 was fitted on the basis 1, T, T^2, 1/T^2
    k0, k1, k2, k3 = cp_coefficients
    c, d, e, f = k0, k1 / 2, k2 / 6, k3 / 2
    t = t_ref
    b = -s_ref - c - c * np.log(t) - 2 * d * t - 3 * e * t ** 2 + f / t ** 2
    a = h_ref + c * t + d * t ** 2 + 2 * e * t ** 3 - 2 * f / t
    return dict(zip(KEYS["sgte"], map(float, (a, b, c, d, e, f))))


def _constants(form, cp_coefficients, t_ref, h_ref, s_ref, formation_kj):
    """All coefficients of one range from its C_p part and H, S [J/mol, J/(mol·K)] at ``t_ref``."""
    if form == "shomate":
        return _shomate(cp_coefficients, t_ref, h_ref, s_ref, formation_kj)
    if form == "nasa7":
        return _nasa7(cp_coefficients, t_ref, h_ref, s_ref)
    return _sgte(cp_coefficients, t_ref, h_ref, s_ref)


def _assemble(form, cps, t_ref, h_ref, s_ref, formation, mid):
    """Coefficient dicts of every range from the C_p parts and H, S at ``t_ref`` (the upper range continues
    H and S of the lower one at ``mid``)."""
    low = _constants(form, cps[0], t_ref, h_ref, s_ref, formation)
    if mid is None:
        return [low]
    at_mid = PROPERTIES[form](low, mid)
    return [low, _constants(form, cps[1], mid, float(at_mid["enthalpy"]), float(at_mid["entropy"]), formation)]


def fit_polynomial(source, form="shomate", t_range=DEFAULT_RANGE, t_mid=None, formation_enthalpy=0.0,
                   phase="cr", name=None):
    r"""Fit one published polynomial form to a heat-capacity source.

    Parameters
    ----------
    source : HeatCapacityData
        C_p, S, H − H(298.15) (see :mod:`thermo.polynomials.sources`).
    form : {'shomate', 'nasa7', 'sgte'}
        Polynomial form.
    t_range : (float, float)
        Fit range [K].
    t_mid : float, optional
        Common midpoint of two ranges [K]: NASA 7-term always has two
        (default :func:`default_midpoint`); Shomate and SGTE get two only
        when it is given.
    formation_enthalpy : float
        Δ_fH°(298.15 K) [kJ/mol]; 0 for an element in its reference state.
    phase : str
        Phase label (``cr``, ``alpha``, …), kept with the coefficients.
    name : str, optional
        Species name, e.g. ``MgO(cr)`` (default empty).

    Returns
    -------
    PolynomialFit
        Coefficients per range, ``evaluate(T)``, errors, warnings; when the
        source carries an uncertainty, ``uncertainty`` holds what it does to
        the coefficients and to the fitted C_p, S, H − H(298.15)
        (:func:`~thermo.polynomials.propagation.propagated_uncertainty`), next
        to the fit's own error in ``errors``.

    Raises
    ------
    OptionError
        Bad form, range or midpoint, or too few source points in the range.

    Notes
    -----
    C_p minimises :math:`\sum_i [(C_p^{fit}(T_i) - C_p(T_i))/C_p(T_i)]^2`
    over the range (with :math:`C_p^{lo}(T_m) = C_p^{hi}(T_m)` for two
    ranges [4]_); then with the reference temperature :math:`T_r`
    (298.15 K if inside the range, else the first source point in it)
    :math:`H(T_r) = \Delta_fH^\circ + [H(T_r) - H(298.15)]_{source}` and
    :math:`S(T_r) = S_{source}(T_r)` fix the constants (Shomate F, G [2]_;
    NASA a6, a7 [1]_; SGTE a, b [3]_).  Enthalpies are on the scale where
    H(298.15 K) = Δ_fH°; for SGTE this is G − H^SER with H^SER the enthalpy
    of the elements in their stable state at 298.15 K and 1 bar.

    Examples
    --------
    >>> from thermo.polynomials.sources import heat_capacity_source
    >>> t = np.linspace(250.0, 1200.0, 60)
    >>> src = heat_capacity_source(t, 24.0 + 0.004 * t, entropy_298=40.0)
    >>> fit = fit_polynomial(src, "shomate", (298.15, 1000.0))
    >>> round(fit.ranges[0].coefficients["B"], 6), fit.errors["heat_capacity_p"]["max_relative"] < 1e-9
    (4.0, True)
    """
    lo, hi = check_range(t_range, form)
    data = source.within(lo, hi)
    if data.temperature.size < 8:
        raise OptionError(f"only {data.temperature.size} source points lie in {lo:g}–{hi:g} K; at least 8 needed")
    if not np.all(data.heat_capacity > 0):
        raise OptionError("C_p must be positive over the fit range")
    mid = float(t_mid) if t_mid is not None else (default_midpoint(lo, hi) if form == "nasa7" else None)
    if mid is not None:
        if not lo < mid < hi:
            raise OptionError(f"midpoint {mid:g} K must lie inside the range {lo:g}–{hi:g} K")
        if min((data.temperature <= mid).sum(), (data.temperature > mid).sum()) < 6:
            raise OptionError(f"midpoint {mid:g} K leaves fewer than 6 source points in one range")
    # sources hold 298.15 K as a grid point; otherwise anchor at the first point of the range
    at = np.flatnonzero(np.isclose(data.temperature, T_STANDARD, rtol=0, atol=1e-9))
    i_ref = int(at[0]) if at.size else 0
    t_ref = float(data.temperature[i_ref])
    h_inc_ref, s_ref = float(data.enthalpy_increment[i_ref]), float(data.entropy[i_ref])
    formation = float(formation_enthalpy)
    h_ref = 1e3 * formation + h_inc_ref
    if mid is not None and mid <= t_ref:
        raise OptionError(f"midpoint {mid:g} K must lie above the reference temperature {t_ref:g} K")
    cps = _cp_fit(form, data.temperature, data.heat_capacity, mid)
    bounds = [(lo, hi)] if mid is None else [(lo, mid), (mid, hi)]
    ranges = [FitRange(a, b, c) for (a, b), c in zip(bounds, _assemble(form, cps, t_ref, h_ref, s_ref, formation, mid))]
    method = ("C_p least squares in relative error; H and S constants from the source at "
              f"{t_ref:g} K" + ("; C_p equal at the midpoint, H and S continuous" if mid else ""))
    fit = PolynomialFit(form=form, ranges=tuple(ranges), formation_enthalpy_kJ_per_mol=formation,
                        phase=str(phase or "cr"), name=name or "", reference_temperature_K=t_ref,
                        source=source.label, method=method, errors={}, warnings=())
    errors = fit_errors(fit, data)
    if data.uncertainty is not None:
        weights = 1.0 / np.abs(data.heat_capacity)
        fit = dataclasses.replace(fit, uncertainty=propagated_uncertainty(
            fit, data, lambda cp: _cp_fit(form, data.temperature, cp, mid, weights),
            lambda cps, h, s: _assemble(form, cps, t_ref, h, s, formation, mid), i_ref, errors))
    step = 2.0 * float(np.median(np.diff(data.temperature)))     # a grid that just misses an end is no gap
    covered = (float(data.temperature[0]), float(data.temperature[-1]), step)
    return fit.with_report(errors, _warnings(form, lo, errors, source.notes, t_ref, hi, covered))


def _warnings(form, lo, errors, notes, t_ref, hi=None, covered=None):
    out = []
    if lo < LOWEST_INTENDED_K[form] - 1e-9:
        out.append(f"the range starts at {lo:g} K, below the {LOWEST_INTENDED_K[form]:g} K where the "
                   f"{form} form is meant to be used; low-temperature C_p is poorly represented")
    for key, value in errors.items():
        if value["max_relative"] > ERROR_LIMIT:
            out.append(f"{key} deviates from the source by up to {100 * value['max_relative']:.3g} % "
                       f"(limit {100 * ERROR_LIMIT:g} %); narrow the range or split it")
    if covered is not None and (covered[0] > lo + covered[2] or covered[1] < hi - covered[2]):
        out.append(f"the source covers {covered[0]:g}-{covered[1]:g} K of the range {lo:g}-{hi:g} K; outside it "
                   "the polynomial extrapolates and neither the fit error nor the uncertainty speaks for it")
    if t_ref != T_STANDARD:
        out.append(f"298.15 K is outside the range; H and S are anchored at {t_ref:g} K and values "
                   "at 298.15 K are extrapolated")
    return tuple(out) + tuple(notes)
