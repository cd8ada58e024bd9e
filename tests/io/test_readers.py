"""Tests of thermo.io.readers.read_table.

Expected values are the numbers written into each test file (the file is the
reference); unit names follow thermo.units.  The .xlsx inputs are written by
openpyxl, an independent implementation of ECMA-376 SpreadsheetML.
"""

from __future__ import annotations

import hashlib
from unittest import mock

import numpy as np
import openpyxl
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from thermo.io import readers
from thermo.errors import DosInputError
from thermo.io.readers import RawTable, read_table

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


def test_only_cr_lf_and_crlf_break_lines():
    # Form feed and U+2028 are whitespace inside a line, not line breaks
    # (the documented layout: lines end with \n, \r\n or \r).
    table = read_table("# a\x0cb\r1 2\r\n3\u20284\n\x0c\n5 6\n")
    assert table.comments == ["# a\x0cb"]
    np.testing.assert_array_equal(table.data, [[1, 2], [3, 4], [5, 6]])
    assert table.line_numbers == [2, 3, 5]


# --- whole-body conversion against the per-cell parser -----------------------
# The per-cell parser (_to_array, reached when _fast_array declines) is the
# reference for the one-pass conversion: every field of the result, or the
# error message, must be the same.  For clean tables the written numbers are
# also checked against Python's float() of the text (repr round-trips exactly).

def _outcome(source):
    try:
        table = read_table(source, name="t.dat")
    except DosInputError as exc:
        return str(exc)
    return (table.data.tobytes(), table.data.shape, table.data.dtype, table.data.flags.c_contiguous,
            table.names, table.header_unit, table.source, table.sha256,
            table.line_numbers, table.comments)


def _careful_outcome(source):
    with mock.patch.object(readers, "_fast_array", return_value=None):
        return _outcome(source)


def _fast_results(source):
    """What _fast_array returned while reading `source`."""
    original, seen = readers._fast_array, []

    def spy(rows, delimiter):
        seen.append(original(rows, delimiter))
        return seen[-1]

    with mock.patch.object(readers, "_fast_array", spy):
        _outcome(source)
    return seen


NUMBER_TEXT = st.one_of(
    st.floats(allow_nan=False, allow_infinity=False).map(repr),
    st.floats(-1e6, 1e6).map(lambda v: f"{v:.9g}"),
    st.floats(allow_nan=False, allow_infinity=False).map(lambda v: f"{v:.6E}"),
    st.floats(-1e3, 1e3).map(lambda v: f"{v:f}"),
    st.integers(-10**20, 10**20).map(str),
    st.sampled_from(["+.5", "5.", "-0", "-0.0", ".5e1", "1e-400", "007", "1E+05", "2e308"]),
)
ODD_CELL = st.sampled_from([
    "1D3", "1d-2", "nan", "-inf", "Infinity", "1e999", "", " ", '"1.5"', "'2'", "1,5", "abc",
    "1_0", "\u0663", "1..2", "-", "+", "e5", "1e", "0x1", "1 2", "\u00a01", "1\x0c", "#1",
    "1-2", "1e+", "+-1", "1e5.5", ".", "-.e1", "1.2.3", "--1", "1e--2", "0b1", "1j",
])
# Short strings over the characters of a plain number: finds cells that one
# parser takes and the other refuses.
NUMBER_LIKE = st.text(alphabet="0123456789.eE+- ", min_size=1, max_size=6)
SEPARATORS = st.sampled_from([" ", "\t", "  ", " \t", ",", ", ", " ,", ";", " ; ", "\t;"])


