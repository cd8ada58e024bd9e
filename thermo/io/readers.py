"""Read a phonon DOS table (text, CSV or .xlsx) into a :class:`RawTable`.

The reader only turns a file into numbers; physical checks (ordering,
negative values, number of points) live in :mod:`thermo.preparation.validation`.

Accepted layouts
----------------
* text with columns separated by whitespace (spaces and/or tabs), commas or
  semicolons; the separator is detected once per file from the first data
  row.  The decimal mark is always ``.``;
* text in UTF-8 (with or without a byte-order mark) or UTF-16 (with a
  byte-order mark, or plain ASCII content saved as UTF-16);
* ``.xlsx`` workbooks (recognised by their zip signature): the first sheet or
  the one chosen by name or number; text rows above the header row (titles)
  are kept as comments;
* comment lines start with ``#``, ``!`` or ``%`` (after optional blanks);
  blank lines are skipped;
* an optional header row: the first non-comment row, if any of its cells is
  not a number.

The frequency unit is taken only from the first header cell, from a commented
header row, or from an explicit statement in a comment (``# frequency unit:
THz``, ``# frequencies in cm-1``, ``# nu (meV)``).  A unit merely mentioned in
a comment (``# smearing sigma = 2 cm-1``) is never taken; it is recorded in
:attr:`RawTable.unit_mentions` so that callers can ask for the unit.

Column 1 is the frequency, column 2 the total DOS, further columns partial
DOS.  Every problem raises :class:`thermo.errors.DosInputError` with a one-line
message naming the file, line and column.
"""

from __future__ import annotations

import hashlib
import math
import re
from dataclasses import dataclass, field
from itertools import compress, count, repeat
from operator import itemgetter, not_
from pathlib import Path

import numpy as np

from ..errors import DosInputError
from .decoding import decode_text
from ..units import guess_unit_from_text
from .unit_statements import HEADER_CELL, frequency_unit
from .workbook import xlsx_rows, xlsx_titles
from .fastpath import chunked_array
from .fastpath import fast_array as _fast_array
from .limits import MAX_ROWS, check_column_count, check_row_count, check_xlsx_size

#: Characters that start a comment line.
COMMENT_CHARS = ("#", "!", "%")

_XLSX_MAGIC = b"PK\x03\x04"
_NUMBER = re.compile(r"[+-]?(?:\d+\.?\d*|\.\d+)(?:[eEdD][+-]?\d+)?")
_NOT_FINITE = re.compile(r"[+-]?(?:nan|inf|infinity)", re.IGNORECASE)
_DECIMAL_COMMA = re.compile(r"[+-]?\d+,\d+")
_LINE_BREAK = re.compile(r"\r\n|\r|\n")
# Breaks that str.splitlines honours besides \r\n, \r and \n.
_OTHER_BREAKS = "\v\f\x1c\x1d\x1e\x85\u2028\u2029"



@dataclass(frozen=True)
class RawTable:
    """Numbers of a DOS file before any physical check.

    Attributes
    ----------
    data : numpy.ndarray, shape (rows, cols)
        All numeric cells [file units]; ``cols >= 2``.
    names : list of str
        Column names from the header row, else ``"frequency"``, ``"total"``,
        ``"column 3"``, ...
    header_unit : str or None
        Frequency unit stated by the first header cell or a comment line
        (canonical name, see :mod:`thermo.units`), else None.
    source : str
        Display name of the input (file name or ``"<text>"``).
    sha256 : str
        Hex SHA-256 of the raw bytes read.
    line_numbers : list of int
        1-based file line (sheet row for .xlsx) of each data row.
    comments : list of str
        Comment lines, stripped of surrounding blanks.
    unit_mentions : tuple of (int, str)
        ``(line, unit)`` of frequency units a comment mentions without
        stating them as the frequency unit (not used for ``header_unit``).
    sheet : str or None
        Name of the worksheet read (.xlsx), else None.
    """

    data: np.ndarray
    names: list
    header_unit: str | None
    source: str
    sha256: str
    line_numbers: list = field(default_factory=list)
    comments: list = field(default_factory=list)
    unit_mentions: tuple = ()
    sheet: str | None = None


