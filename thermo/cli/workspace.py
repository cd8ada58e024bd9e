"""``modeheat workspace add|list|export|remove|purge|spaces``: the persistent workspace from the command line.

Other commands (``table``, ``models``, ...) read a stored dataset when their
input is ``ws:NAME`` (or ``ws:ID``, ``ws:SHA256-PREFIX``), loaded with the
settings it was stored with unless options say otherwise.
"""

from __future__ import annotations

import csv
import glob
import io
import json
import os
import sys
from pathlib import Path

from ..io.inert import inert_text

#: Prefix marking a workspace dataset where a file name is expected.
REFERENCE_PREFIX = "ws:"
_CSV_FIELDS = ("id", "name", "sha256", "size_bytes", "added_utc", "group", "note", "invented")


def add_location_options(parser):
    """``--workspace PATH`` and ``--space NAME`` (shared by every verb and by ``ws:`` inputs)."""
    parser.add_argument("--workspace", metavar="PATH",
                        help="workspace file (default $XDG_DATA_HOME/modeheat/workspace.sqlite, "
                             "else ~/.local/share/modeheat/workspace.sqlite)")
    parser.add_argument("--space", default="main", metavar="NAME",
                        help="named workspace inside the file (default main)")


def register(sub):
    p = sub.add_parser("workspace", help="keep DOS files and their settings in the persistent workspace")
    verbs = p.add_subparsers(dest="verb", metavar="VERB")
    add = verbs.add_parser("add", help="store files (same bytes and settings are stored once)")
    add.add_argument("file", nargs="+", metavar="FILE", help="DOS files or directories (their files)")
    add.add_argument("--name", help="name of the dataset (one file only; default the file name)")
    add.add_argument("--group", default="", help="group label, e.g. 'convergence: mesh'")
    add.add_argument("--note", default="", help="free-text note")
    from .reading import add_reading_options
    add_reading_options(add, formula_help="for values per gram")
    add.add_argument("--unchecked", action="store_true",
                     help="store without loading each file first (default: a file that does not load is refused)")
    lst = verbs.add_parser("list", help="datasets with name, sha256, added_utc and settings")
    lst.add_argument("--format", default="text", choices=["text", "json", "csv"], help="output format")
    exp = verbs.add_parser("export", help="write a dataset's original bytes to a file")
    exp.add_argument("ref", metavar="ID|NAME")
    exp.add_argument("--output", required=True, metavar="FILE")
    exp.add_argument("--force", action="store_true", help="replace an existing file")
    rem = verbs.add_parser("remove", help="delete a dataset (its bytes go when no dataset uses them)")
    rem.add_argument("ref", metavar="ID|NAME")
    pur = verbs.add_parser("purge", help="remove deleted datasets for good, expire idle browser spaces, "
                                         "drop bytes nothing uses and compact the file (every space of the file)")
    pur.add_argument("--retention-days", type=float, metavar="DAYS",
                     help="keep browser spaces holding only demo data this long (default "
                          "$MODEHEAT_SPACE_RETENTION_DAYS, else 30; 0 keeps them)")
    verbs.add_parser("spaces", help="named workspaces in the file with the keys that open them in the dashboard")
    for v in (add, lst, exp, rem, pur, verbs.choices["spaces"]):
        add_location_options(v)
        v.set_defaults(func=run)
    p.set_defaults(func=run)


def open_space(args, create=False):
    """The space named by ``--workspace`` / ``--space`` (the file is only created when ``create``)."""
    from ..errors import WorkspaceError
    from ..workspace import Workspace, default_path
    path = Path(getattr(args, "workspace", None) or default_path())
    if not create and not path.exists():
        raise WorkspaceError(f"no workspace at {path}; add files first (modeheat workspace add FILE...)")
    return Workspace(path).local(getattr(args, "space", None) or "main")


def dataset_names(paths):
    """A name per file: the file name, or ``folder/file`` where several files share a name.

    Examples
    --------
    >>> from pathlib import Path
    >>> dataset_names([Path("runs/mesh8/dos.dat"), Path("runs/mesh12/dos.dat"), Path("x.dat")])
    ['mesh8/dos.dat', 'mesh12/dos.dat', 'x.dat']
    """
    counts = {}
    for p in paths:
        counts[p.name] = counts.get(p.name, 0) + 1
    return [f"{p.parent.name}/{p.name}" if counts[p.name] > 1 and p.parent.name else p.name for p in paths]


def _files(items):
    from ..errors import OptionError
    out = []
    for item in items:
        path = Path(item)
        if path.is_dir():
            out += sorted(p for p in path.iterdir() if p.is_file() and not p.name.startswith("."))
        elif path.is_file():
            out.append(path)
        elif glob.has_magic(item):
            out += sorted(Path(p) for p in glob.glob(item, recursive=True) if os.path.isfile(p))
        else:
            raise OptionError(f"{item}: no such file or directory")
    return out


