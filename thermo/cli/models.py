"""``modeheat models``: Einstein/Debye temperatures, composite model and θ_D(T) of one DOS."""

from __future__ import annotations

import sys

from ..temperatures import DEFAULT_TEMPERATURES, parse_temperatures
from .options import (add_input_options, add_report_output_options, check_digits, check_output_target, emit_report,
                      load_from_args, report_warnings, write_text_output)


def register(sub):
    p = sub.add_parser("models", help="Einstein and Debye temperatures (every definition), composite "
                                      "Debye+Einstein model and equivalent θ_D(T) of a DOS")
    add_input_options(p)
    p.add_argument("--temperatures", default=None, metavar="SPEC",
                   help="START:STOP:STEP in K (STOP included) or a comma list; adds temperature_K and "
                        f"equivalent_debye_temperature_K to json (csv default {DEFAULT_TEMPERATURES})")
    p.add_argument("--fit-range", metavar="TMIN:TMAX",
                   help="temperature range of the C_v least-squares fits in K (default θ_D(0)/20 : θ_D(0))")
    p.add_argument("--optical-terms", type=int, default=1, metavar="K",
                   help="Einstein terms sharing the 3n-3 optical modes in the composite model (default 1)")
    p.add_argument("--format", default="json", choices=["json", "csv"],
                   help="json: every θ with definitions (default); csv: DOS and model tables side by side")
    add_report_output_options(p)
    for action in p._actions:
        if action.dest == "digits":
            action.help = ("significant digits of the numbers written (1 to 17; default: 8 for csv, all digits "
                           "for json)")
    p.set_defaults(func=run)


def parse_fit_range(text):
    """``TMIN:TMAX`` in K as a pair of floats.

    Examples
    --------
    >>> parse_fit_range("10:300")
    (10.0, 300.0)
    """
    from ..errors import OptionError
    from ..models.fitting import check_fit_range
    parts = str(text).split(":")
    if len(parts) != 2:
        raise OptionError(f"fit range {text!r} must be TMIN:TMAX in K")
    try:
        values = [float(p) for p in parts]
    except ValueError:
        raise OptionError(f"fit range {text!r} must be two numbers TMIN:TMAX in K") from None
    return check_fit_range(values)


def run(args) -> int:
    from ..io.writers import export_table
    from ..models.export import models_export

    from ..errors import OptionError
    if args.optical_terms < 1:
        raise OptionError(f"--optical-terms must be >= 1, got {args.optical_terms}")
    check_output_target(args)
    fit_range = None if args.fit_range is None else parse_fit_range(args.fit_range)
    temperatures = None if args.temperatures is None else parse_temperatures(args.temperatures)
    if args.format == "csv" and temperatures is None:
        temperatures = parse_temperatures(DEFAULT_TEMPERATURES)
    digits = check_digits(8 if args.digits is None else args.digits) if args.format == "csv" else None
    dos = load_from_args(args)
    report_warnings(dos)
    info, result = models_export(dos, temperatures, fit_range, args.optical_terms, args.format)
    if args.format == "json":
        return emit_report(args, info, result)
    text = export_table(result, info, "csv", digits=digits).decode("utf-8")
    if args.output:
        write_text_output(args, text)
    else:
        sys.stdout.write(text)
    return 0
