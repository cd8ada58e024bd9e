"""Rows of an ``.xlsx`` worksheet for :mod:`thermo.io.readers`: sheet choice and title rows.

References
----------
.. [1] ECMA-376, *Office Open XML File Formats*, 5th ed. (Ecma International,
   2016), Part 1 (SpreadsheetML).
"""

from __future__ import annotations

import io

from ..errors import DosInputError
from .limits import MAX_ROWS, MAX_SHEET_HEAD_ROWS, MAX_XLSX_CELLS, SheetTooLarge


def _pick_sheet(book, sheet, display):
    names = list(book.sheetnames)
    if sheet is None or (isinstance(sheet, str) and not sheet.strip()):
        return book.worksheets[0]
    text = str(sheet).strip()
    if text in names:
        return book[text]
    if text.isdigit() and 1 <= int(text) <= len(names):
        return book.worksheets[int(text) - 1]
    raise DosInputError(f"no sheet {text!r} in the workbook; its sheets are "
                        + ", ".join(repr(n) for n in names) + " (give a name or a number from 1)",
                        display)


def xlsx_rows(raw: bytes, display: str, choice=None):
    """(sheet row, cells) of every non-empty row of the chosen sheet, and its name."""
    try:
        import openpyxl

        book = openpyxl.load_workbook(io.BytesIO(raw), read_only=True, data_only=True)
    except Exception:  # openpyxl/zipfile raise many types for broken files
        raise DosInputError("not a readable .xlsx workbook", display) from None
    try:
        sheet = _pick_sheet(book, choice, display)
        try:
            rows = []
            cells_seen = 0
            for number, values in enumerate(sheet.iter_rows(values_only=True), start=1):
                cells = list(values)
                cells_seen += len(cells)
                if cells_seen > MAX_XLSX_CELLS or number > MAX_ROWS + MAX_SHEET_HEAD_ROWS:
                    raise SheetTooLarge(number)
                while cells and (cells[-1] is None or str(cells[-1]).strip() == ""):
                    cells.pop()
                if cells:
                    rows.append((number, [xlsx_cell(c) for c in cells]))
        except SheetTooLarge as exc:
            raise DosInputError(f"the sheet has more than {MAX_XLSX_CELLS:,} cells or {MAX_ROWS + MAX_SHEET_HEAD_ROWS:,} rows "
                                f"(stopped at row {exc.args[0]})", display) from None
        except Exception:  # openpyxl/zipfile raise many types for broken files
            raise DosInputError("not a readable .xlsx workbook", display) from None
    finally:
        book.close()
    return rows, sheet.title


def xlsx_titles(comments, candidates, looks_numeric):
    """Text rows above the header of a sheet become comments (titles, notes)."""
    first_data = next((k for k, (_, row) in enumerate(candidates)
                       if sum(looks_numeric(c) for c in row) >= 2
                       and all(looks_numeric(c) or c == "" for c in row)), None)
    if first_data is None or first_data <= 1:
        return comments, candidates
    titles = [(line, " ".join(c for c in row if c)) for line, row in candidates[:first_data - 1]]
    return sorted(comments + titles), candidates[first_data - 1:]


def xlsx_cell(value) -> str:
    if value is None:
        return ""
    if isinstance(value, bool):
        return str(value)
    if isinstance(value, (int, float)):
        return repr(float(value))
    return str(value).strip()
