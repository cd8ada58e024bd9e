"""Command line: table, summary, exports round trip, errors as one line."""

from __future__ import annotations

import hashlib
import json

import numpy as np
import pandas as pd
import pytest

from tests.clirun import run_main
from tests.spectra import debye_table, dos_text
from thermo import load_dos, tabulate
from thermo.io.readback import read_exported_csv, read_exported_json

ROOT = __import__("pathlib").Path(__file__).resolve().parents[2]


def run_cli(*args):
    return run_main(*args)          # in this process (tests/clirun.py); smoke tests: tests/cli/test_smoke.py


@pytest.fixture
def debye_file(tmp_path):
    path = tmp_path / "debye.dat"
    path.write_text(dos_text(*debye_table(380.0, points=801)))
    return path


def test_table_csv_to_stdout_equals_tabulate(debye_file):
    out = run_cli("table", str(debye_file), "--temperatures", "0:300:50", "--digits", "17")
    assert out.returncode == 0, out.stderr
    df, info = read_exported_csv(out.stdout)
    expected = tabulate(load_dos(debye_file), np.arange(0, 301, 50.0))
    assert list(df.columns) == list(expected.columns)
    assert np.allclose(df.to_numpy(), expected.to_numpy(), rtol=1e-15, atol=0)
    (source,) = info["inputs"]
    assert source["sha256"] == hashlib.sha256(debye_file.read_bytes()).hexdigest()
    assert source["options"]["atoms"] == 1 and source["options"]["frequency_unit"] == "THz"
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
        assert info["settings"]["basis"] == "atom"
    else:
        df = pd.read_excel(target, sheet_name="table")
    # default 8 significant digits: rounding error at most half a unit in the 8th digit
    assert np.allclose(df.to_numpy(dtype=float), expected.to_numpy(), rtol=5e-8, atol=0)
    assert not np.allclose(df.to_numpy(dtype=float), expected.to_numpy(), rtol=1e-12, atol=0)
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


def test_default_grid_has_standard_temperature_and_eight_digits(debye_file):
    out = run_cli("table", str(debye_file))
    assert out.returncode == 0, out.stderr
    df, info = read_exported_csv(out.stdout)
    t = df["temperature_K"].to_numpy()
    # our default grid: 0-1500 K every 5 K plus 298.15 K (the standard reference temperature)
    assert t[0] == 0.0 and t[-1] == 1500.0 and len(t) == 302 and 298.15 in t
    assert np.all(np.diff(t) > 0)
    assert info["significant_digits"] == 8
    body = [line for line in out.stdout.splitlines() if line and not line.startswith("#")][1:]
    digits = [len(c.lstrip("-").replace(".", "").split("e")[0].lstrip("0")) for row in body for c in row.split(",")]
    assert max(digits) == 8


@pytest.mark.parametrize("name, fmt, ok", [("t.xlsx", None, True), ("t.json", None, True),
                                            ("t.xlsx", "csv", False), ("t.txt", None, False),
                                            ("t.txt", "json", True)])
def test_format_from_output_suffix(debye_file, tmp_path, name, fmt, ok):
    target = tmp_path / name
    out = run_cli("table", str(debye_file), "--temperatures", "300", "--output", str(target),
                  *(["--format", fmt] if fmt else []))
    if not ok:
        assert out.returncode == 2 and len(out.stderr.strip().splitlines()) == 1 and not target.exists()
        return
    assert out.returncode == 0, out.stderr
    raw = target.read_bytes()
    if name.endswith(".xlsx"):
        assert raw.startswith(b"PK\x03\x04")
        assert pd.read_excel(target, sheet_name="table")["temperature_K"].tolist() == [300.0]
    else:
        assert read_exported_json(target)[0]["temperature_K"].tolist() == [300.0]


def test_serve_has_real_options():
    out = run_cli("serve", "--help")
    assert out.returncode == 0
    for option in ("--port", "--host", "--debug", "--max-upload-mb"):
        assert option in out.stdout
    bad = run_cli("serve", "--port", "0")
    assert bad.returncode == 2 and "--port" in bad.stderr


def test_wrong_unit_is_warned_on_the_command_line(debye_file):
    # THz numbers read as cm-1 (ν_max ~0.2 THz): loaded, with the unit caution on stderr
    out = run_cli("table", str(debye_file), "--freq-unit", "cm-1", "--temperatures", "298.15")
    assert out.returncode == 0
    assert "check the frequency unit" in out.stderr and "entropy at 298.15 K" in out.stderr


def test_impossible_unit_is_refused_on_the_command_line(debye_file):
    # THz numbers read as rad/s (ν_max ~1e-12 THz): refused in one line, exit 2
    out = run_cli("table", str(debye_file), "--freq-unit", "rad/s", "--temperatures", "298.15")
    assert out.returncode == 2 and "check the frequency unit" in out.stderr
    assert len(out.stderr.strip().splitlines()) == 1 and "Traceback" not in out.stderr


def test_summary_says_what_temperatures_do():
    out = run_cli("summary", "--help")
    assert "estimated_relative_error" in " ".join(out.stdout.split())
