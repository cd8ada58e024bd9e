"""Datasets, spaces, settings and sets of a workspace file.

A dataset is a file's bytes (stored once per workspace, addressed by their
SHA-256) plus its name, the settings it is loaded with (see
:data:`SETTING_NAMES`), a group label, a note and its creation time.  Every
change is one transaction, so a process killed at any moment leaves either
the whole change or none of it.

References
----------
.. [1] NIST, *Secure Hash Standard (SHS)*, FIPS PUB 180-4 (2015): SHA-256.
.. [2] SQLite documentation, "Write-Ahead Logging" and "Atomic Commit In
   SQLite", https://sqlite.org (2024).
"""

from __future__ import annotations

import hashlib
import json
import re
import secrets
import sqlite3
import threading
import uuid
from contextlib import closing, contextmanager
from dataclasses import dataclass
from pathlib import Path

from ..errors import WorkspaceError
from ..preparation.options import FIELDS, ReadingOptions
from .location import default_path
from .schema import connect, migrate, transaction, utc_now

#: Settings a dataset is loaded with: the reading options (:mod:`thermo.preparation.options`).
SETTING_NAMES = FIELDS
#: Settings of a dataset added without any (the record's defaults, in stored form).
DEFAULT_SETTINGS = ReadingOptions().stored()
#: Name of the space the command line uses unless told otherwise.
LOCAL_SPACE = "main"

#: A SHA-256 prefix a dataset may be named by (8 to 64 hexadecimal digits).
_HEX_PREFIX = re.compile(r"[0-9A-Fa-f]{8,64}")

_MIGRATED = set()
_MIGRATED_LOCK = threading.Lock()


def sha256_hex(raw: bytes) -> str:
    """SHA-256 of ``raw`` as 64 hexadecimal digits (FIPS 180-4).

    Examples
    --------
    >>> sha256_hex(b"abc")[:16]
    'ba7816bf8f01cfea'
    """
    return hashlib.sha256(raw).hexdigest()


def settings_of(settings=None) -> dict:
    """Complete, canonical settings (unknown names refused): :meth:`ReadingOptions.stored`."""
    settings = dict(settings or {})
    unknown = sorted(set(settings) - set(SETTING_NAMES))
    if unknown:
        raise WorkspaceError(f"unknown dataset setting(s): {', '.join(unknown)}")
    return ReadingOptions.from_mapping(settings).stored()


def _key(settings) -> str:
    return json.dumps(settings_of(settings), sort_keys=True)


@dataclass(frozen=True)
class Dataset:
    """One row of the dataset list (no bytes)."""
    id: str
    name: str
    sha256: str
    size: int
    settings: dict
    group: str
    note: str
    invented: bool
    added_utc: str

    def as_dict(self) -> dict:
        """Plain dict (for JSON/CSV listings)."""
        return {"id": self.id, "name": self.name, "sha256": self.sha256, "size_bytes": self.size,
                "added_utc": self.added_utc, "group": self.group, "note": self.note,
                "invented": self.invented, "settings": dict(self.settings)}


