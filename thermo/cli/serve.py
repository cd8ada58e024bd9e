"""``modeheat serve``: start the dashboard (imports the web layer lazily).

The server options are defined here once; ``python -m webapp`` uses the same
definitions (:func:`add_server_options`).
"""

from __future__ import annotations

#: Port the dashboard listens on by default.
DEFAULT_PORT = 8050


def add_server_options(parser):
    """Add ``--host``, ``--port``, ``--debug`` and ``--max-upload-mb`` to ``parser``."""
    parser.add_argument("--host", default="127.0.0.1",
                        help="interface to bind (default 127.0.0.1, this machine only)")
    parser.add_argument("--port", type=int, default=DEFAULT_PORT, help=f"port (default {DEFAULT_PORT})")
    parser.add_argument("--debug", action="store_true",
                        help="Dash debug mode with reloading (development only)")
    parser.add_argument("--max-upload-mb", type=float, default=None, metavar="MB",
                        help="largest accepted upload per file in MB (default 20)")


def register(sub):
    p = sub.add_parser("serve", help="serve the browser dashboard",
                       description="Serve the modeheat dashboard in the browser.")
    add_server_options(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..errors import OptionError
    if not 0 < args.port < 65536:
        raise OptionError(f"--port must be from 1 to 65535, not {args.port}")
    try:
        from webapp.__main__ import serve
    except ImportError as exc:
        raise OptionError(f"the dashboard is not installed here ({exc})") from None
    return int(serve(args) or 0)
