"""Where the workspace file lives by default (XDG base directory specification)."""

from __future__ import annotations

import os
from pathlib import Path

#: File name of the workspace inside the data folder.
FILE_NAME = "workspace.sqlite"


def default_path(environ=None) -> Path:
    """The per-user default workspace file.

    Parameters
    ----------
    environ : mapping, optional
        Environment to read (default ``os.environ``).

    Returns
    -------
    pathlib.Path
        ``$MODEHEAT_WORKSPACE`` if set, else
        ``$XDG_DATA_HOME/modeheat/workspace.sqlite``, else
        ``~/.local/share/modeheat/workspace.sqlite``.

    Notes
    -----
    The fallback ``~/.local/share`` is the default of ``XDG_DATA_HOME`` in the
    XDG Base Directory Specification; a relative ``XDG_DATA_HOME`` is invalid
    there and is ignored.

    References
    ----------
    .. [1] freedesktop.org, *XDG Base Directory Specification*, version 0.8 (2021).

    Examples
    --------
    >>> str(default_path({"XDG_DATA_HOME": "/data/u"}))
    '/data/u/modeheat/workspace.sqlite'
    """
    env = os.environ if environ is None else environ
    if env.get("MODEHEAT_WORKSPACE"):
        return Path(env["MODEHEAT_WORKSPACE"]).expanduser()
    base = env.get("XDG_DATA_HOME") or ""
    if not os.path.isabs(base):
        base = os.path.join(os.path.expanduser("~"), ".local", "share")
    return Path(base) / "modeheat" / FILE_NAME
