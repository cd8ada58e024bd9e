"""``modeheat batch``: a table for every DOS file of directories or glob patterns.

Exit status: 0 when every file gave a table, 1 when some failed (each one is
reported on stderr and in ``index.csv``), 2 for bad options (nothing written).
"""

from __future__ import annotations

import sys

from .cli_common import add_input_options, add_temperature_option, parse_temperatures


def _accept_many_inputs(parser):
    """Turn the single ``file`` positional of the shared options into 1..n inputs."""
    for action in parser._actions:
        if action.dest == "file":
            action.nargs = "+"
            action.metavar = "DIR_OR_GLOB"
            action.help = ("DOS files, directories (their files) or glob patterns "
                           "(quote them; ** recurses)")


def register(sub):
    p = sub.add_parser("batch", help="a table for each of many DOS files, on all cores, with an index")
    add_input_options(p)
    _accept_many_inputs(p)
    add_temperature_option(p)
    p.add_argument("--per", default="formula", choices=["formula", "atom", "gram"],
                   help="basis of every table (see 'table --help')")
    p.add_argument("--formula", help="chemical formula of the formula unit (for --per gram)")
    p.add_argument("--format", default="csv", choices=["csv", "json", "xlsx"], help="table format (default csv)")
    p.add_argument("--output", required=True, metavar="OUTDIR",
                   help="directory for the tables and index.csv (created when missing)")
    p.add_argument("--force", action="store_true", help="replace existing tables and index in OUTDIR")
    p.add_argument("--workers", type=int, metavar="N",
                   help="worker processes (default: the number of cores)")
    p.set_defaults(func=run)


def run(args) -> int:
    from .batch import INDEX_NAME, BatchOptions, run_batch
    from .errors import OptionError

    if args.workers is not None and args.workers < 1:
        raise OptionError("--workers must be at least 1")
    options = BatchOptions(
        temperatures=tuple(parse_temperatures(args.temperatures).tolist()),
        freq_unit=args.freq_unit, atoms=args.atoms, negative=args.negative,
        low_frequency=args.low_frequency, per=args.per, formula=args.formula,
        fmt=args.format, force=args.force)
    rows = run_batch(args.file, args.output, options, workers=args.workers, progress=True)
    failed = [row for row in rows if row["status"] != "ok"]
    for row in failed:
        print(f"failed: {row['error']}", file=sys.stderr)
    print(f"{len(rows) - len(failed)} of {len(rows)} tables written to {args.output}; "
          f"see {INDEX_NAME} there", file=sys.stderr)
    return 1 if failed else 0
