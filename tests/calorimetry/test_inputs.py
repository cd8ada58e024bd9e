"""Measured C_p inputs: units from a commented header, magnitudes, row limit, cost linear in rows (issues 25, 26)."""

import functools
import json
import tracemalloc

import numpy as np
import pytest
from scipy import constants as sc

from thermo.calorimetry import HeatCapacityModel, read_heat_capacity
from thermo.calorimetry.entropy import third_law_from_data
from thermo.calorimetry.reading import check_heat_capacity_scale
from thermo.calorimetry.report import analyse
from thermo.cli.main import main
from thermo.errors import DosInputError
from thermo.io.limits import MAX_HEAT_CAPACITY_ROWS

from .test_external import _debye_cv_mpmath


@functools.lru_cache(maxsize=None)
def _debye_cv(theta):
    # mpmath Debye C_v (test_external) every 5 K from 5 to 300 K
    t = np.arange(5.0, 301.0, 5.0)
    return t, np.array([_debye_cv_mpmath(x, theta) for x in t])


def _debye_rows(theta=300.0):
    t, c = _debye_cv(theta)
    return t.copy(), c.copy()


def test_commented_header_states_the_units():
    # Issue 25 item 2: "# T[K]  C[mJ/(mol K)]" was ignored ("no unit stated, read as J/(mol K)").
    t, c = _debye_rows()
    text = "# run 7\n# T[K]  C[mJ/(mol K)]\n" + "".join(f"{a:g}  {1e3 * b:.8g}\n" for a, b in zip(t, c))
    m = read_heat_capacity(text, name="cp.dat")
    assert m.unit == "mJ/(mol K)"
    assert m.heat_capacity_J_per_mol_K == pytest.approx(c, rel=1e-7)
    assert not any("no C_p unit" in n or "read as K" in n for n in m.notes)
    # the same rule as the DOS reader: a unit merely mentioned in another comment is not taken
    mention = read_heat_capacity("# calibrated against a 10 mJ/(mol K) heater\nT Cp\n10 1.0\n20 2.0\n")
    assert mention.unit == "J/(mol K)" and any("no C_p unit" in n for n in mention.notes)


def test_heat_capacity_far_above_dulong_petit_is_refused_with_the_likely_unit(tmp_path, capsys):
    # Issue 25 item 2: values in mJ/(mol K) read as J/(mol K) were fitted (θ_D 42.6 K, 63 % misfit).
    # Common practice: C_p of a solid stays near 3nR (Dulong–Petit), R = scipy.constants.R (CODATA).
    t, c = _debye_rows()
    path = tmp_path / "mj_as_j.csv"
    path.write_text("T,Cp\n" + "".join(f"{a:g},{1e3 * b:.8g}\n" for a, b in zip(t, c)))
    assert main(["calorimetry", str(path), "--atoms", "1"]) == 2
    err = capsys.readouterr().err.strip().splitlines()[-1]
    assert err.startswith("error: mj_as_j.csv, line ") and "likely in mJ/(mol K)" in err
    assert f"{6 * sc.R:.3g}" in err or "Dulong-Petit" in err
    # the same numbers with the unit given are fine; more atoms per formula unit raise the limit
    assert main(["calorimetry", str(path), "--atoms", "1", "--cp-unit", "mJ/(mol K)"]) == 0
    capsys.readouterr()
    big = read_heat_capacity("T,Cp\n300,120\n400,124\n")
    with pytest.raises(DosInputError, match="more atoms"):
        check_heat_capacity_scale(big, 1)
    check_heat_capacity_scale(big, 5)          # 5 atoms: 3nR = 125 J/(mol K)


@pytest.mark.parametrize("row, message", [
    ("0.000000001,0.001", "below 0.1 K"),
    ("1e9,20", "above 100000 K"),
])
def test_temperatures_outside_physical_range_are_refused(row, message):
    # Issue 26: a point at 1e-9 K gave S° = −3.4e8 J/(mol K) with exit 0.
    t, c = _debye_rows()
    text = "T,Cp\n" + row + "\n" + "".join(f"{a:g},{b:.8g}\n" for a, b in zip(t, c))
    with pytest.raises(DosInputError, match=message) as info:
        read_heat_capacity(text, name="cp.csv")
    assert "cp.csv, line 2, column 1" in str(info.value)


