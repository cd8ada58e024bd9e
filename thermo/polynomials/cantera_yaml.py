"""A fitted polynomial as a species entry of Cantera's YAML input format.

The schema is the documented, open YAML format of the Cantera library
(species ``thermo`` models ``NASA7`` and ``Shomate``, keys ``model``,
``reference-pressure``, ``temperature-ranges``, ``data``, ``note``); the
SGTE Gibbs polynomial has no model there.

References
----------
.. [1] D. G. Goodwin, H. K. Moffat, I. Schoegl, R. L. Speth and B. W. Weber,
   Cantera: An Object-oriented Software Toolkit for Chemical Kinetics,
   Thermodynamics, and Transport Processes, version 3.2.0 (2025),
   "YAML input file reference: species thermo models", https://cantera.org.
"""

from __future__ import annotations

import json
import re

from ..errors import ModeheatError, OptionError
from ..formula import formula_unit
from .forms import KEYS

#: Cantera model name of each form that has one.
MODELS = {"nasa7": "NASA7", "shomate": "Shomate"}
#: Standard-state pressure written with every block [Pa] (1 bar, IUPAC standard state).
STANDARD_PRESSURE_PA = 1e5


#: Characters of a phase label and of a species name written to the YAML block.
LABEL_PATTERN = re.compile(r"[A-Za-z0-9_()+-]{1,64}")
#: Characters that end a YAML comment line (YAML 1.2 §5.4 line breaks) or are not printable.
_BREAKS = re.compile("[\x00-\x1f\x7f\x85\u2028\u2029]")


def checked_label(text, what="phase label"):
    """``text`` when it is 1-64 of ``A-Z a-z 0-9 _ ( ) + -``; else a one-line OptionError.

    Examples
    --------
    >>> checked_label("alpha-2")
    'alpha-2'
    >>> checked_label("cr #c")
    Traceback (most recent call last):
    ...
    thermo.errors.OptionError: phase label 'cr #c': use 1-64 letters, digits and _ ( ) + - only
    """
    text = str(text).strip()
    if not LABEL_PATTERN.fullmatch(text):
        raise OptionError(f"{what} {text[:40]!r}: use 1-64 letters, digits and _ ( ) + - only")
    return text


def composition_counts(formula) -> dict:
    """Element counts of a formula, e.g. ``{'Mg': 1, 'O': 1}``.

    Examples
    --------
    >>> composition_counts("Al2O3")
    {'Al': 2, 'O': 3}
    """
    import periodictable

    formula_unit(formula)  # one-line error for a bad formula
    atoms = periodictable.formula(str(formula).strip()).atoms
    return {el.symbol: int(round(n)) for el, n in atoms.items()}


def composition(formula):
    """Element counts of a formula as a YAML flow mapping with quoted keys, e.g. ``{"Mg": 1, "O": 1}``.

    Examples
    --------
    >>> composition("Al2O3")
    '{"Al": 2, "O": 3}'
    """
    return json.dumps(composition_counts(formula))


def species_name(formula, phase):
    """Species name ``FORMULA(phase)``, its characters checked (:func:`checked_label`).

    Examples
    --------
    >>> species_name("MgO", "cr")
    'MgO(cr)'
    """
    label = checked_label(str(phase).strip() or "cr")
    return checked_label(f"{str(formula).strip()}({label})", "species name")


def comment(text):
    """One YAML comment line of ``text``: line breaks and control characters become spaces.

    Examples
    --------
    >>> comment("a\\u2028species: x")
    '# a species: x'
    """
    return "# " + _BREAKS.sub(" ", str(text))


def cantera_yaml(fit, formula):
    """The ``species:`` block of a fit in Cantera's YAML format.

    Parameters
    ----------
    fit : PolynomialFit
        A Shomate or NASA 7-term fit.
    formula : str
        Chemical formula of the formula unit (the species composition).

    Returns
    -------
    str
        YAML text: comments with the fit quality and cautions, then
        ``species:`` with one entry.

    Raises
    ------
    OptionError
        An SGTE fit (no Cantera model), or a missing or unreadable formula.

    Notes
    -----
    Shomate data are the seven coefficients A–G (WebBook units); NASA7
    data are a1–a7 per range, lowest range first.

    Examples
    --------
    >>> from thermo.polynomials import FitRange, PolynomialFit
    >>> fit = PolynomialFit("shomate", (FitRange(298.15, 1000.0, dict(zip("ABCDEFGH", [30.0] + [0.0] * 7))),))
    >>> print(cantera_yaml(fit, "Cu").splitlines()[-6])
        model: "Shomate"
    """
    if fit.form not in MODELS:
        raise OptionError(f"Cantera's YAML schema has no {fit.form} model; use json or csv for it, "
                          "or fit nasa7 or shomate for YAML")
    if not formula:
        raise OptionError("YAML output needs the chemical formula (the species composition): give --formula")
    keys = KEYS[fit.form][:7]
    intended = {"name": species_name(formula, fit.phase), "composition": composition_counts(formula),
                "model": MODELS[fit.form], "reference-pressure": STANDARD_PRESSURE_PA,
                "temperature-ranges": [float(b) for b in [fit.ranges[0].T_min_K] + [r.T_max_K for r in fit.ranges]],
                "data": [[float(rng.coefficients[k]) for k in keys] for rng in fit.ranges],
                "note": f"modeheat fit, phase {checked_label(fit.phase)}"}
    lines = [comment(f"modeheat {fit.form} fit: {fit.method}"),
             comment(f"source: {fit.source}; formation enthalpy at 298.15 K: "
                     f"{fit.formation_enthalpy_kJ_per_mol:g} kJ/mol")]
    for key, err in fit.errors.items():
        lines.append(comment(f"{key}: max relative error {err['max_relative']:.3g}, rms {err['rms_relative']:.3g}"))
    lines += [comment(f"caution: {w}") for w in fit.warnings]
    value = json.dumps           # every value a JSON text: a valid YAML flow scalar/collection, quoted strictly
    lines += ["species:", f"- name: {value(intended['name'])}",
              f"  composition: {value(intended['composition'])}", "  thermo:",
              f"    model: {value(intended['model'])}",
              f"    reference-pressure: {value(intended['reference-pressure'])}",
              f"    temperature-ranges: {value(intended['temperature-ranges'])}", "    data:"]
    lines += [f"    - {value(row)}" for row in intended["data"]]
    lines.append(f"    note: {value(intended['note'])}")
    text = "\n".join(lines) + "\n"
    if reloaded(text) != intended:
        raise ModeheatError("the YAML block did not read back as written; it is not offered")
    return text


