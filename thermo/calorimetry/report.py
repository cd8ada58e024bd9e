"""One measured C_p data set analysed: fit, third-law entropy, DOS comparison, as one dict.

The dict is what ``modeheat calorimetry`` prints as JSON and what the
dashboard page shows; its keys are stable.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
from scipy import constants as sc

from ..columns import column_name
from ..errors import OptionError
from .entropy import STANDARD_K, third_law_from_data, third_law_from_model
from .fitting import fit_measured_heat_capacity
from .models import HeatCapacityModel, low_temperature_analysis

#: Cautions shown with every result (a design decision deserves validated data).
CAUTIONS = (
    "The lattice term is harmonic (Debye or the DOS); anharmonicity beyond the dilation term, "
    "vacancies and premelting near the melting point are not modelled.",
    "S° from data assumes the Debye T³ law below the first measured point and no transition, magnetic "
    "or Schottky contribution there; check the low-temperature data before relying on S°.",
    "For design decisions use critically evaluated tables and licensed practice; this is an analysis aid.",
)


def parse_model(text, has_dos):
    """Model terms from ``'debye+electronic+nernst-lindemann'`` style text.

    Returns
    -------
    dict
        ``lattice``, ``electronic``, ``dilation`` keywords of
        :class:`HeatCapacityModel`.

    Examples
    --------
    >>> parse_model("dos+electronic", True)
    {'lattice': 'dos', 'electronic': True, 'dilation': 'none'}
    """
    if text is None:
        text = ("dos" if has_dos else "debye") + "+electronic+nernst-lindemann"
    terms = [p.strip().lower() for p in str(text).replace(",", "+").split("+") if p.strip()]
    known = {"debye", "dos", "electronic", "nernst-lindemann", "dilation-values"}
    bad = [p for p in terms if p not in known]
    if bad:
        raise OptionError(f"unknown model term {bad[0]!r}; combine {', '.join(sorted(known))} with '+'")
    lattices = [p for p in terms if p in ("debye", "dos")]
    if len(lattices) > 1:
        raise OptionError("choose one lattice term: debye or dos")
    dilations = [p for p in terms if p in ("nernst-lindemann", "dilation-values")]
    if len(dilations) > 1:
        raise OptionError("choose one dilation term: nernst-lindemann or dilation-values")
    dilation = {"nernst-lindemann": "nernst-lindemann", "dilation-values": "values"}.get(
        dilations[0] if dilations else "", "none")
    return {"lattice": lattices[0] if lattices else None, "electronic": "electronic" in terms,
            "dilation": dilation}


def _pair(value, uncertainty):
    def clean(v):
        v = float(v)
        return v if np.isfinite(v) else None
    return {"value": clean(value), "uncertainty": clean(uncertainty)}


def _finite_or_none(value):
    """The report with every NaN/inf number replaced by None (strict JSON)."""
    if isinstance(value, dict):
        return {k: _finite_or_none(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_finite_or_none(v) for v in value]
    if isinstance(value, (float, np.floating)):
        return float(value) if np.isfinite(value) else None
    return value


def analyse(measured, model: HeatCapacityModel, fixed=None, fit_range=None, low_t_max=None):
    """Fit, S°(298.15 K) from model and data, low-T analysis and DOS comparison.

    Parameters
    ----------
    measured : MeasuredHeatCapacity
    model : HeatCapacityModel
    fixed : dict, optional
        Held parameters.
    fit_range : tuple of float, optional
        (T_min, T_max) [K].
    low_t_max : float, optional
        Upper limit of the C/T = γ + βT² analysis [K]; default: the points
        below 1/30 of the fitted θ_D (or of 300 K), when at least 3
        (there the T⁵ term bends C/T by about 0.5 %).

    Returns
    -------
    report : dict
        JSON-able (see ``modeheat calorimetry``).
    fit : CalorimetryFit
    third_law : pandas.DataFrame
        S° and H° − H°(0) from the data at each measured temperature.
    """
    fit = fit_measured_heat_capacity(measured, model, fixed, fit_range)
    t = measured.temperature_K
    notes = list(measured.notes) + list(fit.warnings)
    params = {k: _pair(fit.values[k], fit.uncertainties[k]) | {"fixed": k not in fit.free}
              for k in model.parameters}
    model_s = third_law_from_model(fit, STANDARD_K)
    sigma = measured.uncertainty_J_per_mol_K
    if sigma is None:
        rms = float(np.sqrt(np.mean(fit.residuals[column_name("relative_residual")] ** 2)))
        sigma = rms * measured.heat_capacity_J_per_mol_K
        notes.append(f"no uncertainties given: the data S° uses the fit's rms relative residual "
                     f"({100 * rms:.3g} %) as the uncertainty of each point")
    gamma = fit.values.get("gamma_J_per_mol_K2", 0.0)
    table = third_law_from_data(t, measured.heat_capacity_J_per_mol_K, t, sigma, gamma)
    data_s = {"value": None, "uncertainty": None}
    data_h = dict(data_s)
    extrapolated = None
    if t[0] <= STANDARD_K <= t[-1]:
        one = third_law_from_data(t, measured.heat_capacity_J_per_mol_K, STANDARD_K, sigma, gamma)
        data_s = _pair(one["entropy"][0], one["entropy_uncertainty"][0])
        data_h = _pair(one["enthalpy"][0] / 1e3, one["enthalpy_uncertainty"][0] / 1e3)
        extrapolated = float(one["extrapolated_entropy"][0])
        share = extrapolated / one["entropy"][0]
        if share > 0.02:
            notes.append(f"the T³ extrapolation below {t[0]:g} K gives {extrapolated:.3g} J/(mol K), "
                         f"{100 * share:.2g} % of S°(298.15 K); measure lower for a firmer value")
    else:
        notes.append(f"the data span {t[0]:g}-{t[-1]:g} K and do not reach 298.15 K: no S° from data")
    theta = fit.values.get("theta_D_K")
    limit = low_t_max if low_t_max is not None else (theta or 300.0) / 30.0
    try:
        low = low_temperature_analysis(t, measured.heat_capacity_J_per_mol_K, model.atoms,
                                       measured.uncertainty_J_per_mol_K, limit)
    except OptionError as exc:
        low = None
        if low_t_max is not None:
            raise
        notes.append(f"no C/T = γ + βT² analysis: {exc}")
    report = {
        "input": measured.source, "sha256": measured.sha256, "unit_read": measured.unit,
        "atoms": int(model.atoms), "model": model.description, "weighting": fit.weighting,
        "fit_range_K": list(fit.fit_range_K), "points_fitted": int(len(fit.residuals)),
        "fit": params,
        "correlation": {"parameters": list(fit.free), "matrix": [[float(v) for v in row] for row in fit.correlation]},
        "reduced_chi2": float(fit.chi2_reduced) if np.isfinite(fit.chi2_reduced) else None,
        "max_relative_residual": fit.max_relative_residual,
        "entropy_298_15_J_per_mol_K": _pair(model_s["entropy"][0], model_s["entropy_uncertainty"][0]),
        "enthalpy_298_15_minus_0_kJ_per_mol": _pair(model_s["enthalpy"][0] / 1e3,
                                                    model_s["enthalpy_uncertainty"][0] / 1e3),
        "entropy_298_15_from_data_J_per_mol_K": data_s,
        "enthalpy_298_15_minus_0_from_data_kJ_per_mol": data_h,
        "entropy_below_first_point_J_per_mol_K": extrapolated,
        "low_temperature_analysis": low,
        "notes": notes, "cautions": list(CAUTIONS),
    }
    report = _finite_or_none(report)
    third = pd.DataFrame({column_name("temperature"): t,
                          column_name("heat_capacity_p_measured"): measured.heat_capacity_J_per_mol_K,
                          column_name("entropy_third_law"): table["entropy"],
                          column_name("entropy_third_law_uncertainty"): table["entropy_uncertainty"],
                          column_name("enthalpy_from_zero"): table["enthalpy"] / 1e3})
    if model.dos is not None:
        from ..kernels.sums import thermal_sums
        s_dos = sc.R * thermal_sums(model.dos, np.append(t, STANDARD_K))["entropy"]
        report["entropy_298_15_from_dos_J_per_mol_K"] = float(s_dos[-1])
        report["note_dos_entropy"] = "harmonic vibrational S of the unscaled DOS: no electronic or dilation part"
        third[column_name("entropy")] = s_dos[:-1]
    return report, fit, third


def electronic_comparison(report, edos):
    """The band γ of an electronic DOS beside the fitted and the low-temperature γ of a report.

    Parameters
    ----------
    report : dict
        From :func:`analyse`.
    edos : ElectronicDOS
        Electronic DOS of the same formula unit.

    Returns
    -------
    dict
        :func:`thermo.electronic.gamma_comparison` (band γ with its uncertainty, ratios 1 + λ, notes).
    """
    from ..electronic import gamma_comparison
    gammas = {}
    if "gamma_J_per_mol_K2" in report["fit"]:
        gammas["fitted"] = report["fit"]["gamma_J_per_mol_K2"]
    low = report.get("low_temperature_analysis")
    if low:
        gammas["low-temperature (C/T = γ + βT²)"] = low["gamma_J_per_mol_K2"]
    return gamma_comparison(edos, gammas)
