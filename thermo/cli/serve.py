"""``modeheat serve``: start the dashboard (imports the web layer lazily).

The server options are defined once, in :func:`.options.add_server_options`;
``python -m webapp`` uses the same definitions.
"""

from __future__ import annotations

from .options import add_server_options

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
