"""Tests of thermo.readers.read_table.

Expected values are the numbers written into each test file (the file is the
reference); unit names follow thermo.units.  The .xlsx inputs are written by
openpyxl, an independent implementation of ECMA-376 SpreadsheetML.
"""

from __future__ import annotations

import hashlib

import numpy as np
import openpyxl
import pytest

from thermo.errors import DosInputError
from thermo.readers import RawTable, read_table

ROWS = [(0.5, 0.01, 0.004), (1.0, 0.04, 0.02), (1.5, 0.09, 0.05)]
EXPECTED = np.array(ROWS)


def _text(sep: str, rows=ROWS) -> str:
    return "".join(sep.join(repr(v) for v in row) + "\n" for row in rows)


@pytest.mark.parametrize("sep", [" ", "\t", ",", ";", " \t  ", ", ", " ; "])
def test_every_delimiter_gives_the_written_numbers(sep):
    table = read_table(_text(sep))
    assert isinstance(table, RawTable)
    np.testing.assert_array_equal(table.data, EXPECTED)
    assert table.line_numbers == [1, 2, 3]
    assert table.names == ["frequency", "total", "column 3"]
    assert table.source == "<text>"


def test_mixed_whitespace_per_line():
    text = "0.5 0.01\t0.004\n  1.0\t\t0.04   0.02\n1.5\t 0.09 \t0.05  \n"
    np.testing.assert_array_equal(read_table(text).data, EXPECTED)


def test_path_str_path_object_and_bytes(tmp_path):
    path = tmp_path / "dos.dat"
    path.write_text(_text(" "))
    for source in (path, str(path), path.read_bytes()):
        table = read_table(source)
        np.testing.assert_array_equal(table.data, EXPECTED)
    assert read_table(path).source == "dos.dat"
    assert read_table(path.read_bytes()).source == "<bytes>"
    assert read_table(path, name="upload.txt").source == "upload.txt"


def test_sha256_is_of_raw_bytes(tmp_path):
    content = b"# a comment\n" + _text(",").encode()
    path = tmp_path / "dos.csv"
    path.write_bytes(content)
    assert read_table(path).sha256 == hashlib.sha256(content).hexdigest()


def test_header_row_gives_names_and_unit():
    text = "# made-up spring model\nfrequency (cm-1)  total (states/cm-1)  Si\n" + _text("  ")
    table = read_table(text)
    assert table.names == ["frequency (cm-1)", "total (states/cm-1)", "Si"]
    assert table.header_unit == "cm-1"
    assert table.line_numbers == [3, 4, 5]
    assert table.comments == ["# made-up spring model"]


def test_header_in_csv_with_quotes():
    text = '"nu [meV]","dos","A"\n' + _text(",")
    table = read_table(text)
    assert table.names == ["nu [meV]", "dos", "A"]
    assert table.header_unit == "meV"


def test_dos_unit_in_header_is_not_the_frequency_unit():
    text = "freq  dos(states/THz)  partial\n" + _text(" ")
    assert read_table(text).header_unit is None


def test_dos_unit_in_comment_is_ignored_but_frequency_unit_found():
    text = "# DOS in states/THz per formula unit\n" + _text(" ")
    assert read_table(text).header_unit is None
    text = "# frequency unit: meV\n# dos: states/THz\n" + _text(" ")
    assert read_table(text).header_unit == "meV"


def test_commented_header_unit_taken_from_first_column():
    text = "# omega (rad/s)  g (states/THz)  part\n" + _text(" ")
    assert read_table(text).header_unit == "rad/s"


def test_duplicate_header_names_made_unique():
    table = read_table("f g g\n" + _text(" "))
    assert table.names == ["f", "g", "g (column 3)"]


@pytest.mark.parametrize("mark", ["#", "!", "%", "   #", "\t!"])
def test_comment_characters_and_blank_lines(mark):
    text = f"{mark} note\n\n0.5 0.01 0.004\n{mark} inside\n  \n1.0 0.04 0.02\n1.5 0.09 0.05\n"
    table = read_table(text)
    np.testing.assert_array_equal(table.data, EXPECTED)
    assert table.line_numbers == [3, 6, 7]
    assert len(table.comments) == 2


