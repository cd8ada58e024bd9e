"""Tests of thermo.io.writers: exports read back by our readers and by
independent parsers (pandas.read_csv, the json standard library module,
openpyxl)."""

from __future__ import annotations

import io
import json

import numpy as np
import openpyxl
import pandas as pd
import pytest

from thermo.errors import OptionError
from thermo.io.writers import EXPORT_FORMATS, export_table, write_table
from thermo.io.readback import read_exported_csv, read_exported_json

PROVENANCE = {
    "tool_version": "0.1.0",
    "input": "spring_demo.dat",
    "input_sha256": "ab" * 32,
    "unit": "cm-1",
    "atoms": 2,
    "raw_integral": 5.999999999987,
    "scale_factor": np.float64(1.0000000000021),
    "negative_mode_fraction": 0.0,
    "imaginary_policy": "drop",
    "low_frequency": {"mode": "auto", "cutoff_thz": 0.4},
    "error_estimate": None,
    "timestamp": "2024-01-01T00:00:00+00:00",
    "text_that_looks_numeric": "12",
}
EXPECTED_PROVENANCE = {**PROVENANCE, "scale_factor": 1.0000000000021}


def _frame():
    rng = np.random.default_rng(7)
    t = np.linspace(0.0, 1000.0, 11)
    return pd.DataFrame({
        "temperature_K": t,
        "entropy_J_per_mol_K": rng.random(11) * 10.0 ** rng.integers(-8, 3, 11),
        "helmholtz_energy_kJ_per_mol": -rng.random(11) / 3.0,
    })


def _assert_same(df, back):
    assert list(back.columns) == list(df.columns)
    np.testing.assert_allclose(back.to_numpy(float), df.to_numpy(float), rtol=1e-12, atol=0)


def test_csv_round_trip_and_layout():
    df = _frame()
    content = export_table(df, PROVENANCE, "csv")
    text = content.decode()
    lines = text.splitlines()
    assert all(line.startswith("# ") for line in lines[:len(PROVENANCE)])
    assert lines[len(PROVENANCE)] == ",".join(df.columns)
    back, meta = read_exported_csv(text)
    _assert_same(df, back)
    assert meta == EXPECTED_PROVENANCE
    # independent parser: pandas with '#' comments
    other = pd.read_csv(io.StringIO(text), comment="#")
    _assert_same(df, other)


def test_csv_keeps_full_precision():
    df = pd.DataFrame({"x": [1 / 3, 2.0 / 7.0 * 1e-7, 123456.78901234567]})
    back, _ = read_exported_csv(export_table(df, {}, "csv"))
    assert back["x"].tolist() == df["x"].tolist()   # exact, not only 1e-12


def test_csv_nan_round_trip():
    df = pd.DataFrame({"a": [1.0, np.nan]})
    back, _ = read_exported_csv(export_table(df, {}, "csv"))
    assert np.isnan(back["a"][1]) and back["a"][0] == 1.0


def test_json_round_trip_and_layout():
    df = _frame()
    df.loc[3, "entropy_J_per_mol_K"] = np.nan
    content = export_table(df, PROVENANCE, "json")
    obj = json.loads(content)                       # independent parser
    assert obj["columns"] == list(df.columns)
    assert obj["data"][3][1] is None
    assert obj["provenance"] == EXPECTED_PROVENANCE
    back, meta = read_exported_json(content)
    assert meta == EXPECTED_PROVENANCE
    assert np.isnan(back["entropy_J_per_mol_K"][3])
    np.testing.assert_allclose(back.to_numpy(float), df.to_numpy(float), rtol=1e-12,
                               equal_nan=True)


def test_json_nan_in_provenance_is_null():
    obj = json.loads(export_table(_frame(), {"x": float("nan")}, "json"))
    assert obj["provenance"]["x"] is None


def test_xlsx_sheets():
    df = _frame()
    book = openpyxl.load_workbook(io.BytesIO(export_table(df, PROVENANCE, "xlsx")))
    assert book.sheetnames == ["table", "provenance"]
    rows = list(book["table"].iter_rows(values_only=True))
    assert list(rows[0]) == list(df.columns)
    np.testing.assert_allclose(np.array(rows[1:], float), df.to_numpy(float), rtol=1e-12)
    meta = {k: v for k, v in book["provenance"].iter_rows(min_row=2, values_only=True)}
    assert meta["input_sha256"] == PROVENANCE["input_sha256"]
    assert meta["raw_integral"] == PROVENANCE["raw_integral"]
    assert json.loads(meta["low_frequency"]) == PROVENANCE["low_frequency"]


@pytest.mark.parametrize("fmt", EXPORT_FORMATS)
def test_write_table_refuses_overwrite(tmp_path, fmt):
    path = tmp_path / f"table.{fmt}"
    write_table(_frame(), PROVENANCE, fmt, path)
    first = path.read_bytes()
    with pytest.raises(OptionError, match="refusing to overwrite") as info:
        write_table(_frame().iloc[:2], PROVENANCE, fmt, path)
    assert "\n" not in str(info.value)
    assert path.read_bytes() == first
    write_table(_frame().iloc[:2], {}, fmt, path, overwrite=True)
    assert path.read_bytes() != first


def test_write_table_format_from_suffix(tmp_path):
    path = write_table(_frame(), PROVENANCE, None, tmp_path / "t.csv")
    back, meta = read_exported_csv(path)
    _assert_same(_frame(), back)
    assert meta["atoms"] == 2


def test_unknown_format_lists_choices():
    with pytest.raises(OptionError, match="csv, json, xlsx"):
        export_table(_frame(), {}, "parquet")
    assert export_table(_frame(), {}, ".CSV").startswith(b"temperature_K")


def test_unwritable_path_is_option_error(tmp_path):
    with pytest.raises(OptionError, match="cannot write"):
        write_table(_frame(), {}, "csv", tmp_path / "missing_dir" / "t.csv")


def _awkward_floats(seed, rows=40):
    rng = np.random.default_rng(seed)
    values = rng.standard_normal((rows, 4)) * 10.0 ** rng.integers(-300, 300, (rows, 4))
    values[::7, 1] = np.nan
    values[3, 2], values[5, 3], values[9, 0] = np.inf, -0.0, -np.inf
    values[11] = np.nan
    return pd.DataFrame(values, columns=["temperature_K", "=risky name", "a,b", "c"])


@pytest.mark.parametrize("seed", range(5))
def test_all_float_csv_writes_what_pandas_writes(seed):
    # Reference: pandas' own DataFrame.to_csv (an independent CSV writer) on the same table.
    df = _awkward_floats(seed)
    text = export_table(df, {}, "csv").decode()
    reference = df.rename(columns=lambda c: "'" + c if c.startswith("=") else c).to_csv(index=False,
                                                                                        lineterminator="\n")
    assert text == reference


@pytest.mark.parametrize("digits", [1, 3, 8, 17])
def test_rounded_floats_are_the_decimal_rounding_of_each_value(digits):
    # Reference: Python's correctly rounded '%.{digits}g' formatting of each value (Gay 1990).
    df = _awkward_floats(digits)
    back, _ = read_exported_csv(export_table(df, {}, "csv", digits=digits))
    expected = [[float(f"{v:.{digits}g}") for v in row] for row in df.to_numpy().tolist()]
    np.testing.assert_array_equal(back.to_numpy(float), np.array(expected))


def test_single_float_column_with_nan_writes_what_pandas_writes():
    df = pd.DataFrame({"a": [1.0, np.nan, 2.5]})
    assert export_table(df, {}, "csv").decode() == df.to_csv(index=False, lineterminator="\n")
