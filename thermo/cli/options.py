"""Options and helpers shared by the command-line subcommands."""

from __future__ import annotations

import sys

import numpy as np

from ..errors import OptionError
from ..unit_names import FREQUENCY_UNITS

DEFAULT_TEMPERATURES = "0:1000:10"


def add_input_options(parser, many=False):
    """Add the options that say how to read a DOS file (or, with ``many``, several)."""
    if many:
        parser.add_argument("file", nargs="+", metavar="DIR_OR_GLOB",
                            help="DOS files, directories (their files) or glob patterns (quote them; ** recurses)")
    else:
        parser.add_argument("file", help="DOS file: text (space, tab, comma or semicolon separated) or .xlsx")
    parser.add_argument("--freq-unit", metavar="U",
                        help=f"unit of the frequency column: {', '.join(FREQUENCY_UNITS)} "
                             "(default: as stated in the file header)")
    parser.add_argument("--atoms", type=int, metavar="N",
                        help="atoms per formula unit (default: inferred when the DOS integrates to 3N)")
    parser.add_argument("--negative", default="drop", choices=["drop", "keep-count", "refuse"],
                        help="imaginary (negative-frequency) modes: drop and renormalise (default), "
                             "drop without renormalising, or refuse the file")
    parser.add_argument("--low-frequency", default="auto", metavar="auto|off|LOW:HIGH",
                        help="ν² treatment below a cut-off: automatic window (default), off, or a window in THz")


def add_table_options(parser, output_help):
    """Add ``--per``, ``--formula``, ``--format``, ``--output`` and ``--force``."""
    parser.add_argument("--per", default="formula", choices=["formula", "atom", "gram"],
                        help="basis: per mole of formula units (default), per atom, per gram (needs --formula)")
    parser.add_argument("--formula", help="chemical formula of the formula unit, e.g. MgO (for --per gram)")
    parser.add_argument("--format", default="csv", choices=["csv", "json", "xlsx"], help="table format (default csv)")
    parser.add_argument("--output", metavar="PATH", help=output_help)
    parser.add_argument("--force", action="store_true", help="replace existing output files")


def add_temperature_option(parser, default=DEFAULT_TEMPERATURES):
    """Add ``--temperatures SPEC``."""
    parser.add_argument("--temperatures", default=default, metavar="SPEC",
                        help="START:STOP:STEP in K (STOP included) or a comma list "
                             f"(default {default})")


def parse_temperatures(spec: str):
    """Temperatures from ``START:STOP:STEP`` (STOP included) or ``a,b,c``.

    Examples
    --------
    >>> parse_temperatures("0:20:10").tolist()
    [0.0, 10.0, 20.0]
    >>> parse_temperatures("5, 298.15").tolist()
    [5.0, 298.15]
    """
    text = str(spec).strip()
    try:
        if ":" in text:
            parts = [float(p) for p in text.split(":")]
            if len(parts) != 3:
                raise ValueError
            start, stop, step = parts
            if step <= 0 or stop < start:
                raise OptionError(f"temperature range {text!r} needs STEP > 0 and STOP >= START")
            count = int(np.floor((stop - start) / step + 1e-9)) + 1
            if count > 1_000_000:
                raise OptionError(f"temperature range {text!r} has more than a million points")
            values = start + step * np.arange(count)
        else:
            values = np.array([float(p) for p in text.split(",") if p.strip()])
    except ValueError:
        raise OptionError(f"temperatures {text!r}: use START:STOP:STEP or a comma list of numbers") from None
    from ..tables import check_temperatures
    return check_temperatures(values)


def load_from_args(args):
    """Load the DOS named by parsed input options."""
    from ..preparation.loading import load_dos
    return load_dos(args.file, freq_unit=args.freq_unit, atoms=args.atoms,
                    negative=args.negative, low_frequency=args.low_frequency)


def report_warnings(dos):
    """Print the DOS's cautions on stderr, one per line."""
    for note in dos.warnings:
        print(f"warning: {note}", file=sys.stderr)
