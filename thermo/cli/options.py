"""Options and helpers shared by the command-line subcommands."""

from __future__ import annotations

import os
import sys

from ..temperatures import DEFAULT_TEMPERATURES, describe_temperatures
from .reading import add_formula_option, add_reading_options


def add_input_options(parser, many=False, formula_help="for --per gram"):
    """Add the options that say how to read a DOS file (or, with ``many``, several)."""
    if many:
        parser.add_argument("file", nargs="*", metavar="DIR_OR_GLOB",
                            help="DOS files, directories (their files) or glob patterns (quote them; ** recurses)")
    else:
        parser.add_argument("file", help="DOS file: text (space, tab, comma or semicolon separated) or .xlsx, "
                                         "or ws:NAME for a dataset of the workspace")
        from .workspace import add_location_options
        add_location_options(parser)
    add_reading_options(parser, formula_help, many=many)


def add_dos_option(parser, help_text, formula_help=None, atoms_default=None):
    """Add ``--dos FILE|ws:NAME`` with the reading options and workspace location that go with it.

    Load it with ``load_from_args(args, args.dos)``.
    """
    parser.add_argument("--dos", metavar="DOS", help=help_text + " (a file, or ws:NAME for a dataset of the workspace)")
    from .workspace import add_location_options
    add_location_options(parser)
    add_reading_options(parser, formula_help, for_option="--dos", atoms_default=atoms_default)


def add_table_options(parser, output_help):
    """Add ``--per``, ``--formula`` (when no reading option added it), ``--format``, ``--output``, ``--force``."""
    parser.add_argument("--per", default="formula", choices=["formula", "atom", "gram"],
                        help="basis: per mole of formula units (default), per atom, per gram (needs --formula)")
    add_formula_option(parser, "for --per gram")
    add_output_options(parser, output_help)


def add_output_options(parser, output_help):
    """Add ``--format``, ``--output``, ``--digits`` and ``--force`` (see :func:`output_plan`)."""
    parser.add_argument("--format", default=None, choices=["csv", "json", "xlsx"],
                        help="table format (default: from the --output suffix, else csv)")
    parser.add_argument("--output", metavar="PATH", help=output_help)
    parser.add_argument("--digits", type=int, default=8, metavar="N",  # = io.writers.DEFAULT_DIGITS
                        help="significant digits of the numbers written (default 8, which the numerics "
                             "support; 17 for full double precision)")
    parser.add_argument("--force", action="store_true", help="replace existing output files")


def add_report_output_options(parser, output_help="write here (default: stdout)"):
    """Add ``--output``, ``--force`` and ``--digits`` to a command writing a JSON report (see :func:`emit_report`).

    ``--digits`` rounds the report's numbers (not its provenance); by default
    they are written in full.
    """
    parser.add_argument("--output", metavar="PATH", help=output_help)
    parser.add_argument("--force", action="store_true", help="replace an existing output file")
    parser.add_argument("--digits", type=int, default=None, metavar="N",
                        help="significant digits of the numbers written (1 to 17; default: all digits)")


def report_digits(args):
    """``--digits`` of a report command: None (all digits) or an int from 1 to 17."""
    digits = getattr(args, "digits", None)
    return None if digits is None else check_digits(digits)


def emit_report(args, provenance, report, ensure_ascii=True, allow_nan=False):
    """Write ``{"provenance": ..., **report}`` as JSON to ``--output`` or standard output; returns 0.

    The report's floats are rounded to ``--digits`` significant digits.
    """
    from ..io.writers import report_text
    text = report_text(provenance, report, report_digits(args), ensure_ascii=ensure_ascii, allow_nan=allow_nan)
    if getattr(args, "output", None):
        write_text_output(args, text)
    else:
        sys.stdout.write(text)
    return 0


def add_temperature_option(parser, default=DEFAULT_TEMPERATURES):
    """Add ``--temperatures SPEC``."""
    parser.add_argument("--temperatures", default=default, metavar="SPEC",
                        help="START:STOP:STEP in K (STOP included), a comma list, or both mixed "
                             f"(default {default}: {describe_temperatures(default)})")


