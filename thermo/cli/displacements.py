"""``modeheat displacements``: ⟨u²⟩, U_iso, B and θ_M per species from a (partial) DOS."""

from __future__ import annotations

import sys

from .options import (add_input_options, add_output_options, add_temperature_option, emit_table, formula_of,
                      load_from_args, output_plan, report_warnings)


def register(sub):
    p = sub.add_parser("displacements",
                       help="mean-square displacements ⟨u²⟩, U_iso, Debye–Waller B and θ_M per species vs T")
    add_input_options(p, formula_help="masses and atom counts of the species")
    add_temperature_option(p, default="0:1000:10")
    p.add_argument("--masses", metavar="S=M,...",
                   help="mass of each species in u, e.g. Ly=12.4,Hv=88.6 (isotopes, invented species)")
    p.add_argument("--species-columns", metavar="S,...",
                   help="partial-DOS columns to report (default: all partial columns)")
    where = p.add_mutually_exclusive_group()
    where.add_argument("--distance", type=float, metavar="D",
                       help="nearest-neighbour distance in Å (adds the Lindemann ratio)")
    where.add_argument("--lattice", metavar="TYPE:A",
                       help="lattice and parameter a in Å, e.g. fcc:3.61 (d from the cell; sc, bcc, fcc, hcp, "
                            "rocksalt, cscl, diamond, zincblende)")
    add_output_options(p, "write here (default: stdout for csv/json)")
    p.set_defaults(func=run)


def run(args) -> int:
    from ..temperatures import parse_temperatures
    from ..vibration.displacements import displacement_provenance, displacement_summary, displacement_table
    from ..vibration.inputs import parse_distance, parse_masses, parse_species

    temperatures = parse_temperatures(args.temperatures)
    plan = output_plan(args)
    masses = parse_masses(args.masses)
    distance = parse_distance(args.distance, args.lattice)
    species = parse_species(args.species_columns)
    dos = load_from_args(args)
    formula = formula_of(args, dos)
    table = displacement_table(dos, temperatures, formula, masses, distance, species)
    summary = displacement_summary(dos, formula, masses, distance, temperatures, species)
    report_warnings(dos)
    for note in summary["warnings"]:
        print(f"warning: {note}", file=sys.stderr)
    info = displacement_provenance(dos, temperatures, formula, masses, distance, summary, species)
    return emit_table(table, info, args, plan)
