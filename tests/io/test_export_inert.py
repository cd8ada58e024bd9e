"""Exports are inert: no text from users becomes a live spreadsheet formula.

Source of the rule: OWASP Foundation, "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection):
cells starting with ``=``, ``+``, ``-``, ``@``, tab or carriage return are interpreted as formulas
by spreadsheet programs.  Each CSV is parsed independently with Python's ``csv`` module, splitting
at commas and (as some locales do) at semicolons; each workbook is checked in its XML (no ``<f>``
formula element, no formula cell type).
"""

from __future__ import annotations

import csv
import io
import re
import zipfile

import numpy as np
import openpyxl
import pandas as pd
import pytest

from thermo.io.writers import FORMULA_PREFIXES, export_table
from thermo.io.readback import read_exported_csv, read_exported_json

PREFIXES = ["=", "+", "-", "@", "\t", "\r"]
PAYLOAD = "HYPERLINK(\"http://example.invalid\",\"x\")"


def _is_number(cell):
    try:
        float(cell)
        return True
    except ValueError:
        return False


def _dangerous_cells(text, delimiter):
    bad = []
    for row in csv.reader(io.StringIO(text, newline=""), delimiter=delimiter):
        for cell in row:
            if cell.startswith(tuple(PREFIXES)) and not _is_number(cell):
                bad.append(cell)
    return bad


def _frame(prefix):
    return pd.DataFrame({"temperature_K": [1.0, 300.0], f"{prefix}{PAYLOAD}": [-1.5, 2.0],
                         "label": [f"{prefix}cmd|' /C calc'!A0", "plain"]})


def _provenance(prefix):
    return {"input": f"{prefix}{PAYLOAD}.dat", "name": f"demo,{prefix}1+1;{prefix}2", "columns": [f"{prefix}x", "y"],
            "note": {"by": f"a, {prefix}b"}}


def test_formula_prefixes_cover_owasp_list():
    assert set(FORMULA_PREFIXES) == set(PREFIXES)


@pytest.mark.parametrize("prefix", PREFIXES)
@pytest.mark.parametrize("delimiter", [",", ";"])
def test_csv_has_no_formula_cell(prefix, delimiter):
    text = export_table(_frame(prefix), _provenance(prefix), "csv").decode()
    assert _dangerous_cells(text, delimiter) == []


@pytest.mark.parametrize("prefix", PREFIXES)
def test_csv_reads_back_the_original_text(prefix):
    df, meta = _frame(prefix), _provenance(prefix)
    back, meta_back = read_exported_csv(export_table(df, meta, "csv"))
    assert list(back.columns) == list(df.columns)
    assert back["label"].tolist() == df["label"].tolist()
    np.testing.assert_array_equal(back[f"{prefix}{PAYLOAD}"].to_numpy(), [-1.5, 2.0])   # numbers stay numbers
    assert meta_back == meta


@pytest.mark.parametrize("prefix", PREFIXES)
def test_xlsx_has_only_text_cells_for_text(prefix):
    raw = export_table(_frame(prefix), _provenance(prefix), "xlsx")
    with zipfile.ZipFile(io.BytesIO(raw)) as z:
        sheets = [z.read(n).decode() for n in z.namelist() if n.startswith("xl/worksheets/")]
    assert sheets and not any(re.search(r"<f[ >]", s) for s in sheets)
    book = openpyxl.load_workbook(io.BytesIO(raw))
    cells = [c for ws in book.worksheets for row in ws.iter_rows() for c in row]
    assert not [c.coordinate for c in cells if c.data_type == "f"]
    values = {c.value for c in cells}
    assert f"{prefix}{PAYLOAD}.dat" in values and f"{prefix}cmd|' /C calc'!A0" in values
    assert -1.5 in values          # numbers stay numeric cells


def test_json_keeps_text_as_is():
    df, meta = _frame("="), _provenance("=")
    back, meta_back = read_exported_json(export_table(df, meta, "json"))
    assert back["label"].tolist() == df["label"].tolist() and meta_back == meta
