"""The fitted polynomial: coefficients per range, evaluation, errors and a JSON-able record.

References
----------
.. [1] B. J. McBride, M. J. Zehe and S. Gordon, NASA/TP-2002-211556 (2002)
   (piecewise ranges sharing a common temperature).
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ..columns import column_name
from ..errors import OptionError
from .forms import PROPERTIES, T_STANDARD

#: Quantities of :meth:`PolynomialFit.evaluate`, in column order.
EVALUATED = ("temperature", "heat_capacity_p", "enthalpy", "enthalpy_increment", "entropy", "gibbs_energy")
#: Quantities compared with the source, with their error keys.
COMPARED = ("heat_capacity_p", "enthalpy_increment", "entropy")


@dataclass(frozen=True)
class FitRange:
    """One temperature range of a fit: ``T_min_K`` ≤ T ≤ ``T_max_K`` and its coefficients."""

    T_min_K: float
    T_max_K: float
    coefficients: dict


@dataclass(frozen=True)
class PolynomialFit:
    """Coefficients of one polynomial form over one or two ranges, with fit quality.

    Attributes
    ----------
    form : {'shomate', 'nasa7', 'sgte'}
    ranges : tuple of FitRange
        In increasing temperature; neighbours share their boundary.
    formation_enthalpy_kJ_per_mol : float
        Δ_fH°(298.15 K) [kJ/mol] the enthalpy scale is anchored to.
    phase, name : str
        Phase label and species name.
    reference_temperature_K : float
        Where H and S were anchored to the source [K].
    source, method : str
        What was fitted, and how.
    errors : dict
        ``{quantity: {"max_relative": …, "rms_relative": …}}`` over the range.
    warnings : tuple of str
        Range, error and source cautions.
    uncertainty : dict
        What the source's uncertainty does to the fit
        (:func:`~thermo.polynomials.propagation.propagated_uncertainty`); empty
        when the source has none.
    """

    form: str
    ranges: tuple
    formation_enthalpy_kJ_per_mol: float = 0.0
    phase: str = "cr"
    name: str = ""
    reference_temperature_K: float = T_STANDARD
    source: str = ""
    method: str = ""
    errors: dict = field(default_factory=dict)
    warnings: tuple = ()
    uncertainty: dict = field(default_factory=dict)

    @property
    def t_min(self):
        """Lowest temperature of the fit [K]."""
        return self.ranges[0].T_min_K

    @property
    def t_max(self):
        """Highest temperature of the fit [K]."""
        return self.ranges[-1].T_max_K

    def with_report(self, errors, warnings):
        """A copy carrying ``errors`` and ``warnings``."""
        return dataclasses.replace(self, errors=errors, warnings=tuple(warnings))

    def properties(self, temperature, extrapolate=False):
        """C_p, H, H − H(298.15), S, G in SI units (J/mol, J/(mol·K)), piecewise over the ranges.

        Raises
        ------
        OptionError
            A temperature outside the fitted range (unless ``extrapolate``).
        """
        t = np.atleast_1d(np.asarray(temperature, dtype=float))
        if not np.all(np.isfinite(t)) or np.any(t <= 0):
            raise OptionError("temperatures must be finite and > 0 K")
        if not extrapolate and (t.min() < self.t_min - 1e-9 or t.max() > self.t_max + 1e-9):
            raise OptionError(f"temperatures {t.min():g}–{t.max():g} K leave the fitted range "
                              f"{self.t_min:g}–{self.t_max:g} K")
        out = {k: np.empty_like(t) for k in EVALUATED[1:]}
        which = np.searchsorted([r.T_max_K for r in self.ranges[:-1]], t, side="left")
        h298 = 1e3 * self.formation_enthalpy_kJ_per_mol
        for i, rng in enumerate(self.ranges):
            sel = which == i
            if not sel.any():
                continue
            p = PROPERTIES[self.form](rng.coefficients, t[sel])
            p["enthalpy_increment"] = p["enthalpy"] - h298
            for k in out:
                out[k][sel] = p[k]
        return out

    def evaluate(self, temperature, extrapolate=False):
        """Table of the fit: T, C_p, H, H − H(298.15), S, G per mole of formula units.

        Parameters
        ----------
        temperature : array_like
            Temperatures [K] inside the fitted range.
        extrapolate : bool
            Allow temperatures outside it.

        Returns
        -------
        pandas.DataFrame
            Columns named by :mod:`thermo.columns` (J/(mol·K), kJ/mol).
        """
        p = self.properties(temperature, extrapolate)
        t = np.atleast_1d(np.asarray(temperature, dtype=float))
        data = {column_name("temperature"): t}
        for key in EVALUATED[1:]:
            scale = 1e-3 if key in ("enthalpy", "enthalpy_increment", "gibbs_energy") else 1.0
            data[column_name(key, "formula")] = p[key] * scale
        return pd.DataFrame(data)

    def to_dict(self):
        """JSON-able record: form, ranges with coefficients, errors, warnings and conventions."""
        units = {"shomate": "C_p [J/(mol K)] with t = T/1000 K; A-E, G in J/(mol K) units; F, H in kJ/mol",
                 "nasa7": "C_p/R, H/(RT), S/R with T in K (dimensionless a1-a5, a6 in K, a7 dimensionless)",
                 "sgte": "G - H_SER [J/mol] with T in K"}[self.form]
        spread = self.uncertainty.get("coefficients") or [None] * len(self.ranges)
        ranges = [{"T_min_K": r.T_min_K, "T_max_K": r.T_max_K, "coefficients": dict(r.coefficients),
                   **({} if u is None else {"coefficient_uncertainties": dict(u)})}
                  for r, u in zip(self.ranges, spread)]
        data = {k: v for k, v in self.uncertainty.items() if k != "coefficients"}
        return {"form": self.form, "name": self.name, "phase": self.phase, "ranges": ranges,
                "errors": self.errors, **({"uncertainty": data} if data else {}), "warnings": list(self.warnings),
                "formation_enthalpy_kJ_per_mol": self.formation_enthalpy_kJ_per_mol,
                "reference_state": "H(298.15 K) = formation enthalpy (0 for an element in its stable "
                                   "state at 298.15 K, 1 bar; SGTE: G - H_SER); standard pressure 1 bar",
                "reference_temperature_K": self.reference_temperature_K,
                "units": units, "source": self.source, "method": self.method}

    def provenance(self, inputs, formula=None):
        """The provenance record of an export of this fit (:func:`thermo.provenance.provenance_record`).

        Parameters
        ----------
        inputs : iterable of dict
            The source's file entries (:func:`thermo.provenance.dos_input` or ``input_record``).
        formula : str, optional
            Chemical formula recorded with the settings.

        Returns
        -------
        dict
            Settings: form, range, midpoint (two ranges), formation enthalpy,
            phase, formula; warnings: the fit's.
        """
        from ..provenance import provenance_record
        settings = {"form": self.form, "range_K": [self.ranges[0].T_min_K, self.ranges[-1].T_max_K],
                    "mid_K": self.ranges[0].T_max_K if len(self.ranges) > 1 else None,
                    "formation_enthalpy_kJ_per_mol": self.formation_enthalpy_kJ_per_mol,
                    "phase": self.phase, "formula": formula}
        return provenance_record(inputs, settings, self.warnings)


def _relative(fit_values, source_values, floor_share=0.0):
    scale = np.abs(source_values)
    if floor_share:
        scale = np.maximum(scale, floor_share * float(np.max(scale)) if np.any(scale) else 1.0)
    rel = np.abs(fit_values - source_values) / scale
    return {"max_relative": float(np.max(rel)), "rms_relative": float(np.sqrt(np.mean(rel ** 2)))}


def fit_errors(fit, data):
    """Maximum and RMS relative deviation of C_p, H − H(298.15) and S from the source.

    Parameters
    ----------
    fit : PolynomialFit
    data : HeatCapacityData
        Source points inside the range.

    Returns
    -------
    dict
        ``{quantity: {"max_relative", "rms_relative"}}``.

    Notes
    -----
    :math:`|y_{fit} - y|/|y|`; for H − H(298.15), which passes through zero,
    the denominator is floored at 10⁻³ of its largest magnitude over the
    range (as in :func:`thermo.tables.estimated_relative_error`).
    """
    p = fit.properties(data.temperature)
    return {"heat_capacity_p": _relative(p["heat_capacity_p"], data.heat_capacity),
            "enthalpy_increment": _relative(p["enthalpy_increment"], data.enthalpy_increment, 1e-3),
            "entropy": _relative(p["entropy"], data.entropy)}
