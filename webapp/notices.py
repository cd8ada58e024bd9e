"""Warnings shown once: the same caution from several inputs becomes one line naming them and the spread.

Pages show a result's warnings beside it through :func:`warning_items`; a warning that
several files share (the same words, other numbers) is shown once, with the range of each
number and the files it concerns, so nine volumes never print the same line nine times.
"""

from __future__ import annotations

import re

from . import components as c

_NUMBER = re.compile(r"[-+]?\d+(?:\.\d+)?(?:[eE][-+]?\d+)?")


def _spread(values):
    """``'a'`` when all equal, else ``'lo–hi'`` (by value, as written).

    Examples
    --------
    >>> _spread(["1.00013", "0.999978", "1.00016"])
    '0.999978–1.00016'
    """
    distinct = sorted(set(values), key=float)
    return distinct[0] if len(distinct) == 1 else f"{distinct[0]}–{distinct[-1]}"


def grouped_warnings(pairs):
    """One line per distinct warning: ``(source, text)`` pairs with the same words merged.

    Parameters
    ----------
    pairs : iterable of (str or None, str)
        The input each warning concerns (None: the result itself) and its text.

    Returns
    -------
    list of str
        In first-seen order; a warning of one source as ``source: text``; of
        several as ``N inputs (first … last): text`` with each number
        replaced by its range over them.

    Examples
    --------
    >>> grouped_warnings([("a.dat", "rescaled by ×1.2 to 3 modes"), ("b.dat", "rescaled by ×1.5 to 3 modes"),
    ...                   (None, "outside the sampled volumes")])
    ['2 inputs (a.dat … b.dat): rescaled by ×1.2–1.5 to 3 modes', 'outside the sampled volumes']
    """
    groups = {}
    for source, text in pairs:
        text = " ".join(str(text).split())
        key = _NUMBER.sub("#", text)
        entry = groups.setdefault(key, {"sources": [], "numbers": [], "text": text})
        if source not in entry["sources"] or source is None:
            entry["sources"].append(source)
            entry["numbers"].append(_NUMBER.findall(text))
    lines = []
    for key, entry in groups.items():
        sources = [s for s in dict.fromkeys(entry["sources"]) if s is not None]
        if len(entry["numbers"]) == 1 or len(sources) <= 1:
            prefix = f"{sources[0]}: " if sources else ""
            lines.append(prefix + entry["text"])
            continue
        parts = key.split("#")
        columns = list(zip(*entry["numbers"]))
        text = parts[0] + "".join(_spread(col) + part for col, part in zip(columns, parts[1:]))
        lines.append(f"{len(sources)} inputs ({sources[0]} … {sources[-1]}): {text}")
    return lines


def warning_items(pairs, kind="warn"):
    """Children of a messages panel: :func:`grouped_warnings` of ``pairs``, each shown once."""
    return c.message_items([(kind, line) for line in grouped_warnings(pairs)])
