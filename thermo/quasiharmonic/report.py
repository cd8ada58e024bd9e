"""Provenance record of a quasi-harmonic table (written beside every export)."""

from __future__ import annotations

import re

from ..provenance import dos_input, input_record, provenance_record, temperature_settings
from ..accuracy.reuse import table_breakdown
from ..tables import estimated_relative_error


def _grouped_warnings(volume_set):
    """DOS warnings, one line per kind: the first file's text and the files it applies to."""
    groups = {}
    for name, dos in zip(volume_set.names, volume_set.doses):
        for text in dos.warnings:
            key = re.sub(r"[-+]?\d[\d.eE+-]*", "#", text)
            groups.setdefault(key, [text, []])[1].append(name)
    out = []
    for text, names in groups.values():
        where = names[0] if len(names) == 1 else (f"{len(names)} of {len(volume_set.names)} volumes"
                                                  f" ({names[0]} ... {names[-1]})")
        out.append(f"{where}: {text}" + ("" if len(names) == 1 else " (values of the first)"))
    return out


def _uncertainty(table):
    """The record of the ``_error_`` columns, when the table has them."""
    summary = table.attrs.get("uncertainty")
    if summary is None:
        return {}
    return {"uncertainty": {
        "columns": "<quantity>_error_<unit>: an estimate of the largest error of the value beside it (not a "
                   "standard deviation), the sum of the parts below",
        "parts": {"harmonic": "per-volume harmonic error (numerical + low-frequency) carried through the "
                              "minimisation, worst sign at every volume",
                  "equation_of_state": "largest change when Birch-Murnaghan, Vinet or spline replaces the "
                                       "chosen form",
                  "volume_sampling": "largest change when one sampled volume is left out",
                  "edge": "minimum beyond the outermost volume: that volume's leave-out change times the "
                          "distance in volume spacings"},
        "largest_relative": summary,
        "not_included": "static energies are taken as exact; explicit anharmonicity, electrons and defects "
                        "are outside the model (see cautions)"}}


def quasiharmonic_provenance(volume_set, table, temperatures):
    """Provenance of :func:`thermo.quasiharmonic.quasiharmonic_table` output.

    Parameters
    ----------
    volume_set : VolumeSet
        The volume set the table came from.
    table : pandas.DataFrame
        The quasi-harmonic table (its ``attrs`` carry the settings and diagnostics).
    temperatures : array_like
        Temperatures of the table [K].

    Returns
    -------
    dict
        :func:`thermo.provenance.provenance_record`: inputs (the manifest,
        then every DOS with its SHA-256 and reading options), settings (basis,
        formula, EOS, pressure, temperature grid), warnings; as details the
        atoms, low-frequency mode, the largest error estimate, the fit
        diagnostics, per-volume records, cautions and the model statement.
    """
    doses = volume_set.doses
    first = doses[0]
    diag = table.attrs.get("diagnostics", {})
    fits = [d.low_frequency for d in doses]
    records = diag.get("volumes", [])
    inputs = [input_record(volume_set.source.get("name"), volume_set.source.get("sha256"), role="manifest")] \
        if volume_set.source.get("name") else []
    inputs += [dos_input(d, role=f"DOS at {v:.6g} Å³") for v, d in zip(volume_set.volumes_a3, doses)]
    electronic = {}
    if volume_set.electronic:
        from ..electronic import electronic_input, electronic_summary
        inputs += [electronic_input(e, role=f"electronic DOS at {v:.6g} Å³")
                   for v, e in zip(volume_set.volumes_a3, volume_set.electronic)]
        electronic["electronic"] = [dict(electronic_summary(e), volume_A3=float(v))
                                    for v, e in zip(volume_set.volumes_a3, volume_set.electronic)]
    settings = {"basis": table.attrs.get("per"), "formula": table.attrs.get("formula"),
                "equation_of_state": table.attrs.get("eos"), "pressure_GPa": table.attrs.get("pressure_GPa"),
                "temperatures_K": temperature_settings(temperatures)}
    return provenance_record(
        inputs, settings, list(diag.get("warnings", [])) + _grouped_warnings(volume_set),
        atoms=volume_set.atoms, atoms_inferred=bool(first.source.get("atoms_inferred")),
        low_frequency="off" if fits[0] is None else ("auto" if fits[0].automatic else "manual"),
        estimated_relative_error=max(estimated_relative_error(d, temperatures, table_breakdown(d, temperatures))
                                     for d in doses),
        volume_range_A3=diag.get("volume_range_A3"),
        max_fit_residual_meV=diag.get("max_fit_residual_meV"),
        outside_range_K=diag.get("outside_range_K"),
        imaginary_volumes_A3=diag.get("imaginary_volumes"),
        volumes=[{"volume_A3": r["volume_A3"], "energy_eV": r["energy_eV"], "dos_file": r["dos_file"],
                  "imaginary_share": r["imaginary_share"], "raw_integral": d.source.get("raw_integral")}
                 for r, d in zip(records, doses)],
        cautions=list(diag.get("cautions", [])),
        model=("quasi-harmonic: F(V,T) = E(V) + F_vib(V,T) (zero-point included) + F_el(V,T) (electronic DOS at "
               "each volume, fixed electron count), EOS fit at each T, G = min_V (F + pV); no explicit anharmonic or "
               "defect terms, no electron–phonon renormalisation") if volume_set.electronic else
              ("quasi-harmonic: F(V,T) = E(V) + F_vib(V,T) (zero-point included), EOS fit at each T, "
               "G = min_V (F + pV); no explicit anharmonic, electronic or defect terms"),
        carrier="S and C_v carried between volumes as splines of ln S, ln C_v in ln V",
        **electronic,
        **_uncertainty(table),
    )
