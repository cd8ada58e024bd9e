"""``modeheat table --errors``: error columns named by the column schema, flagged rows with reasons.

The crystal is the spring-model bcc test crystal (tests/crystal.py, exact values from a q-sphere
integral near Γ plus a fine mesh; Ashcroft & Mermin 1976, ch. 23, for the T³ limit).
"""

import contextlib
import io
import json

import numpy as np
import pytest

from tests import crystal as C
from thermo.columns import column_name, error_key, lookup


@pytest.fixture(scope="module")
def coarse(tmp_path_factory):
    p = tmp_path_factory.mktemp("errors") / "bcc8.dat"
    p.write_text(C.dos_text(*C.gaussian_dos(C.BCC, 8, 0.12)))
    return p


def _run(*argv):
    from thermo.cli.main import main
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(list(argv))
    return code, out.getvalue(), err.getvalue()


def test_json_table_carries_error_columns_that_cover_the_exact_values(coarse):
    code, out, err = _run("table", str(coarse), "--atoms", "1", "--errors", "--format", "json",
                          "--temperatures", "2,5,20,100,298.15")
    assert code == 0
    doc = json.loads(out)
    cols = doc["columns"]
    rows = np.array([[r[cols.index(c)] for c in cols if c not in ("error_flag", "error_reason")] for r in doc["data"]])
    names = [c for c in cols if c not in ("error_flag", "error_reason")]
    t = rows[:, names.index("temperature_K")]
    exact = C.reference(C.BCC, t)
    for key in ("heat_capacity_v", "entropy"):
        value = rows[:, names.index(column_name(key))]
        error = rows[:, names.index(column_name(error_key(key)))]
        assert lookup(column_name(error_key(key))).unit == "J/(mol·K)"
        assert np.all(np.abs(value - exact[key]) <= error)
    flags = [r[cols.index("error_flag")] for r in doc["data"]]
    reasons = [r[cols.index("error_reason")] for r in doc["data"]]
    assert flags[:3] == [True, True, True] and flags[-1] is False
    assert "resolved frequency" in reasons[0] and reasons[-1] == ""
    assert "rows have an estimated error" in err
    assert any("not determined by the data" in w for w in doc["provenance"]["warnings"])


def test_csv_without_errors_has_no_error_columns(coarse):
    code, out, _ = _run("table", str(coarse), "--atoms", "1", "--temperatures", "300")
    header = [line for line in out.splitlines() if not line.startswith("#")][0]
    assert code == 0 and "error_J_per_mol_K" not in header and "error_flag" not in header
