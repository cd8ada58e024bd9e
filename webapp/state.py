"""Per-user workspace kept in the browser, and cached calls into :mod:`thermo`.

The workspace is a JSON-able dict stored in a ``dcc.Store`` of each browser
tab (``storage_type="session"``)::

    {"datasets": [{"id", "name", "content", "encoding", "sha256", "options"}, ...],
     "active": "<id>"}

It holds the original file content and the load options, never computed
arrays.  Results are recomputed through :mod:`thermo` and memoised in a small
module-level LRU cache keyed by the SHA-256 of the content and the options;
that cache holds pure results only, so users never share state through it.
"""

from __future__ import annotations

import base64
import binascii
import hashlib
import logging
import threading
import uuid
from collections import OrderedDict
from pathlib import Path

import numpy as np

from thermo import load_dos, tabulate
from thermo.cli.options import parse_temperatures
from thermo.errors import ModeheatError

log = logging.getLogger(__name__)

#: Load options of a new dataset (see :func:`thermo.load_dos`); ``formula``
#: is only used for values per gram.
DEFAULT_OPTIONS = {"freq_unit": None, "atoms": None, "negative": "drop",
                   "low_frequency": "auto", "formula": ""}
#: Default per-file upload limit [MB].
DEFAULT_MAX_UPLOAD_MB = 20.0
#: Demo files shipped in ``sample_dos/`` beside the package.
DEMO_DIR = Path(__file__).resolve().parent.parent / "sample_dos"
DEMO_SUFFIXES = (".dat", ".tsv", ".csv", ".txt", ".xlsx")


def one_line(exc: BaseException) -> str:
    """A one-line user message for an exception (no traceback)."""
    if isinstance(exc, ModeheatError):
        text = str(exc)
    else:
        text = f"unexpected error: {type(exc).__name__}: {exc}"
    return " ".join(text.split()) or type(exc).__name__


class _LRU:
    """Thread-safe least-recently-used memo of pure results."""

    def __init__(self, size):
        self.size = size
        self._data = OrderedDict()
        self._lock = threading.Lock()

    def get(self, key, compute):
        with self._lock:
            if key in self._data:
                self._data.move_to_end(key)
                return self._data[key]
        value = compute()
        with self._lock:
            self._data[key] = value
            while len(self._data) > self.size:
                self._data.popitem(last=False)
        return value


_DOS_CACHE = _LRU(48)
_TABLE_CACHE = _LRU(128)
_HEADER_CACHE = _LRU(64)


# ---------------------------------------------------------------- datasets

def content_bytes(dataset) -> bytes:
    """Original file bytes of a dataset."""
    if dataset.get("encoding") == "base64":
        return base64.b64decode(dataset["content"])
    return dataset["content"].encode("utf-8")


def new_dataset(name: str, raw: bytes, options=None) -> dict:
    """A workspace entry for file ``raw`` (text kept as text, binary as base64)."""
    try:
        content, encoding = raw.decode("utf-8"), "text"
    except UnicodeDecodeError:
        content, encoding = base64.b64encode(raw).decode("ascii"), "base64"
    return {"id": uuid.uuid4().hex[:10], "name": str(name), "content": content,
            "encoding": encoding, "sha256": hashlib.sha256(raw).hexdigest(),
            "options": {**DEFAULT_OPTIONS, **(options or {})}}


def _load_key(dataset):
    opts = {**DEFAULT_OPTIONS, **dataset.get("options", {})}
    return (dataset["sha256"], dataset["name"], opts["freq_unit"], opts["atoms"],
            opts["negative"], str(opts["low_frequency"]))


def load(dataset):
    """The :class:`thermo.PhononDOS` of a dataset (cached by content and options).

    Raises the :mod:`thermo` errors of :func:`thermo.load_dos`.
    """
    key = _load_key(dataset)

    def compute():
        return load_dos(content_bytes(dataset), freq_unit=key[2], atoms=key[3],
                        negative=key[4], low_frequency=key[5], name=key[1])
    return _DOS_CACHE.get(key, compute)


