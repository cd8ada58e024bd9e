"""How to read a DOS file: the reading options shared by every command that loads one.

Every flag here defaults to None ("not given"); what that means is written once,
in :data:`thermo.preparation.options.DEFAULT_VALUES`, and the help texts are made
from it.  :func:`reading_from_args` turns the parsed flags into the one record.
"""

from __future__ import annotations

from ..preparation.options import DEFAULT_TEXT
from ..unit_names import FREQUENCY_UNITS


def add_reading_options(parser, formula_help=None, for_option=None, many=False, atoms_default=None):
    """Add ``--freq-unit``, ``--atoms``, ``--negative``, ``--sheet``, ``--low-frequency``, ``--histogram``, ``--formula``.

    ``for_option`` names the option holding the DOS (e.g. ``--dos``) when it is
    not the positional input; ``formula_help`` says what the command uses the
    formula for; with ``many`` the options are carried to many files, where
    a unit a file states (and an atom count its integral gives) wins;
    ``atoms_default`` replaces the words for the default atom count.
    """
    what = f"of {for_option}" if for_option else "of the DOS"
    stored = "" if many else " (a ws: input keeps its stored setting unless this is given)"
    wins = ("for files that state none (a unit a file states wins, with a warning in the index)" if many
            else "a unit given here overrides the file's, with a warning")
    parser.add_argument("--freq-unit", metavar="U",
                        help=f"unit of the frequency column {what}: {', '.join(FREQUENCY_UNITS)} (default: "
                             f"{DEFAULT_TEXT['freq_unit']}, e.g. '# frequency unit: THz'; {wins})")
    parser.add_argument("--atoms", type=int, metavar="N",
                        help=f"atoms per formula unit (default: {atoms_default or DEFAULT_TEXT['atoms']}"
                             + ("; used for files whose integral gives no whole 3N)" if many else ")"))
    parser.add_argument("--negative", default=None, choices=["drop", "drop-unscaled", "refuse", "keep-count"],
                        metavar="{drop,drop-unscaled,refuse}",
                        help=f"imaginary (negative-frequency) modes {what}: drop and renormalise to 3N "
                             f"(default {DEFAULT_TEXT['negative']}), drop-unscaled: drop without renormalising "
                             "(old spelling keep-count still accepted), or refuse the file" + stored)
    parser.add_argument("--sheet", metavar="NAME_OR_NUMBER",
                        help=f".xlsx input: worksheet name or number from 1 (default: {DEFAULT_TEXT['sheet']})")
    parser.add_argument("--low-frequency", default=None, metavar="auto|off|LOW:HIGH|elastic:THETA_K",
                        help="ν² treatment below a cut-off: automatic window, off, a window in THz, or "
                             "elastic:THETA_K — the long-wave limit anchored by an elastic Debye temperature "
                             "(e.g. from 'modeheat elastic') and blended into the data above their resolved limit "
                             f"(default {DEFAULT_TEXT['low_frequency']})" + stored)
    parser.add_argument("--histogram", action="store_true", default=None,
                        help=f"the rows {what} are histogram bins (bin centres, equally spaced): summed as "
                             f"Σ g·Δν (default: {DEFAULT_TEXT['histogram']})" + stored)
    add_formula_option(parser, formula_help)


def add_formula_option(parser, formula_help=None):
    """Add ``--formula`` (the reading option) unless the parser has it already."""
    if "--formula" in parser._option_string_actions:
        return
    parser.add_argument("--formula", default=None,
                        help="chemical formula of the formula unit, e.g. MgO"
                             + (f" ({formula_help})" if formula_help else ""))


def reading_from_args(args):
    """The :class:`~thermo.preparation.options.ReadingOptions` given on the command line."""
    from ..preparation.options import ReadingOptions
    return ReadingOptions.from_args(args)