class Workspace:
    r"""A workspace file (created and migrated on first use).

    Parameters
    ----------
    path : path-like, optional
        The SQLite file; default :func:`~thermo.workspace.default_path`.

    Examples
    --------
    >>> import tempfile, os
    >>> ws = Workspace(os.path.join(tempfile.mkdtemp(), "w.sqlite"))
    >>> space = ws.local()
    >>> d, new = space.add(b"# frequency (THz) dos\n0 0\n1 1\n", "a.dat")
    >>> new, [x.name for x in space.datasets()]
    (True, ['a.dat'])
    """

    def __init__(self, path=None):
        self.path = Path(path) if path is not None else default_path()
        where = str(self.path)
        with _MIGRATED_LOCK:
            if where not in _MIGRATED or not self.path.exists():
                with closing(connect(self.path)) as con:
                    migrate(con, where)
                _MIGRATED.add(where)
        self._local = threading.local()

    def __eq__(self, other):
        return isinstance(other, Workspace) and self.path.resolve() == other.path.resolve()

    def __hash__(self):
        return hash(str(self.path.resolve()))

    def __repr__(self):
        return f"Workspace({str(self.path)!r})"

    def connect(self) -> sqlite3.Connection:
        """A new connection to the file (the caller closes it)."""
        return connect(self.path)

    @contextmanager
    def db(self):
        """This thread's connection of this object (opened once, reused by every call)."""
        con = getattr(self._local, "con", None)
        if con is None:
            con = self._local.con = connect(self.path)
        yield con

    def _space(self, where, args):
        with self.db() as con:
            row = con.execute(f"SELECT id, name, key, kind FROM spaces WHERE {where}", args).fetchone()
        return Space(self, *row) if row else None

    def _create(self, name, kind, key=None):
        key = key or secrets.token_urlsafe(32)
        with self.db() as con, transaction(con, str(self.path)):
            con.execute("INSERT OR IGNORE INTO spaces (name, key, kind, created_utc) VALUES (?, ?, ?, ?)",
                        (name, key, kind, utc_now()))
        return self._space("name = ?", (name,)) if kind == "local" else self._space("key = ?", (key,))

    def local(self, name=LOCAL_SPACE):
        """The command line's space ``name`` (created when missing)."""
        return self._space("name = ? AND kind IN ('local', 'named')", (name,)) or self._create(name, "local")

    def by_key(self, key):
        """The space opened by ``key`` (None when no space has it)."""
        return self._space("key = ?", (str(key),)) if key else None

    def browser(self, key):
        """The space of one browser (its cookie ``key``), created when new; second value True if new."""
        found = self.by_key(key)
        if found is not None:
            return found, False
        space = self._create(f"browser-{sha256_hex(str(key).encode())[:12]}", "browser", key)
        from .upkeep import sweep
        sweep(self)                     # idle spaces past the retention go (at most once an hour)
        return space, True

    def create_named(self, name):
        """A new named space with a fresh key; its name is the one given plus a tag of the key.

        The tag makes every name new, so creating one tells nothing about the
        spaces already in the file (no "exists already"), and a name typed in
        the dashboard never opens the command line's space of that name.
        """
        name = " ".join(str(name or "").split())
        if not name or name.startswith("browser-"):
            raise WorkspaceError(f"workspace name {name!r} is empty or reserved")
        key = secrets.token_urlsafe(32)
        space = self._create(f"{name} [{sha256_hex(key.encode())[:12]}]", "named", key)
        if space is None:
            raise WorkspaceError("could not create the workspace; try again")
        return space

    def spaces(self, kinds=("local", "named")):
        """Spaces of the given kinds, by name (browser spaces are private and left out by default)."""
        marks = ",".join("?" * len(kinds))
        with self.db() as con:
            rows = con.execute(f"SELECT id, name, key, kind FROM spaces WHERE kind IN ({marks}) ORDER BY name",
                               tuple(kinds)).fetchall()
        return [Space(self, *r) for r in rows]

    def check(self) -> list:
        """Problems found: SQLite's integrity check and every blob re-hashed (empty when consistent)."""
        problems = []
        with self.db() as con:
            status = con.execute("PRAGMA integrity_check").fetchone()[0]
            if status != "ok":
                problems.append(f"integrity_check: {status}")
            for sha, size, content in con.execute("SELECT sha256, size, content FROM blobs"):
                if sha256_hex(content) != sha or len(content) != size:
                    problems.append(f"blob {sha[:12]} does not hash to its address")
            for (did,) in con.execute("SELECT d.id FROM datasets d LEFT JOIN blobs b ON b.sha256 = d.sha256 "
                                      "WHERE b.sha256 IS NULL"):
                problems.append(f"dataset {did} has no bytes")
        return problems


_COLUMNS = ("d.id, d.name, d.sha256, b.size, d.settings, d.group_label, d.note, d.invented, d.added_utc")


def _dataset(row) -> Dataset:
    return Dataset(row[0], row[1], row[2], int(row[3]), json.loads(row[4]), row[5], row[6], bool(row[7]), row[8])


