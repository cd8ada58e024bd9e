"""``modeheat table``: thermodynamic table of one DOS file."""

from __future__ import annotations

import sys
from pathlib import Path

from ..temperatures import parse_temperatures
from .options import (add_input_options, add_table_options, add_temperature_option, check_digits,
                      load_from_args, report_warnings)


def register(sub):
    p = sub.add_parser("table", help="C_v, S, U, F versus temperature for one DOS file")
    add_input_options(p)
    add_temperature_option(p)
    add_table_options(p, "write here (default: stdout for csv/json)")
    p.set_defaults(func=run)


def run(args) -> int:
    from ..errors import OptionError
    from ..tables import provenance, tabulate
    from ..io.writers import export_table, format_from_suffix, write_table

    temperatures = parse_temperatures(args.temperatures)
    digits = check_digits(args.digits)
    fmt = format_from_suffix(args.output, args.format) if args.output else (args.format or "csv")
    if args.output and not args.force and Path(args.output).exists():
        raise OptionError(f"refusing to overwrite existing file {args.output}; use --force to replace it")
    dos = load_from_args(args)
    table = tabulate(dos, temperatures, per=args.per, formula=args.formula)
    report_warnings(dos)
    info = provenance(dos, temperatures, per=args.per, formula=args.formula)
    if args.output:
        write_table(table, info, fmt, args.output, overwrite=args.force, digits=digits)
        print(f"wrote {args.output}", file=sys.stderr)
        return 0
    if fmt == "xlsx":
        raise OptionError("xlsx output needs --output PATH")
    sys.stdout.write(export_table(table, info, fmt, digits=digits).decode("utf-8"))
    return 0