def stated_unit(dataset):
    """Frequency unit stated in the file header, or None."""
    from thermo.io.readers import read_table

    def compute():
        try:
            return read_table(content_bytes(dataset), name=dataset["name"]).header_unit
        except ModeheatError:
            return None
    return _HEADER_CACHE.get(dataset["sha256"], compute)


def table(dataset, temperatures, per="formula"):
    """:func:`thermo.tabulate` of a dataset, cached; ``formula`` from its options."""
    t = np.asarray(temperatures, dtype=float)
    formula = (dataset.get("options", {}).get("formula") or None) if per == "gram" else None
    key = (_load_key(dataset), hashlib.sha1(t.tobytes()).hexdigest(), per, formula)
    return _TABLE_CACHE.get(key, lambda: tabulate(load(dataset), t, per=per, formula=formula))


def temperature_grid(t_min, t_max, step):
    """Temperatures from a range, through the CLI's own parser (one-line errors)."""
    return parse_temperatures(f"{float(t_min or 0)}:{float(t_max or 0)}:{float(step or 0)}")


# ---------------------------------------------------------------- workspace

def empty_workspace():
    return {"datasets": [], "active": None}


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


def _unique_name(workspace, name):
    taken = {d["name"] for d in workspace["datasets"]}
    if name not in taken:
        return name
    k = 2
    while f"{name} ({k})" in taken:
        k += 1
    return f"{name} ({k})"


class UploadRefused(ModeheatError):
    """An upload that never reached :mod:`thermo` (size limit, bad encoding)."""


def decode_upload(contents: str, name: str) -> bytes:
    """Bytes of a ``dcc.Upload`` data URL (``data:<type>;base64,<data>``)."""
    head, sep, data = str(contents or "").partition(",")
    if not sep or ";base64" not in head:
        raise UploadRefused(f"{name}: the upload did not arrive as a base64 data URL")
    try:
        return base64.b64decode(data, validate=True)
    except binascii.Error:
        raise UploadRefused(f"{name}: the upload is not valid base64") from None


def add_uploads(workspace, contents_list, names, max_bytes):
    """Add uploaded files that load; report the others.

    Each file is checked with :func:`thermo.load_dos` under default options
    before it enters the workspace, so a bad file never replaces the active
    dataset.  The last good file becomes active.

    Returns
    -------
    workspace : dict
        A new workspace (the input is not modified).
    messages : list of (str, str)
        ``("error" | "info", one-line text)`` for each file.
    """
    ws = {"datasets": list((workspace or {}).get("datasets", [])),
          "active": (workspace or {}).get("active")}
    messages = []
    for contents, name in zip(contents_list or [], names or []):
        try:
            raw = decode_upload(contents, name)
            if len(raw) > max_bytes:
                raise UploadRefused(f"{name}: the file is {len(raw) / 1e6:.1f} MB; "
                                 f"the upload limit is {max_bytes / 1e6:g} MB")
            dataset = new_dataset(_unique_name(ws, name), raw)
            load(dataset)
        except Exception as exc:  # every failure becomes a one-line message
            messages.append(("error", one_line(exc)))
            continue
        ws["datasets"].append(dataset)
        ws["active"] = dataset["id"]
        messages.append(("info", f"loaded {dataset['name']}"))
    return ws, messages


def with_options(workspace, dataset_id, options):
    """Workspace with new load options for one dataset, if they load.

    Returns ``(workspace, error)``; on error the workspace is unchanged.
    """
    old = find(workspace, dataset_id)
    if old is None:
        return workspace, "no dataset is selected"
    candidate = {**old, "options": {**DEFAULT_OPTIONS, **old.get("options", {}), **options}}
    try:
        load(candidate)
        if candidate["options"].get("formula"):
            from thermo.formula import formula_unit
            formula_unit(candidate["options"]["formula"])
    except Exception as exc:  # keep the previous options on any failure
        return workspace, one_line(exc)
    datasets = [candidate if d["id"] == dataset_id else d for d in workspace["datasets"]]
    return {**workspace, "datasets": datasets}, None