def load_from_args(args, source=None):
    """Load the DOS named by ``source`` (default the positional input) with the reading options given.

    The input is a path (never file text) or ``ws:NAME``; a workspace dataset
    is read with its stored settings under the options given now (an option
    given wins even when it equals the default).  The options used, the
    formula included, are in ``dos.source["reading_options"]``
    (:meth:`~thermo.preparation.options.ReadingOptions.of`).
    """
    from pathlib import Path

    from ..preparation.loading import load_dos
    from ..preparation.options import ReadingOptions
    from .reading import reading_from_args
    from .workspace import is_reference, resolve_reference
    source = args.file if source is None else source
    given = reading_from_args(args)
    if is_reference(source):
        raw, name, kept = resolve_reference(args, source)
        return load_dos(raw, name=name, options=given.over(ReadingOptions.from_mapping(kept)))
    return load_dos(Path(source), name=os.path.basename(source) or None, options=given)


def formula_of(args, dos=None):
    """The formula in use: ``--formula``, else the one a ``ws:`` input was stored with, else None."""
    from ..preparation.options import ReadingOptions
    if dos is not None:
        return ReadingOptions.of(dos).formula
    return ReadingOptions(formula=getattr(args, "formula", None)).formula


def check_digits(digits):
    """``--digits`` as an int from 1 to 17 (OptionError otherwise)."""
    from ..errors import OptionError
    if digits is None or not 1 <= digits <= 17:
        raise OptionError(f"--digits must be from 1 to 17, not {digits}")
    return digits


def report_warnings(dos):
    """Print the DOS's cautions on stderr, one per line."""
    for note in dos.warnings:
        print(f"warning: {note}", file=sys.stderr)


#: Port the dashboard listens on by default.
DEFAULT_PORT = 8050


def add_server_options(parser):
    """Add ``--host``, ``--port``, ``--debug``, ``--max-upload-mb``, ``--workspace``/``--no-workspace`` (``serve``, ``python -m webapp``)."""
    parser.add_argument("--host", default="127.0.0.1",
                        help="interface to bind (default 127.0.0.1, this machine only)")
    parser.add_argument("--port", type=int, default=DEFAULT_PORT, help=f"port (default {DEFAULT_PORT})")
    parser.add_argument("--debug", action="store_true",
                        help="Dash debug mode with reloading (development only)")
    parser.add_argument("--max-upload-mb", type=float, default=None, metavar="MB",
                        help="largest accepted upload per file in MB (default 20)")
    parser.add_argument("--workspace", metavar="PATH",
                        help="workspace file keeping each browser's datasets (default "
                             "$XDG_DATA_HOME/modeheat/workspace.sqlite, else ~/.local/share/modeheat/workspace.sqlite)")
    parser.add_argument("--no-workspace", action="store_true",
                        help="keep datasets in the browser tab only (lost when the tab closes)")


def output_plan(args):
    """``(format, digits)`` of a table command, checked before any work.

    The format comes from ``--format``, else from the ``--output`` suffix, else
    csv; an existing output file is refused unless ``--force``.
    """
    from ..errors import OptionError
    from ..io.writers import format_from_suffix
    digits = check_digits(args.digits)
    fmt = format_from_suffix(args.output, args.format) if args.output else (args.format or "csv")
    check_output_target(args)
    if fmt == "xlsx" and not args.output:
        raise OptionError("xlsx output needs --output PATH")
    return fmt, digits


def emit_table(table, info, args, plan):
    """Write a table with its provenance to ``--output`` or standard output; returns exit code 0."""
    import sys

    from ..io.writers import export_table, write_table
    fmt, digits = plan
    if args.output:
        write_table(table, info, fmt, args.output, overwrite=args.force, digits=digits)
        print(f"wrote {args.output}", file=sys.stderr)
    else:
        sys.stdout.write(export_table(table, info, fmt, digits=digits).decode("utf-8"))
    return 0


def check_output_target(args):
    """Refuse an existing ``--output`` file unless ``--force`` (before any work is done)."""
    from pathlib import Path

    from ..errors import OptionError
    if args.output and not args.force and Path(args.output).exists():
        raise OptionError(f"refusing to overwrite existing file {args.output}; use --force to replace it")


def write_text_output(args, text):
    """Write ``text`` to ``--output`` (never through a symbolic link) and say so on stderr."""
    from ..io.inert import write_file
    write_file(args.output, text.encode("utf-8"), overwrite=args.force)
    print(f"wrote {args.output}", file=sys.stderr)
