"""``modeheat serve``: start the dashboard (imports the web layer lazily)."""

from __future__ import annotations


def register(sub):
    p = sub.add_parser("serve", help="serve the browser dashboard (same options as python -m webapp)")
    p.add_argument("options", nargs="*", metavar="OPTION",
                   help="passed on to the dashboard, e.g. -- --port 8060")
    p.add_argument("--workspace", metavar="PATH",
                   help="workspace file keeping each browser's datasets (default: the per-user data folder)")
    p.set_defaults(func=run)


def run(args) -> int:
    try:
        from webapp.__main__ import main as serve
    except ImportError as exc:
        from ..errors import OptionError
        raise OptionError(f"the dashboard is not installed here ({exc})") from None
    extra = ["--workspace", args.workspace] if args.workspace else []
    return int(serve(extra + list(args.options)) or 0)