def renamed(workspace, dataset_id, name):
    """Workspace with one dataset renamed (blank names refused)."""
    name = " ".join(str(name or "").split())
    if not name or find(workspace, dataset_id) is None:
        return workspace
    datasets = [{**d, "name": name} if d["id"] == dataset_id else d for d in workspace["datasets"]]
    return {**workspace, "datasets": datasets}


def removed(workspace, dataset_id):
    """Workspace without one dataset; the first remaining one becomes active."""
    datasets = [d for d in workspace["datasets"] if d["id"] != dataset_id]
    act = workspace.get("active")
    if act == dataset_id or find({"datasets": datasets}, act) is None:
        act = datasets[0]["id"] if datasets else None
    return {"datasets": datasets, "active": act}


def activated(workspace, dataset_id):
    if find(workspace, dataset_id) is None:
        return workspace
    return {**workspace, "active": dataset_id}


# ---------------------------------------------------------------- demo

def demo_workspace(directory=None):
    """Workspace with every demo file of ``directory`` that loads.

    A missing directory or a file that does not load is skipped (logged), so
    the app always starts.
    """
    folder = Path(directory) if directory is not None else DEMO_DIR
    ws = empty_workspace()
    if not folder.is_dir():
        log.warning("demo directory %s not found; starting empty", folder)
        return ws
    for path in sorted(folder.iterdir()):
        if path.suffix.lower() not in DEMO_SUFFIXES or not path.is_file():
            continue
        try:
            dataset = new_dataset(path.name, path.read_bytes())
            load(dataset)
        except Exception as exc:  # a broken demo file must not stop the app
            log.warning("demo file skipped: %s", one_line(exc))
            continue
        ws["datasets"].append(dataset)
    if ws["datasets"]:
        ws["active"] = ws["datasets"][0]["id"]
    return ws


# ---------------------------------------------------------------- labels

#: Axis titles of the table columns (symbol and unit).
COLUMN_LABELS = {
    "temperature_K": "T [K]",
    "heat_capacity_v_J_per_mol_K": "C_v [J/(mol·K)]", "entropy_J_per_mol_K": "S [J/(mol·K)]",
    "internal_energy_kJ_per_mol": "U [kJ/mol]", "helmholtz_energy_kJ_per_mol": "F [kJ/mol]",
    "heat_capacity_v_kB_per_atom": "C_v [k_B/atom]", "entropy_kB_per_atom": "S [k_B/atom]",
    "internal_energy_meV_per_atom": "U [meV/atom]", "helmholtz_energy_meV_per_atom": "F [meV/atom]",
    "heat_capacity_v_J_per_g_K": "C_v [J/(g·K)]", "entropy_J_per_g_K": "S [J/(g·K)]",
    "internal_energy_J_per_g": "U [J/g]", "helmholtz_energy_J_per_g": "F [J/g]",
}
PER_CHOICES = [{"label": "per formula unit (mol)", "value": "formula"},
               {"label": "per atom", "value": "atom"}, {"label": "per gram", "value": "gram"}]


def dulong_petit(dataset, per):
    """Classical limit 3nR of C_v in the units of ``per`` (3 k_B per atom).

    Common-practice reference line (Dulong–Petit law); molar mass from
    :func:`thermo.formula.formula_unit` for values per gram.
    """
    from scipy.constants import R

    from thermo.formula import formula_unit
    n = load(dataset).atoms
    if per == "atom":
        return 3.0
    if per == "gram":
        return 3.0 * n * R / formula_unit(dataset.get("options", {}).get("formula"))[0]
    return 3.0 * n * R


_DERIVED_CACHE = _LRU(96)


def derived(kind, dataset, compute, *params):
    """Memoise ``compute(dos)`` for a dataset under ``(kind, params)``.

    ``params`` must be hashable and, with the dataset's content hash and
    options, fully determine the result (pure functions of :mod:`thermo` only).
    """
    key = (kind, _load_key(dataset), params)
    return _DERIVED_CACHE.get(key, lambda: compute(load(dataset)))


#: Largest workspace [characters of JSON] kept in the tab's session storage
#: (browsers allow about 5 million characters per site; common practice).
SAVED_LIMIT_CHARS = 3_000_000


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
    """
    import json
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
