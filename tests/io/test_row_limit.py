"""The row limit of DOS input counts data rows: a header, comments and blank lines are not rows.

The limit (:data:`thermo.io.limits.MAX_ROWS`, 10⁶) is the project's own; the expected outcome is
stated by its documentation (docs/limits.md, "data rows of a DOS file").  The numbers read back are
the numbers written into each test file (the file is the reference).
"""

from __future__ import annotations

import numpy as np
import openpyxl
import pytest

from thermo.errors import DosInputError
from thermo.io import limits, readers
from thermo.io.readers import read_table


def _body(rows):
    nu = np.arange(rows) * 1e-5
    return "\n".join(np.char.add(np.char.mod("%.5f", nu), " 1.5").tolist()) + "\n"


@pytest.mark.parametrize("head", ["freq_THz dos\n", "# a comment\n# unit THz\nfreq dos\n"])
def test_a_header_and_comments_do_not_count_against_the_limit(head):
    table = read_table(head + _body(limits.MAX_ROWS))
    assert table.data.shape == (limits.MAX_ROWS, 2)
    assert table.data[-1, 0] == pytest.approx((limits.MAX_ROWS - 1) * 1e-5, rel=1e-12)
    assert table.line_numbers[0] == head.count("\n") + 1


def test_one_data_row_more_than_the_limit_is_refused_with_the_count():
    with pytest.raises(DosInputError, match=r"1,000,001 data rows; at most 1,000,000 are read"):
        read_table("freq dos\n" + _body(limits.MAX_ROWS + 1))


@pytest.mark.parametrize("general", [False, True])
def test_data_rows_are_counted_on_both_reading_paths(monkeypatch, general):
    """A small limit; the general (per-cell) path is forced by a Fortran exponent in the last row."""
    monkeypatch.setattr(limits, "MAX_ROWS", 5)
    monkeypatch.setattr(readers, "MAX_ROWS", 5)
    rows = ["0.1 1", "0.2 1", "0.3 1", "0.4 1", "0.5 1d0" if general else "0.5 1"]
    head = "# comment one\n# comment two\n\nfreq dos\n"
    assert read_table(head + "\n".join(rows) + "\n").data.shape == (5, 2)
    with pytest.raises(DosInputError, match=r"6 data rows; at most 5 are read"):
        read_table(head + "\n".join(rows + ["0.6 1"]) + "\n")


def test_a_sheet_header_does_not_count_against_the_limit(monkeypatch, tmp_path):
    monkeypatch.setattr(limits, "MAX_ROWS", 3)
    monkeypatch.setattr(readers, "MAX_ROWS", 3)
    from thermo.io import workbook
    monkeypatch.setattr(workbook, "MAX_ROWS", 3)
    book = openpyxl.Workbook()
    book.active.append(["freq (THz)", "dos"])
    for v in (0.1, 0.2, 0.3):
        book.active.append([v, 1.0])
    path = tmp_path / "three.xlsx"
    book.save(path)
    np.testing.assert_array_equal(read_table(path).data[:, 0], [0.1, 0.2, 0.3])
    book.active.append([0.4, 1.0])
    book.save(path)
    with pytest.raises(DosInputError, match=r"at most 3"):
        read_table(path)