@st.composite
def table_texts(draw, odd=True):
    sep = draw(SEPARATORS)
    width = draw(st.integers(1, 4))
    cell = st.one_of(NUMBER_TEXT, ODD_CELL, NUMBER_LIKE) if odd else NUMBER_TEXT
    rows = []
    for _ in range(draw(st.integers(1, 6))):
        row_width = draw(st.sampled_from([width, width, width, width + 1, max(width - 1, 1)])
                         if odd else st.just(width))
        row = sep.join(draw(st.lists(cell, min_size=row_width, max_size=row_width)))
        if odd and draw(st.booleans()):
            row += draw(st.sampled_from([sep, sep.strip() or sep, " ", "\t", sep * 2]))
        rows.append(row)
    if draw(st.booleans()):
        rows.insert(0, sep.join(["freq (THz)", "total", "Si", "O"][:width]))
    if draw(st.booleans()):
        rows.insert(draw(st.integers(0, len(rows))), draw(st.sampled_from(["# c", "  ! x", "", "%"])))
    end = draw(st.sampled_from(["\n", "\r\n", "\r"] + (["\x0c\n", "\u2028"] if odd else [])))
    return (end.join(rows) + draw(st.sampled_from(["", end]))).encode("utf-8")


COMPARE = settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])


@COMPARE
@given(table_texts())
def test_one_pass_conversion_matches_per_cell_parser(content):
    assert _outcome(content) == _careful_outcome(content)


@COMPARE
@given(table_texts(odd=False))
def test_clean_tables_take_the_one_pass_conversion(content):
    outcome = _outcome(content)
    assert outcome == _careful_outcome(content)
    if isinstance(outcome, tuple):
        results = _fast_results(content)       # the whole-body try first, then the rows (if it declined)
        assert 1 <= len(results) <= 2 and results[-1] is not None
        rows = [line.strip() for line in content.decode().replace("\r\n", "\n").replace("\r", "\n")
                .split("\n")]
        body = [rows[n - 1] for n in outcome[8]]
        sep = ";" if ";" in body[0] else "," if "," in body[0] else None
        written = [[float(cell) for cell in row.split(sep)] for row in body]
        np.testing.assert_array_equal(results[-1], written)


@pytest.mark.parametrize("rows, delimiter", [
    (["1 2", "3 4 5"], None),          # ragged
    (["1", "2"], None),                # one column
    (["1 2", "3 nan"], None),
    (["1 2", "3 1e999"], None),        # overflow to inf
    (["1;2", "3;1,5"], ";"),           # decimal comma
    (["1,2", "3,,4"], ","),            # empty cell
    (["1,2,", "3,4,"], ","),           # trailing delimiter
    (['"1",2', "3,4"], ","),           # quotes
    (["1 2", "3 1_0"], None),          # digit separator accepted by float()
    (["1 2", "3 \u0663"], None),       # non-ASCII digit accepted by float()
    (["1 2", "3\x0c4"], None),         # form feed: left to the per-cell parser
])
def test_one_pass_conversion_declines_what_it_does_not_cover(rows, delimiter):
    assert readers._fast_array(rows, delimiter) is None
    content = "\n".join(rows).encode()
    assert _outcome(content) == _careful_outcome(content)


def test_a_commented_header_row_names_the_columns_as_a_plain_one_does():
    # issue 25 item 6: the commented row gave the unit but the partials stayed "column 3", "column 4"
    body = "0 0 0 0\n1 0.2 0.1 0.1\n2 0.8 0.4 0.4\n"
    table = read_table("# invented test data\n# frequency (THz)  total  Mg  O\n" + body)
    assert table.names == ["frequency (THz)", "total", "Mg", "O"] and table.header_unit == "THz"
    # a comment of four words that states no unit in its first cell is not a header
    plain = read_table("# made up by hand\n# frequency unit: THz\n" + body)
    assert plain.names == ["frequency", "total", "column 3", "column 4"] and plain.header_unit == "THz"


def test_a_commented_header_row_of_a_workbook_names_the_columns(tmp_path):
    book = openpyxl.Workbook()
    book.active.append(["# frequency (THz)", "total", "Mg", "O"])
    for row in ([0, 0, 0, 0], [1, 0.2, 0.1, 0.1], [2, 0.8, 0.4, 0.4]):
        book.active.append(row)
    path = tmp_path / "c.xlsx"
    book.save(path)
    assert read_table(path).names == ["frequency (THz)", "total", "Mg", "O"]
