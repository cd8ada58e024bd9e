"""Upkeep of a workspace file: idle browser spaces expire, deleted datasets are purged, the file is compacted.

A browser's space is created on its first page load and seeded with the
invented demo datasets.  A space that never got anything of its own (every
dataset it ever had is invented demo data, and it keeps no file set) is
*idle*; idle spaces older than the retention (:func:`retention_days`,
``MODEHEAT_SPACE_RETENTION_DAYS``, default :data:`DEFAULT_RETENTION_DAYS`)
are deleted by the server (at most once per :data:`SWEEP_SECONDS` per file,
when a new space is created) and by ``modeheat workspace purge``.  A browser
coming back after that simply gets the demo again.

A *purge* removes datasets deleted softly (the page's "Delete", which Undo
can bring back until then), the bytes no dataset or set references any more,
then compacts the file (``VACUUM``) and empties the write-ahead log, so the
deleted bytes are no longer anywhere in the file [1]_.

References
----------
.. [1] SQLite documentation, "VACUUM", "PRAGMA wal_checkpoint" and
   "PRAGMA secure_delete", https://sqlite.org (2024).
"""

from __future__ import annotations

import os
import threading
import time
from datetime import datetime, timedelta, timezone

from ..errors import WorkspaceError
from .schema import storage_error, transaction

#: Environment variable: days an idle browser space is kept (0 keeps them for ever).
RETENTION_ENV = "MODEHEAT_SPACE_RETENTION_DAYS"
#: Retention of idle browser spaces when the environment says nothing [days].
DEFAULT_RETENTION_DAYS = 30.0
#: Least time between two sweeps of one file by a server [s].
SWEEP_SECONDS = 3600.0

_SWEPT = {}
_SWEPT_LOCK = threading.Lock()

# browser spaces with no dataset of their own (live or deleted) and no file set
_IDLE = ("kind = 'browser' AND created_utc < ? "
         "AND NOT EXISTS (SELECT 1 FROM datasets d WHERE d.space_id = spaces.id AND d.invented = 0) "
         "AND NOT EXISTS (SELECT 1 FROM sets s WHERE s.space_id = spaces.id)")
_UNUSED_BLOBS = ("NOT EXISTS (SELECT 1 FROM datasets d WHERE d.sha256 = blobs.sha256) "
                 "AND NOT EXISTS (SELECT 1 FROM set_files f WHERE f.sha256 = blobs.sha256)")


def retention_days(environ=None) -> float:
    """Days an idle browser space is kept: ``$MODEHEAT_SPACE_RETENTION_DAYS`` or 30 (0: never expire).

    Examples
    --------
    >>> retention_days({}), retention_days({"MODEHEAT_SPACE_RETENTION_DAYS": "7"})
    (30.0, 7.0)
    """
    env = os.environ if environ is None else environ
    text = str(env.get(RETENTION_ENV) or "").strip()
    if not text:
        return DEFAULT_RETENTION_DAYS
    try:
        days = float(text)
    except ValueError:
        days = float("nan")
    if not (days >= 0 and days < 1e6):
        raise WorkspaceError(f"{RETENTION_ENV}={text!r}: give a number of days from 0 (keep for ever) to 1e6")
    return days


def _cutoff(days, now=None) -> str:
    now = now or datetime.now(timezone.utc)
    return (now - timedelta(days=float(days))).strftime("%Y-%m-%dT%H:%M:%S.%fZ")


def expire_idle_spaces(workspace, days=None, now=None) -> int:
    """Delete the idle browser spaces older than ``days`` (default :func:`retention_days`); returns how many.

    Their datasets and settings go with them (the bytes stay until no one
    references them: :func:`drop_unused_bytes`).  ``days`` 0 expires nothing.
    """
    days = retention_days() if days is None else float(days)
    if days <= 0:
        return 0
    with workspace.db() as con, transaction(con, str(workspace.path)):
        gone = con.execute(f"DELETE FROM spaces WHERE {_IDLE}", (_cutoff(days, now),)).rowcount
        con.execute(f"DELETE FROM blobs WHERE {_UNUSED_BLOBS}")
    return gone


def sweep(workspace, now=None) -> int:
    """:func:`expire_idle_spaces` at most once per :data:`SWEEP_SECONDS` per file (servers call it);
    a failure (full or read-only disk) is left to the next sweep."""
    where = str(workspace.path)
    with _SWEPT_LOCK:
        if time.monotonic() - _SWEPT.get(where, -SWEEP_SECONDS) < SWEEP_SECONDS:
            return 0
        _SWEPT[where] = time.monotonic()
    try:
        return expire_idle_spaces(workspace, now=now)
    except WorkspaceError:
        return 0


def drop_unused_bytes(con) -> int:
    """Delete the stored bytes no dataset and no set references (inside the caller's transaction)."""
    return con.execute(f"DELETE FROM blobs WHERE {_UNUSED_BLOBS}").rowcount


def compact(workspace):
    """``VACUUM`` the file and truncate its write-ahead log: freed pages leave the file."""
    with workspace.db() as con:
        try:
            con.execute("VACUUM")
            con.execute("PRAGMA wal_checkpoint(TRUNCATE)").fetchone()
        except Exception as exc:  # sqlite3.DatabaseError: one line, the original reason first
            import sqlite3
            if isinstance(exc, sqlite3.DatabaseError):
                raise storage_error(exc, str(workspace.path)) from None
            raise


def purge(workspace, space=None, days=None, now=None) -> dict:
    """Remove deleted datasets for good, drop bytes nothing references, compact the file.

    Parameters
    ----------
    workspace : Workspace
    space : Space, optional
        Only this space's deleted datasets (the dashboard's action); default
        every space's, and idle browser spaces past the retention expire too.
    days : float, optional
        Retention of idle browser spaces [days] (default :func:`retention_days`).

    Returns
    -------
    dict
        ``{"datasets": removed, "spaces": expired, "blobs": byte records dropped,
        "bytes_before": file size, "bytes_after": file size}`` (sizes with the WAL [bytes]).

    Examples
    --------
    >>> import os, tempfile
    >>> from thermo.workspace import Workspace
    >>> ws = Workspace(os.path.join(tempfile.mkdtemp(), "w.sqlite"))
    >>> d, _ = ws.local().add(b"# frequency (THz) dos\\n0 0\\n1 1\\n", "a.dat")
    >>> _ = ws.local().remove(d.id, soft=True)
    >>> done = purge(ws)
    >>> done["datasets"], done["blobs"]
    (1, 1)
    """
    before = _size(workspace.path)
    spaces = 0 if space is not None else expire_idle_spaces(workspace, days, now)
    with workspace.db() as con, transaction(con, str(workspace.path)):
        if space is None:
            datasets = con.execute("DELETE FROM datasets WHERE deleted_utc IS NOT NULL").rowcount
        else:
            datasets = con.execute("DELETE FROM datasets WHERE deleted_utc IS NOT NULL AND space_id = ?",
                                   (space.id,)).rowcount
        blobs = drop_unused_bytes(con)
    compact(workspace)
    return {"datasets": datasets, "spaces": spaces, "blobs": blobs, "bytes_before": before,
            "bytes_after": _size(workspace.path)}


def _size(path) -> int:
    return sum(os.path.getsize(p) for p in (str(path), f"{path}-wal") if os.path.exists(p))
