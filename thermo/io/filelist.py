"""A file list: DOS files with their own reading options, one row each (``batch --file-list``).

Layout: CSV (comma, semicolon or tab separated), ``#`` comment lines allowed,
a header naming the columns.  ``file`` is required (a path, relative to the
list's folder); the other columns are reading options named as in
:data:`thermo.preparation.options.FIELDS` (``freq_unit``, ``atoms``,
``negative``, ``low_frequency``, ``formula``, ``sheet``).  A blank cell means
"not given" for that file.  Only the layout is checked here; the values are
checked where the options are built.
"""

from __future__ import annotations

import csv
import io
from pathlib import Path

from ..errors import DosInputError
from .decoding import decode_text

#: The column naming the file (the others are reading options).
FILE_COLUMN = "file"


def read_file_list(path, option_names):
    """Rows of a file list as ``(line, file path, {option: text})``.

    Parameters
    ----------
    path : str or path-like
        The list (CSV with a header).
    option_names : sequence of str
        Accepted option columns besides ``file``.

    Returns
    -------
    list of tuple
        ``(line number, pathlib.Path, dict)``: the path resolved against the
        list's folder; the dict holds the non-blank cells only.

    Raises
    ------
    DosInputError
        One line: no ``file`` column, an unknown column (with the accepted
        names), a row without a file, a row with more cells than the header,
        or an empty list.

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as tmp:
    ...     p = Path(tmp) / "files.csv"
    ...     _ = p.write_text("file,freq_unit,atoms\\na.dat,cm-1,2\\nb.dat,,\\n")
    ...     [(line, f.name, o) for line, f, o in read_file_list(p, ("freq_unit", "atoms"))]
    [(2, 'a.dat', {'freq_unit': 'cm-1', 'atoms': '2'}), (3, 'b.dat', {})]
    """
    source = Path(path)
    text = decode_text(source.read_bytes(), str(source))
    lines = [(n, row) for n, row in enumerate(text.splitlines(), start=1)
             if row.strip() and not row.lstrip().startswith("#")]
    if not lines:
        raise DosInputError(f"{source}: the file list is empty (expected a header with 'file' and rows)")
    first = lines[0][1]
    delimiter = max((",", ";", "\t"), key=first.count)
    rows = list(csv.reader(io.StringIO("\n".join(row for _, row in lines)), delimiter=delimiter))
    header = [cell.strip().lower() for cell in rows[0]]
    where = f"{source} line {lines[0][0]}"
    if FILE_COLUMN not in header:
        raise DosInputError(f"{where}: the file list needs a '{FILE_COLUMN}' column (found {', '.join(header)})")
    unknown = [name for name in header if name != FILE_COLUMN and name not in option_names]
    if unknown:
        raise DosInputError(f"{where}: unknown column '{unknown[0]}' in the file list; columns are "
                            f"{FILE_COLUMN}, {', '.join(option_names)}")
    out = []
    for (number, _), cells in zip(lines[1:], rows[1:]):
        if len(cells) > len(header):
            raise DosInputError(f"{source} line {number}: {len(cells)} cells, the header has {len(header)}")
        values = dict(zip(header, (cell.strip() for cell in cells)))
        name = values.pop(FILE_COLUMN, "")
        if not name:
            raise DosInputError(f"{source} line {number}: no file named in column '{FILE_COLUMN}'")
        out.append((number, source.parent / name, {k: v for k, v in values.items() if v}))
    if not out:
        raise DosInputError(f"{source}: the file list has a header but no files")
    return out
