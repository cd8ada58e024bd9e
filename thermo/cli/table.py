"""``modeheat table``: thermodynamic table of one DOS file."""

from __future__ import annotations


from ..temperatures import parse_temperatures
from .electronic import add_electronic_reading_options, load_electronic_from_args, report_electronic
from .options import (add_input_options, add_table_options, add_temperature_option, emit_table, formula_of,
                      load_from_args, output_plan, report_warnings)


def register(sub):
    p = sub.add_parser("table", help="C_v, S, U, F versus temperature for one DOS file")
    add_input_options(p)
    add_temperature_option(p)
    add_table_options(p, "write here (default: stdout for csv/json)")
    p.add_argument("--electronic", metavar="EDOS",
                   help="electronic DOS of the same solid (metals): adds C_el, S_el, U_el, F_el, μ − E_F and the "
                        "vibrational + electronic totals (see 'modeheat electronic' for its format)")
    add_electronic_reading_options(p)
    p.add_argument("--errors", action="store_true",
                   help="add each quantity's estimated error (<quantity>_error_<unit>: numerical, low-frequency, "
                        "resolution and smearing parts) and flag rows whose error of C_v or S exceeds 1 %% "
                        "(error_flag, error_reason)")
    p.set_defaults(func=run)


def run(args) -> int:
    from ..tables import provenance, tabulate

    temperatures = parse_temperatures(args.temperatures)
    plan = output_plan(args)
    dos = load_from_args(args)
    edos = load_electronic_from_args(args, args.electronic) if args.electronic else None
    formula = formula_of(args, dos)
    table = tabulate(dos, temperatures, per=args.per, formula=formula)
    report_warnings(dos)
    breakdown = None
    if args.errors:           # one breakdown for the error columns and the provenance
        from ..accuracy.reuse import table_breakdown
        breakdown = table_breakdown(dos, temperatures)
    info = provenance(dos, temperatures, per=args.per, formula=formula, breakdown=breakdown)
    if args.errors:
        import sys

        from ..accuracy.rows import add_error_columns
        table = add_error_columns(table, dos, formula, breakdown=breakdown)
        flagged = table[table.error_flag]
        if len(flagged):
            print(f"warning: {len(flagged)} of {len(table)} rows have an estimated error of C_v or S over 1 % "
                  f"(first at {flagged.iloc[0, 0]:g} K: {flagged.error_reason.iloc[0]}); see error_reason",
                  file=sys.stderr)
    if edos is not None:
        from ..electronic import electronic_details, electronic_input, with_electronic
        table = with_electronic(table, edos, atoms=dos.atoms)
        report_electronic(table.attrs["electronic"])
        info["inputs"].append(electronic_input(edos, role="electronic DOS"))
        info["warnings"] += table.attrs["electronic"]["warnings"]
        info["electronic"] = electronic_details(edos, table.attrs["electronic"])
        info["model"] = ("harmonic lattice at fixed volume plus the electronic term of a fixed electronic DOS "
                         "(C_v); no anharmonic or C_p - C_v terms")
    return emit_table(table, info, args, plan)
