"""How to read a DOS file: the reading options shared by every command that loads one."""

from __future__ import annotations

from ..unit_names import FREQUENCY_UNITS


def add_reading_options(parser):
    """Add ``--freq-unit``, ``--atoms``, ``--negative``, ``--sheet`` and ``--low-frequency``."""
    parser.add_argument("--freq-unit", metavar="U",
                        help=f"unit of the frequency column: {', '.join(FREQUENCY_UNITS)} "
                             "(default: as stated by the frequency column's header or an explicit "
                             "unit line such as '# frequency unit: THz'; never guessed)")
    parser.add_argument("--atoms", type=int, metavar="N",
                        help="atoms per formula unit (default: inferred when the DOS integrates to 3N)")
    parser.add_argument("--negative", default="drop", choices=["drop", "drop-unscaled", "refuse", "keep-count"],
                        metavar="{drop,drop-unscaled,refuse}",
                        help="imaginary (negative-frequency) modes: drop and renormalise to 3N (default), "
                             "drop-unscaled: drop without renormalising (old spelling keep-count still "
                             "accepted), or refuse the file")
    parser.add_argument("--sheet", metavar="NAME_OR_NUMBER",
                        help=".xlsx input: worksheet name or number from 1 (default: the first sheet)")
    parser.add_argument("--low-frequency", default="auto", metavar="auto|off|LOW:HIGH",
                        help="ν² treatment below a cut-off: automatic window (default), off, or a window in THz")
