"""``python -m webapp [--host 127.0.0.1] [--port 8050] [--debug] [--max-upload-mb 20] [--workspace PATH | --no-workspace]``."""

from __future__ import annotations

import argparse
import os
import sys


def build_parser():
    """Options of ``python -m webapp`` (the same as ``modeheat serve``)."""
    from thermo.cli.options import add_server_options
    p = argparse.ArgumentParser(prog="python -m webapp", description="Serve the modeheat dashboard.")
    add_server_options(p)
    return p


def serve(args) -> int:
    """Serve with parsed options (``host``, ``port``, ``debug``, ``max_upload_mb``)."""
    if args.max_upload_mb is not None:
        if not args.max_upload_mb > 0:
            print("error: --max-upload-mb must be > 0", file=sys.stderr)
            return 2
        os.environ["MODEHEAT_MAX_UPLOAD_MB"] = str(args.max_upload_mb)
    if args.host not in ("127.0.0.1", "localhost", "::1"):
        print(f"warning: serving on {args.host} makes the dashboard reachable from other machines; "
              "it has no login", file=sys.stderr)
    if args.host in ("0.0.0.0", "::") and not os.environ.get("MODEHEAT_ALLOWED_HOSTS"):
        print("note: only requests naming localhost, 127.0.0.1 or [::1] are answered; list the names "
              "others use in MODEHEAT_ALLOWED_HOSTS (comma-separated)", file=sys.stderr)
    from thermo.errors import ModeheatError
    from thermo.workspace import Workspace, default_path
    from .app import create_app
    path = None if args.no_workspace else (args.workspace or default_path())
    if path is not None:
        try:
            Workspace(path)
        except ModeheatError as exc:
            print(f"error: {exc}", file=sys.stderr)
            return 2
        print(f"workspace: {path}", file=sys.stderr)
    try:
        app = create_app(workspace=path, bound_host=args.host)
    except ValueError as exc:
        print(f"error: {exc}", file=sys.stderr)
        return 2
    app.run(host=args.host, port=args.port, debug=args.debug)
    return 0


def main(argv=None) -> int:
    """Serve the dashboard; returns the exit code."""
    return serve(build_parser().parse_args(argv))


if __name__ == "__main__":
    sys.exit(main())
