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
from .entropy import STANDARD_K, low_temperature_forms, model_form, third_law_from_data, third_law_from_model
from .fitting import fit_measured_heat_capacity
from .models import HeatCapacityModel, low_temperature_analysis, parameter_name
from .reading import check_heat_capacity_scale

#: Cautions shown with every result (a design decision deserves validated data).
CAUTIONS = (
    "The lattice term is harmonic (Debye or the DOS); anharmonicity beyond the dilation term, "
    "vacancies and premelting near the melting point are not modelled.",
    "S° from data takes the part below the first measured point from low-temperature forms (Debye T³, Debye, "
    "the model, the DOS) and their spread; none has a transition, magnetic or Schottky contribution there: "
    "check the low-temperature data before relying on S°.",
    "For design decisions use critically evaluated tables and licensed practice; this is an analysis aid.",
)


def parse_model(text, has_dos, metal=False):
    """Model terms from ``'debye+electronic+nernst-lindemann'`` style text.

    The default is the lattice (``dos`` with a DOS, else ``debye``) and the
    Nernst–Lindemann dilation term; γT only for a metal (``metal=True`` or the
    term ``electronic`` named): an insulator's data do not carry a γ, and a
    fitted one leaks into the extrapolation below the first point.

    Returns
    -------
    dict
        ``lattice``, ``electronic``, ``dilation`` keywords of
        :class:`HeatCapacityModel`.

    Examples
    --------
    >>> parse_model("dos+electronic", True)
    {'lattice': 'dos', 'electronic': True, 'dilation': 'none'}
    >>> parse_model(None, False)["electronic"], parse_model(None, False, metal=True)["electronic"]
    (False, True)
    """
    if text is None:
        text = ("dos" if has_dos else "debye") + "+nernst-lindemann"
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
    return {"lattice": lattices[0] if lattices else None, "electronic": "electronic" in terms or bool(metal),
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


def electronic_note(model, fixed):
    """How γ entered the fit, in words (for the JSON key ``electronic_term`` and the notes).

    Examples
    --------
    >>> electronic_note(HeatCapacityModel(atoms=1, electronic=False), {})
    'none: γ = 0 (an insulator assumed); declare a metal (--metal) to fit γT, or hold γ with --fix gamma=VALUE'
    """
    if not model.electronic:
        return ("none: γ = 0 (an insulator assumed); declare a metal (--metal) to fit γT, or hold γ with "
                "--fix gamma=VALUE")
    if "gamma_J_per_mol_K2" in {parameter_name(k) for k in (fixed or {})}:
        return "held: γ as given"
    return "fitted: γT (a metal declared)"


def _reference_theta(fit, model, forms):
    """θ_D [K] to compare the first point with: the fitted one, the DOS's θ_D(0)·s, else the Debye form's."""
    if "theta_D_K" in fit.values:
        return fit.values["theta_D_K"]
    if model.dos is not None:
        theta = model.dos.low_frequency_debye_temperature_k()
        if theta:
            return theta * fit.values.get("scale", 1.0)
    return forms.get("debye", {}).get("theta_D_K")


def analyse(measured, model: HeatCapacityModel, fixed=None, fit_range=None, low_t_max=None):
    """Fit, S°(298.15 K) and H°(298.15 K) − H°(0) from model and data, low-T analysis and DOS comparison.

    Parameters
    ----------
    measured : MeasuredHeatCapacity
    model : HeatCapacityModel
    fixed : dict, optional
        Held parameters (a value or ``(value, uncertainty)``).
    fit_range : tuple of float, optional
        (T_min, T_max) [K].
    low_t_max : float, optional
        Upper limit of the C/T = γ + βT² analysis [K]; default: the points
        below 1/30 of the fitted θ_D (or of 300 K), when at least 3
        (there the T⁵ term bends C/T by about 0.5 %).

    Returns
    -------
    report : dict
        JSON-able (see ``modeheat calorimetry``); every S°, H° − H°(0) and
        parameter as ``{"value": x, "uncertainty": u}``.
    fit : CalorimetryFit
    third_law : pandas.DataFrame
        S° and H° − H°(0) from the data at each measured temperature, with
        their standard uncertainties (``*_error_*`` columns).

    Raises
    ------
    DosInputError
        C_p above twice Dulong–Petit plus electronic room for the model's
        atoms (likely another unit), or data giving a negative entropy.
    """
    check_heat_capacity_scale(measured, model.atoms)
    fit = fit_measured_heat_capacity(measured, model, fixed, fit_range)
    t, cp = measured.temperature_K, measured.heat_capacity_J_per_mol_K
    notes = list(measured.notes) + list(fit.warnings)
    electronic = electronic_note(model, fixed)
    if not model.electronic:
        notes.append(f"electronic term {electronic}")
    params = {k: _pair(fit.values[k], fit.uncertainties[k]) | {"fixed": k not in fit.free}
              for k in model.parameters}
    structure = fit.structure
    if structure.get("structured"):
        notes.append(f"the residuals are structured ({'; '.join(structure['reasons'])}): the model does not "
                     f"describe the data; a model discrepancy of {100 * structure['discrepancy']:.2g} % of S° and "
                     "H° − H°(0) is added to the model route's uncertainty")
    sigma = measured.uncertainty_J_per_mol_K
    stated = sigma is not None
    if not stated:
        sigma = max(structure.get("noise", 0.0), 1e-12) * cp
        notes.append(f"no uncertainties given: each point's uncertainty is taken from the point-to-point scatter "
                     f"of the residuals ({100 * structure.get('noise', 0.0):.2g} %)")
    gamma = fit.values.get("gamma_J_per_mol_K2", 0.0)
    gamma_u = fit.uncertainties.get("gamma_J_per_mol_K2", 0.0)
    data_forms = low_temperature_forms(t, cp, sigma if stated else None, gamma, gamma_u, model.atoms, model.dos)
    own = model_form(fit, t[0])
    targets = np.append(t, STANDARD_K) if t[0] <= STANDARD_K <= t[-1] else t
    table = third_law_from_data(t, cp, targets, sigma, gamma, model.atoms, [own], gamma_u,
                                data_forms=data_forms, non_lattice=lambda x: _non_lattice(fit, x))
    model_s = third_law_from_model(fit, STANDARD_K, table["below_first_point"])
    forms = {name: _form_entry(v) for name, v in table["forms"].items()}
    data_s = {"value": None, "uncertainty": None}
    data_h = dict(data_s)
    share = None
    if targets.size > t.size:
        data_s = _pair(table["entropy"][-1], table["entropy_uncertainty"][-1])
        data_h = _pair(table["enthalpy"][-1] / 1e3, table["enthalpy_uncertainty"][-1] / 1e3)
        share = table["extrapolated_entropy"] / table["entropy"][-1]
        theta = _reference_theta(fit, model, forms)
        if theta and t[0] > theta / 10.0:
            notes.append(f"S° from data is weakly determined: the first point ({t[0]:g} K) lies above θ_D/10 "
                         f"(θ_D ≈ {theta:.3g} K); {table['extrapolated_entropy']:.3g} ± "
                         f"{table['extrapolated_entropy_uncertainty']:.2g} J/(mol K), {100 * share:.2g} % of "
                         f"S°(298.15 K), is extrapolated below it (spread of {len(forms)} low-temperature forms)")
        elif share > 0.02:
            notes.append(f"{table['extrapolated_entropy']:.3g} ± {table['extrapolated_entropy_uncertainty']:.2g} "
                         f"J/(mol K), {100 * share:.2g} % of S°(298.15 K), is extrapolated below the first point "
                         f"({t[0]:g} K); measure lower for a firmer value")
    else:
        notes.append(f"the data span {t[0]:g}-{t[-1]:g} K and do not reach 298.15 K: no S° from data")
    theta = fit.values.get("theta_D_K")
    limit = low_t_max if low_t_max is not None else (theta or 300.0) / 30.0
    try:
        low = low_temperature_analysis(t, cp, model.atoms, measured.uncertainty_J_per_mol_K, limit)
    except OptionError as exc:
        low = None
        if low_t_max is not None:
            raise
        notes.append(f"no C/T = γ + βT² analysis: {exc}")
    report = {
        "input": measured.source, "sha256": measured.sha256, "unit_read": measured.unit,
        "atoms": int(model.atoms), "model": model.description, "electronic_term": electronic,
        "weighting": fit.weighting, "fit_range_K": list(fit.fit_range_K), "points_fitted": int(len(fit.residuals)),
        "fit": params,
        "correlation": {"parameters": list(fit.free), "matrix": [[float(v) for v in row] for row in fit.correlation]},
        "reduced_chi2": float(fit.chi2_reduced) if np.isfinite(fit.chi2_reduced) else None,
        "max_relative_residual": fit.max_relative_residual,
        "residual_structure": _structure_entry(structure),
        "entropy_298_15_J_per_mol_K": _pair(model_s["entropy"][0], model_s["entropy_uncertainty"][0]),
        "enthalpy_298_15_minus_0_kJ_per_mol": _pair(model_s["enthalpy"][0] / 1e3,
                                                    model_s["enthalpy_uncertainty"][0] / 1e3),
        "uncertainty_parts_model_route": _parts(model_s["parts"], 0),
        "entropy_298_15_from_data_J_per_mol_K": data_s,
        "enthalpy_298_15_minus_0_from_data_kJ_per_mol": data_h,
        "uncertainty_parts_data_route": _parts(table["parts"], -1) if targets.size > t.size else None,
        "below_first_point": {
            "temperature_K": float(t[0]),
            "entropy_J_per_mol_K": _pair(table["extrapolated_entropy"], table["extrapolated_entropy_uncertainty"]),
            "enthalpy_kJ_per_mol": _pair(table["extrapolated_enthalpy"] / 1e3,
                                         table["extrapolated_enthalpy_uncertainty"] / 1e3),
            "share_of_entropy_298_15": share, "forms": forms},
        "low_temperature_analysis": low,
        "notes": notes, "cautions": list(CAUTIONS),
    }
    report = _finite_or_none(report)
    n = t.size
    third = pd.DataFrame({column_name("temperature"): t,
                          column_name("heat_capacity_p_measured"): cp,
                          column_name("entropy_third_law"): table["entropy"][:n],
                          column_name("entropy_third_law_error"): table["entropy_uncertainty"][:n],
                          column_name("enthalpy_from_zero"): table["enthalpy"][:n] / 1e3,
                          column_name("enthalpy_from_zero_error"): table["enthalpy_uncertainty"][:n] / 1e3})
    if model.dos is not None:
        from ..kernels.sums import thermal_sums
        s_dos = sc.R * thermal_sums(model.dos, np.append(t, STANDARD_K))["entropy"]
        report["entropy_298_15_from_dos_J_per_mol_K"] = float(s_dos[-1])
        report["note_dos_entropy"] = "harmonic vibrational S of the unscaled DOS: no electronic or dilation part"
        third[column_name("entropy")] = s_dos[:-1]
    return report, fit, third


def _non_lattice(fit, temperatures):
    """γT + C_p − C_v of the fitted model [J/(mol K)] (what the lattice's equivalent Debye θ leaves out)."""
    parts = fit.model.parts(temperatures, fit.values)
    return parts["electronic"] + parts["dilation"]


def _form_entry(form):
    """A form's JSON entry: S and H − H(0) as pairs [J/(mol K), kJ/mol] and what was fitted."""
    h = form["enthalpy_J_per_mol"]
    return {"entropy_J_per_mol_K": form["entropy_J_per_mol_K"],
            "enthalpy_kJ_per_mol": {"value": h["value"] / 1e3, "uncertainty": h["uncertainty"] / 1e3},
            "detail": form["detail"], "relative_misfit": form["relative_misfit"], "admissible": form["admissible"],
            **({"theta_D_K": form["parameter"]} if form["name"] == "debye" else {})}


def _structure_entry(structure):
    keep = ("structured", "reasons", "discrepancy", "noise", "noise_from", "rms", "birge_ratio", "chi2_p")
    return {k: structure.get(k) for k in keep} | {"runs": structure.get("runs")}


def _parts(parts, index):
    """Uncertainty parts at one target: entropy [J/(mol K)], enthalpy [kJ/mol]."""
    return {k: float(v[index]) / (1e3 if k.startswith("enthalpy") else 1.0) for k, v in parts.items()}


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
