"""``modeheat compare``: C_v, S, U, F of several runs against a reference run, with each run's error estimate."""

from __future__ import annotations

import os

from .options import add_output_options, check_digits, load_from_args, output_plan, report_warnings
from .reading import add_formula_option, add_reading_options


def register(sub):
    p = sub.add_parser("compare", help="relative differences of C_v, S, U, F between runs (convergence study), "
                                       "with each run's estimated error")
    p.add_argument("file", nargs="+", metavar="FILE",
                   help="DOS files or mode lists of the same solid (or ws:NAME datasets); the first is the "
                        "reference unless --reference names another")
    p.add_argument("--table", action="append", default=[], metavar="CSV",
                   help="a table modeheat wrote (thermodynamics, quasi-harmonic, calorimetry: its S° stands for S) "
                        "compared as one more run, interpolated between its rows (repeat for several)")
    p.add_argument("--reference", metavar="FILE", help="the run the others are compared with (one of FILE)")
    p.add_argument("--temperatures", default="5,20,298.15", metavar="SPEC",
                   help="temperatures [K], > 0: a comma list and/or START:STOP:STEP (default 5,20,298.15)")
    p.add_argument("--per", default="formula", choices=["formula", "atom", "gram"],
                   help="basis: per mole of formula units (default), per atom, per gram (needs --formula)")
    add_reading_options(p, "for --per gram", many=True)
    add_formula_option(p, "for --per gram")
    from .workspace import add_location_options
    add_location_options(p)
    add_output_options(p, "write here (default: stdout for csv/json)")
    p.set_defaults(func=run)


def run(args) -> int:
    from ..convergence import compare_runs, comparison_provenance, with_table_run
    from ..errors import OptionError
    from ..temperatures import parse_temperatures
    from .options import emit_table, formula_of

    check_digits(args.digits)
    plan = output_plan(args)
    temperatures = parse_temperatures(args.temperatures)
    files = list(args.file)
    if args.reference is not None and args.reference not in files:
        files.insert(0, args.reference)
    if len(files) + len(args.table) < 2 or not files:
        raise OptionError("compare needs at least two runs (files, or a file and --table)")
    reference = files.index(args.reference) if args.reference is not None else 0
    doses = [load_from_args(args, f) for f in files]
    for dos in doses:
        report_warnings(dos)
    names = [f if f.startswith("ws:") else os.path.basename(f) for f in files]
    formula = formula_of(args, doses[0])
    table = compare_runs(doses, temperatures, reference=reference, names=names, per=args.per, formula=formula)
    info = comparison_provenance(doses, temperatures, reference=reference, names=names, per=args.per,
                                 formula=formula)
    for path in args.table:
        with open(path, "rb") as handle:
            table, info = with_table_run(table, info, handle.read(), os.path.basename(path), formula)
    return emit_table(table, info, args, plan)
