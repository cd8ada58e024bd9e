"""What a calorimetry result writes: the JSON report or the residual and third-law table, with its provenance.

One function for the ``calorimetry`` command and the Calorimetry page, so both write the same content.
"""

from __future__ import annotations

import math

#: Formats of the calorimetry result.
CALORIMETRY_FORMATS = ("json", "csv", "xlsx")


def calorimetry_provenance(measured, cp_unit=None, formula=None, dos=None, dos_label=None, dilation_values=None,
                           edos=None, settings=None, notes=()):
    """The provenance record of a calorimetry result.

    Parameters
    ----------
    measured : MeasuredHeatCapacity
        The measured file as read (its name, SHA-256 and unit read).
    cp_unit, formula : str, optional
        The C_p unit and formula given (None: not given).
    dos : PhononDOS, optional
        The lattice DOS; ``dos_label`` prefixes its warnings.
    dilation_values : str, optional
        Path of the C_p − C_v table of the dilation-values term.
    edos : ElectronicDOS, optional
        The electronic DOS compared with the fitted γ.
    settings : dict, optional
        The choices that shaped the fit (model, fixed, range, atoms, ...).
    notes : sequence of str
        The result's notes (after the DOS's warnings in ``warnings``).

    Returns
    -------
    dict
        :func:`thermo.provenance.provenance_record`.

    Examples
    --------
    >>> from types import SimpleNamespace
    >>> m = SimpleNamespace(source="cp.csv", sha256="0" * 64, unit="J/(mol K)")
    >>> calorimetry_provenance(m, settings={"model": None})["inputs"][0]["role"]
    'measured heat capacity'
    """
    from ..provenance import dos_input, input_record, provenance_record
    inputs = [input_record(measured.source, measured.sha256,
                           {"cp_unit": cp_unit, "unit_read": measured.unit, "formula": formula},
                           role="measured heat capacity")]
    if dos is not None:
        inputs.append(dos_input(dos, role="lattice DOS"))
    if dilation_values:
        inputs.append(input_record(dilation_values, data=dilation_values, role="dilation values"))
    if edos is not None:
        from ..electronic import electronic_input
        inputs.append(electronic_input(edos, role="electronic DOS"))
    dos_notes = [] if dos is None else [f"{dos_label}: {w}" for w in dos.warnings]
    return provenance_record(inputs, settings, dos_notes + list(notes))


def calorimetry_export(measured, model, fixed=None, fit_range=None, low_t_max=None, edos=None, edos_label=None,
                       fmt="json", **provenance):
    """The calorimetry result as written out: ``(provenance, report)`` or ``(provenance, table)``.

    Parameters
    ----------
    measured : MeasuredHeatCapacity
        Measured C_p(T).
    model : HeatCapacityModel
        The model fitted.
    fixed : dict, optional
        Held parameters (:func:`thermo.calorimetry.parse_fixed`).
    fit_range : tuple of float, optional
        (T_min, T_max) [K] of the fit (default all points).
    low_t_max : float, optional
        Upper temperature [K] of the C/T = γ + βT² analysis.
    edos : ElectronicDOS, optional
        Electronic DOS whose band γ is compared with the fitted γ; ``edos_label``
        prefixes its warnings in the notes.
    fmt : {'json', 'csv', 'xlsx'}
        ``json``: the report of :func:`thermo.calorimetry.report.analyse` with
        the residuals; ``csv``/``xlsx``: the third-law table with the residuals.
    **provenance
        Keywords of :func:`calorimetry_provenance` (``cp_unit``, ``formula``,
        ``dos``, ``dos_label``, ``dilation_values``, ``settings``).

    Returns
    -------
    provenance : dict
    result : dict or pandas.DataFrame
    notes : list of str
        The notes of the result (also in the report), for showing.
    """
    from ..errors import OptionError
    from .report import analyse, electronic_comparison
    if fmt not in CALORIMETRY_FORMATS:
        raise OptionError(f"unknown calorimetry format {fmt!r}; choose json, csv or xlsx")
    report, fit, third = analyse(measured, model, fixed, fit_range, low_t_max)
    if edos is not None:
        report["electronic_dos_comparison"] = electronic_comparison(report, edos)
        report["notes"] += report["electronic_dos_comparison"]["notes"] + [f"{edos_label}: {w}"
                                                                           for w in edos.warnings]
    record = calorimetry_provenance(measured, edos=edos, notes=report["notes"], **provenance)
    if fmt == "json":
        report["residuals"] = {k: [_number(v) for v in fit.residuals[k]] for k in fit.residuals.columns}
        return record, report, list(report["notes"])
    table = third.merge(fit.residuals.drop(columns=[third.columns[1]]), on=third.columns[0], how="left")
    record.update((k, v) for k, v in report.items()
                  if k not in ("input", "sha256", "notes", "correlation", "low_temperature_analysis"))
    return record, table, list(report["notes"])


def _number(value):
    value = float(value)
    return value if math.isfinite(value) else None
