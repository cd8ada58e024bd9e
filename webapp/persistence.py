"""The server-side workspace: each browser's datasets kept in the SQLite workspace (:mod:`thermo.workspace`).

Every browser gets its own space, keyed by an unguessable id
(``secrets.token_urlsafe``) in an HttpOnly cookie; a named workspace is opened
by putting its key in that cookie.  The page keeps the familiar workspace dict
(:mod:`webapp.session`); :func:`sync` writes each edit of it to the store and
:func:`browser_workspace` reads it back on a page load.  Without a configured
workspace file the dashboard keeps the browser-only behaviour.
"""

from __future__ import annotations

import secrets

import flask

from thermo.errors import WorkspaceError
from thermo.workspace import Workspace
from thermo.workspace.schema import utc_now

from . import session

#: Name of the HttpOnly cookie holding the key of the browser's space.
COOKIE = "mh_space"
#: Cookie lifetime [s] (about ten years: the workspace should be there tomorrow).
COOKIE_SECONDS = 10 * 365 * 24 * 3600
#: Note stored with the seeded demo datasets.
DEMO_NOTE = "invented demo data (spring models with made-up force constants), not a material"


def enabled(server) -> bool:
    """True when the server keeps workspaces in a file."""
    return bool(server.config.get("MODEHEAT_WORKSPACE"))


def _key():
    key = getattr(flask.g, "mh_space_key", None)
    if key is None:
        key = flask.request.cookies.get(COOKIE) or secrets.token_urlsafe(32)
        flask.g.mh_space_key = key
    return key


def install(server):
    """Give every response of ``server`` the browser's space cookie (set once, HttpOnly, SameSite=Lax),
    and let :func:`webapp.session.content_bytes` read stored bytes from the requesting browser's space only
    (:func:`webapp.session.verified_sha256` accepts a stored reference only when that space holds it)."""
    session.STORED_BYTES["fetch"] = lambda sha: current_space(server).content(sha)
    session.STORED_BYTES["owns"] = lambda sha: enabled(server) and owns(current_space(server), sha)

    @server.after_request
    def _cookie(response):
        if enabled(server) and flask.has_request_context():
            key = getattr(flask.g, "mh_space_open", None) or _key()
            if flask.request.cookies.get(COOKIE) != key:
                response.set_cookie(COOKIE, key, max_age=COOKIE_SECONDS, httponly=True, samesite="Lax",
                                    secure=flask.request.is_secure)
        return response


def owns(space, sha) -> bool:
    """True when ``space`` holds a live dataset with the SHA-256 ``sha`` (a full 64-digit hash)."""
    return any(d.sha256 == sha for d in space.datasets())


def store(server):
    """The configured :class:`~thermo.workspace.Workspace`."""
    return Workspace(server.config["MODEHEAT_WORKSPACE"])


#: Said when a request carries no space cookie (cookies off, or a client that never keeps them).
NO_COOKIE = "this browser sends no workspace cookie (cookies off?), so nothing is kept on the server"


def sends_cookie() -> bool:
    """True when the request carries the space cookie: only such a browser gets a space in the file
    (a client that never sends it back would create a new, unreachable space on every request)."""
    return bool(flask.request.cookies.get(COOKIE))


def current_space(server, demo=None):
    """The space of the browser making this request (new ones get the demo datasets, once).

    Raises
    ------
    WorkspaceError
        The request carries no space cookie (:data:`NO_COOKIE`): no space is created for it.
    """
    if not sends_cookie():
        raise WorkspaceError(NO_COOKIE)
    space, new = store(server).browser(_key())
    if new and demo is not None:
        for d in demo().get("datasets", []):
            space.add(session.content_bytes(d), d["name"], _settings(d), group="demo", note=DEMO_NOTE,
                      invented=True)
    return space


def _settings(dataset):
    return {k: session.options_of(dataset)[k] for k in session.DEFAULT_OPTIONS}


def browser_workspace(space):
    """The workspace dict (:mod:`webapp.session` format) of a stored space."""
    datasets = []
    for d in space.datasets():       # bytes stay on the server: the page gets names, hashes and settings
        datasets.append({"id": d.id, "name": d.name, "content": None, "encoding": "stored", "sha256": d.sha256,
                         "size": d.size, "options": {**session.DEFAULT_OPTIONS, **d.settings,
                                                     "formula": d.settings.get("formula") or ""},
                         "group": d.group, "note": d.note, "invented": d.invented})
    active = space.setting("active")
    ids = {d["id"] for d in datasets}
    return {"datasets": datasets, "active": active if active in ids else (datasets[0]["id"] if datasets else None),
            "rev": space.setting("rev"), "stored": True}


def sync(space, workspace, loaded_utc):
    """Write the page's workspace dict to the store; returns the number of rows changed.

    Datasets new in the dict are added (same id), changed names, settings,
    groups and notes updated, and stored datasets missing from the dict are
    deleted softly (undo: :meth:`~thermo.workspace.store.Space.restore`) — but
    only those that existed when the page was loaded (``loaded_utc``), so a
    file added meanwhile by the command line or another tab is kept.
    """
    stored = {d.id: d for d in space.datasets()}
    changed = 0
    seen = set()
    for d in (workspace or {}).get("datasets", []):
        seen.add(d["id"])
        old = stored.get(d["id"])
        if old is None:
            if space.has_id(d["id"]):
                continue                 # deleted in another tab: not brought back behind its back
            space.add(session.content_bytes(d), d["name"], _settings(d), group=d.get("group", ""),
                      note=d.get("note", ""), invented=d.get("invented", False), dataset_id=d["id"])
            changed += 1
            continue
        changes = {"name": d["name"], "settings": _settings(d), "group": d.get("group", ""), "note": d.get("note", "")}
        current = {"name": old.name, "settings": old.settings, "group": old.group, "note": old.note}
        if changes != current:
            space.update(old.id, **{k: v for k, v in changes.items() if current[k] != v})
            changed += 1
    for did, old in stored.items():
        if did not in seen and old.added_utc <= (loaded_utc or ""):
            space.remove(did, soft=True)
            changed += 1
    ws = workspace or {}
    if ws.get("active") != space.setting("active"):
        space.set_setting("active", ws.get("active"))
    if changed and ws.get("rev"):
        space.set_setting("rev", ws.get("rev"))
    return changed


def open_named(server, key):
    """Switch this browser to the named space opened by ``key``; returns it (None for an unknown key)."""
    space = store(server).by_key(key)
    if space is not None and space.kind == "named":
        flask.g.mh_space_open = space.key
        return space
    return None


def create_named(server, name):
    """A new named space; this browser switches to it. Returns it (its key is shown once)."""
    space = store(server).create_named(name)
    flask.g.mh_space_open = space.key
    return space


def purge(server):
    """Remove the deleted datasets of this browser's space for good, drop unused bytes, compact the file
    (:func:`thermo.workspace.upkeep.purge`); returns its counts."""
    from thermo.workspace.upkeep import purge as purged
    return purged(store(server), space=current_space(server))


def own_space(server):
    """Leave a named space: a fresh private space for this browser."""
    flask.g.mh_space_open = secrets.token_urlsafe(32)


def loaded_stamp():
    """The time a page was loaded (UTC text comparable with ``added_utc``)."""
    return utc_now()
