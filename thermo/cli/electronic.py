"""``modeheat electronic``: electronic C_el, S_el, F_el and μ(T) of a metal from its electronic DOS."""

from __future__ import annotations

import sys

from ..unit_names import ELECTRON_ENERGY_UNITS
from .options import add_table_options, add_temperature_option, emit_table, output_plan


def add_electronic_reading_options(parser):
    """Add how to read an electronic DOS: energy unit, Fermi energy, spin columns, formula units per cell."""
    parser.add_argument("--energy-unit", metavar="U",
                        help=f"unit of the electronic DOS energies: {', '.join(ELECTRON_ENERGY_UNITS)} (default: as "
                             "the first header cell or a line '# energy unit: eV' states; never guessed); the DOS "
                             "is in states per this unit")
    parser.add_argument("--fermi-energy", type=float, metavar="EV",
                        help="absolute Fermi energy in eV when the energies are absolute (default: the file's "
                             "'# Fermi energy: … eV' line, else the energies are relative to E_F)")
    parser.add_argument("--spin", choices=["summed", "pair"], default=None,
                        help="summed: the DOS columns already hold both spins; pair: columns 2 and 3 are spin up "
                             "and down and are summed (default: pair when their names say up/down)")
    parser.add_argument("--formula-units", type=float, metavar="N",
                        help="formula units in the cell the electronic DOS is for (the DOS is divided by N; "
                             "default 1)")


def electronic_options(args):
    """Keyword arguments of :func:`thermo.electronic.load_electronic_dos` from the parsed options."""
    return {"energy_unit": args.energy_unit, "fermi_energy_ev": args.fermi_energy, "spin": args.spin,
            "formula_units": args.formula_units}


def load_electronic_from_args(args, path, sheet=None):
    """The :class:`~thermo.electronic.ElectronicDOS` at ``path`` read with the parsed options (notes on stderr)."""
    import os
    from pathlib import Path

    from ..electronic import load_electronic_dos
    edos = load_electronic_dos(Path(path), sheet=sheet, name=os.path.basename(str(path)) or None,
                               **electronic_options(args))
    for note in edos.notes:
        print(f"note: {note}", file=sys.stderr)
    return edos


def report_electronic(attrs):
    """Print the warnings and key numbers of an electronic table (its ``attrs``) on stderr."""
    summary = attrs["summary"]
    for note in attrs.get("warnings", []):
        print(f"warning: {note}", file=sys.stderr)
    gamma = summary["sommerfeld_gamma_mJ_per_mol_K2"]
    print(f"note: γ = {gamma['value']:.5g} ± {gamma['uncertainty']:.2g} mJ/(mol K²) from g(E_F) = "
          f"{summary['dos_at_fermi_level_per_eV']['value']:.5g} states/eV per formula unit; "
          f"{summary['electrons_below_fermi_level']:.6g} electrons below E_F in the table", file=sys.stderr)


def register(sub):
    p = sub.add_parser("electronic", help="electronic C_el, S_el, F_el and μ(T) from an electronic DOS (metals)")
    p.add_argument("file", metavar="EDOS",
                   help="electronic DOS: energy (relative to E_F, or absolute with a stated Fermi energy), total DOS "
                        "in states per energy unit per formula unit (or spin up and down), optional projected "
                        "columns; text (space, tab, comma or semicolon separated) or .xlsx")
    add_electronic_reading_options(p)
    p.add_argument("--sheet", metavar="NAME_OR_NUMBER", help=".xlsx input: worksheet name or number from 1")
    p.add_argument("--atoms", type=int, metavar="N", help="atoms per formula unit (for --per atom or gram)")
    add_temperature_option(p)
    add_table_options(p, "write here (default: stdout for csv/json)")
    p.set_defaults(func=run)


def run(args) -> int:
    from ..electronic import electronic_provenance, electronic_table
    from ..temperatures import parse_temperatures

    temperatures = parse_temperatures(args.temperatures)
    plan = output_plan(args)
    edos = load_electronic_from_args(args, args.file, sheet=args.sheet)
    table = electronic_table(edos, temperatures, per=args.per, atoms=args.atoms, formula=args.formula)
    report_electronic(table.attrs)
    return emit_table(table, electronic_provenance(edos, table.attrs, temperatures), args, plan)
