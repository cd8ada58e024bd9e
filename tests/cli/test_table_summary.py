"""Command line: table, summary, exports round trip, errors as one line."""

from __future__ import annotations

import json
import subprocess
import sys

import numpy as np
import pandas as pd
import pytest

from tests.spectra import debye_table, dos_text
from thermo import load_dos, tabulate
from thermo.io.writers import read_exported_csv, read_exported_json

ROOT = __import__("pathlib").Path(__file__).resolve().parents[2]


def run_cli(*args):
    return subprocess.run([sys.executable, "-m", "thermo", *args], capture_output=True, text=True, cwd=ROOT)


@pytest.fixture
def debye_file(tmp_path):
    path = tmp_path / "debye.dat"
    path.write_text(dos_text(*debye_table(380.0, points=801)))
    return path


def test_table_csv_to_stdout_equals_tabulate(debye_file):
    out = run_cli("table", str(debye_file), "--temperatures", "0:300:50")
    assert out.returncode == 0, out.stderr
    df, info = read_exported_csv(out.stdout)
    expected = tabulate(load_dos(debye_file), np.arange(0, 301, 50.0))
    assert list(df.columns) == list(expected.columns)
    assert np.allclose(df.to_numpy(), expected.to_numpy(), rtol=1e-12)
    assert info["input_sha256"] and info["atoms"] == 1 and info["frequency_unit"] == "THz"
    assert "inferred" in out.stderr  # warnings go to stderr


@pytest.mark.parametrize("fmt", ["json", "xlsx"])
def test_table_files_round_trip(debye_file, tmp_path, fmt):
    target = tmp_path / f"out.{fmt}"
    out = run_cli("table", str(debye_file), "--temperatures", "10,100,298.15", "--per", "atom",
                  "--format", fmt, "--output", str(target))
    assert out.returncode == 0, out.stderr
    expected = tabulate(load_dos(debye_file), [10, 100, 298.15], per="atom")
    if fmt == "json":
        df, info = read_exported_json(target)
        assert info["basis"] == "atom"
    else:
        df = pd.read_excel(target, sheet_name="table")
    assert np.allclose(df.to_numpy(dtype=float), expected.to_numpy(), rtol=1e-12)
    again = run_cli("table", str(debye_file), "--format", fmt, "--output", str(target))
    assert again.returncode == 2 and "overwrite" in again.stderr and "--force" in again.stderr


def test_summary_keys(debye_file):
    out = run_cli("summary", str(debye_file))
    assert out.returncode == 0, out.stderr
    data = json.loads(out.stdout)
    for key in ("atoms", "raw_integral", "negative_mode_fraction", "zero_point_energy_kJ_per_mol",
                "low_frequency_debye_temperature_K", "estimated_relative_error"):
        assert key in data
    # Debye: low-frequency θ_D equals θ; ZPE = 9Rθ/8 (closed form).
    assert data["low_frequency_debye_temperature_K"] == pytest.approx(380.0, rel=1e-5)
    assert data["zero_point_energy_kJ_per_mol"] == pytest.approx(9 * 8.314462618 * 380 / 8 / 1e3, rel=1e-5)


@pytest.mark.parametrize("content, args", [
    ("not a dos file at all\n", []),
    ("frequency_THz total\n1 2\n3 abc\n" + "\n".join(f"{i} 1" for i in range(4, 20)), []),
    (None, ["--freq-unit", "parsec"]),
    (None, ["--temperatures", "5:1"]),
    (None, ["--per", "gram"]),
])
def test_bad_input_exits_2_with_one_line(tmp_path, debye_file, content, args):
    path = debye_file
    if content is not None:
        path = tmp_path / "bad.dat"
        path.write_text(content)
    out = run_cli("table", str(path), *args)
    assert out.returncode == 2
    lines = [ln for ln in out.stderr.splitlines() if ln.startswith("error:")]
    assert len(lines) == 1 and "Traceback" not in out.stderr


def test_missing_file_is_one_line(tmp_path):
    out = run_cli("summary", str(tmp_path / "nope.dat"))
    assert out.returncode == 2 and "Traceback" not in out.stderr and out.stderr.count("\n") == 1


def test_line_number_in_error_message(tmp_path):
    path = tmp_path / "bad.dat"
    path.write_text("# c\nfrequency_THz total\n" + "\n".join(f"{i} {i}" for i in range(12)) + "\n12 x\n")
    out = run_cli("table", str(path))
    assert "line 15" in out.stderr
