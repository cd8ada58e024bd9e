"""The fast conversion paths of the text reader give exactly what the per-cell parser gives.

Reference: the per-cell parser (`_to_array`, Python ``float`` after d->e, correctly rounded
per Gay 1990) — the fast paths are numpy's and pandas' readers; the timing is bench figure P12, not here.
"""

from unittest import mock

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from tests.io.test_readers import _careful_outcome, _outcome, table_texts
from thermo.errors import DosInputError
from thermo.io import fastpath, readers
from thermo.io.readers import read_table


@settings(max_examples=200, deadline=None)
@given(st.lists(st.tuples(st.floats(allow_nan=False, allow_infinity=False, width=64),
                          st.floats(allow_nan=False, allow_infinity=False, width=64)), min_size=1, max_size=30),
       st.sampled_from(["d", "D", "e"]))
def test_fortran_exponents_convert_like_the_per_cell_parser(pairs, mark):
    rows = [f"{a!r} {b!r}".replace("e", mark) for a, b in pairs]
    fast = readers._fast_array(rows, None)
    slow, _ = readers._to_array([(k + 1, r.split()) for k, r in enumerate(rows)], "x")
    if fast is not None:
        np.testing.assert_array_equal(fast, slow)
    assert fast is not None or any(not np.isfinite(v) for v in slow.ravel())


@pytest.mark.parametrize("bad_row", [1, 19_999, 20_000, 45_123, 59_999])
@pytest.mark.parametrize("cell, message", [("0.4x", "'0.4x' is not a number"), ("", "expected 2 columns"),
                                           ("1 2", "expected 2 columns"), ("nan", "not a finite number")])
def test_blockwise_reading_names_the_same_cell(bad_row, cell, message):
    rows = [f"{k * 1e-3:.6f} {k * 2e-3:.6f}" for k in range(60_000)]
    rows[bad_row] = f"{bad_row * 1e-3:.6f} {cell}".strip()
    text = "\n".join(rows) + "\n"
    with pytest.raises(DosInputError, match=message) as info:
        read_table(text)
    assert info.value.line == bad_row + 1
    cells = [(k + 1, r.split()) for k, r in enumerate(rows)]
    with pytest.raises(DosInputError) as slow:
        readers._to_array(cells, "<text>")
    assert str(slow.value) == str(info.value)


def test_blockwise_reading_mixes_plain_and_quoted_blocks():
    rows = [f"{k * 1e-3:.6f},{k * 2e-3:.6f}" for k in range(50_000)]
    rows[30_000] = '"30.000000","60.000000"'
    table = read_table("\n".join(rows) + "\n")
    assert table.data.shape == (50_000, 2)
    assert table.data[30_000].tolist() == [30.0, 60.0] and table.data[-1, 1] == pytest.approx(99.998)


# --- the whole-body path (every row after the header plain) ------------------
# Reference: the per-cell parser (``_fast_array`` switched off), as in test_readers.py.


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(table_texts())
def test_pandas_conversion_matches_per_cell_parser(content):
    with mock.patch.object(fastpath, "LARGE_BODY_LINES", 1):       # every body through pandas' reader
        fast = _outcome(content)
    assert fast == _careful_outcome(content)


def _big_text(rows=20_000, end="\n", extra=None):
    head = ["# invented spectrum (demo)", "", "! frequency unit: THz", "freq total"]
    body = [f"{k * 1e-3!r} {k * k * 1.23456789e-7!r}" for k in range(rows)]
    if extra is not None:
        body.insert(*extra)
    return end.join(head + body) + end


@pytest.mark.parametrize("end", ["\n", "\r\n"])
def test_large_clean_body_reads_with_line_numbers(end):
    text = _big_text(end=end)
    table = read_table(text.encode())
    assert table.names == ["freq", "total"] and table.header_unit == "THz"
    assert table.line_numbers[0] == 5 and table.line_numbers[-1] == 20_004
    expected = [[float(c) for c in line.split()] for line in text.split(end)[4:-1]]   # Python float()
    np.testing.assert_array_equal(table.data, expected)
    assert _outcome(text.encode()) == _careful_outcome(text.encode())


@pytest.mark.parametrize("extra", [(10_000, ""), (10_000, "  "), (15_000, "# note"), (19_999, "1 2 3"),
                                   (5, "1,5 2"), (12_345, "3 -")])
def test_large_body_with_something_inside_reads_like_the_general_path(extra):
    content = _big_text(extra=extra).encode()
    assert _outcome(content) == _careful_outcome(content)
