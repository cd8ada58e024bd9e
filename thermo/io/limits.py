"""Size limits of DOS input, checked before the expensive step (no part of a workbook is unpacked first).

The limits bound the memory and time one file can cost: rows and columns of
a table, the unpacked size and cell count of an ``.xlsx`` workbook.  Each
refusal is a one-line :class:`thermo.errors.DosInputError` naming the file and
the limit.

References
----------
.. [1] PKWARE, *APPNOTE.TXT — .ZIP File Format Specification*, version 6.3.10
   (2022), section 4.3.12 (central directory: uncompressed sizes).

Examples
--------
>>> check_row_count(10, "x.dat")
>>> check_column_count(300, "x.dat")
Traceback (most recent call last):
...
thermo.errors.DosInputError: x.dat: 300 columns; at most 256 are read
"""

from __future__ import annotations

import io
import zipfile

from ..errors import DosInputError


#: Most data rows a DOS file may have (a header row, comments and blank lines are not counted).
MAX_ROWS = 1_000_000
#: Rows above the data a sheet may have besides them (titles, header) while it is streamed.
MAX_SHEET_HEAD_ROWS = 1_000
#: Most columns (frequency, total and partial DOS) a DOS file may have.
MAX_COLUMNS = 256
#: Largest uncompressed size of all parts of an .xlsx workbook [bytes].
MAX_XLSX_UNPACKED_BYTES = 100_000_000
#: Most cells read from the first sheet of an .xlsx workbook.
MAX_XLSX_CELLS = 4_000_000


class SheetTooLarge(Exception):
    """Internal: the sheet passed a size limit while it was read."""


def check_row_count(rows: int, display: str) -> None:
    """Refuse a file of more than :data:`MAX_ROWS` data rows (header, comments and blank lines not counted)."""
    if rows > MAX_ROWS:
        raise DosInputError(f"{rows:,} data rows; at most {MAX_ROWS:,} are read", display)


def check_column_count(width: int, display: str, line=None) -> None:
    """Refuse a table of more than :data:`MAX_COLUMNS` columns."""
    if width > MAX_COLUMNS:
        raise DosInputError(f"{width:,} columns; at most {MAX_COLUMNS} are read", display, line)


def check_xlsx_size(raw: bytes, display: str) -> None:
    """Refuse a workbook that unpacks to more than :data:`MAX_XLSX_UNPACKED_BYTES`.

    Only the zip directory is read (no part is decompressed); the sizes it
    declares bound what :mod:`zipfile` will ever decompress.
    """
    try:
        with zipfile.ZipFile(io.BytesIO(raw)) as book:
            unpacked = sum(info.file_size for info in book.infolist())
    except Exception:  # zipfile raises many types for broken archives (BadZipFile, NotImplementedError, ...)
        raise DosInputError("not a readable .xlsx workbook", display) from None
    if unpacked > MAX_XLSX_UNPACKED_BYTES:
        raise DosInputError(f"the workbook would unpack to {unpacked / 1e6:,.0f} MB; at most "
                            f"{MAX_XLSX_UNPACKED_BYTES / 1e6:g} MB are unpacked", display)


#: Most measured points a heat-capacity (calorimetry) file may have: the fit evaluates the model at every
#: point on each step, so this bounds its time; measured sets rarely exceed a few thousand points.
MAX_HEAT_CAPACITY_ROWS = 20_000


def check_heat_capacity_rows(rows: int, display: str) -> None:
    """Refuse a measured C_p table of more than :data:`MAX_HEAT_CAPACITY_ROWS` points.

    Examples
    --------
    >>> check_heat_capacity_rows(30_000, "cp.csv")
    Traceback (most recent call last):
    ...
    thermo.errors.DosInputError: cp.csv: 30,000 measured points; at most 20,000 are read
    """
    if rows > MAX_HEAT_CAPACITY_ROWS:
        raise DosInputError(f"{rows:,} measured points; at most {MAX_HEAT_CAPACITY_ROWS:,} are read", display)
