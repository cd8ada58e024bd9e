"""The fast conversion paths of the text reader give exactly what the per-cell parser gives.

Reference: the per-cell parser (`_to_array`, Python ``float`` after d->e, correctly rounded
per Gay 1990) — the fast paths are numpy's; the timing itself is bench figure P12, not here.
"""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from thermo.errors import DosInputError
from thermo.io import readers
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