@dataclass(frozen=True)
class Space:
    """The datasets of one user or purpose inside a workspace file."""
    workspace: Workspace
    id: int
    name: str
    key: str
    kind: str

    # ------------------------------------------------------------------ reading
    def datasets(self, include_deleted=False):
        """Datasets in the order they were added."""
        live = "" if include_deleted else " AND d.deleted_utc IS NULL"
        with self.workspace.db() as con:
            rows = con.execute(f"SELECT {_COLUMNS} FROM datasets d JOIN blobs b ON b.sha256 = d.sha256 "
                               f"WHERE d.space_id = ?{live} ORDER BY d.added_utc, d.rowid", (self.id,)).fetchall()
        return [_dataset(r) for r in rows]

    def find(self, ref):
        """The live dataset whose id, name or SHA-256 prefix (8+ digits) is ``ref``; None when absent."""
        ref = str(ref)
        # a SHA-256 prefix is 8-64 hexadecimal digits compared as text (no LIKE: '%' and '_' match nothing)
        prefix = ref.lower() if _HEX_PREFIX.fullmatch(ref) else None
        with self.workspace.db() as con:
            rows = con.execute(f"SELECT {_COLUMNS} FROM datasets d JOIN blobs b ON b.sha256 = d.sha256 "
                               "WHERE d.space_id = ? AND d.deleted_utc IS NULL AND (d.id = ? OR d.name = ? OR "
                               "(? IS NOT NULL AND substr(d.sha256, 1, length(?)) = ?)) "
                               "ORDER BY d.id = ? DESC, d.name = ? DESC",
                               (self.id, ref, ref, prefix, prefix, prefix, ref, ref)).fetchall()
        if not rows:
            return None
        exact = [r for r in rows if r[0] == ref or r[1] == ref]
        if not exact and len(rows) > 1:
            raise WorkspaceError(f"{ref!r} matches {len(rows)} datasets by SHA-256 prefix; give more digits or the name")
        return _dataset(rows[0])

    def get(self, ref) -> Dataset:
        """Like :meth:`find` but raising a one-line error when absent."""
        found = self.find(ref)
        if found is None:
            raise WorkspaceError(f"no dataset {ref!r} in workspace {self.name!r} of {self.workspace.path}")
        return found

    def has_id(self, dataset_id) -> bool:
        """True when ``dataset_id`` is or was (deleted) a dataset of this space."""
        with self.workspace.db() as con:
            return con.execute("SELECT 1 FROM datasets WHERE id = ? AND space_id = ?",
                               (str(dataset_id), self.id)).fetchone() is not None

    def content(self, dataset) -> bytes:
        """The original bytes of a dataset of this space (checked against its SHA-256)."""
        sha = dataset.sha256 if isinstance(dataset, Dataset) else str(dataset)
        with self.workspace.db() as con:
            row = con.execute("SELECT content FROM blobs WHERE sha256 = ? AND EXISTS (SELECT 1 FROM datasets "
                              "WHERE sha256 = ? AND space_id = ?)", (sha, sha, self.id)).fetchone()
        if row is None or sha256_hex(row[0]) != sha:
            raise WorkspaceError(f"workspace {self.workspace.path}: the bytes of {sha[:12]} are missing or damaged")
        return bytes(row[0])

    # ------------------------------------------------------------------ writing
    def add(self, raw: bytes, name: str, settings=None, group="", note="", invented=False, dataset_id=None):
        """Add a file's bytes as a dataset, in one transaction.

        The same bytes with the same settings already in the space are not
        added again: the existing dataset is returned with ``False``.  A name
        that is taken gets `` (2)``, `` (3)``, ... appended.

        Returns
        -------
        dataset : Dataset
        added : bool
            False when an identical dataset was there already.
        """
        raw = bytes(raw)
        sha = sha256_hex(raw)
        key = _key(settings)
        name = " ".join(str(name or "").split()) or sha[:12]
        with self.workspace.db() as con:
            with transaction(con, str(self.workspace.path)):
                same = con.execute("SELECT id FROM datasets WHERE space_id = ? AND sha256 = ? AND settings = ? "
                                   "AND deleted_utc IS NULL", (self.id, sha, key)).fetchone()
                if same:
                    new_id = same[0]
                else:
                    con.execute("INSERT OR IGNORE INTO blobs VALUES (?, ?, ?)", (sha, len(raw), raw))
                    taken = {r[0] for r in con.execute("SELECT name FROM datasets WHERE space_id = ? AND "
                                                       "deleted_utc IS NULL AND (name = ? OR substr(name, 1, ?) = ?)",
                                                       (self.id, name, len(name) + 2, name + " ("))}
                    final, k = name, 2
                    while final in taken:
                        final, k = f"{name} ({k})", k + 1
                    new_id = dataset_id or uuid.uuid4().hex[:10]
                    owner = con.execute("SELECT space_id FROM datasets WHERE id = ?", (new_id,)).fetchone()
                    if owner and owner[0] == self.id:
                        raise WorkspaceError(f"dataset id {new_id!r} is taken in this workspace")
                    if owner:           # another space's id: a fresh one, and nothing said about the other
                        new_id = uuid.uuid4().hex[:10]
                    con.execute("INSERT INTO datasets (id, space_id, name, sha256, settings, group_label, note, "
                                "invented, added_utc) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)",
                                (new_id, self.id, final, sha, key, str(group or ""), str(note or ""),
                                 int(bool(invented)), utc_now()))
        return self.get(new_id), not same

    def update(self, ref, name=None, settings=None, group=None, note=None):
        """Rename, re-set, regroup or annotate a dataset (one transaction); returns the new row."""
        d = self.get(ref)
        changes = {}
        if name is not None:
            clean = " ".join(str(name).split())
            if not clean:
                raise WorkspaceError("a dataset name cannot be blank")
            changes["name"] = clean
        if settings is not None:
            changes["settings"] = _key({**d.settings, **settings})
        if group is not None:
            changes["group_label"] = " ".join(str(group).split())
        if note is not None:
            changes["note"] = str(note).strip()
        if changes:
            sets = ", ".join(f"{k} = ?" for k in changes)
            try:
                with self.workspace.db() as con, transaction(con, str(self.workspace.path)):
                    con.execute(f"UPDATE datasets SET {sets} WHERE id = ? AND space_id = ?",
                                (*changes.values(), d.id, self.id))
            except sqlite3.IntegrityError:
                raise WorkspaceError(f"a dataset named {changes.get('name')!r} exists already") from None
        return self.get(d.id)

    def remove(self, ref, soft=False):
        """Delete a dataset; ``soft`` only marks it (undone by :meth:`restore`). Bytes no one uses are dropped."""
        d = self.get(ref)
        with self.workspace.db() as con, transaction(con, str(self.workspace.path)):
            if soft:
                con.execute("UPDATE datasets SET deleted_utc = ? WHERE id = ?", (utc_now(), d.id))
            else:
                con.execute("DELETE FROM datasets WHERE id = ?", (d.id,))
                con.execute("DELETE FROM blobs WHERE sha256 = ? AND NOT EXISTS "
                            "(SELECT 1 FROM datasets WHERE sha256 = ?) AND NOT EXISTS "
                            "(SELECT 1 FROM set_files WHERE sha256 = ?)", (d.sha256, d.sha256, d.sha256))
        return d

    def restore(self, dataset_id):
        """Undo a soft delete (a name taken meanwhile gets a suffix); returns the dataset."""
        with self.workspace.db() as con, transaction(con, str(self.workspace.path)):
            row = con.execute("SELECT name FROM datasets WHERE id = ? AND space_id = ? AND deleted_utc IS NOT NULL",
                              (dataset_id, self.id)).fetchone()
            if row is None:
                raise WorkspaceError(f"dataset {dataset_id!r} is not deleted here; nothing to undo")
            taken = {r[0] for r in con.execute("SELECT name FROM datasets WHERE space_id = ? AND deleted_utc IS NULL",
                                               (self.id,))}
            final, k = row[0], 2
            while final in taken:
                final, k = f"{row[0]} ({k})", k + 1
            con.execute("UPDATE datasets SET deleted_utc = NULL, name = ? WHERE id = ?", (final, dataset_id))
        return self.get(dataset_id)

    # ------------------------------------------------------------------ settings and sets
    def setting(self, key, default=None):
        """A space setting (JSON value) or ``default``."""
        with self.workspace.db() as con:
            row = con.execute("SELECT value FROM settings WHERE space_id = ? AND key = ?", (self.id, key)).fetchone()
        return json.loads(row[0]) if row else default

    def set_setting(self, key, value):
        """Store a space setting (any JSON value)."""
        with self.workspace.db() as con, transaction(con, str(self.workspace.path)):
            con.execute("INSERT OR REPLACE INTO settings VALUES (?, ?, ?)", (self.id, key, json.dumps(value)))

    def save_set(self, name, kind, members, note=""):
        """Store a volume set or a measured set: ``members`` are ``(dataset ref, value)`` pairs, in order."""
        rows = [(self.get(ref).id, None if value is None else float(value)) for ref, value in members]
        with self.workspace.db() as con, transaction(con, str(self.workspace.path)):
            con.execute("DELETE FROM sets WHERE space_id = ? AND name = ?", (self.id, name))
            cur = con.execute("INSERT INTO sets (space_id, kind, name, note, created_utc) VALUES (?, ?, ?, ?, ?)",
                              (self.id, kind, name, note, utc_now()))
            con.executemany("INSERT INTO set_members VALUES (?, ?, ?, ?)",
                            [(cur.lastrowid, did, i, v) for i, (did, v) in enumerate(rows)])

    def sets(self):
        """``{name: {"kind", "note", "members": [(dataset id, value), ...]}}``."""
        out = {}
        with self.workspace.db() as con:
            for sid, kind, name, note in con.execute("SELECT id, kind, name, note FROM sets WHERE space_id = ? "
                                                     "ORDER BY name", (self.id,)).fetchall():
                members = con.execute("SELECT m.dataset_id, m.value FROM set_members m JOIN datasets d ON "
                                      "d.id = m.dataset_id WHERE m.set_id = ? AND d.deleted_utc IS NULL "
                                      "ORDER BY m.position", (sid,)).fetchall()
                out[name] = {"kind": kind, "note": note, "members": [tuple(m) for m in members]}
        return out
