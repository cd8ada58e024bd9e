"""``modeheat table``: thermodynamic table of one DOS file."""

from __future__ import annotations


from ..temperatures import parse_temperatures
from .options import (add_input_options, add_table_options, add_temperature_option, emit_table, formula_of,
                      load_from_args, output_plan, report_warnings)


def register(sub):
    p = sub.add_parser("table", help="C_v, S, U, F versus temperature for one DOS file")
    add_input_options(p)
    add_temperature_option(p)
    add_table_options(p, "write here (default: stdout for csv/json)")
    p.set_defaults(func=run)


def run(args) -> int:
    from ..tables import provenance, tabulate

    temperatures = parse_temperatures(args.temperatures)
    plan = output_plan(args)
    dos = load_from_args(args)
    formula = formula_of(args, dos)
    table = tabulate(dos, temperatures, per=args.per, formula=formula)
    report_warnings(dos)
    info = provenance(dos, temperatures, per=args.per, formula=formula)
    return emit_table(table, info, args, plan)
