"""The one provenance record written beside every export.

Every file modeheat writes (harmonic, model, quasi-harmonic, calorimetry,
polynomial, displacement and batch tables; JSON reports) carries the same
record, built here and nowhere else::

    {"tool": "modeheat", "version": "0.3.0", "created_utc": "2026-...Z",
     "inputs": [{"name": ..., "sha256": ..., "role": ..., "options": {...}}, ...],
     "settings": {...}, "warnings": [...], <capability-specific details>}

``inputs`` lists every file the result depends on with the SHA-256 of its
bytes and the reading options used; ``settings`` holds the user's choices
that shaped the result (basis, temperature grid, fit range, model ...);
``warnings`` what was done to the data and by how much.  A capability adds its
own details (fits, error estimates, diagnostics) as further keys; they may
not replace the common ones.
"""

from __future__ import annotations

import datetime
import hashlib
from pathlib import Path

from . import __version__

#: Name written as ``tool`` in every record.
TOOL = "modeheat"

#: Keys every record has, in the order they are written.
COMMON_KEYS = ("tool", "version", "created_utc", "inputs", "settings", "warnings")


def provenance_record(inputs=(), settings=None, warnings=(), **details):
    """The provenance record of one export (JSON-able dict).

    Parameters
    ----------
    inputs : iterable of dict
        One entry per input file, from :func:`input_record` or :func:`dos_input`.
    settings : dict, optional
        The choices that shaped the result (JSON-able values).
    warnings : iterable of str
        What was done to the inputs and by how much (one line each).
    **details
        Capability-specific keys (fits, error estimates, diagnostics).

    Returns
    -------
    dict
        ``tool``, ``version``, ``created_utc`` (UTC, ISO 8601, seconds),
        ``inputs``, ``settings``, ``warnings``, then ``details`` in the order given.

    Raises
    ------
    ValueError
        A detail key that would replace one of :data:`COMMON_KEYS`.

    Examples
    --------
    >>> rec = provenance_record([input_record("a.dat", data=b"1 2\\n")], {"basis": "atom"},
    ...                         ["rescaled by 1.5"], scale_factor=1.5)
    >>> list(rec)
    ['tool', 'version', 'created_utc', 'inputs', 'settings', 'warnings', 'scale_factor']
    >>> rec["inputs"][0]["sha256"][:12]
    'f251ddc12234'
    """
    clash = sorted(set(details) & set(COMMON_KEYS))
    if clash:
        raise ValueError(f"provenance details may not replace the common keys {clash}")
    record = {
        "tool": TOOL, "version": __version__,
        "created_utc": datetime.datetime.now(datetime.timezone.utc).isoformat(timespec="seconds"),
        "inputs": [dict(entry) for entry in inputs],
        "settings": dict(settings or {}),
        "warnings": [str(w) for w in warnings],
    }
    record.update(details)
    return record


def input_record(name, sha256=None, options=None, role=None, data=None):
    """One entry of ``inputs``: a file's name, SHA-256 and reading options.

    Parameters
    ----------
    name : str
        The file's name as the user gave it (or the upload's name).
    sha256 : str, optional
        Hex SHA-256 of the file's bytes; computed from ``data`` when None.
    options : dict, optional
        Reading options used (unit, atoms, sheet ...); ``None`` values mean "not given".
    role : str, optional
        What the file is for when a result has several inputs (``"measured"``,
        ``"lattice DOS"``, ``"manifest"``, ``"volume 3"`` ...).
    data : bytes or path-like, optional
        The file's content or path, hashed when ``sha256`` is None.

    Returns
    -------
    dict
        ``name``, ``sha256``, then ``role`` when given, then ``options``.

    Examples
    --------
    >>> input_record("cp.csv", "ab" * 32, {"cp_unit": "J/(mol K)"}, role="measured")["role"]
    'measured'
    """
    if sha256 is None and data is not None:
        content = data if isinstance(data, (bytes, bytearray)) else Path(data).read_bytes()
        sha256 = hashlib.sha256(content).hexdigest()
    entry = {"name": None if name is None else str(name), "sha256": sha256}
    if role is not None:
        entry["role"] = role
    entry["options"] = dict(options or {})
    return entry


def dos_input(dos, role=None):
    """The ``inputs`` entry of a loaded :class:`~thermo.spectrum.PhononDOS`.

    Parameters
    ----------
    dos : PhononDOS
        A DOS from :func:`thermo.preparation.loading.load_dos` (its ``source``
        holds name, SHA-256 and the options used); a DOS built by hand gives
        empty fields.
    role : str, optional
        As :func:`input_record`.

    Returns
    -------
    dict
        :func:`input_record` with the reading options actually used (the
        record of :mod:`thermo.preparation.options`, ``dos.source["reading_options"]``):
        ``frequency_unit``, ``atoms`` (and whether they were ``atoms_inferred``),
        ``negative`` (imaginary-mode policy), ``low_frequency`` (``auto``,
        ``off`` or ``LOW:HIGH``), and ``formula`` and ``sheet`` when given.

    Examples
    --------
    >>> import numpy as np
    >>> from thermo.spectrum import PhononDOS
    >>> dos_input(PhononDOS(np.linspace(0, 5, 6), np.ones(6), atoms=2))["options"]["atoms"]
    2
    """
    from .preparation.options import ReadingOptions
    src = dict(getattr(dos, "source", None) or {})
    used = ReadingOptions.of(dos) if "reading_options" in src else ReadingOptions(
        freq_unit=src.get("freq_unit"), negative=src.get("negative_policy"))
    options = {"frequency_unit": used.freq_unit, "atoms": dos.atoms,
               "atoms_inferred": src.get("atoms_inferred"), "negative": used.negative,
               "low_frequency": used.low_frequency}
    options.update((k, v) for k, v in (("formula", used.formula), ("sheet", used.sheet)) if v is not None)
    return input_record(src.get("name"), src.get("sha256"), options, role=role)


def temperature_settings(temperatures):
    """Compact description of a temperature grid for ``settings`` [K].

    Examples
    --------
    >>> temperature_settings([0.0, 5.0, 298.15, 10.0])
    {'min': 0.0, 'max': 298.15, 'points': 4}
    """
    values = [float(t) for t in temperatures]
    if not values:
        return {"min": None, "max": None, "points": 0}
    return {"min": min(values), "max": max(values), "points": len(values)}


def stated_atoms(record):
    """Atoms per formula unit a provenance record states (its ``atoms``, else its first input's), or None.

    Examples
    --------
    >>> stated_atoms({"inputs": [{"name": "a.dat", "options": {"atoms": 2}}]})
    2
    >>> stated_atoms({"atoms": 1.5}) is None
    True
    """
    candidates = [(record or {}).get("atoms")] + [(i.get("options") or {}).get("atoms")
                                                  for i in (record or {}).get("inputs") or [] if isinstance(i, dict)][:1]
    for atoms in candidates:
        if isinstance(atoms, (int, float)) and not isinstance(atoms, bool) and float(atoms).is_integer() and atoms >= 1:
            return int(atoms)
    return None
