"""``modeheat batch``: a table for every DOS file of directories or glob patterns, or a campaign.

``--kind table`` (default): one harmonic table per DOS file.  ``--kind
quasiharmonic``: one quasi-harmonic table per manifest, and with ``--form``
the polynomial of each in one merged coefficient file.  ``--kind polynomial``:
the polynomial of each DOS's harmonic C_p, in one merged coefficient file.

Exit status: 0 when every file gave its result, 1 when some failed (each one is
reported on stderr and in ``index.csv``), 2 for bad options (nothing written).
"""

from __future__ import annotations

import sys
from pathlib import Path

from ..temperatures import parse_temperatures
from .options import add_input_options, add_table_options, add_temperature_option, check_digits
from .polynomial import add_fit_options
from .quasiharmonic import add_step_options
from .reading import reading_from_args


def register(sub):
    p = sub.add_parser("batch", help="a table for each of many DOS files, on all cores, with an index")
    add_input_options(p, many=True)
    add_temperature_option(p)
    add_table_options(p, "directory for the tables and index.csv (created when missing; required)")
    p.add_argument("--pattern", action="append", metavar="GLOB",
                   help="file names taken from a directory, e.g. '*.dos' (repeatable; default: the known "
                        "DOS kinds .dat .txt .csv .tsv .dos .xlsx); other files are reported as skipped")
    p.add_argument("--file-list", metavar="CSV",
                   help="files with their own reading options: CSV with a 'file' column (paths relative to the "
                        "list) and any of freq_unit, atoms, negative, low_frequency, formula, sheet; a cell given "
                        "wins for that file, a blank one falls back to the options given here (--kind table)")
    p.add_argument("--workers", type=int, metavar="N",
                   help="worker processes (default: the number of cores)")
    p.add_argument("--kind", default="table", choices=["table", "quasiharmonic", "polynomial"],
                   help="table: a harmonic table per DOS file (default); quasiharmonic: the inputs are "
                        "manifests (directories give their *.csv), a quasi-harmonic table each, and with --form "
                        "their polynomials in one merged file; polynomial: a polynomial of each DOS's harmonic "
                        "C_p, all in one merged file")
    campaign = p.add_argument_group("campaigns (--kind quasiharmonic or polynomial)")
    add_step_options(campaign)
    add_fit_options(campaign, form_default=None,
                    form_help="polynomial form fitted to each result (polynomial: default shomate; "
                              "quasiharmonic: no fit unless given)")
    campaign.add_argument("--coefficients", default="json", choices=["json", "csv"],
                          help="format of the merged coefficient file coefficients.json|csv (default json), "
                               "with the provenance of every input")
    p.add_argument("--scheduler", metavar="ADDRESS",
                   help="run on a running Dask cluster instead of local processes, e.g. tcp://10.0.0.5:8786 "
                        "(needs pip install 'modeheat[cluster]'; the workers must reach the input and "
                        "output paths)")
    p.set_defaults(func=run)


def run(args) -> int:
    from ..batch import INDEX_NAME, BatchOptions, run_batch
    from ..errors import OptionError

    if not args.output:
        raise OptionError("batch needs --output OUTDIR")
    if args.workers is not None and args.workers < 1:
        raise OptionError("--workers must be at least 1")
    if args.kind != "table":
        if args.file_list:
            raise OptionError("--file-list applies to --kind table")
        if not args.file:
            raise OptionError("batch needs input files, directories or patterns")
        return _campaign(args)
    files, per_file = list(args.file), ()
    if args.file_list:
        from ..batch import file_list
        listed, per_file = file_list(args.file_list)
        files += listed
    if not files:
        raise OptionError("batch needs input files, directories or patterns, or --file-list CSV")
    options = BatchOptions(
        temperatures=tuple(parse_temperatures(args.temperatures).tolist()), reading=reading_from_args(args),
        per=args.per, fmt=args.format or "csv", force=args.force, digits=check_digits(args.digits),
        per_file=per_file)
    with _executor(args.scheduler) as executor:
        rows = run_batch(files, args.output, options, workers=args.workers, progress=True,
                         pattern=args.pattern, executor=executor)
    failed = [row for row in rows if row["status"] == "failed"]
    skipped = [row for row in rows if row["status"] == "skipped"]
    done = [row for row in rows if row["status"] == "ok"]
    for row in failed:
        print(f"failed: {row['error']}", file=sys.stderr)
    if skipped:
        names = ", ".join(Path(row["input"]).name for row in skipped[:5]) + (" ..." if len(skipped) > 5 else "")
        print(f"skipped {_count(len(skipped), 'file')} of other kinds ({names}); choose files with --pattern",
              file=sys.stderr)
    tried = len(done) + len(failed)
    print(f"{len(done)} of {_count(tried, 'table')} written to {args.output}; "
          f"see {INDEX_NAME} there", file=sys.stderr)
    return 1 if failed else 0


def _campaign(args) -> int:
    from ..batch import INDEX_NAME
    from ..campaign import CampaignOptions, run_campaign
    from ..errors import OptionError
    from .models import parse_fit_range

    if args.per != "formula":
        raise OptionError(f"--per applies to --kind table; {args.kind} results are per mole of formula units")
    form = args.form or ("shomate" if args.kind == "polynomial" else None)
    options = CampaignOptions(
        kind=args.kind, temperatures=tuple(parse_temperatures(args.temperatures).tolist()),
        reading=reading_from_args(args), pressure_gpa=args.pressure, eos=args.eos, form=form, fit_range=parse_fit_range(args.range), mid=args.mid,
        formation_enthalpy=args.formation_enthalpy, phase=args.phase, fmt=args.format or "csv",
        digits=check_digits(args.digits), force=args.force)
    with _executor(args.scheduler) as executor:
        results = run_campaign(args.file, args.output, options, workers=args.workers, progress=True,
                               pattern=args.pattern, executor=executor, coefficients=args.coefficients)
    rows = [r["row"] for r in results]
    failed = [row for row in rows if row["status"] == "failed"]
    for row in failed:
        print(f"failed: {row['error']}", file=sys.stderr)
    fits = sum(r["entry"] is not None for r in results)
    merged = f"; {_count(fits, 'fit')} in coefficients.{args.coefficients}" if form else ""
    print(f"{len(rows) - len(failed)} of {_count(len(rows), 'input')} done{merged}; see {INDEX_NAME} in "
          f"{args.output}", file=sys.stderr)
    return 1 if failed else 0


def _executor(address):
    """The Dask scheduler's executor for ``--scheduler``, else no executor (the local pool)."""
    import contextlib

    from ..parallel import scheduler_executor
    return scheduler_executor(address) if address else contextlib.nullcontext(None)


def _count(n, noun):
    return f"{n} {noun}" + ("" if n == 1 else "s")