def test_one_outlier_of_1e9_is_refused_not_integrated(tmp_path, capsys):
    # Issue 26: one C_p of 1e9 gave S° = −2,203 J/(mol K).
    t, c = _debye_rows()
    c = c.copy()
    c[30] = 1e9
    path = tmp_path / "outlier.csv"
    path.write_text("T (K),Cp (J/(mol K))\n" + "".join(f"{a:g},{b:.8g}\n" for a, b in zip(t, c)))
    assert main(["calorimetry", str(path), "--atoms", "1"]) == 2
    err = capsys.readouterr().err.strip().splitlines()[-1]
    assert err.startswith("error: outlier.csv, line 32, column 2") and "internal error" not in err


def test_third_law_entropy_is_never_negative():
    # An oscillating table (legal values) whose spline would dip below zero: refused in one line.
    t = np.array([1.0, 1.1, 50.0, 50.1, 100.0, 100.1, 300.0])
    c = np.array([1e-4, 40.0, 1e-4, 40.0, 1e-4, 40.0, 1e-4])
    try:
        r = third_law_from_data(t, c, t)
    except DosInputError as exc:
        assert "a third-law entropy is >= 0" in str(exc) and "\n" not in str(exc)
    else:
        assert np.all(r["entropy"] >= 0) and np.all(r["enthalpy"] >= 0)


def test_row_limit_is_documented_and_enforced():
    rows = MAX_HEAT_CAPACITY_ROWS + 1
    text = "T,Cp\n" + "".join(f"{1 + 1e-3 * k:.4f},1.0\n" for k in range(rows))
    with pytest.raises(DosInputError, match=f"at most {MAX_HEAT_CAPACITY_ROWS:,} are read"):
        read_heat_capacity(text, name="long.csv")


def _peak_bytes(rows):
    t = np.linspace(2.0, 600.0, rows)
    c = 3 * sc.R * (t / 300.0) ** 3 / (1 + (t / 300.0) ** 3 * 77.93 / 3)   # smooth stand-in, < 3R
    tracemalloc.start()
    r = third_law_from_data(t, c, t, 0.001 * c, atoms=1)
    peak = tracemalloc.get_traced_memory()[1]
    tracemalloc.stop()
    assert np.all(np.diff(r["entropy"]) > 0) and np.all(r["entropy_uncertainty"] > 0)
    return peak


def test_six_thousand_rows_cost_memory_linear_in_rows():
    # Issue 26: 6,000 rows took 4.7 GB and 73 s (an N × N identity matrix splined; N × N alone is 288 MB).
    # Now the peak grows linearly: doubling the rows at most 2.5× the peak, and 6,000 rows under 100 MB.
    small, large = _peak_bytes(3000), _peak_bytes(6000)
    assert large < 100e6
    assert large < 2.5 * small


def test_uncertainty_column_is_registered_and_written(tmp_path, capsys):
    t, c = _debye_rows()
    path = tmp_path / "d.csv"
    path.write_text("T (K),Cp (J/(mol K)),u\n" + "".join(f"{a:g},{b:.8g},{1e-3 * b:.3g}\n" for a, b in zip(t, c)))
    assert main(["calorimetry", str(path), "--atoms", "1", "--format", "csv"]) == 0
    header = next(line for line in capsys.readouterr().out.splitlines() if not line.startswith("#"))
    assert "entropy_third_law_error_J_per_mol_K" in header and "enthalpy_from_zero_error_kJ_per_mol" in header
    report, _, third = analyse(read_heat_capacity(path), HeatCapacityModel(atoms=1))
    assert np.all(third["entropy_third_law_error_J_per_mol_K"] > 0)
    json.dumps(report, allow_nan=False)
