"""``modeheat phases``: ΔF(T) / ΔG(T, p) of phases, transition temperatures with uncertainties, formation."""

from __future__ import annotations

import argparse
import json
import os
import sys

from .options import add_output_options, add_temperature_option, check_output_target, emit_table, output_plan
from .reading import add_reading_options

#: 0 to 1000 K every 5 K.
_DEFAULT_TEMPERATURES = "0:1000:5"


def register(sub):
    p = sub.add_parser("phases", conflict_handler="resolve",
                       help="compare phases: ΔF(T) or ΔG(T, p), transition temperatures and pressures with "
                            "uncertainties, p–T boundary, formation quantities")
    p.add_argument("phase", nargs="+", metavar="NAME=FILE",
                   help="a phase: a DOS file (harmonic, fixed volume) or a volume-set manifest (quasi-harmonic; "
                        "CSV with volume_A3, energy_eV, dos_file), or a CSV table modeheat wrote (quasi-harmonic "
                        "G, or calorimetry H − H(0) and S°: a phase at fixed pressure); ws:NAME for a workspace "
                        "dataset. All phases of a "
                        "run are of one kind; the first is the reference of the Δ columns")
    add_reading_options(p, None)
    p.add_argument("--atoms", action="append", default=[], metavar="NAME=N",
                   help="atoms per formula unit of a phase (default: from its DOS integral)")
    p.add_argument("--static", action="append", default=[], metavar="NAME=VALUE",
                   help="static (0 K, no zero-point) energy per formula unit of that phase, in --energy-unit "
                        "(default 0; for a volume set it is added to the manifest's energies)")
    p.add_argument("--static-uncertainty", action="append", default=[], metavar="NAME=VALUE",
                   help="uncertainty of that static energy per formula unit, in --energy-unit (default 0)")
    p.add_argument("--energy-unit", default="eV", choices=["eV", "kJ/mol", "Ry", "Ha"],
                   help="unit of --static and --static-uncertainty (kJ/mol: per mole of formula units; default eV)")
    p.add_argument("--electronic", action="append", default=[], metavar="NAME=EDOS",
                   help="electronic DOS of a harmonic phase (metals): adds F_el(T) and S_el(T); a volume set takes "
                        "it per volume in its manifest (electronic_dos_file)")
    p.add_argument("--electronic-energy-unit", default=None, metavar="U",
                   help="unit of the electronic DOS energies (eV, meV, Ry, Ha; default: as its header states)")
    p.add_argument("--pressure", default=None, metavar="GPA_LIST",
                   help="pressures in GPa for volume sets: a comma list, START:STOP:STEP, or both (default 0)")
    p.add_argument("--boundary", action="store_true",
                   help="the p–T boundary over the pressures, checked against Clausius–Clapeyron dT/dp = ΔV/ΔS")
    p.add_argument("--eos", default="birch-murnaghan", choices=["birch-murnaghan", "vinet", "spline"],
                   help="equation of state of volume sets (default birch-murnaghan)")
    p.add_argument("--per-formula", default=None, metavar="FORMULA_OR_N",
                   help="compare per formula unit of this common composition (e.g. TiO2, or an atom count); "
                        "default per atom")
    p.add_argument("--reaction", default=None, metavar='"AB = A + B"',
                   help="formation quantities instead: ΔF_f, ΔS_f, ΔH_f of the left phase (one formula unit) from "
                        "the right ones ('A2B = 2 A + B'; names are phase names; atoms must balance)")
    p.add_argument("--no-errors", action="store_true", help="skip the error estimate of every row (faster)")
    add_temperature_option(p, default=_DEFAULT_TEMPERATURES)
    add_output_options(p, "write here (default: stdout for csv/json)")
    from .workspace import add_location_options
    add_location_options(p)
    p.set_defaults(func=run)


def _pairs(items, option, names, convert=str):
    """``NAME=VALUE`` items as a dict (OptionError naming the option on a bad item or unknown name)."""
    from ..errors import OptionError
    out = {}
    for item in items:
        name, sep, value = str(item).partition("=")
        name = name.strip()
        if not sep or not name or not value.strip():
            raise OptionError(f"{option} {item!r}: expected NAME=VALUE")
        if names is not None and name not in names:
            raise OptionError(f"{option} {item!r}: no phase named {name!r} (phases: {', '.join(names)})")
        if name in out:
            raise OptionError(f"{option}: {name} is given twice")
        try:
            out[name] = convert(value.strip())
        except ValueError:
            raise OptionError(f"{option} {item!r}: {value.strip()!r} is not a number") from None
    return out


def parse_pressures(spec):
    """``0,2,5`` / ``0:10:2`` / both mixed → list of GPa (OptionError on bad items)."""
    import numpy as np

    from ..errors import OptionError
    out = []
    for item in str(spec).split(","):
        item = item.strip()
        try:
            if ":" in item:
                start, stop, step = (float(x) for x in item.split(":"))
                if step <= 0 or stop < start:
                    raise ValueError
                count = int(np.floor((stop - start) / step + 1e-9)) + 1
                out += [start + k * step for k in range(count)]
            else:
                out.append(float(item))
        except ValueError:
            raise OptionError(f"--pressure: cannot read {item!r} (GPa: a number or START:STOP:STEP)") from None
    if not out or not all(np.isfinite(out)):
        raise OptionError("--pressure: give finite pressures in GPa")
    return sorted(set(out))


