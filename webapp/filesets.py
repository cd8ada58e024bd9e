"""Volume sets and measured sets of the requesting browser's space, for the Quasi-harmonic and Calorimetry pages.

With a workspace file (:mod:`webapp.persistence`), an uploaded volume set
(manifest + DOS files) or measured file is kept in the browser's space
(:mod:`thermo.workspace.sets`); the page lists the kept sets and reopens the
last one after a reload or a server restart.  The same bytes uploaded again
select the set already kept.  Without a workspace file nothing is kept here
and every function says so (empty lists, None).
"""

from __future__ import annotations

import dash

from thermo.workspace import sets as stored

from . import persistence

#: Space setting holding the name of the set of ``kind`` opened last.
_OPEN = "open_{kind}_set"
#: Space setting holding the values typed beside loaded datasets for a set of ``kind``.
_TYPED = "typed_{kind}_values"


def enabled() -> bool:
    """True when the server keeps a workspace file."""
    return persistence.enabled(dash.get_app().server)


def _space():
    return persistence.current_space(dash.get_app().server)


def names(kind):
    """Names of the kept sets of ``kind`` (oldest first; [] without a workspace file)."""
    if not enabled():
        return []
    return [s.name for s in stored.file_sets(_space(), kind)]


def keep(kind, files, settings=None):
    """Keep ``files`` (``(role, name, bytes)``) as a set of ``kind`` and open it; returns ``(name, added)``.

    Without a workspace file: ``(None, False)``.  Identical bytes give the
    set already kept (``added`` False).
    """
    if not enabled():
        return None, False
    space = _space()
    kept, added = stored.save_file_set(space, files[0][1], kind, files, settings)
    space.set_setting(_OPEN.format(kind=kind), kept.name)
    return kept.name, added


def reopen(kind, name):
    """``[(role, name, bytes), ...]`` of the kept set ``name`` (now the open one of its kind)."""
    space = _space()
    files = stored.set_contents(space, name)
    space.set_setting(_OPEN.format(kind=kind), name)
    return files


def contents(name):
    """``[(role, name, bytes), ...]`` of the kept set ``name``, without making it the open one ([] without a file)."""
    if not enabled():
        return []
    return stored.set_contents(_space(), name)


def last(kind):
    """``(name, files)`` of the set of ``kind`` opened last, or ``(None, None)`` (none, or no workspace file)."""
    if not enabled():
        return None, None
    space = _space()
    name = space.setting(_OPEN.format(kind=kind))
    if name not in [s.name for s in stored.file_sets(space, kind)]:
        return None, None
    return name, stored.set_contents(space, name)


def typed_values(kind):
    """``{dataset sha256: {column: value}}`` typed beside loaded datasets for ``kind`` ({} without a workspace file)."""
    if not enabled():
        return {}
    return dict(_space().setting(_TYPED.format(kind=kind), {}) or {})


def keep_typed_values(kind, rows, datasets):
    """Keep the values of ``rows`` (``id`` + columns) by the bytes of their dataset; True when kept.

    A dataset is named by its content's sha256, so the values come back
    after a reload, a server restart or the same file uploaded again.
    """
    if not enabled():
        return False
    digest = {d["id"]: d["sha256"] for d in datasets or []}
    values = typed_values(kind)
    for row in rows or []:
        if row.get("id") in digest:
            values[digest[row["id"]]] = {k: v for k, v in row.items() if k not in ("id", "name")}
    _space().set_setting(_TYPED.format(kind=kind), values)
    return True


def choices(kind, demo_label):
    """Dropdown choices: the invented demo (value ``demo``), then the kept sets."""
    return [{"label": demo_label, "value": "demo"}] + [{"label": n, "value": n} for n in names(kind)]
