r"""S and H − H(0) below the first measured point: admissible low-temperature forms and their spread.

Below the first measured temperature T₁ nothing is measured; S(T₁) and
H(T₁) − H(0) come from a form that is fitted to the lowest points and
continued to 0 K.  Forms that fit those points equally well may differ far
more than their parameter uncertainties say, so the result is the middle of
the admissible forms with their half-range as a standard uncertainty,
combined with the largest parameter uncertainty among them (a fitted form is
admissible when it describes the lowest points; when none does, all are
used):

.. math::
    S_{ext} = \tfrac12(\max_k S_k + \min_k S_k),\qquad
    u^2 = \frac{(\max_k S_k - \min_k S_k)^2}{4} + \max_k u_k^2.

The half-range, not the half-range/√3 of a rectangular distribution: the
forms are not drawn around the truth, and for reference solids the truth lies
at an end of their range or beyond it (NIST-JANAF Al, Cu, NaCl at the Debye
form's end from 100 K; MgO 2 % below the T³ form's end).

The forms (each ``γT`` + lattice, γ as given, 0 for an insulator):

* ``debye T³``: C = γT + bT³ through the first point (the limiting law;
  too little S once T₁ is above about θ_D/50, a lower bound of the range);
* fitted over the lowest points (T ≤ 1.5 T₁, at least three), in
  :mod:`.fitted_forms`: ``debye`` (Debye C_v of 3n modes), ``acoustic +
  optical`` (Debye of 3 acoustic + Einstein of 3n − 3 optical modes, n >= 2),
  ``dos`` (the phonon DOS with its frequencies scaled by s);
* ``model``: the fitted model itself from 0 K (its parameter covariance and
  model-discrepancy term).

Cautions: a phase transition, magnetic or Schottky contribution below T₁ is
in none of these forms.

References
----------
.. [1] P. Debye, "Zur Theorie der spezifischen Wärmen", Ann. Phys. 344,
   789-839 (1912).
.. [2] JCGM 100:2008, *Guide to the expression of uncertainty in measurement*
   (BIPM, 2008), §4.3 (Type B evaluation from the range of possible values).
.. [3] E. S. R. Gopal, *Specific Heats at Low Temperatures* (Plenum, 1966),
   ch. 2-3 (extrapolation of C_p to 0 K).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy import constants as sc

#: The lowest points of the data used by the fitted forms: T <= LOWEST_SPAN × T₁ ...
LOWEST_SPAN = 1.5
#: ... and at least this many points.
LOWEST_POINTS = 3


@dataclass(frozen=True)
class LowTemperatureForm:
    """One form's S(T₁) and H(T₁) − H(0), each with its standard uncertainty.

    Attributes
    ----------
    name : str
        ``'debye T³'``, ``'debye'``, ``'acoustic + optical'``, ``'dos'`` or ``'model'``.
    entropy, entropy_uncertainty : float
        S(T₁) [J/(mol K)].
    enthalpy, enthalpy_uncertainty : float
        H(T₁) − H(0) [J/mol].
    detail : str
        The fitted parameter in words.
    parameter : float or None
        The fitted parameter (θ_D [K], s, b [J/(mol K⁴)]).
    misfit : float
        rms relative misfit over the points it was fitted to [1] (0 for the model's own form).
    admissible : bool
        It describes those points (see
        :data:`thermo.calorimetry.fitted_forms.ADMISSIBLE_MISFIT`).
    """

    name: str
    entropy: float
    entropy_uncertainty: float
    enthalpy: float
    enthalpy_uncertainty: float
    detail: str = ""
    parameter: float | None = None
    misfit: float = 0.0
    admissible: bool = True


def lowest_points(temperatures):
    """Number of lowest points the fitted forms use: T <= 1.5 T₁, at least 3 (all when fewer).

    Examples
    --------
    >>> lowest_points([10.0, 12.0, 14.0, 16.0, 30.0])
    3
    >>> lowest_points([100.0, 200.0, 250.0, 300.0])
    3
    """
    t = np.asarray(temperatures, dtype=float)
    return int(min(t.size, max(LOWEST_POINTS, np.count_nonzero(t <= LOWEST_SPAN * t[0]))))


def t3_form(temperatures, heat_capacity, sigma, gamma=0.0, gamma_uncertainty=0.0, absolute=True):
    r"""Form C = γT + bT³ through the first measured point (the Debye limiting law).

    Parameters
    ----------
    temperatures, heat_capacity, sigma : array_like
        Measured T [K], C_p [J/(mol K)] and its standard uncertainty, increasing T.
    gamma, gamma_uncertainty : float
        γ [J/(mol K²)] held in the form and its standard uncertainty.
    absolute : bool
        σ are standard uncertainties (True) or only relative weights (False:
        no noise part).

    Returns
    -------
    LowTemperatureForm

    Notes
    -----
    :math:`b = (C_1 - \gamma T_1)/T_1^3`,
    :math:`S(T_1) = \gamma T_1 + bT_1^3/3`, :math:`H(T_1) = \gamma T_1^2/2 + bT_1^4/4`.
    Above about θ_D/50 the lattice C/T³ of a Debye-like solid falls with T,
    so this form then gives too little S: it bounds the admissible range
    from below while the fitted forms bound it from above.

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).

    Examples
    --------
    >>> t = np.array([2.0, 2.5, 3.0])
    >>> f = t3_form(t, 1e-4 * t ** 3, 1e-6 * t ** 3)
    >>> round(float(f.entropy) / (1e-4 * 8 / 3), 12)
    1.0
    """
    t1 = float(np.asarray(temperatures, dtype=float)[0])
    c1 = float(np.asarray(heat_capacity, dtype=float)[0])
    s1 = float(np.asarray(sigma, dtype=float)[0]) if absolute else 0.0
    b = (c1 - gamma * t1) / t1 ** 3
    entropy = gamma * t1 + b * t1 ** 3 / 3.0
    enthalpy = gamma * t1 * t1 / 2.0 + b * t1 ** 4 / 4.0
    us = np.hypot(s1 / 3.0, 2.0 * t1 / 3.0 * gamma_uncertainty)
    uh = np.hypot(s1 * t1 / 4.0, t1 * t1 / 4.0 * gamma_uncertainty)
    return LowTemperatureForm("debye T³", float(entropy), float(us), float(enthalpy), float(uh),
                              f"b = {b:.4g} J/(mol K⁴) through the point at {t1:g} K", b)


def distance_to_forms(value, combined, key="entropy"):
    r"""Standard uncertainty of one form's value as an estimate of the truth the forms bracket.

    Parameters
    ----------
    value : float
        S(T₁) [J/(mol K)] or H(T₁) − H(0) [J/mol] of one form (e.g. the model's).
    combined : dict
        :func:`combine_forms` of all forms.
    key : {'entropy', 'enthalpy'}

    Returns
    -------
    float
        :math:`\sqrt{(x - m)^2 + w^2}`: the rms distance of x from a truth
        with standard uncertainty w (the half-range) about the middle m.

    Examples
    --------
    >>> a, b = LowTemperatureForm("a", 1.0, 0.0, 0.0, 0.0), LowTemperatureForm("b", 2.0, 0.0, 0.0, 0.0)
    >>> round(distance_to_forms(2.0, combine_forms([a, b])), 6)      # √(0.5² + 0.5²)
    0.707107
    """
    return float(np.hypot(value - combined[key], combined[f"{key}_spread"]))


def combine_forms(forms):
    r"""Middle of the forms and the standard uncertainty of their spread (see the module notes).

    Parameters
    ----------
    forms : list of LowTemperatureForm

    Returns
    -------
    dict
        ``entropy``, ``entropy_uncertainty`` [J/(mol K)], ``enthalpy``,
        ``enthalpy_uncertainty`` [J/mol], the spread parts alone
        (``entropy_spread``, ``enthalpy_spread``) and ``forms`` (name → values).

    References
    ----------
    .. [1] JCGM 100:2008 (GUM), §4.3.

    Examples
    --------
    >>> a = LowTemperatureForm("a", 1.0, 0.01, 10.0, 0.1)
    >>> b = LowTemperatureForm("b", 1.2, 0.02, 12.0, 0.1)
    >>> r = combine_forms([a, b])
    >>> round(r["entropy"], 9), round(r["entropy_uncertainty"], 6)      # √(0.1² + 0.02²)
    (1.1, 0.10198)
    """
    out = {"forms": {f.name: {"entropy_J_per_mol_K": {"value": f.entropy, "uncertainty": f.entropy_uncertainty},
                              "enthalpy_J_per_mol": {"value": f.enthalpy, "uncertainty": f.enthalpy_uncertainty},
                              "detail": f.detail, "parameter": f.parameter, "name": f.name,
                              "relative_misfit": f.misfit, "admissible": f.admissible} for f in forms}}
    used = [f for f in forms if f.admissible] or list(forms)
    for key in ("entropy", "enthalpy"):
        values = np.array([getattr(f, key) for f in used])
        spread = values.max() - values.min()
        parameter = max(getattr(f, f"{key}_uncertainty") for f in used)
        out[key] = float(0.5 * (values.max() + values.min()))
        out[f"{key}_spread"] = float(spread / 2.0)
        out[f"{key}_uncertainty"] = float(np.hypot(spread / 2.0, parameter))
    return out
