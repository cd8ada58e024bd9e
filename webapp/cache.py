"""Memoised calls into :mod:`thermo` for the datasets of a workspace.

Results are keyed by the SHA-256 of the file content and the load options, so
the caches hold pure results only and users never share state through them.
"""

from __future__ import annotations

import hashlib
import threading
from collections import OrderedDict

import numpy as np

from thermo import load_dos, tabulate
from thermo.errors import ModeheatError
from thermo.io.readers import read_table

from .session import content_bytes, options_of


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
_DERIVED_CACHE = _LRU(96)


def _load_key(dataset):
    opts = options_of(dataset)
    return (dataset["sha256"], dataset["name"], opts["freq_unit"], opts["atoms"],
            opts["negative"], str(opts["low_frequency"]), opts.get("sheet") or None)


def load(dataset):
    """The :class:`thermo.PhononDOS` of a dataset (cached by content and options).

    Raises the :mod:`thermo` errors of :func:`thermo.load_dos`.
    """
    key = _load_key(dataset)

    def compute():
        return load_dos(content_bytes(dataset), freq_unit=key[2], atoms=key[3],
                        negative=key[4], low_frequency=key[5], name=key[1], sheet=key[6])
    return _DOS_CACHE.get(key, compute)


def stated_unit(dataset):
    """Frequency unit stated in the file header, or None."""
    def compute():
        try:
            return read_table(content_bytes(dataset), name=dataset["name"]).header_unit
        except ModeheatError:
            return None
    return _HEADER_CACHE.get(dataset["sha256"], compute)


def formula_for(dataset, per):
    """The dataset's formula when ``per`` needs one (values per gram), else None."""
    return (options_of(dataset).get("formula") or None) if per == "gram" else None


def table(dataset, temperatures, per="formula"):
    """:func:`thermo.tabulate` of a dataset, cached; ``formula`` from its options."""
    t = np.asarray(temperatures, dtype=float)
    formula = formula_for(dataset, per)
    key = (_load_key(dataset), hashlib.sha1(t.tobytes()).hexdigest(), per, formula)
    return _TABLE_CACHE.get(key, lambda: tabulate(load(dataset), t, per=per, formula=formula))


def derived(kind, dataset, compute, *params):
    """Memoise ``compute(dos)`` for a dataset under ``(kind, params)``.

    ``params`` must be hashable and, with the dataset's content hash and
    options, fully determine the result (pure functions of :mod:`thermo` only).
    """
    key = (kind, _load_key(dataset), params)
    return _DERIVED_CACHE.get(key, lambda: compute(load(dataset)))
