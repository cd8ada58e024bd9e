"""The workspace file: connection settings (WAL, busy timeout, foreign keys), schema version and migrations.

Every migration is a list of SQL statements applied in one transaction that
also records the new version in ``schema_version``; a file written by a newer
modeheat (a version above :data:`SCHEMA_VERSION`) is refused, not guessed at.
"""

from __future__ import annotations

import sqlite3
import time
from contextlib import contextmanager
from datetime import datetime, timezone
from pathlib import Path

from ..errors import WorkspaceError

#: Schema version written by this modeheat.
SCHEMA_VERSION = 3
#: How long a writer waits for another process's transaction [s] before giving up.
BUSY_SECONDS = 60.0

#: ``MIGRATIONS[v]`` takes a file from version ``v - 1`` to ``v``.
MIGRATIONS = {
    1: [
        "CREATE TABLE blobs (sha256 TEXT PRIMARY KEY, size INTEGER NOT NULL, content BLOB NOT NULL)",
        "CREATE TABLE spaces (id INTEGER PRIMARY KEY, name TEXT NOT NULL UNIQUE, key TEXT NOT NULL UNIQUE,"
        " kind TEXT NOT NULL CHECK (kind IN ('local', 'browser', 'named')), created_utc TEXT NOT NULL)",
        "CREATE TABLE datasets (id TEXT PRIMARY KEY,"
        " space_id INTEGER NOT NULL REFERENCES spaces(id) ON DELETE CASCADE,"
        " name TEXT NOT NULL, sha256 TEXT NOT NULL REFERENCES blobs(sha256),"
        " settings TEXT NOT NULL, group_label TEXT NOT NULL DEFAULT '', note TEXT NOT NULL DEFAULT '',"
        " invented INTEGER NOT NULL DEFAULT 0, added_utc TEXT NOT NULL, deleted_utc TEXT)",
        "CREATE UNIQUE INDEX datasets_live_name ON datasets(space_id, name) WHERE deleted_utc IS NULL",
        "CREATE INDEX datasets_sha ON datasets(space_id, sha256)",
        "CREATE TABLE settings (space_id INTEGER NOT NULL REFERENCES spaces(id) ON DELETE CASCADE,"
        " key TEXT NOT NULL, value TEXT NOT NULL, PRIMARY KEY (space_id, key))",
    ],
    2: [
        "CREATE TABLE sets (id INTEGER PRIMARY KEY,"
        " space_id INTEGER NOT NULL REFERENCES spaces(id) ON DELETE CASCADE,"
        " kind TEXT NOT NULL CHECK (kind IN ('volume', 'measured')), name TEXT NOT NULL,"
        " note TEXT NOT NULL DEFAULT '', created_utc TEXT NOT NULL, UNIQUE (space_id, name))",
        "CREATE TABLE set_members (set_id INTEGER NOT NULL REFERENCES sets(id) ON DELETE CASCADE,"
        " dataset_id TEXT NOT NULL REFERENCES datasets(id) ON DELETE CASCADE,"
        " position INTEGER NOT NULL, value REAL, PRIMARY KEY (set_id, dataset_id))",
    ],
    3: [   # file sets: a volume set's manifest and DOS files, a measured C_p file (thermo/workspace/sets.py)
        "ALTER TABLE sets ADD COLUMN settings TEXT NOT NULL DEFAULT '{}'",
        "CREATE TABLE set_files (set_id INTEGER NOT NULL REFERENCES sets(id) ON DELETE CASCADE,"
        " position INTEGER NOT NULL, role TEXT NOT NULL, name TEXT NOT NULL,"
        " sha256 TEXT NOT NULL REFERENCES blobs(sha256), PRIMARY KEY (set_id, position))",
        "CREATE INDEX set_files_sha ON set_files(sha256)",
    ],
}


def utc_now() -> str:
    """The current time as ISO 8601 UTC with microseconds (sorts as text)."""
    return datetime.now(timezone.utc).strftime("%Y-%m-%dT%H:%M:%S.%fZ")


#: One-line wording of SQLite's storage failures, by result code (SQLite documentation, "Result and Error Codes").
STORAGE_WORDS = {"SQLITE_FULL": "disk is full", "SQLITE_READONLY": "the workspace is read-only",
                 "SQLITE_IOERR": "disk read/write error", "SQLITE_CANTOPEN": "cannot open the workspace file",
                 "SQLITE_CORRUPT": "the workspace file is damaged", "SQLITE_NOTADB": "not a workspace file",
                 "SQLITE_PERM": "no permission to write the workspace"}


def storage_message(exc, where="workspace") -> str:
    """One line for an SQLite failure: what happened first, then where and SQLite's own words.

    Examples
    --------
    >>> storage_message(sqlite3.OperationalError("database or disk is full"), "w.sqlite")
    'disk is full: w.sqlite (database or disk is full)'
    """
    name = str(getattr(exc, "sqlite_errorname", "") or "")
    words = STORAGE_WORDS.get("_".join(name.split("_")[:2]))          # SQLITE_IOERR_WRITE -> SQLITE_IOERR
    text = " ".join(str(exc).split())
    if words is None:
        words = next((w for k, w in (("full", "disk is full"), ("readonly", "the workspace is read-only"),
                                     ("read-only", "the workspace is read-only")) if k in text.lower()),
                     "workspace storage failed")
    return f"{words}: {where} ({text})"


