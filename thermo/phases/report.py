"""Provenance and the JSON report of a phase comparison or a formation table."""

from __future__ import annotations

import math

from ..provenance import dos_input, input_record, provenance_record, temperature_settings

#: Cautions written with every comparison (common practice; defer to validated data).
CAUTIONS = (
    "Harmonic (DOS) phases are compared at fixed volumes: no thermal expansion, no pressure; a transition found "
    "this way is indicative only.",
    "Quasi-harmonic G neglects explicit anharmonicity and fails approaching melting; imaginary modes at a volume "
    "make its F there meaningless.",
    "Transition temperatures are very sensitive to the static energy difference: u(T*) grows as u(ΔE)/|ΔS|. "
    "Check against measured or validated phase data before a design decision.",
)


def phase_inputs(phase):
    """The provenance ``inputs`` entries of one phase (its DOS or manifest and DOS files, electronic DOS)."""
    role = f"phase {phase.name}"
    src = phase.source
    if phase.quasiharmonic:
        out = [input_record(src.source.get("name"), src.source.get("sha256"), role=f"{role}: manifest")] \
            if src.source.get("name") else []
        out += [dos_input(d, role=f"{role}: DOS at {v:.6g} Å³") for v, d in zip(src.volumes_a3, src.doses)]
        if src.electronic:
            from ..electronic import electronic_input
            out += [electronic_input(e, role=f"{role}: electronic DOS at {v:.6g} Å³")
                    for v, e in zip(src.volumes_a3, src.electronic)]
        return out
    if getattr(src, "tabulated", False):
        return [input_record(src.name, src.sha256, role=f"{role}: {src.kind}")]
    out = [dos_input(src, role=f"{role}: DOS")]
    if phase.electronic is not None:
        from ..electronic import electronic_input
        out.append(electronic_input(phase.electronic, role=f"{role}: electronic DOS"))
    return out


def phase_settings(phase, energy_unit="eV"):
    """What was given for a phase: static energy, its uncertainty, atoms, kind."""
    from .phase import ENERGY_UNITS
    factor = ENERGY_UNITS[energy_unit]
    kind = getattr(phase.source, "kind", None) if getattr(phase.source, "tabulated", False) else None
    return {"name": phase.name, "kind": kind or ("quasi-harmonic (volume set)" if phase.quasiharmonic else
                                                 "harmonic (DOS at fixed volume)"), "atoms_per_formula_unit": phase.atoms,
            "static_energy": phase.static_ev / factor, "static_uncertainty": phase.static_uncertainty_ev / factor,
            "energy_unit": f"{energy_unit} per formula unit of the phase",
            "electronic": phase.electronic is not None or bool(getattr(phase.source, "electronic", ()))}


def _warnings(phases):
    out = []
    for ph in phases:
        doses = ph.source.doses if ph.quasiharmonic else (ph.source,)
        for text in dict.fromkeys(w for d in doses for w in d.warnings):
            out.append(f"phase {ph.name}: {text}")
    return out


def comparison_provenance(result, phases, temperatures, energy_unit="eV"):
    """Provenance record of :func:`~thermo.phases.compare.compare_phases` output (every input with SHA-256).

    The transitions, crossings of metastable pairs, pairs without a crossing
    and the boundary are details of the record, so a CSV or XLSX export carries
    them beside the table.
    """
    settings = dict(result.settings, temperatures_K=temperature_settings(temperatures),
                    phases=[phase_settings(p, energy_unit) for p in phases])
    return provenance_record(
        [entry for p in phases for entry in phase_inputs(p)], settings, _warnings(phases) + list(result.warnings),
        transitions=result.transitions, metastable_crossings=result.metastable_crossings,
        no_crossing=result.no_crossing, boundary=result.boundary, cautions=list(CAUTIONS),
        uncertainty=("each row's error is u(G) of both phases added: harmonic rows the numerical + low-frequency "
                     "estimate, quasi-harmonic rows their G error column (harmonic, EOS, volume sampling, edge), "
                     "plus the static uncertainty given; u(T*) = u(ΔG)/|ΔS| at the crossing, at least the "
                     "interval where |ΔG| <= u(ΔG), plus the root tolerance; an estimate of the largest error, not a "
                     "standard deviation"))


def formation_provenance(table, phases, temperatures, energy_unit="eV"):
    """Provenance record of :func:`~thermo.phases.reaction.formation_table` output."""
    settings = {"reaction": table.attrs["reaction"], "basis": table.attrs["basis"],
                "pressure_GPa": table.attrs["pressure_GPa"], "temperatures_K": temperature_settings(temperatures),
                "phases": [phase_settings(p, energy_unit) for p in phases]}
    return provenance_record([entry for p in phases for entry in phase_inputs(p)], settings,
                             _warnings(phases) + list(table.attrs.get("warnings", [])), cautions=list(CAUTIONS))


def jsonable(value):
    """numpy/pandas values → plain JSON values (non-finite → None), as the table writers do."""
    from ..io.writers import plain_value
    return plain_value(value)


def comparison_report(result, record, digits=None):
    """The JSON document of a comparison: provenance, transitions, boundary, then the table (columns by name)."""
    table = result.table
    rows = table.to_numpy(dtype=object).tolist()
    if digits:
        rows = [[float(f"{v:.{digits}g}") if isinstance(v, float) and math.isfinite(v) else v for v in r]
                for r in rows]
    return jsonable({"provenance": record, "transitions": result.transitions,
                     "metastable_crossings": result.metastable_crossings, "no_crossing": result.no_crossing,
                     "boundary": result.boundary, "columns": list(table.columns), "table": rows})


#: Details of a comparison record that the JSON report carries at its top level instead.
TOP_LEVEL = ("transitions", "metastable_crossings", "no_crossing", "boundary")


def comparison_json(result, record, digits=None):
    """The JSON text of a comparison (what ``modeheat phases --format json`` writes and the page downloads)."""
    import json
    plain = {k: v for k, v in record.items() if k not in TOP_LEVEL}
    return json.dumps(comparison_report(result, plain, digits), indent=1, ensure_ascii=False, allow_nan=False) + "\n"