def read_table(source, name: str | None = None, sheet=None) -> RawTable:
    r"""Read a DOS table from a path, raw bytes or text.

    Parameters
    ----------
    source : str, pathlib.Path or bytes
        A path; the raw content of an uploaded file (``bytes``); or the file
        text itself (a ``str`` that contains a line break).
    name : str, optional
        Display name used in messages; default the file name, ``"<text>"``
        for text and ``"<bytes>"`` for bytes.
    sheet : str or int, optional
        Worksheet of an ``.xlsx`` workbook: its name or 1-based number
        (default the first sheet); ignored for text.

    Returns
    -------
    RawTable
        Numeric table with column names, unit hint and provenance.

    Raises
    ------
    DosInputError
        Unreadable, empty, binary or malformed input; the one-line message
        names the file, line and column.

    Notes
    -----
    A cell is a number when it matches
    ``[+-]digits[.digits][(e|E|d|D)[+-]digits]``; ``nan`` and ``inf`` are
    rejected.  The separator is taken from the first row that starts like a
    number: ``;`` if present, else ``,``, else whitespace.  A body of plain
    decimal cells is converted in one pass; any other body goes through the
    per-cell parser, which gives the same numbers and names the faulty cell.

    References
    ----------
    .. [1] Y. Shafranovich, "Common Format and MIME Type for Comma-Separated
       Values (CSV) Files", RFC 4180 (IETF, 2005).
    .. [2] ECMA-376, *Office Open XML File Formats*, 5th ed. (Ecma
       International, 2016), Part 1 (SpreadsheetML).

    Examples
    --------
    >>> table = read_table("# nu in THz\nfreq total Si\n0.5 0.1 0.05\n1.0 0.4 0.2\n")
    >>> table.names, table.header_unit, table.line_numbers
    (['freq', 'total', 'Si'], 'THz', [3, 4])
    >>> table.data[:, 1]
    array([0.1, 0.4])
    """
    raw, display = _raw_bytes(source, name)
    digest = hashlib.sha256(raw).hexdigest()
    if not raw.strip():
        raise DosInputError("the file is empty", display)
    is_xlsx = raw.startswith(_XLSX_MAGIC)
    sheet_name = None
    if is_xlsx:
        check_xlsx_size(raw, display)
        rows, sheet_name = xlsx_rows(raw, display, sheet)
    else:
        text = decode_text(raw, display)
        plain = _plain_body(text)
        if plain is not None:     # a clean numeric body: converted at once, no Python step per line
            return _raw_table(*plain, display, digest, None)
        rows = _text_rows(text)
    comments, candidates = _split_comments(rows)
    if is_xlsx:
        comments, candidates = xlsx_titles(comments, candidates, _looks_numeric)
    if not candidates:
        where = f" on sheet {sheet_name!r}" if sheet_name else ""
        raise DosInputError(f"no data rows{where} (only comments or blank lines)", display)
    delimiter = None if is_xlsx else _choose_delimiter(candidates)
    split = None if is_xlsx else _splitter(delimiter)
    header = None
    first = split(candidates[0][1]) if split else candidates[0][1]
    if not all(_looks_numeric(c) or c == "" for c in first):
        header, candidates = candidates[0], candidates[1:]
    if not candidates:
        where = f" on sheet {sheet_name!r}" if sheet_name else ""
        raise DosInputError(f"no data rows{where} after the header", display, header[0])
    check_row_count(len(candidates), display)
    data = None if is_xlsx else chunked_array(candidates, delimiter, split, display, _to_array, _fast_array)
    if data is None:
        cells = [(line, split(row) if split else row) for line, row in candidates]
        data, lines = _to_array(cells, display)
    else:
        lines = list(map(itemgetter(0), candidates))
    return _raw_table(data, lines, header, split, comments, display, digest, sheet_name)


def _raw_table(data, lines, header, split, comments, display, digest, sheet_name):
    check_column_count(data.shape[1], display)
    if header is None:     # a commented header row that states the unit names the columns too
        header = _commented_header(comments, lines[0], data.shape[1], split)
    names = _column_names(header, data.shape[1], split)
    unit, mentions = frequency_unit(names[0] if header else None, comments, data.shape[1],
                                    "".join(COMMENT_CHARS))
    return RawTable(data=data, names=names, header_unit=unit, source=display,
                    sha256=digest, line_numbers=lines,
                    comments=[text for _, text in comments], unit_mentions=mentions,
                    sheet=sheet_name)