def test_bom_and_crlf():
    raw = b"\xef\xbb\xbf" + _text(";").replace("\n", "\r\n").encode()
    table = read_table(raw)
    np.testing.assert_array_equal(table.data, EXPECTED)
    assert table.line_numbers == [1, 2, 3]
    raw = b"\xef\xbb\xbffreq (THz)\ttotal\r\n1 2\r\n3 abc\r\n"
    with pytest.raises(DosInputError, match=r"line 3, column 2: 'abc' is not a number"):
        read_table(raw)


def test_fortran_exponent_and_signs():
    table = read_table("-1.0D-01 +2.5e+00\n.5 1.\n")
    np.testing.assert_array_equal(table.data, [[-0.1, 2.5], [0.5, 1.0]])


def test_non_uniform_grid_is_fine():
    table = read_table("0 0\n0.1 1\n0.15 2\n1.0 3\n")
    np.testing.assert_array_equal(table.data[:, 0], [0, 0.1, 0.15, 1.0])


def test_xlsx_first_sheet(tmp_path):
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.append(["# invented demo DOS"])
    sheet.append(["frequency (THz)", "total", "Al"])
    for row in ROWS:
        sheet.append(list(row))
    book.create_sheet("other").append(["ignored", 1])
    path = tmp_path / "dos.xlsx"
    book.save(path)
    table = read_table(path)
    np.testing.assert_array_equal(table.data, EXPECTED)
    assert table.names == ["frequency (THz)", "total", "Al"]
    assert table.header_unit == "THz"
    assert table.line_numbers == [3, 4, 5]
    assert table.comments == ["# invented demo DOS"]
    assert read_table(path.read_bytes()).sha256 == hashlib.sha256(path.read_bytes()).hexdigest()


def test_xlsx_bad_cell_names_sheet_row_and_column(tmp_path):
    book = openpyxl.Workbook()
    book.active.append([1.0, 2.0])
    book.active.append([2.0, "x"])
    path = tmp_path / "bad.xlsx"
    book.save(path)
    with pytest.raises(DosInputError, match=r"bad\.xlsx, line 2, column 2: 'x' is not a number"):
        read_table(path)


def test_broken_zip_is_not_a_workbook():
    with pytest.raises(DosInputError, match="not a readable .xlsx workbook"):
        read_table(b"PK\x03\x04 this is not a zip file", name="up.xlsx")


# --- errors: (content, expected message fragment with line/column) ----------
ERROR_CASES = [
    (b"", r"empty"),
    (b"  \n\n", r"empty"),
    (b"# only a comment\n", r"no data rows"),
    (b"freq total\n", r"line 1: no data rows after the header"),
    (b"1 2\n\x00\x01", r"line 2: binary content"),
    (b"1 2\n3 4\n5 \xe96\n", r"line 3: not UTF-8 text \(byte 0xE9 at offset 10\)"),
    (b"1\n2\n3\n", r"line 1: found 1 numeric column"),
    (b"1 2 3\n" * 16 + b"4 5\n", r"line 17: expected 3 columns, found 2"),
    (b"1 2\n" * 11 + b"3 abc\n", r"line 12, column 2: 'abc' is not a number"),
    (b"1 2\n1 nan\n", r"line 2, column 2: 'nan' is not a finite number"),
    (b"1 2\n-inf 2\n", r"line 2, column 1: '-inf' is not a finite number"),
    (b"1 2\n1 1e400\n", r"line 2, column 2: '1e400' is too large"),
    (b"1 2\nfreq dos\n", r"line 2: text row inside the data"),
    (b"1,5;2,5\n", r"line 1, column 1: '1,5' is not a number; the decimal mark must be '.'"),
    (b"1,,2\n", r"line 1, column 2: empty cell"),
]


@pytest.mark.parametrize("content, message", ERROR_CASES)
def test_errors_name_line_and_column(content, message):
    with pytest.raises(DosInputError, match=message) as info:
        read_table(content, name="dos.txt")
    text = str(info.value)
    assert "\n" not in text
    assert text.startswith("dos.txt")


def test_latin1_file_reports_line(tmp_path):
    path = tmp_path / "latin.dat"
    path.write_bytes("# Fréquence\n1 2\n".encode("latin-1"))
    with pytest.raises(DosInputError, match=r"latin\.dat, line 1: not UTF-8"):
        read_table(path)


def test_missing_file_is_one_line_error(tmp_path):
    with pytest.raises(DosInputError, match=r"nothing\.dat: cannot read file"):
        read_table(tmp_path / "nothing.dat")


def test_wrong_source_type():
    with pytest.raises(DosInputError, match="cannot read input of type int"):
        read_table(42)
