"""The merged coefficient file of a campaign: every material's fit and the provenance of every input.

JSON (default)
    ``{"format": "modeheat-coefficients", "version": 1, "provenance": {...},
    "entries": [...], "failed": [...]}``; each entry is
    :meth:`thermo.polynomials.PolynomialFit.to_dict` plus ``input``, ``name``
    (the file stem) and ``inputs`` (the files it came from, each with its
    SHA-256 and reading options); ``failed`` lists the inputs without a fit
    and why.
CSV
    The provenance as ``# key: value`` lines, then one row per coefficient:
    ``name, input, form, range, T_min_K, T_max_K, coefficient, value,
    uncertainty, cp_fit_max_relative_error`` (``uncertainty``: the source's
    uncertainty carried to the coefficient, empty when the source has none).

The top-level provenance lists every input of every entry; its settings are
the campaign options.
"""

from __future__ import annotations

import json
from pathlib import Path

#: File name of the merged coefficients, without suffix.
COEFFICIENTS_STEM = "coefficients"
#: Formats of the merged file.
COEFFICIENT_FORMATS = ("json", "csv")
#: Tag of the JSON format.
JSON_TAG = "modeheat-coefficients"


def campaign_settings(options):
    """The campaign options as provenance settings.

    Examples
    --------
    >>> from thermo.campaign.jobs import CampaignOptions
    >>> campaign_settings(CampaignOptions("polynomial"))["range_K"]
    [298.15, 1500.0]
    """
    from ..provenance import temperature_settings
    settings = {"kind": options.kind, "form": options.form, "range_K": list(options.fit_range),
                "mid_K": options.mid, "formation_enthalpy_kJ_per_mol": options.formation_enthalpy,
                "phase": options.phase, "reading_options": options.reading.given()}
    if options.kind == "quasiharmonic":
        settings.update(pressure_GPa=options.pressure_gpa, eos=options.eos,
                        temperatures_K=temperature_settings(options.temperatures))
    return settings


def merged_record(results, options):
    """The merged file's content as one JSON-able dict (see the module docstring)."""
    from ..provenance import provenance_record
    entries = [r["entry"] for r in results if r["entry"] is not None]
    inputs = [item for r in results for item in r["inputs"]]
    warnings = [f"{e['name']}: {w}" for e in entries for w in e["warnings"]]
    info = provenance_record(inputs, campaign_settings(options), warnings)
    failed = [{"input": r["row"]["input"], "error": r["row"]["error"]} for r in results
              if r["row"]["status"] == "failed"]
    return {"format": JSON_TAG, "version": 1, "provenance": info, "entries": entries, "failed": failed}


def merged_text(record, fmt):
    """The merged record as file text in ``fmt`` (``json`` or ``csv``).

    Examples
    --------
    >>> rec = {"format": JSON_TAG, "version": 1, "provenance": {"tool": "modeheat"}, "failed": [],
    ...        "entries": [{"name": "a", "input": "a.dat", "form": "sgte", "errors": {},
    ...                     "ranges": [{"T_min_K": 298.15, "T_max_K": 1000.0, "coefficients": {"a": 1.5}}]}]}
    >>> merged_text(rec, "csv").splitlines()[-1]
    'a,a.dat,sgte,0,298.15,1000.0,a,1.5,,'
    """
    if fmt == "json":
        return json.dumps(record, indent=1, allow_nan=False, ensure_ascii=False) + "\n"
    import pandas as pd

    from ..io.writers import export_table
    columns = ["name", "input", "form", "range", "T_min_K", "T_max_K", "coefficient", "value", "uncertainty",
               "cp_fit_max_relative_error"]
    rows = [(e["name"], e["input"], e["form"], k, r["T_min_K"], r["T_max_K"], key, value,
             r.get("coefficient_uncertainties", {}).get(key), e["errors"].get("heat_capacity_p", {}).get("max_relative"))
            for e in record["entries"] for k, r in enumerate(e["ranges"]) for key, value in r["coefficients"].items()]
    meta = {**record["provenance"], "failed": record["failed"]}
    return export_table(pd.DataFrame(rows, columns=columns), meta, "csv").decode("utf-8")


def write_merged(results, options, outdir, fmt="json"):
    """Write the merged coefficient file ``coefficients.<fmt>`` in ``outdir``; returns its path.

    Never through a symbolic link; an existing file only with ``options.force``.
    """
    from ..io.inert import write_file
    target = Path(outdir) / f"{COEFFICIENTS_STEM}.{fmt}"
    write_file(target, merged_text(merged_record(results, options), fmt).encode("utf-8"), overwrite=options.force)
    return target
