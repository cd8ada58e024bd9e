"""Memoised calls into :mod:`thermo` for the datasets of a workspace.

Results are keyed by the SHA-256 the server computed from the bytes (or, for
a dataset kept in the workspace file, after checking that the requesting
browser's space holds it: :func:`webapp.session.verified_sha256`) and the load
options, never by a hash a request states; so the caches hold pure results
only, a browser cannot read another's results by naming their hash, and bytes
posted under someone else's hash are cached under their own.

Each cache is bounded by entry count and by bytes (arrays, tables and strings
it holds, measured by :func:`held_bytes`); the four caches together hold at
most ``MODEHEAT_CACHE_MB`` (environment, default 256) MB per server process.
"""

from __future__ import annotations

import dataclasses
import hashlib
import os
import sys
import threading
from collections import OrderedDict

import numpy as np
import pandas as pd

from thermo import load_dos, tabulate
from thermo.errors import ModeheatError
from thermo.io.readers import read_table

from thermo.preparation.options import FIELDS

from .session import content_bytes, options_of, reading_of, verified_sha256


def held_bytes(value, _depth=0) -> int:
    """Approximate memory [bytes] held by a cached value (arrays, frames, dataclasses, containers)."""
    if isinstance(value, np.ndarray):
        return int(value.nbytes)
    if isinstance(value, (pd.DataFrame, pd.Series)):
        return int(value.memory_usage(deep=True).sum() if isinstance(value, pd.DataFrame)
                   else value.memory_usage(deep=True))
    if _depth > 6:
        return sys.getsizeof(value)
    if dataclasses.is_dataclass(value) and not isinstance(value, type):
        return sys.getsizeof(value) + sum(held_bytes(getattr(value, f.name), _depth + 1)
                                          for f in dataclasses.fields(value))
    if isinstance(value, dict):
        return sys.getsizeof(value) + sum(held_bytes(k, _depth + 1) + held_bytes(v, _depth + 1)
                                          for k, v in value.items())
    if isinstance(value, (list, tuple, set, frozenset)):
        return sys.getsizeof(value) + sum(held_bytes(v, _depth + 1) for v in value)
    if hasattr(value, "__dict__") and not isinstance(value, type):
        return sys.getsizeof(value) + held_bytes(vars(value), _depth + 1)
    return sys.getsizeof(value)


class _LRU:
    """Thread-safe least-recently-used memo of pure results, bounded by entries and bytes."""

    def __init__(self, size, share):
        self.size = size
        self.share = share            # share of the MODEHEAT_CACHE_MB budget
        self.max_bytes = 0
        self.held = 0
        self._data = OrderedDict()
        self._lock = threading.Lock()
        self.resize()

    def resize(self, total_bytes=None):
        """Set the byte bound from ``total_bytes`` (default ``MODEHEAT_CACHE_MB``) and evict."""
        if total_bytes is None:
            total_bytes = float(os.environ.get("MODEHEAT_CACHE_MB", DEFAULT_CACHE_MB)) * 1e6
        with self._lock:
            self.max_bytes = int(total_bytes * self.share)
            self._evict()

    def _evict(self):
        while self._data and (len(self._data) > self.size or self.held > self.max_bytes):
            _, (_, nbytes) = self._data.popitem(last=False)
            self.held -= nbytes

    def get(self, key, compute):
        with self._lock:
            if key in self._data:
                self._data.move_to_end(key)
                return self._data[key][0]
        value = compute()
        nbytes = held_bytes(value)
        with self._lock:
            if key not in self._data and nbytes <= self.max_bytes:
                self._data[key] = (value, nbytes)
                self.held += nbytes
                self._evict()
        return value


#: Default memory budget of all result caches together [MB] (``MODEHEAT_CACHE_MB``).
DEFAULT_CACHE_MB = 256.0
_DOS_CACHE = _LRU(48, 0.45)
_TABLE_CACHE = _LRU(128, 0.30)
_HEADER_CACHE = _LRU(64, 0.05)
_DERIVED_CACHE = _LRU(96, 0.15)
_RESULT_CACHE = _LRU(32, 0.05)
CACHES = (_DOS_CACHE, _TABLE_CACHE, _HEADER_CACHE, _DERIVED_CACHE, _RESULT_CACHE)


def held_total() -> int:
    """Bytes held by all result caches now."""
    return sum(c.held for c in CACHES)


def verified(dataset) -> str:
    """:func:`webapp.session.verified_sha256` of a dataset, computed once per request for the same content."""
    memo = _request_memo()
    if memo is None:
        return verified_sha256(dataset)
    content = dataset.get("content")
    mark = (dataset.get("encoding"), dataset.get("sha256"), id(content))
    if mark not in memo or memo[mark][0] is not content:
        memo[mark] = (content, verified_sha256(dataset))     # content kept: its id is not reused meanwhile
    return memo[mark][1]


def _request_memo():
    try:
        import flask
    except ImportError:     # pragma: no cover - flask comes with dash
        return None
    if not flask.has_request_context():
        return None
    if not hasattr(flask.g, "mh_verified"):
        flask.g.mh_verified = {}
    return flask.g.mh_verified


def load_key(dataset):
    """The key of a dataset's loaded DOS: the verified content hash, name and reading options (canonical record).

    Raises :class:`webapp.session.ForeignDataset` for a stored reference the
    requesting browser's space does not hold, before any cache is consulted.
    """
    reading = reading_of(dataset).resolved()
    return (verified(dataset), str(dataset["name"]), *(getattr(reading, k) for k in FIELDS))


def load(dataset, loaded=None):
    """The :class:`thermo.PhononDOS` of a dataset (cached by content and options).

    ``loaded`` is a DOS the caller has just read from these bytes with the
    options of ``dataset`` (it is kept instead of reading them again).
    Raises the :mod:`thermo` errors of :func:`thermo.load_dos`.
    """
    key = load_key(dataset)

    def compute():
        if loaded is not None:
            return loaded
        return load_dos(content_bytes(dataset), name=dataset["name"], options=reading_of(dataset))
    return _DOS_CACHE.get(key, compute)


def stated_unit(dataset):
    """Frequency unit stated in the file header, or None."""
    def compute():
        try:
            return read_table(content_bytes(dataset), name=dataset["name"]).header_unit
        except ModeheatError:
            return None
    return _HEADER_CACHE.get(verified(dataset), compute)


def formula_for(dataset, per):
    """The dataset's formula when ``per`` needs one (values per gram), else None."""
    return (options_of(dataset).get("formula") or None) if per == "gram" else None


def table(dataset, temperatures, per="formula"):
    """:func:`thermo.tabulate` of a dataset, cached; ``formula`` from its options."""
    t = np.asarray(temperatures, dtype=float)
    formula = formula_for(dataset, per)
    key = (load_key(dataset), hashlib.sha1(t.tobytes()).hexdigest(), per, formula)
    return _TABLE_CACHE.get(key, lambda: tabulate(load(dataset), t, per=per, formula=formula))


def derived(kind, dataset, compute, *params):
    """Memoise ``compute(dos)`` for a dataset under ``(kind, params)``.

    ``params`` must be hashable and, with the dataset's content hash and
    options, fully determine the result (pure functions of :mod:`thermo` only).
    """
    key = (kind, load_key(dataset), params)
    return _DERIVED_CACHE.get(key, lambda: compute(load(dataset)))


def result(key, compute):
    """Memoise ``compute()`` under ``key`` (content hashes and settings only; a pure result of :mod:`thermo`)."""
    return _RESULT_CACHE.get(key, compute)

