"""The frequency unit of a DOS table: from the first header cell or an explicit statement only.

A comment that merely mentions a unit (``# smearing sigma = 2 cm-1``) is never
taken as the unit of the frequency column; such mentions are returned so that
the caller can ask for the unit.
"""

from __future__ import annotations

import re

from ..errors import ModeheatError
from ..units import canonical_unit, guess_unit_from_text, units_in_text

# A header cell with its unit in brackets kept attached: "frequency (THz)".
HEADER_CELL = re.compile(r"[^\s(\[]+(?:\s*[(\[][^)\]]*[)\]])?|[(\[][^)\]]*[)\]]")
_NUMERIC = re.compile(r"[+-]?(?:\d+[.,]?\d*|[.,]\d+)(?:[eEdD][+-]?\d+)?|[+-]?(?:nan|inf|infinity)", re.I)
# Denominators of a DOS unit ("states/THz", "per cm-1") are not frequency units.
_DOS_DENOMINATOR = re.compile(
    r"(?:states|modes|dos|arb\.?|a\.u\.|1(?!\s*/\s*cm\b))\s*/\s*[a-z0-9^*\-⁻¹]+(?:\s*-\s*1)?|\bper\s+\S+",
    re.IGNORECASE)
# An explicit statement of the frequency unit in a comment: a frequency word
# followed by ":", "=", "in", "(" or "[" and the unit, or "unit(s): <unit>".
_UNIT_STATEMENT = re.compile(
    r"(?:\b(?:frequenc(?:y|ies)|freqs?|nu|omega|energy|energies|wavenumbers?|x|column\s*1)"
    r"(?:\s+(?:axis|column))?(?:\s+units?)?\s*(?:[:=]|\bin\b|[(\[])|[νω]\s*(?:[:=]|\bin\b|[(\[])"
    r"|\bunits?\s*(?:of\s+(?:the\s+)?frequenc(?:y|ies)\s*)?[:=])"
    r"\s*(?P<unit>[^\s,;)\]]+(?:\s*(?:\^|\*\*)?\s*-\s*1)?)", re.IGNORECASE)


def header_cells(row):
    """Cells of a header row; a unit in brackets stays with its name, nested brackets allowed.

    Cells are separated by blanks, tabs, commas or semicolons outside brackets;
    a cell that is only a bracket joins the name before it.

    Examples
    --------
    >>> header_cells("T[K]  C[mJ/(mol K)]")
    ['T[K]', 'C[mJ/(mol K)]']
    >>> header_cells("T (K), Cp (J/(mol K)), u")
    ['T (K)', 'Cp (J/(mol K))', 'u']
    """
    cells, current, depth = [], "", 0
    for ch in str(row):
        depth += ch in "([{"
        depth = max(0, depth - (ch in ")]}"))
        if depth == 0 and (ch.isspace() or ch in ",;"):
            if current:
                cells.append(current)
            current = ""
            continue
        current += ch
    if current:
        cells.append(current)
    merged = []
    for cell in cells:
        if merged and cell[0] in "([":
            merged[-1] += " " + cell
        else:
            merged.append(cell)
    return merged


def commented_header(comments, width, comment_chars="#!%"):
    """Cells of the last comment line that reads as a header row of ``width`` columns, or None.

    Parameters
    ----------
    comments : iterable of str
        Comment lines (with their comment character).
    width : int
        Columns of the data.

    Examples
    --------
    >>> commented_header(["# made by hand", "# T[K]  C[mJ/(mol K)]"], 2)
    ['T[K]', 'C[mJ/(mol K)]']
    >>> commented_header(["# 1.0 2.0"], 2) is None
    True
    """
    found = None
    for text in comments:
        cells = header_cells(str(text).lstrip("".join(comment_chars)).strip())
        if len(cells) == width and not _NUMERIC.fullmatch(cells[0]):
            found = cells
    return found


def _stated_in_comment(body, width):
    """Unit a comment states for column 1 (commented header or explicit statement)."""
    cells = HEADER_CELL.findall(body)
    if len(cells) == width and not _NUMERIC.fullmatch(cells[0]):   # a commented-out header row
        unit = guess_unit_from_text(cells[0])
        if unit:
            return unit
    try:   # the whole comment is a unit name: "# THz", "# [cm-1]"
        return canonical_unit(body.strip(" ()[]:"))
    except ModeheatError:
        pass
    stated = {guess_unit_from_text(m.group("unit")) for m in _UNIT_STATEMENT.finditer(body)}
    stated.discard(None)
    return stated.pop() if len(stated) == 1 else None


def frequency_unit(first_header_cell, comments, width, comment_chars="#!%"):
    """Unit of column 1 and the comment lines that only mention a unit.

    The unit comes from the first header cell, else from a comment that
    states it (see the module notes); units named in other comments are
    returned as ``(line, unit)`` mentions and never used.

    Examples
    --------
    >>> frequency_unit(None, [(1, "# sigma = 2 cm-1")], 2)
    (None, ((1, 'cm-1'),))
    >>> frequency_unit(None, [(1, "# frequency unit: meV")], 2)
    ('meV', ())
    """
    if first_header_cell:
        unit = guess_unit_from_text(first_header_cell)
        if unit:
            return unit, ()
    found, mentions = set(), []
    for line, text in comments:
        body = _DOS_DENOMINATOR.sub(" ", text.lstrip("".join(comment_chars)).strip())
        unit = _stated_in_comment(body, width)
        if unit:
            found.add(unit)
        else:
            mentions += [(line, u) for u in units_in_text(body)]
    return (found.pop() if len(found) == 1 else None), tuple(mentions)