def storage_error(exc, where="workspace") -> WorkspaceError:
    """The :class:`~thermo.errors.WorkspaceError` carrying :func:`storage_message`."""
    return WorkspaceError(storage_message(exc, where))


def _open(path, mode=None):
    if mode is None:
        con = sqlite3.connect(str(path), timeout=BUSY_SECONDS, isolation_level=None, check_same_thread=False)
    else:
        uri = f"{path.resolve().as_uri()}?{mode}"
        con = sqlite3.connect(uri, uri=True, timeout=BUSY_SECONDS, isolation_level=None, check_same_thread=False)
    try:
        con.execute(f"PRAGMA busy_timeout = {int(BUSY_SECONDS * 1000)}")
        con.execute("PRAGMA foreign_keys = ON")
        con.execute("PRAGMA secure_delete = ON")     # deleted rows are overwritten, not left in free pages
        mode_now = con.execute("PRAGMA journal_mode" if mode else "PRAGMA journal_mode = WAL").fetchone()[0]
        if mode is None:
            con.execute("PRAGMA synchronous = NORMAL")
        con.execute("SELECT count(*) FROM sqlite_master").fetchone()
    except BaseException:
        con.close()
        raise
    return con, mode_now


def connect(path) -> sqlite3.Connection:
    """Open ``path`` with WAL, foreign keys and a busy timeout (autocommit; see :func:`transaction`).

    An existing file that cannot be opened for writing (full disk, read-only
    file system) is opened read-only (``mode=ro``, else ``immutable=1``), so
    listing and reading still work; a write then fails with one line
    (:func:`storage_message`).
    """
    path = Path(path)
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
    except OSError:
        pass                                    # a read-only parent: the file may still be readable
    try:
        con, mode = _open(path)
    except sqlite3.DatabaseError as exc:
        code = str(getattr(exc, "sqlite_errorname", "") or "")
        if not path.exists() or code.startswith(("SQLITE_NOTADB", "SQLITE_BUSY", "SQLITE_LOCKED")):
            raise WorkspaceError(f"cannot open the workspace: {storage_message(exc, path)}") from None
        for fallback in ("mode=ro", "immutable=1"):
            try:
                return _open(path, fallback)[0]
            except sqlite3.DatabaseError:
                continue
        raise WorkspaceError(f"cannot open the workspace: {storage_message(exc, path)}") from None
    if str(mode).lower() != "wal":
        con.close()
        raise WorkspaceError(f"{path}: the workspace cannot use write-ahead logging here (journal mode {mode})")
    return con


@contextmanager
def transaction(con, where="workspace"):
    """One write transaction (``BEGIN IMMEDIATE``): all of it is committed, or none of it.

    A writer that finds the file busy waits (SQLite's busy timeout, then a
    few retries); after about :data:`BUSY_SECONDS` it raises a one-line
    :class:`~thermo.errors.WorkspaceError` instead of ``database is locked``.
    """
    deadline = time.monotonic() + BUSY_SECONDS
    while True:
        try:
            con.execute("BEGIN IMMEDIATE")
            break
        except sqlite3.OperationalError as exc:
            if "locked" not in str(exc) and "busy" not in str(exc):
                raise storage_error(exc, where) from None
            if time.monotonic() > deadline:
                raise WorkspaceError(f"{where}: another program kept the workspace busy for over "
                                     f"{BUSY_SECONDS:g} s; try again") from None
            time.sleep(0.05)
    try:
        yield con
    except sqlite3.DatabaseError as exc:
        _rollback(con)                          # SQLite may have rolled back already (disk full)
        if isinstance(exc, sqlite3.IntegrityError):
            raise
        raise storage_error(exc, where) from None
    except BaseException:
        _rollback(con)
        raise
    try:
        con.execute("COMMIT")
    except sqlite3.DatabaseError as exc:
        _rollback(con)
        raise storage_error(exc, where) from None


def _rollback(con):
    """Roll back an open transaction; never hides the error that caused it."""
    if con.in_transaction:
        try:
            con.execute("ROLLBACK")
        except sqlite3.DatabaseError:
            pass


def version(con) -> int:
    """Schema version of an open file (0 for a new, empty file)."""
    has = con.execute("SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = 'schema_version'").fetchone()
    if not has:
        return 0
    row = con.execute("SELECT MAX(version) FROM schema_version").fetchone()
    return int(row[0] or 0)


def migrate(con, where="workspace", target=SCHEMA_VERSION) -> int:
    """Bring the file to ``target``, one migration per transaction; returns the version reached.

    A file already at ``target`` is only read (it opens on a full or read-only disk)."""
    try:
        if version(con) == target:
            return target
    except sqlite3.DatabaseError as exc:
        raise storage_error(exc, where) from None
    with transaction(con, where):
        con.execute("CREATE TABLE IF NOT EXISTS schema_version (version INTEGER PRIMARY KEY, applied_utc TEXT NOT NULL)")
    current = version(con)
    if current > target:
        raise WorkspaceError(f"{where}: the workspace has schema version {current}, newer than this modeheat "
                             f"understands ({target}); use a newer modeheat")
    while current < target:
        with transaction(con, where):
            current = version(con)          # another process may have migrated meanwhile
            if current >= target:
                break
            for statement in MIGRATIONS[current + 1]:
                con.execute(statement)
            con.execute("INSERT INTO schema_version VALUES (?, ?)", (current + 1, utc_now()))
            current += 1
    return current
