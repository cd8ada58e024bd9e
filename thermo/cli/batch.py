"""``modeheat batch``: a table for every DOS file of directories or glob patterns.

Exit status: 0 when every file gave a table, 1 when some failed (each one is
reported on stderr and in ``index.csv``), 2 for bad options (nothing written).
"""

from __future__ import annotations

import sys
from pathlib import Path

from ..temperatures import parse_temperatures
from .options import add_input_options, add_table_options, add_temperature_option, check_digits
from .reading import reading_from_args


def register(sub):
    p = sub.add_parser("batch", help="a table for each of many DOS files, on all cores, with an index")
    add_input_options(p, many=True)
    add_temperature_option(p)
    add_table_options(p, "directory for the tables and index.csv (created when missing; required)")
    p.add_argument("--pattern", action="append", metavar="GLOB",
                   help="file names taken from a directory, e.g. '*.dos' (repeatable; default: the known "
                        "DOS kinds .dat .txt .csv .tsv .dos .xlsx); other files are reported as skipped")
    p.add_argument("--workers", type=int, metavar="N",
                   help="worker processes (default: the number of cores)")
    p.set_defaults(func=run)


def run(args) -> int:
    from ..batch import INDEX_NAME, BatchOptions, run_batch
    from ..errors import OptionError

    if not args.output:
        raise OptionError("batch needs --output OUTDIR")
    if args.workers is not None and args.workers < 1:
        raise OptionError("--workers must be at least 1")
    options = BatchOptions(
        temperatures=tuple(parse_temperatures(args.temperatures).tolist()), reading=reading_from_args(args),
        per=args.per, fmt=args.format or "csv", force=args.force, digits=check_digits(args.digits))
    rows = run_batch(args.file, args.output, options, workers=args.workers, progress=True,
                     pattern=args.pattern)
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


def _count(n, noun):
    return f"{n} {noun}" + ("" if n == 1 else "s")