#: Lines looked at for comments and a header before the data start (one-pass path only).
_HEAD_SCAN_LINES = 1000
_PLAIN_ROW = re.compile(r"[0-9.eEdD+\- \t,;]+")


def _plain_body(text):
    """``(data, lines, header, split, comments)`` when every row from the first data row on is plain, else None.

    Plain: decimal cells only (no comment, blank line, quote, other line break
    than ``\n`` or ``\r\n``) after at most one header row and any comments.
    Then the body is converted in one pass without a Python step per line.
    Anything else returns None and the general path reads the file, which
    gives the same table (or error) on any input.
    """
    start, number, head_rows = 0, 1, 0
    for match in _LINE_BREAK.finditer(text):
        row = text[start:match.start()].strip()
        if row and not row.startswith(COMMENT_CHARS):
            if _PLAIN_ROW.fullmatch(row) and _NUMBER.match(row):
                break
            head_rows += 1
            if head_rows > 1:
                return None
        start, number = match.end(), number + 1
        if number > _HEAD_SCAN_LINES:
            return None
    else:
        return None          # no data row followed by a line break: small, the general path reads it
    head, body = text[:start], text[start:].rstrip()
    if "\r" in body:
        if body.count("\r") != body.count("\r\n"):
            return None
        body = body.replace("\r\n", "\n")
    count = body.count("\n") + 1
    rows = _text_rows(head)
    if count > MAX_ROWS:
        return None          # the general path counts the data rows exactly and refuses
    comments, candidates = _split_comments(rows)
    first = body[:body.find("\n")] if count > 1 else body
    delimiter = _choose_delimiter(candidates + [(number, first.strip())])
    split = _splitter(delimiter)
    header = candidates[0] if candidates else None
    if header is not None and all(_looks_numeric(c) or c == "" for c in split(header[1])):
        return None          # a numeric-looking row that is not plain: the per-cell parser names it
    data = _fast_array([body], delimiter)
    if data is None or len(data) != count:   # a cell to name, or blank lines inside (line numbers)
        return None
    return data, list(range(number, number + count)), header, split, comments


# ----------------------------------------------------------------------------
# input -> bytes -> rows


def _clean_name(text) -> str:
    return " ".join(str(text).split()) or "<unnamed>"


def _raw_bytes(source, name):
    if isinstance(source, (bytes, bytearray, memoryview)):
        return bytes(source), _clean_name(name or "<bytes>")
    if isinstance(source, str) and ("\n" in source or "\r" in source):
        return source.encode("utf-8", "surrogatepass"), _clean_name(name or "<text>")
    if not isinstance(source, (str, Path)):
        raise DosInputError(
            f"cannot read input of type {type(source).__name__}; "
            "give a path, bytes or text", _clean_name(name or "<input>"))
    path = Path(source)
    display = _clean_name(name or path.name or str(source))
    try:
        return path.read_bytes(), display
    except (OSError, ValueError) as exc:
        reason = getattr(exc, "strerror", None) or str(exc)
        raise DosInputError(f"cannot read file: {reason}", display) from None


def _text_rows(text: str):
    """(line number, stripped line) of every non-blank line."""
    # splitlines() is the faster split when no other break is present; it
    # differs from _LINE_BREAK.split only by dropping a final empty line.
    other = any(map(text.__contains__, _OTHER_BREAKS))
    lines = _LINE_BREAK.split(text) if other else text.splitlines()
    return list(filter(itemgetter(1), zip(count(1), map(str.strip, lines))))


def _split_comments(rows):
    """(line, text) of the comment rows and (line, row) of the others."""
    firsts = list(map(itemgetter(1), rows))
    if not all(map(isinstance, firsts, repeat(str))):
        firsts = [row if isinstance(row, str) else row[0] for row in firsts]
    marked = list(map(str.startswith, map(str.lstrip, firsts), repeat(COMMENT_CHARS)))
    comments = [(number, (row if isinstance(row, str) else " ".join(c for c in row if c)).strip())
                for number, row in compress(rows, marked)]
    return comments, list(compress(rows, map(not_, marked)))