def reloaded(text) -> dict:
    """The species entry of a block written by :func:`cantera_yaml`, read back line by line.

    Comment lines are skipped; every other line must be one of the keys the
    writer uses with a JSON value, so anything a label could have smuggled in
    (a second key, a truncated value) shows as a difference.

    Examples
    --------
    >>> reloaded('# x\\nspecies:\\n- name: "A(cr)"\\n  thermo:\\n    data:\\n    - [1.0]\\n')
    {'name': 'A(cr)', 'data': [[1.0]]}
    """
    entry, data = {}, []
    pattern = re.compile(r"(?:- |  |    )([a-z-]+): (.+)")
    for line in str(text).splitlines():
        if line.startswith("#") or line in ("species:", "  thermo:", "    data:"):
            continue
        if line.startswith("    - "):
            data.append(json.loads(line[6:]))
            continue
        match = pattern.fullmatch(line)
        if match is None or match.group(1) in entry:
            raise ModeheatError(f"the YAML block has an unexpected line: {line[:60]!r}")
        entry[match.group(1)] = json.loads(match.group(2))
    if data:
        entry["data"] = data
    return entry


def polynomial_export(fit, fmt, formula=None, provenance=None, digits=None):
    """A fit as file text: ``json`` (the provenance and the record of
    :meth:`PolynomialFit.to_dict`), ``csv`` (one row per coefficient, provenance
    lines first) or ``yaml`` (Cantera; the provenance as one comment line).

    Parameters
    ----------
    fit : PolynomialFit
    fmt : {'json', 'csv', 'yaml'}
    formula : str, optional
        Chemical formula (needed for ``yaml``; recorded otherwise).
    provenance : dict, optional
        :func:`thermo.provenance.provenance_record` of the fit (its input and
        settings); when None, a record without inputs carrying the fit's warnings.

    Returns
    -------
    str

    Raises
    ------
    OptionError
        Unknown format, or as :func:`cantera_yaml`.

    Examples
    --------
    >>> from thermo.polynomials import FitRange, PolynomialFit
    >>> fit = PolynomialFit("sgte", (FitRange(298.15, 1000.0, dict(zip("abcdef", [1.0] * 6))),))
    >>> polynomial_export(fit, "csv").splitlines()[-1]
    '0,298.15,1000.0,f,1.0'
    """
    import pandas as pd

    from ..io.writers import export_table, rounded_report

    from ..provenance import COMMON_KEYS, provenance_record

    info = provenance if provenance is not None else provenance_record(warnings=fit.warnings)
    kind = str(fmt).lower()
    if kind == "yaml":
        # ASCII JSON: no character of a name (U+2028, U+0085 …) can end the comment line in YAML
        return f"# provenance: {json.dumps(info, allow_nan=False, ensure_ascii=True)}\n" + cantera_yaml(fit, formula)
    record = rounded_report(fit.to_dict(), digits)
    record["formula"] = formula
    if kind == "json":
        return json.dumps({"provenance": info, **record}, indent=2, allow_nan=False, ensure_ascii=False) + "\n"
    if kind != "csv":
        raise OptionError(f"unknown polynomial format {fmt!r}; choose json, csv or yaml")
    ranges = record.pop("ranges")
    rows = [(i, r["T_min_K"], r["T_max_K"], key, value, r.get("coefficient_uncertainties", {}).get(key))
            for i, r in enumerate(ranges) for key, value in r["coefficients"].items()]
    table = pd.DataFrame(rows, columns=["range", "T_min_K", "T_max_K", "coefficient", "value", "uncertainty"])
    if "coefficient_uncertainties" not in ranges[0]:
        table = table.drop(columns="uncertainty")
    meta = {**info, **{k: v for k, v in record.items() if k not in COMMON_KEYS}}
    return export_table(table, meta, "csv", digits=digits).decode("utf-8")
