"""Tests of thermo.preparation.validation.check_spectrum.

Inputs are small invented tables (a ν² spring-model DOS); the expected numbers
and line numbers are the ones written into each table.
"""

from __future__ import annotations

import numpy as np
import pytest

from thermo.errors import DosInputError, OptionError
from thermo.io.readers import read_table
from thermo.preparation.validation import CleanSpectrum, check_spectrum


def _table(rows, header=None):
    lines = ([header] if header else []) + [" ".join(repr(float(v)) for v in r) for r in rows]
    return read_table("\n".join(lines) + "\n", name="dos.dat")


def _rows(n=20, partial=False):
    nu = 0.25 * np.arange(n)
    g = 0.3 * nu**2
    return [(a, b, b / 3) if partial else (a, b) for a, b in zip(nu, g)]


def test_clean_spectrum_fields():
    spec = check_spectrum(_table(_rows(partial=True), header="nu(THz) total Mg"))
    assert isinstance(spec, CleanSpectrum)
    np.testing.assert_array_equal(spec.frequency, 0.25 * np.arange(20))
    np.testing.assert_array_equal(spec.total, 0.3 * (0.25 * np.arange(20)) ** 2)
    assert list(spec.partials) == ["Mg"]
    np.testing.assert_array_equal(spec.partials["Mg"], spec.total / 3)
    assert spec.warnings == ()
    assert spec.header_unit == "THz"
    assert spec.source == "dos.dat"
    assert spec.line_numbers == tuple(range(2, 22))


def test_negative_frequencies_are_kept_for_imaginary_modes():
    rows = [(-0.5, 0.001)] + _rows(12)
    spec = check_spectrum(_table(rows))
    assert spec.frequency[0] == -0.5


def test_too_few_points():
    with pytest.raises(DosInputError, match=r"only 9 data points; at least 10"):
        check_spectrum(_table(_rows(9)))


def test_duplicate_frequency_names_both_lines():
    rows = _rows(50)
    rows[39] = (rows[38][0], 1.0)   # file line 40 repeats line 39
    with pytest.raises(DosInputError,
                       match=r"dos\.dat, line 40: frequency 9\.5 repeats line 39"):
        check_spectrum(_table(rows))


def test_decreasing_frequency():
    rows = _rows(50)
    rows[40] = (9.4, 1.0)           # file line 41, after 10.0 on line 40
    with pytest.raises(DosInputError,
                       match=r"line 41: frequency decreases \(9\.4 after 9\.75\); sort the file"):
        check_spectrum(_table(rows))


def test_total_all_zero():
    with pytest.raises(DosInputError, match=r"total DOS \(column 2\) is zero everywhere"):
        check_spectrum(_table([(k, 0.0) for k in range(12)]))


def test_small_negative_values_clipped_with_one_warning():
    rows = _rows(20)
    gmax = max(g for _, g in rows)
    rows[1] = (rows[1][0], -0.5e-3 * gmax)
    rows[2] = (rows[2][0], -1e-3 * gmax)   # exactly at the threshold: clipped
    spec = check_spectrum(_table(rows))
    assert spec.total[1] == 0.0 and spec.total[2] == 0.0
    assert len(spec.warnings) == 1
    assert "negative" in spec.warnings[0] and "2" in spec.warnings[0]
    assert np.all(spec.total >= 0)


def test_large_negative_value_is_error_with_line_and_column():
    rows = _rows(20)
    rows[4] = (rows[4][0], -1.0)
    with pytest.raises(DosInputError, match=r"line 5, column 2: negative DOS value -1\.0"):
        check_spectrum(_table(rows))


def test_partial_column_negative_rule():
    rows = _rows(20, partial=True)
    gmax = max(r[1] for r in rows)
    rows[3] = (rows[3][0], rows[3][1], -1e-4 * gmax)
    spec = check_spectrum(_table(rows))
    assert spec.partials["column 3"][3] == 0.0
    assert "negative" in spec.warnings[0]
    rows[6] = (rows[6][0], rows[6][1], -0.1 * gmax)
    with pytest.raises(DosInputError, match=r"line 7, column 3: negative DOS value"):
        check_spectrum(_table(rows))


def test_negative_noise_option():
    rows = _rows(20)
    rows[1] = (rows[1][0], -1e-6)
    with pytest.raises(DosInputError, match="line 2, column 2"):
        check_spectrum(_table(rows), negative_noise=0.0)
    with pytest.raises(OptionError, match="negative_noise"):
        check_spectrum(_table(rows), negative_noise=-1)


def test_all_negative_total_is_error():
    with pytest.raises(DosInputError, match=r"line 1, column 2: negative DOS value"):
        check_spectrum(_table([(k, -1.0) for k in range(12)]))


def test_messages_are_single_line():
    rows = _rows(20)
    rows[5] = (rows[4][0], 1.0)
    with pytest.raises(DosInputError) as info:
        check_spectrum(_table(rows))
    assert "\n" not in str(info.value)
