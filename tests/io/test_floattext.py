"""Vectorised rounding and CSV text of floats: the same bits and the same text as Python's own formatting.

Reference: CPython's ``format(v, ".{d}g")`` (correctly rounded, IEEE 754-2019 §5.12) and ``repr`` (shortest
round-trip text, Gay 1990), one value at a time — what the writers did before the vectorised path.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from thermo.io.floattext import rounded_csv_rows, rounded_floats
from thermo.io.writers import export_table

EDGE = [np.nan, np.inf, -np.inf, 0.0, -0.0, 1e-300, -1e-300, 1e300, -1e300, 5e-324, 2.2250738585072014e-308,
        1.0, 2.0, -7.0, 300.0, 12345678.0, 123456785.0, 99999999.5, 999999995.0, 1e15, 1e16, 9.9999999e15,
        1e-4, 1e-5, 0.00012345678, 0.5, 1.5, 2.5, 0.125, 1e22, 1e23, 1e-22, 1e-23, 1 / 3, 2 / 3, 0.1,
        9.999999995, 9.9999999949, 9.99999996, 1e100, 1.5e-100, 4503599627370497.0, 2.0 ** 53, 12345.678901,
        np.nextafter(1.0, 0.0), np.nextafter(10.0, 20.0), np.nextafter(1e16, 0.0), np.nextafter(1e-4, 0.0)]


def _values():
    rng = np.random.default_rng(7)
    many = rng.standard_normal(30_000) * 10.0 ** rng.integers(-30, 30, 30_000)
    halves = (rng.integers(10 ** 7, 10 ** 8, 5_000) + 0.5) * 10.0 ** rng.integers(-8, 8, 5_000)   # 8-digit ties
    whole = rng.integers(-10 ** 9, 10 ** 9, 5_000).astype(float)
    return np.concatenate([EDGE, many, halves, whole])


def _one_by_one(v, digits):
    return np.array([float(format(x, f".{digits}g")) for x in v])


def _rows_one_by_one(block, digits):
    lines = [",".join("" if x != x else repr(float(format(x, f".{digits}g"))) for x in row) for row in block.tolist()]
    return "".join((line or '""') + "\n" for line in lines)


@pytest.mark.parametrize("digits", [1, 3, 8, 9, 10, 17])
def test_rounded_floats_bit_for_bit_as_python_formatting(digits):
    v = _values()
    new, old = rounded_floats(v, digits), _one_by_one(v, digits)
    same = (new.view(np.int64) == old.view(np.int64)) | (np.isnan(new) & np.isnan(old))
    assert same.all(), v[~same][:5]


@pytest.mark.parametrize("digits", [2, 8, 9, 12])
@pytest.mark.parametrize("columns", [1, 4])
def test_csv_rows_same_text_as_repr_of_the_rounded_values(digits, columns):
    v = _values()
    block = v[: v.size // columns * columns].reshape(-1, columns)
    assert rounded_csv_rows(block, digits) == _rows_one_by_one(block, digits)


def test_edge_values_text():
    # Python's repr (CPython 3.x): '-0.0', 'inf', '1e-300', '1e+300', '300.0', positional from 1e-4 to < 1e16
    block = np.array([[-0.0, np.inf, 1e-300, 1e300, 300.0, 1e-4, 1e16, np.nan, 1 / 3]])
    assert rounded_csv_rows(block, 8) == "-0.0,inf,1e-300,1e+300,300.0,0.0001,1e+16,,0.33333333\n"
    assert rounded_csv_rows(np.array([[np.nan], [2.0]]), 8) == '""\n2.0\n'


def test_export_with_digits_writes_what_rounding_then_repr_wrote():
    v = _values()[:4000].reshape(-1, 4)
    df = pd.DataFrame(v, columns=["temperature_K", "a", "b", "c"])
    text = export_table(df, {"input": "x"}, "csv", digits=8).decode()
    body = text.split("temperature_K,a,b,c\n", 1)[1]
    assert body == _rows_one_by_one(v, 8)
    assert "# significant_digits: 8" in text
