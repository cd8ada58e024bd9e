"""The error breakdown of a table, computed once per DOS and temperature grid and reused.

A table's provenance, its per-row errors (quasi-harmonic carrying, convergence),
the largest relative error and the pages all read the same breakdown; it costs
several re-preparations and tables (:func:`~thermo.accuracy.breakdown.error_breakdown`),
so it is kept on the DOS object beside its frozen fields, keyed by the
temperatures' bytes, and handed out as a copy.
"""

from __future__ import annotations

import numpy as np

import copy

from .breakdown import breakdown_summary, error_breakdown, estimated_relative_error
from .resolution import analyse_resolution, resolution_note

#: Attribute of the DOS holding its breakdowns (not a field: equality and replace() ignore it).
_HELD = "_error_breakdowns"
#: Temperature grids kept per DOS (oldest dropped first).
KEEP = 8
#: Temperatures kept per DOS over all its grids (a cache that sized the DOS when it stored it does not
#: see what is added later; about 10 MB at most); a larger grid is computed and not kept.
KEEP_TEMPERATURES = 30_000


def table_breakdown(dos, temperatures):
    """:func:`~thermo.accuracy.breakdown.error_breakdown` of ``dos`` at ``temperatures``, computed once.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS (prepared spectra are immutable, so the result stays valid).
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.

    Returns
    -------
    pandas.DataFrame
        A copy of the kept breakdown (the caller may change it freely).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0, 5, 201)
    >>> d = PhononDOS(nu, 9 * nu**2 / 125, atoms=1)
    >>> table_breakdown(d, [300.0]).equals(table_breakdown(d, [300.0]))
    True
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float)).ravel()
    held = getattr(dos, "__dict__", None)
    if held is None:
        return error_breakdown(dos, t)
    kept = held.setdefault(_HELD, {})
    key = t.tobytes()
    if key in kept:
        return kept[key].copy()
    fresh = error_breakdown(dos, t)
    if t.size > KEEP_TEMPERATURES:
        return fresh
    while kept and (len(kept) >= KEEP or sum(len(b) for b in kept.values()) + t.size > KEEP_TEMPERATURES):
        kept.pop(next(iter(kept)))
    kept[key] = fresh
    return fresh.copy()


def table_digest(dos, temperatures):
    """What a provenance record carries of the table's breakdown, computed once per DOS and temperatures.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.

    Returns
    -------
    tuple
        ``(estimated_relative_error, breakdown_summary, resolution_note)`` of :func:`table_breakdown`
        (the summary a copy the caller may change; the note None when there is none).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0, 5, 201)
    >>> d = PhononDOS(nu, 9 * nu**2 / 125, atoms=1)
    >>> table_digest(d, [300.0])[1] == table_digest(d, [300.0])[1]
    True
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float)).ravel()
    held = getattr(dos, "__dict__", None)
    kept = {} if held is None else held.setdefault("_error_digests", {})
    key = t.tobytes()
    if key not in kept:
        b = table_breakdown(dos, t)
        digest = (estimated_relative_error(dos, t, b), breakdown_summary(b),
                  resolution_note(analyse_resolution(dos), t))
        if t.size > KEEP_TEMPERATURES:
            return digest
        while len(kept) >= KEEP:
            kept.pop(next(iter(kept)))
        kept[key] = digest
    estimate, summary, note = kept[key]
    return estimate, copy.deepcopy(summary), note


def breakdown_with_row(dos, temperatures, at):
    """A table's breakdown and that of one more temperature, from one :func:`~.breakdown.error_breakdown`.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    temperatures : array_like, shape (M,)
        The table's temperatures [K], >= 0.
    at : float
        The other temperature [K] (``batch``'s index row at 298.15 K).

    Returns
    -------
    table, row : pandas.DataFrame
        The breakdown's rows of ``temperatures`` and of ``at``.

    Notes
    -----
    The one breakdown runs over ``temperatures``, ``at`` and the samples a breakdown at ``at`` alone
    takes for its window maxima (the smearing envelope, a mode list's spread): each row's windows see
    every sample they saw alone, so no row reports less than either breakdown alone.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0, 5, 201)
    >>> table, row = breakdown_with_row(PhononDOS(nu, 9 * nu**2 / 125, atoms=1), [100.0, 200.0], 298.15)
    >>> len(table), row["temperature_K"].tolist()
    (2, [298.15])
    """
    from .breakdown import LIST_ENVELOPE
    from .resolution import ENVELOPE, ENVELOPE_POINTS
    t = np.atleast_1d(np.asarray(temperatures, dtype=float)).ravel()
    if dos.modes is not None and not dos.source.get("histogram"):
        samples = np.geomspace(at / LIST_ENVELOPE, at * LIST_ENVELOPE, 60)
    else:
        samples = np.geomspace(at / ENVELOPE, at * ENVELOPE, ENVELOPE_POINTS)
    b = error_breakdown(dos, np.concatenate([t, [float(at)], samples]))
    return b.iloc[:t.size], b.iloc[t.size:t.size + 1]
