"""UTF-16 / BOM text and .xlsx title rows and sheet choice (file formats: Unicode 15 §2.5
byte-order marks; ECMA-376 SpreadsheetML written by openpyxl)."""

from __future__ import annotations

import io

import numpy as np
import openpyxl
import pytest

from thermo import DosInputError
from thermo.io.readers import read_table

BODY = "freq_THz total\n" + "\n".join(f"{0.25 * k} {0.01 * k * k}" for k in range(1, 21)) + "\n"


@pytest.mark.parametrize("encoding", ["utf-16", "utf-16-le", "utf-16-be", "utf-8-sig"])
def test_unicode_text_encodings_read_like_utf8(encoding):
    reference = read_table(BODY.encode("utf-8"))
    table = read_table(BODY.encode(encoding))
    assert table.names == ["freq_THz", "total"] and table.header_unit == "THz"
    assert np.array_equal(table.data, reference.data)


def test_real_binary_is_still_refused():
    with pytest.raises(DosInputError, match="binary content"):
        read_table(b"\x00\x01\x02\x03\xff\x00abc\n")


def _workbook():
    book = openpyxl.Workbook()
    notes = book.active
    notes.title = "notes"
    notes.append(["invented spring model, for a test"])
    dos = book.create_sheet("dos")
    dos.append(["Phonon DOS of an invented crystal"])
    dos.append(["computed 2026-12-03"])
    dos.append([])
    dos.append(["frequency (THz)", "total", "A"])
    for k in range(1, 16):
        dos.append([0.5 * k, 0.02 * k * k, 0.01 * k * k])
    out = io.BytesIO()
    book.save(out)
    return out.getvalue()


@pytest.mark.parametrize("choice", ["dos", 2, "2"])
def test_xlsx_sheet_choice_and_title_rows(choice):
    table = read_table(_workbook(), name="book.xlsx", sheet=choice)
    assert table.sheet == "dos"
    assert table.names == ["frequency (THz)", "total", "A"]
    assert table.header_unit == "THz"
    assert table.line_numbers[0] == 5 and table.data.shape == (15, 3)
    assert table.data[2, 1] == pytest.approx(0.18)
    assert "Phonon DOS of an invented crystal" in table.comments


def test_xlsx_unknown_sheet_lists_the_sheets():
    with pytest.raises(DosInputError, match="no sheet 'x' in the workbook; its sheets are 'notes', 'dos'"):
        read_table(_workbook(), sheet="x")
    with pytest.raises(DosInputError, match="no data rows on sheet 'notes'"):
        read_table(_workbook())