def _add(args, space):
    from ..errors import ModeheatError, OptionError
    from ..preparation.loading import load_dos
    from .reading import reading_from_args
    files = _files(args.file)
    if args.name and len(files) != 1:
        raise OptionError("--name needs exactly one file")
    reading = reading_from_args(args)
    settings = reading.as_dict()
    # the automatic ν² window never refuses a file (only an explicit window can), so the check skips its fit
    check = reading.replaced(low_frequency="off") if reading.resolved().low_frequency == "auto" else reading
    added = present = failed = 0
    for path, name in zip(files, dataset_names(files)):
        raw = path.read_bytes()
        if not args.unchecked:
            try:
                load_dos(raw, name=path.name, options=check)
            except ModeheatError as exc:
                print(f"error: {inert_text(exc)}", file=sys.stderr)
                failed += 1
                continue
        d, new = space.add(raw, args.name or name, settings, group=args.group, note=args.note)
        added, present = added + new, present + (not new)
        if not new:
            print(inert_text(f"{path}: already stored as {d.name!r} ({d.id})"), file=sys.stderr)
    print(f"added {added}, already present {present}, refused {failed} (workspace {space.workspace.path}, "
          f"space {space.name})", file=sys.stderr)
    return 2 if failed else 0


def _list(args, space):
    rows = [d.as_dict() for d in space.datasets()]
    if args.format == "json":
        sys.stdout.write(json.dumps(rows, indent=1, ensure_ascii=False) + "\n")
    elif args.format == "csv":
        buf = io.StringIO()
        from ..workspace.store import SETTING_NAMES
        writer = csv.DictWriter(buf, fieldnames=_CSV_FIELDS + SETTING_NAMES, lineterminator="\n")
        writer.writeheader()
        for r in rows:
            writer.writerow({**{k: r[k] for k in _CSV_FIELDS if k in r}, **r["settings"]})
        sys.stdout.write(buf.getvalue())
    else:
        for r in rows:
            group = f"  [{r['group']}]" if r["group"] else ""
            mark = "  (invented demo data)" if r["invented"] else ""
            print(inert_text(f"{r['id']}  {r['sha256'][:12]}  {r['added_utc'][:19]}  {r['name']}{group}{mark}"))
        print(inert_text(f"{len(rows)} dataset(s) in space {space.name} of {space.workspace.path}"), file=sys.stderr)
    return 0


def _export(args, space):
    from ..io.inert import replace_file
    d = space.get(args.ref)
    out = replace_file(args.output, space.content(d), overwrite=args.force)
    print(f"wrote {inert_text(out)} ({d.size} bytes, sha256 {d.sha256[:12]})", file=sys.stderr)
    return 0


def _remove(args, space):
    d = space.remove(args.ref)
    print(inert_text(f"removed {d.name!r} ({d.id})"), file=sys.stderr)
    return 0


def _purge(args, space):
    from ..errors import OptionError
    from ..workspace.upkeep import purge
    days = args.retention_days
    if days is not None and not 0 <= days < 1e6:
        raise OptionError(f"--retention-days {days:g}: give a number of days from 0 (keep for ever) to 1e6")
    done = purge(space.workspace, days=days)
    print(f"purged {done['datasets']} deleted dataset(s), {done['spaces']} idle browser space(s), "
          f"{done['blobs']} unused file(s); {space.workspace.path}: {done['bytes_before']} -> "
          f"{done['bytes_after']} bytes", file=sys.stderr)
    return 0


def _spaces(args, space):
    for s in space.workspace.spaces():
        print(f"{inert_text(s.name)}\t{s.key}")
    return 0


def run(args) -> int:
    from ..errors import OptionError
    verb = getattr(args, "verb", None)
    if verb is None:
        raise OptionError("workspace needs a verb: add, list, export, remove, purge or spaces")
    return {"add": _add, "list": _list, "export": _export, "remove": _remove, "purge": _purge,
            "spaces": _spaces}[verb](
        args, open_space(args, create=verb == "add"))


def is_reference(text) -> bool:
    """True when an input names a workspace dataset (``ws:...``)."""
    return str(text).startswith(REFERENCE_PREFIX)


def resolve_reference(args, reference=None):
    """``(bytes, name, settings)`` of the ``ws:`` dataset named by ``reference`` (default ``args.file``)."""
    space = open_space(args)
    d = space.get(str(args.file if reference is None else reference)[len(REFERENCE_PREFIX):])
    return space.content(d), d.name, d.settings
