"""The per-tab workspace kept in the browser (``dcc.Store``): datasets as file bytes plus options.

The workspace is a JSON-able dict stored in the page shell's ``mh-workspace``
store (and mirrored to the tab's session storage)::

    {"datasets": [{"id", "name", "content", "encoding", "sha256", "options"}, ...],
     "active": "<id>", "rev": "<changes on every edit>"}

It holds the original file content and the load options, never computed
arrays; results are recomputed through :mod:`webapp.cache`.  The functions
here never modify their input.
"""

from __future__ import annotations

import base64
import hashlib
import json
import re
import uuid

from thermo.errors import ModeheatError
from thermo.preparation.options import FIELDS, ReadingOptions

#: Load options of a new dataset: the reading-options record's defaults in stored form
#: (:meth:`thermo.preparation.options.ReadingOptions.stored`); ``formula`` is used for values per gram.
DEFAULT_OPTIONS = ReadingOptions().stored()
#: Largest workspace [characters of JSON] kept in the tab's session storage
#: (browsers allow about 5 million characters per site; common practice).
SAVED_LIMIT_CHARS = 3_000_000


def empty_workspace():
    """A workspace without datasets."""
    return {"datasets": [], "active": None}


#: Reads the bytes of a dataset kept by the server (``encoding: "stored"``, no ``content``) and tells
#: whether the requesting browser's space holds a SHA-256 (``owns``); set by
#: :func:`webapp.persistence.install` (configuration, not per-user data).
STORED_BYTES = {"fetch": None, "owns": None}


class ForeignDataset(ModeheatError):
    """A dataset reference the requesting browser's space does not hold."""


def content_bytes(dataset) -> bytes:
    """Original file bytes of a dataset."""
    if dataset.get("encoding") == "stored":
        return STORED_BYTES["fetch"](dataset["sha256"])
    if dataset.get("encoding") == "base64":
        return base64.b64decode(dataset["content"])
    return dataset["content"].encode("utf-8")


def verified_sha256(dataset) -> str:
    """The SHA-256 [64 hex digits] the server itself vouches for (FIPS 180-4), never the one a request states.

    A dataset carrying its bytes (``text``/``base64``) is hashed here; a
    stored one (``encoding: "stored"``) is only a reference, accepted when
    the requesting browser's space holds those bytes
    (:class:`ForeignDataset` otherwise).  Caches key on this value.

    Examples
    --------
    >>> d = new_dataset("a.dat", b"1 2\\n")
    >>> verified_sha256({**d, "sha256": "0" * 64}) == d["sha256"]
    True
    """
    if dataset.get("encoding") == "stored":
        sha = str(dataset.get("sha256") or "")
        owns = STORED_BYTES["owns"]
        if owns is None or not re.fullmatch(r"[0-9a-f]{64}", sha) or not owns(sha):
            raise ForeignDataset(f"dataset {str(dataset.get('name'))[:80]!r} is not in this browser's workspace")
        return sha
    return hashlib.sha256(content_bytes(dataset)).hexdigest()


def options_of(dataset) -> dict:
    """The dataset's load options, with defaults for the ones not set."""
    return {**DEFAULT_OPTIONS, **(dataset or {}).get("options", {})}


def reading_of(dataset) -> ReadingOptions:
    """The dataset's load options as the one record (checked; :class:`~thermo.errors.OptionError` if bad)."""
    return ReadingOptions.from_mapping({k: v for k, v in options_of(dataset).items() if k in FIELDS})


def new_dataset(name: str, raw: bytes, options=None) -> dict:
    """A workspace entry for file ``raw`` (text kept as text, binary as base64)."""
    try:
        content, encoding = raw.decode("utf-8"), "text"
    except UnicodeDecodeError:
        content, encoding = base64.b64encode(raw).decode("ascii"), "base64"
    return {"id": uuid.uuid4().hex[:10], "name": str(name), "content": content,
            "encoding": encoding, "sha256": hashlib.sha256(raw).hexdigest(),
            "options": ReadingOptions.from_mapping(options).stored()}


def find(workspace, dataset_id):
    """The dataset with ``dataset_id`` or None."""
    for d in (workspace or {}).get("datasets", []):
        if d["id"] == dataset_id:
            return d
    return None


def active(workspace):
    """The active dataset, or None when the workspace is empty."""
    ws = workspace or {}
    return find(ws, ws.get("active")) or (ws.get("datasets") or [None])[0]


def unique_name(workspace, name):
    """``name``, or ``name (k)`` when a dataset of that name exists."""
    taken = {d["name"] for d in (workspace or {}).get("datasets", [])}
    if name not in taken:
        return name
    k = 2
    while f"{name} ({k})" in taken:
        k += 1
    return f"{name} ({k})"


def with_dataset(workspace, dataset, make_active=True):
    """Workspace with ``dataset`` appended (and active)."""
    ws = workspace or empty_workspace()
    return {**ws, "datasets": list(ws.get("datasets", [])) + [dataset],
            "active": dataset["id"] if make_active else ws.get("active")}


def replaced(workspace, dataset):
    """Workspace with the dataset of the same id replaced by ``dataset``."""
    datasets = [dataset if d["id"] == dataset["id"] else d for d in workspace["datasets"]]
    return {**workspace, "datasets": datasets}


def renamed(workspace, dataset_id, name):
    """Workspace with one dataset renamed (blank names refused)."""
    name = " ".join(str(name or "").split())
    old = find(workspace, dataset_id)
    if not name or old is None:
        return workspace
    return replaced(workspace, {**old, "name": name})


def removed(workspace, dataset_id):
    """Workspace without one dataset; the first remaining one becomes active."""
    datasets = [d for d in workspace["datasets"] if d["id"] != dataset_id]
    act = workspace.get("active")
    if act == dataset_id or find({"datasets": datasets}, act) is None:
        act = datasets[0]["id"] if datasets else None
    return {"datasets": datasets, "active": act}


def activated(workspace, dataset_id):
    """Workspace with ``dataset_id`` active (unchanged when there is no such dataset)."""
    if find(workspace, dataset_id) is None:
        return workspace
    return {**workspace, "active": dataset_id}


def revised(workspace):
    """The workspace with a new revision stamp (marks an edit for the tab's storage)."""
    return {**workspace, "rev": uuid.uuid4().hex}


def persistable(workspace, limit=SAVED_LIMIT_CHARS):
    """The part of a workspace that fits the browser's session storage.

    The largest datasets are left out until the JSON fits ``limit``
    characters; they stay in the page's memory until a reload.

    Returns
    -------
    saved : dict
        Workspace to store (same ``rev``).
    left_out : list of str
        Names of the datasets that will not survive a reload.

    With ``limit=None`` the server keeps the workspace (:mod:`webapp.persistence`):
    only the revision stamp is stored in the tab and nothing is left out.
    """
    if limit is None:
        return {"rev": workspace.get("rev"), "stored": True}, []
    datasets = list(workspace.get("datasets", []))
    left_out = []
    size = len(json.dumps(workspace))
    for d in sorted(datasets, key=lambda d: len(d["content"]), reverse=True):
        if size <= limit:
            break
        datasets.remove(d)
        left_out.append(d["name"])
        size -= len(json.dumps(d))
    if not left_out:
        return workspace, []
    active_id = workspace.get("active") if find({"datasets": datasets}, workspace.get("active")) else \
        (datasets[0]["id"] if datasets else None)
    return {**workspace, "datasets": datasets, "active": active_id}, left_out