def _choose_delimiter(candidates):
    """``";"``, ``","`` or None (whitespace), from the first numeric-looking row."""
    sample = next((row for _, row in candidates if _NUMBER.match(row)), candidates[0][1])
    return next((d for d in (";", ",") if d in sample), None)


def _splitter(delimiter):
    """Cell splitter of a text row for the file's delimiter."""
    if delimiter is None:
        return str.split
    return lambda row: _split_delimited(row, delimiter)


def _split_delimited(row: str, delimiter: str):
    cells = [_unquote(c.strip()) for c in row.rstrip(delimiter + " \t").split(delimiter)]
    return cells


def _unquote(cell: str) -> str:
    if len(cell) >= 2 and cell[0] == cell[-1] and cell[0] in "\"'":
        return cell[1:-1].strip()
    return cell


# ----------------------------------------------------------------------------
# cells -> numbers


def _is_numeric(cell: str) -> bool:
    return bool(_NUMBER.fullmatch(cell) or _NOT_FINITE.fullmatch(cell))


def _looks_numeric(cell: str) -> bool:
    """A number, nan/inf, or a number written with a decimal comma."""
    return _is_numeric(cell) or bool(_DECIMAL_COMMA.fullmatch(cell))


def _shown(cell: str) -> str:
    text = cell if len(cell) <= 30 else cell[:27] + "..."
    return repr(text)




def _to_array(cells, display):
    width = len(cells[0][1])
    check_column_count(width, display, cells[0][0])
    first_line = cells[0][0]
    if width < 2:
        raise DosInputError(
            f"found {width} numeric column; need at least 2 (frequency, total DOS)",
            display, first_line)
    values = np.empty((len(cells), width))
    lines = []
    for i, (line, row) in enumerate(cells):
        if not any(_looks_numeric(c) for c in row):
            raise DosInputError(
                "text row inside the data; only the first row may be a header",
                display, line)
        if len(row) != width:
            raise DosInputError(f"expected {width} columns, found {len(row)}",
                                display, line)
        for j, cell in enumerate(row):
            values[i, j] = _number(cell, display, line, j + 1)
        lines.append(line)
    return values, lines


def _number(cell: str, display, line, column) -> float:
    if cell == "":
        raise DosInputError("empty cell", display, line, column)
    if _NUMBER.fullmatch(cell):
        value = float(cell.replace("d", "e").replace("D", "e"))
        if math.isfinite(value):
            return value
        raise DosInputError(f"{_shown(cell)} is too large to be a finite number",
                            display, line, column)
    if _NOT_FINITE.fullmatch(cell):
        raise DosInputError(f"{_shown(cell)} is not a finite number", display, line, column)
    hint = "; the decimal mark must be '.'" if _DECIMAL_COMMA.fullmatch(cell) else ""
    raise DosInputError(f"{_shown(cell)} is not a number{hint}", display, line, column)


# ----------------------------------------------------------------------------
# names and unit


def _default_names(width: int):
    return ["frequency", "total"] + [f"column {k}" for k in range(3, width + 1)]


def _header_cells(row, split, width):
    """Header cells, trying splits that keep "(unit)" with its name."""
    if not isinstance(row, str):
        return list(row)
    if split is not str.split:
        return split(row)
    tries = (HEADER_CELL.findall(row), row.split(), re.split(r"\s{2,}|\t", row))
    return next((t for t in tries if len(t) == width), tries[0])


def _commented_header(comments, first_data_line, width, split):
    """The last comment row before the data that is a header: ``width`` cells, the first stating a unit."""
    for line, text in reversed([c for c in comments if c[0] < first_data_line]):
        body = text.lstrip("".join(COMMENT_CHARS)).strip()
        cells = _header_cells(body, split or str.split, width)
        if len(cells) == width and not any(_looks_numeric(c) for c in cells) and guess_unit_from_text(cells[0]):
            return line, cells
    return None


def _column_names(header, width, split):
    names = _default_names(width)
    if header is None:
        return names
    cells = _header_cells(header[1], split, width)
    if len(cells) != width:
        return names
    seen = set()
    out = []
    for k, cell in enumerate(cells, start=1):
        text = _clean_name(cell) if cell.strip() else f"column {k}"
        if text in seen:
            text = f"{text} (column {k})"
        seen.add(text)
        out.append(text)
    return out