def _is_manifest(path):
    """True when the file's header names the volume-set columns (volume_A3 and dos_file)."""
    try:
        with open(path, "rb") as handle:
            head = handle.read(4096).decode("utf-8-sig", errors="replace").lower()
    except OSError:
        return False
    lines = [line for line in head.splitlines() if line.strip() and not line.lstrip().startswith("#")]
    return bool(lines) and "volume_a3" in lines[0] and "dos_file" in lines[0]


def _is_table(path):
    """True when the file is a table modeheat wrote (a quasi-harmonic or calorimetry CSV, read as a phase)."""
    from ..phases.tabulated import is_phase_table
    try:
        with open(path, "rb") as handle:
            return is_phase_table(handle.read(256))
    except OSError:
        return False


def load_phases(args):
    """The :class:`~thermo.phases.Phase` list of the command line."""
    from ..errors import OptionError
    from ..phases import Phase, energy_in_ev
    from .options import load_from_args
    from .reading import reading_from_args
    from .workspace import is_reference
    specs = _pairs(args.phase, "phase", None)
    names = list(specs)
    if len(names) < 2:
        raise OptionError("give at least two phases as NAME=FILE")
    atoms = _pairs(args.atoms, "--atoms", names, int)
    static = _pairs(args.static, "--static", names, float)
    u_static = _pairs(args.static_uncertainty, "--static-uncertainty", names, float)
    electronic = _pairs(args.electronic, "--electronic", names)
    reading = argparse.Namespace(**vars(args))
    phases = []
    for name in names:
        source = specs[name]
        reading.atoms = atoms.get(name)
        edos = _electronic(args, electronic[name]) if name in electronic else None
        if not is_reference(source) and _is_manifest(source):
            from ..quasiharmonic import read_manifest
            from .quasiharmonic import _workspace_resolver
            loaded = read_manifest(source, options=reading_from_args(reading), resolve=_workspace_resolver(args),
                                   electronic_options={"energy_unit": args.electronic_energy_unit},
                                   name=os.path.basename(source))
        elif not is_reference(source) and _is_table(source):
            from ..phases.tabulated import read_phase_table
            loaded = read_phase_table(source)
        else:
            loaded = load_from_args(reading, source)
        phases.append(Phase(name, loaded, static_ev=energy_in_ev(static.get(name, 0.0), args.energy_unit),
                            atoms=atoms.get(name), electronic=edos,
                            static_uncertainty_ev=energy_in_ev(u_static.get(name, 0.0), args.energy_unit)))
    return phases


def _electronic(args, path):
    from ..electronic import load_electronic_dos
    edos = load_electronic_dos(path, energy_unit=args.electronic_energy_unit, name=os.path.basename(path) or None)
    for note in edos.notes:
        print(f"note: {note}", file=sys.stderr)
    return edos


def run(args) -> int:
    from ..errors import OptionError
    from ..phases import compare_phases, formation_table
    from ..phases.report import comparison_json, comparison_provenance, formation_provenance
    from ..temperatures import parse_temperatures

    temperatures = parse_temperatures(args.temperatures)
    fmt, digits = output_plan(args)
    check_output_target(args)
    phases = load_phases(args)
    quasi = phases[0].quasiharmonic
    pressures = parse_pressures(args.pressure) if args.pressure is not None else None
    if pressures is not None and not quasi:
        raise OptionError("--pressure needs volume sets (manifests); DOS files are compared at fixed volume")
    if args.reaction:
        if pressures is not None and len(pressures) > 1:
            raise OptionError("--reaction takes one pressure")
        table = formation_table(phases, args.reaction, temperatures, pressure_gpa=pressures[0] if pressures else None,
                                per_formula=args.per_formula, eos=args.eos, errors=not args.no_errors)
        record = formation_provenance(table, phases, temperatures, args.energy_unit)
        for note in record["warnings"]:
            print(f"warning: {note}", file=sys.stderr)
        return _emit(args, fmt, digits, table, record)
    result = compare_phases(phases, temperatures, pressures_gpa=pressures, per_formula=args.per_formula,
                            eos=args.eos, errors=not args.no_errors, boundary=args.boundary)
    record = comparison_provenance(result, phases, temperatures, args.energy_unit)
    for note in record["warnings"]:
        print(f"warning: {note}", file=sys.stderr)
    _say(result)
    if fmt == "json":
        return _write_text(args, comparison_json(result, record, digits))
    return _emit(args, fmt, digits, result.table, record)


def _say(result):
    for tr in result.transitions:
        where = "" if tr["pressure_GPa"] is None else f" at {tr['pressure_GPa']:g} GPa"
        print(f"note: {tr['low_phase']} -> {tr['high_phase']}{where}: T* = {tr['temperature_K']:.6g} ± "
              f"{tr['uncertainty_K']:.2g} K", file=sys.stderr)
    for none in result.no_crossing:
        c = none["closest_approach"] or {}
        where = "" if none["pressure_GPa"] is None else f" at {none['pressure_GPa']:g} GPa"
        print(f"note: {' / '.join(none['phases'])}{where}: no crossing in the temperature range; {none['stable_phase']} "
              f"stays lower, closest at {c.get('temperature_K', float('nan')):g} K", file=sys.stderr)


def _emit(args, fmt, digits, table, record):
    if fmt == "json":
        from ..phases.report import jsonable
        rows = table.to_numpy(dtype=object).tolist()
        text = json.dumps(jsonable({"provenance": record, "columns": list(table.columns), "table": rows}),
                          indent=1, ensure_ascii=False, allow_nan=False)
        return _write_text(args, text + "\n")
    return emit_table(table, record, args, (fmt, digits))


def _write_text(args, text):
    if args.output:
        from .options import write_text_output
        write_text_output(args, text)
    else:
        sys.stdout.write(text)
    return 0
