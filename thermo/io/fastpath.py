"""One-pass conversion of plain numeric text bodies, whole or block by block.

The per-cell parser of :mod:`thermo.io.readers` names a faulty cell exactly
but costs a Python call per cell; here the body is converted in one pass when it
holds only plain decimal cells (numpy's reader; pandas' C reader from
:data:`LARGE_BODY_LINES` lines on), and a large body that is not plain is
converted in blocks so only the faulty block goes to the per-cell parser.

References
----------
.. [1] D. M. Gay, "Correctly rounded binary-decimal and decimal-binary
   conversions", AT&T Bell Laboratories Numerical Analysis Manuscript 90-10
   (1990) (numpy and ``float`` both round correctly).

Examples
--------
>>> fast_array(["1 2", "3 4.5d-1"], None).tolist()
[[1.0, 2.0], [3.0, 0.45]]
>>> fast_array(["1 2", "3 x"], None) is None
True
"""

from __future__ import annotations

import csv
import io
from operator import itemgetter

import numpy as np

# Bytes a plain decimal cell may hold (whitespace and the delimiter added
# per file); anything else sends the body to the per-cell parser.
_PLAIN_BYTES = b"0123456789.eE+-"
_D_TO_E_BYTES = bytes.maketrans(b"dD", b"eE")
#: Bodies of at least this many lines are converted by pandas' C reader (about twice
#: numpy's speed on large input, slower to start on small input); both round correctly.
LARGE_BODY_LINES = 10_000


def fast_array(rows, delimiter):
    """All data rows converted at once, or None if any row needs the per-cell parser.

    Accepted only when every cell is a plain decimal number (ASCII digits,
    ``.``, ``e``/``E``, signs; blanks around it), every row has the same
    number (>= 2) of cells and every value is finite.  On such text numpy's
    parser accepts exactly the cells that ``_NUMBER`` matches and rounds
    correctly, as ``float`` does in the per-cell parser, so the result is that of
    the per-cell parser; any other input (quotes, ``d`` exponents, decimal commas,
    empty cells, trailing delimiters, ragged rows, nan/inf, overflow,
    non-ASCII) returns None.
    """
    text = "\n".join(rows)
    allowed = _PLAIN_BYTES + b"dD \t\n" + (delimiter or "").encode()
    if not text.isascii():
        return None
    data = text.encode("ascii")
    if data.translate(None, allowed):
        return None
    if b"d" in data or b"D" in data:      # Fortran exponents: 1.5d-3 is 1.5e-3, as in the per-cell parser
        data = data.translate(_D_TO_E_BYTES)
    try:
        if data.count(b"\n") + 1 >= LARGE_BODY_LINES:
            values = _pandas_values(data, delimiter)
        else:
            values = np.loadtxt(data.decode("ascii").split("\n"), dtype=float, delimiter=delimiter,
                                comments=None, quotechar=None, ndmin=2)
    except ValueError:   # ragged rows, empty or malformed cells (pandas' ParserError is a ValueError)
        return None
    if values.ndim != 2 or values.shape[1] < 2 or not np.isfinite(values).all():
        return None
    return values


def _pandas_values(data, delimiter):
    """The numbers of a plain ASCII body by pandas' C reader (a short row gives NaN, so it is declined)."""
    import pandas as pd
    frame = pd.read_csv(io.BytesIO(data), sep=r"\s+" if delimiter is None else delimiter, header=None,
                        dtype=float, engine="c", comment=None, quoting=csv.QUOTE_NONE, skip_blank_lines=True)
    return np.ascontiguousarray(frame.to_numpy(dtype=float))



#: Rows converted per block when the whole body is not plain.
CHUNK_ROWS = 5_000


def chunked_array(candidates, delimiter, split, display, per_cell, fast=None):
    """The body as an array, block by block, or None when a block needs the per-cell parser first.

    The whole body is tried at once (:func:`fast_array`); if that fails, it
    is converted in blocks of :data:`CHUNK_ROWS` rows with the same width,
    and only a block that is not plain goes through the per-cell parser,
    ``per_cell(cells, display)`` (returning ``(array, lines)``), which names
    the faulty cell exactly as for the whole file (the first
    faulty block holds the first faulty cell).  A 10⁶-line file with one bad
    cell at the end is so refused in about the time it takes to read.
    """
    fast = fast or fast_array
    rows = list(map(itemgetter(1), candidates))
    whole = fast(rows, delimiter)
    if whole is not None or len(rows) <= CHUNK_ROWS:
        return whole
    width = None
    blocks = []
    for start in range(0, len(rows), CHUNK_ROWS):
        block = fast(rows[start:start + CHUNK_ROWS], delimiter)
        if block is None or (width is not None and block.shape[1] != width):
            part = candidates[start:start + CHUNK_ROWS]
            head = [] if width is None else [candidates[0]]
            cells = [(line, split(row)) for line, row in head + part]
            block = per_cell(cells, display)[0][len(head):]
        width = block.shape[1] if width is None else width
        blocks.append(block)
    return np.concatenate(blocks)
