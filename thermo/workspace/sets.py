"""Sets of files kept together in a space: a volume set (a manifest and its DOS files), a measured set.

A file set is a row of ``sets`` (kind, unique name per space, note, settings
JSON) with its files in ``set_files`` (position, role, file name, SHA-256);
the bytes live once in ``blobs`` like those of datasets, and go when neither a
dataset nor a set uses them.  Identical files saved again give the set already
kept, never a copy: re-uploading the same bytes selects what is there.

References
----------
.. [1] NIST, *Secure Hash Standard (SHS)*, FIPS PUB 180-4 (2015): SHA-256.
"""

from __future__ import annotations

import json
from dataclasses import dataclass

from ..errors import WorkspaceError
from .schema import transaction, utc_now
from .store import sha256_hex

#: Kinds of file sets.
KINDS = ("volume", "measured")
#: Roles a file plays in a set.
ROLES = ("manifest", "dos", "measured")


@dataclass(frozen=True)
class SetFile:
    """One file of a set (no bytes)."""
    role: str
    name: str
    sha256: str


@dataclass(frozen=True)
class FileSet:
    """A kept set: name, kind, note, settings and its files in order."""
    name: str
    kind: str
    note: str
    settings: dict
    files: tuple
    created_utc: str


def _identity(files):
    return sorted((role, sha) for role, _, sha in files)


def _load(con, space_id, where="", args=()):
    rows = con.execute(f"SELECT id, name, kind, note, settings, created_utc FROM sets WHERE space_id = ? {where} "
                       "AND EXISTS (SELECT 1 FROM set_files f WHERE f.set_id = sets.id) ORDER BY created_utc, id",
                       (space_id, *args)).fetchall()
    out = []
    for sid, name, kind, note, settings, created in rows:
        files = con.execute("SELECT role, name, sha256 FROM set_files WHERE set_id = ? ORDER BY position",
                            (sid,)).fetchall()
        out.append(FileSet(name, kind, note, json.loads(settings or "{}"),
                           tuple(SetFile(*f) for f in files), created))
    return out


def file_sets(space, kind=None):
    """The file sets of a space (of one ``kind`` when given), oldest first."""
    with space.workspace.db() as con:
        if kind is None:
            return _load(con, space.id)
        return _load(con, space.id, "AND kind = ?", (kind,))


def file_set(space, name):
    """The file set ``name`` of a space (:class:`~thermo.errors.WorkspaceError` when absent)."""
    with space.workspace.db() as con:
        found = _load(con, space.id, "AND name = ?", (str(name),))
    if not found:
        raise WorkspaceError(f"no set {name!r} in workspace {space.name!r}")
    return found[0]


def save_file_set(space, name, kind, files, settings=None, note=""):
    """Keep ``files`` (``(role, file name, bytes)`` in order) as one set, in one transaction.

    A set of the same kind with the same bytes in the same roles is not saved
    again: it is returned with ``False``.  A name taken by another set gets
    `` (2)``, `` (3)``, ... appended.

    Returns
    -------
    fileset : FileSet
    added : bool

    Examples
    --------
    >>> import os, tempfile
    >>> from thermo.workspace import Workspace
    >>> space = Workspace(os.path.join(tempfile.mkdtemp(), "w.sqlite")).local()
    >>> s, added = save_file_set(space, "cp.csv", "measured", [("measured", "cp.csv", b"T Cp\\n1 2\\n")])
    >>> added, save_file_set(space, "again.csv", "measured", [("measured", "again.csv", b"T Cp\\n1 2\\n")])[1]
    (True, False)
    """
    if kind not in KINDS:
        raise WorkspaceError(f"unknown set kind {kind!r}; one of {', '.join(KINDS)}")
    entries = [(str(role), " ".join(str(n).split()) or "file", bytes(raw)) for role, n, raw in files]
    if not entries:
        raise WorkspaceError("a set needs at least one file")
    bad = sorted({role for role, _, _ in entries} - set(ROLES))
    if bad:
        raise WorkspaceError(f"unknown file role(s) {', '.join(bad)}; one of {', '.join(ROLES)}")
    hashed = [(role, n, sha256_hex(raw), raw) for role, n, raw in entries]
    wanted = _identity([(role, n, sha) for role, n, sha, _ in hashed])
    for kept in file_sets(space, kind):
        if _identity([(f.role, f.name, f.sha256) for f in kept.files]) == wanted:
            return kept, False
    base = " ".join(str(name or "").split()) or entries[0][1]
    with space.workspace.db() as con, transaction(con, str(space.workspace.path)):
        taken = {r[0] for r in con.execute("SELECT name FROM sets WHERE space_id = ?", (space.id,))}
        final, k = base, 2
        while final in taken:
            final, k = f"{base} ({k})", k + 1
        cur = con.execute("INSERT INTO sets (space_id, kind, name, note, created_utc, settings) "
                          "VALUES (?, ?, ?, ?, ?, ?)", (space.id, kind, final, str(note or ""), utc_now(),
                                                        json.dumps(settings or {}, sort_keys=True)))
        for position, (role, n, sha, raw) in enumerate(hashed):
            con.execute("INSERT OR IGNORE INTO blobs VALUES (?, ?, ?)", (sha, len(raw), raw))
            con.execute("INSERT INTO set_files VALUES (?, ?, ?, ?, ?)", (cur.lastrowid, position, role, n, sha))
    return file_set(space, final), True


def set_contents(space, name):
    """``[(role, file name, bytes), ...]`` of a set of this space, each checked against its SHA-256."""
    kept = file_set(space, name)
    out = []
    with space.workspace.db() as con:
        for f in kept.files:
            row = con.execute("SELECT b.content FROM blobs b WHERE b.sha256 = ? AND EXISTS (SELECT 1 FROM set_files s "
                              "JOIN sets t ON t.id = s.set_id WHERE s.sha256 = ? AND t.space_id = ?)",
                              (f.sha256, f.sha256, space.id)).fetchone()
            if row is None or sha256_hex(row[0]) != f.sha256:
                raise WorkspaceError(f"workspace {space.workspace.path}: the bytes of {f.name} in set {name!r} "
                                     "are missing or damaged")
            out.append((f.role, f.name, bytes(row[0])))
    return out


def remove_file_set(space, name):
    """Delete a set; its bytes go when no dataset or other set uses them."""
    kept = file_set(space, name)
    with space.workspace.db() as con, transaction(con, str(space.workspace.path)):
        con.execute("DELETE FROM sets WHERE space_id = ? AND name = ?", (space.id, kept.name))
        for f in kept.files:
            con.execute("DELETE FROM blobs WHERE sha256 = ? AND NOT EXISTS (SELECT 1 FROM datasets WHERE sha256 = ?) "
                        "AND NOT EXISTS (SELECT 1 FROM set_files WHERE sha256 = ?)", (f.sha256, f.sha256, f.sha256))
    return kept
