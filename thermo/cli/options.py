"""Options and helpers shared by the command-line subcommands."""

from __future__ import annotations

import os
import sys

from ..temperatures import DEFAULT_TEMPERATURES
from ..unit_names import FREQUENCY_UNITS


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


def load_from_args(args):
    """Load the DOS named by parsed input options (the argument is always a path, never file text)."""
    from pathlib import Path

    from ..preparation.loading import load_dos
    return load_dos(Path(args.file), name=os.path.basename(args.file) or None, freq_unit=args.freq_unit, atoms=args.atoms,
                    negative=args.negative, low_frequency=args.low_frequency)


def report_warnings(dos):
    """Print the DOS's cautions on stderr, one per line."""
    for note in dos.warnings:
        print(f"warning: {note}", file=sys.stderr)
