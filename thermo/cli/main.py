"""Command line: ``python -m thermo`` / ``modeheat``.

Subcommands live in ``thermo/cli/<name>.py`` modules, each with ``register(sub)``.
Bad input ends with exit code 2 and one line on stderr, never a traceback.
"""

from __future__ import annotations

import argparse
import importlib
import sqlite3
import sys

from .. import __version__
from ..errors import ModeheatError

#: Subcommand modules, in the order shown by --help.
SUBCOMMANDS = ("table", "summary", "models", "batch", "serve", "workspace", "quasiharmonic", "calorimetry",
               "displacements", "elastic", "polynomial", "electronic", "compare", "phases")


def build_parser():
    parser = argparse.ArgumentParser(
        prog="modeheat",
        description="Harmonic thermodynamics (C_v, S, U, F, zero-point energy) from a phonon DOS.")
    parser.add_argument("--version", action="version", version=f"modeheat {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    for name in SUBCOMMANDS:
        importlib.import_module(f"thermo.cli.{name}").register(sub)
    return parser


#: Options that name where the workspace is; accepted before or after the command and its verb.
GLOBAL_OPTIONS = ("--workspace", "--space")
#: Commands whose next word is a verb (``workspace add``).
_VERB_COMMANDS = ("workspace",)


def placed_global_options(argv):
    """``argv`` with ``--workspace``/``--space`` given before the command (or its verb) moved after it.

    argparse only knows an option in the parser of the word it follows, so
    ``modeheat --workspace P workspace add F`` and ``modeheat workspace
    --workspace P add F`` are rewritten to ``modeheat workspace add F
    --workspace P``; options after the last command word are left alone.

    Examples
    --------
    >>> placed_global_options(["workspace", "--workspace", "w.sqlite", "add", "a.dat"])
    ['workspace', 'add', 'a.dat', '--workspace', 'w.sqlite']
    >>> placed_global_options(["--space=lab", "table", "ws:a"])
    ['table', 'ws:a', '--space=lab']
    """
    argv = list(argv)
    words, moved, rest, i = [], [], [], 0
    while i < len(argv):
        token = argv[i]
        if token == "--":
            break
        name = token.split("=", 1)[0]
        if name in GLOBAL_OPTIONS:
            take = 1 if "=" in token else 2
            moved += argv[i:i + take]
            i += take
            continue
        if token.startswith("-"):
            break               # another option before the command: leave the line as given
        words.append(token)
        i += 1
        if len(words) == 1 and words[0] not in _VERB_COMMANDS or len(words) == 2:
            break
    rest = argv[i:]
    if not moved:
        return argv
    return words + rest + moved


def main(argv=None) -> int:
    parser = build_parser()
    args = parser.parse_args(placed_global_options(sys.argv[1:] if argv is None else argv))
    if not getattr(args, "func", None):
        parser.print_help(sys.stderr)
        return 2
    try:
        return int(args.func(args) or 0)
    except ModeheatError as exc:
        from ..io.inert import inert_text
        print(f"error: {inert_text(exc)}", file=sys.stderr)
        return 2
    except sqlite3.DatabaseError as exc:          # a storage failure outside a transaction (disk, permissions)
        from ..workspace.schema import storage_message
        print(f"error: {storage_message(exc)}", file=sys.stderr)
        return 2
    except OSError as exc:
        print(f"error: {exc.strerror or exc}: {exc.filename or ''}".rstrip(": "), file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        print("error: interrupted", file=sys.stderr)
        return 130
    except Exception as exc:  # noqa: BLE001 - a bug must still end in one line, not a traceback
        detail = " ".join(str(exc).split())[:300]
        print(f"error: internal error in '{args.command}' ({type(exc).__name__}: {detail}); "
              "please report it with the input file", file=sys.stderr)
        return 1
