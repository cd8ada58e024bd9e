"""What the models result writes: the JSON report or the side-by-side table, with its provenance.

One function for the ``models`` command and the Models page, so both write the same content.
"""

from __future__ import annotations

from .catalogue import model_tables, models_report, side_by_side
from .composite import CompositeModel

#: Formats of the models result.
MODELS_FORMATS = ("json", "csv")
#: Temperatures of the side-by-side table when none are given (as the ``table`` command).
TABLE_NOTE = "einstein/debye columns use the θ fitted to C_v over fit_range_K; U and F include the ZPE"


def models_export(dos, temperatures=None, fit_range=None, optical_terms=1, fmt="json"):
    """The models result of a DOS as written out: ``(provenance, report)`` or ``(provenance, table)``.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    temperatures : array_like, optional
        Temperatures [K]: of θ_D(T) in the report (omitted when None), of the
        table rows (required for ``csv``).
    fit_range : tuple of float, optional
        (T_min, T_max) of the C_v fits [K] (default θ_D(0)/20 to θ_D(0)).
    optical_terms : int
        Einstein terms of the composite model.
    fmt : {'json', 'csv'}
        ``json``: the record of :func:`models_report`; ``csv``: the DOS,
        fitted Einstein, fitted Debye and composite tables side by side
        (:func:`side_by_side`).

    Returns
    -------
    provenance : dict
        :func:`thermo.provenance.provenance_record` of the DOS and settings
        (for ``csv`` with the fitted θ's [K] and the fit range).
    result : dict or pandas.DataFrame
        The report (``json``) or the table (``csv``).

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> info, report = models_export(debye_spectrum(5.0), fmt="json")
    >>> info["tool"], round(report["debye_theta_moment_2_K"] / debye_spectrum(5.0).atoms, 1) > 0
    ('modeheat', True)
    """
    import numpy as np

    from ..errors import OptionError
    from ..provenance import dos_input, provenance_record, temperature_settings
    if fmt not in MODELS_FORMATS:
        raise OptionError(f"unknown models format {fmt!r}; choose json or csv")
    if optical_terms < 1:
        raise OptionError(f"optical terms must be >= 1, got {optical_terms}")
    if fmt == "csv" and temperatures is None:
        raise OptionError("the models table needs temperatures")
    t = None if temperatures is None else np.atleast_1d(np.asarray(temperatures, dtype=float))
    report = models_report(dos, t if fmt == "json" else None, fit_range, optical_terms)
    settings = {"fit_range_K": None if fit_range is None else [float(v) for v in fit_range],
                "optical_terms": int(optical_terms),
                "temperatures_K": None if t is None else temperature_settings(t)}
    if fmt == "json":
        return provenance_record([dos_input(dos)], settings, dos.warnings), report
    composite = CompositeModel.from_dict(report["composite"])
    tables = model_tables(dos, t, report["einstein_theta_fit_K"], report["debye_theta_fit_K"], composite)
    info = provenance_record(
        [dos_input(dos)], settings, dos.warnings,
        einstein_theta_K=report["einstein_theta_fit_K"], debye_theta_K=report["debye_theta_fit_K"],
        composite_debye_theta_K=report["composite_debye_theta_K"],
        composite_einstein_theta_K=report["composite_einstein_theta_K"],
        fit_range_K=report["fit_range_K"], note=TABLE_NOTE)
    return info, side_by_side(tables)
