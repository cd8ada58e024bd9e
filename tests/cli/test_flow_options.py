"""Command-line options of the workflow: every writing command takes --output/--force/--digits, the
workspace location is accepted before or after the verb, and ``batch --file-list`` reads each file
with its own options.

Outside references: Debye entropy by mpmath quadrature (P. Debye, Ann. Phys. 39, 789 (1912);
``tests.spectra.debye_entropy``); the THz → cm⁻¹ factor from CODATA c (scipy.constants).
"""

from __future__ import annotations

import json

import numpy as np
import pytest
from scipy import constants as sc

from tests.spectra import debye_entropy, debye_table
from thermo.cli.main import main, placed_global_options
from thermo.io.readback import read_exported_csv

CM1_PER_THZ = 1e12 / (sc.c * 100)


def _plain(path, nu, g):
    """A DOS file whose header states no unit (so a unit must be given)."""
    path.write_text("frequency dos\n" + "\n".join(f"{float(a)!r} {float(b)!r}" for a, b in zip(nu, g)) + "\n")
    return path


@pytest.fixture
def two_units(tmp_path):
    """Debye spectra θ = 300 K: one in THz (1 atom), one in cm⁻¹ (2 atoms, DOS per cm⁻¹)."""
    nu, g = debye_table(300.0, atoms=1)
    a = _plain(tmp_path / "a_thz.dat", nu, g)
    nu2, g2 = debye_table(300.0, atoms=2)
    b = _plain(tmp_path / "b_cm.dat", nu2 * CM1_PER_THZ, g2 / CM1_PER_THZ)
    return a, b


def _entropy_300(path):
    table, _ = read_exported_csv(path)
    row = table[np.isclose(table["temperature_K"], 300.0)]
    return float(row["entropy_J_per_mol_K"].iloc[0])


def test_batch_file_list_reads_each_file_with_its_own_unit_and_atoms(two_units, tmp_path, capsys):
    a, b = two_units
    listing = tmp_path / "files.csv"
    listing.write_text("# per-file reading options\nfile,freq_unit,atoms\na_thz.dat,THz,1\nb_cm.dat,cm-1,2\n")
    out = tmp_path / "out"
    assert main(["batch", "--file-list", str(listing), "--output", str(out), "--temperatures", "100:300:100",
                 "--workers", "1"]) == 0
    # Debye (1912) by mpmath: per mole of atoms; the 2-atom file per formula unit is twice that
    expected = debye_entropy(300.0, 300.0)
    assert _entropy_300(out / "a_thz.csv") == pytest.approx(expected, rel=2e-4)
    assert _entropy_300(out / "b_cm.csv") == pytest.approx(2 * expected, rel=2e-4)
    # one unit for both files (the old way) reads the cm⁻¹ file wrongly
    assert main(["batch", str(a), str(b), "--freq-unit", "THz", "--output", str(tmp_path / "one"),
                 "--temperatures", "100:300:100", "--workers", "1"]) in (0, 1)
    wrong = tmp_path / "one" / "b_cm.csv"
    assert not wrong.exists() or abs(_entropy_300(wrong) - 2 * expected) > 0.1 * expected


@pytest.mark.parametrize("text, message", [
    ("file,unit\na_thz.dat,THz\n", "unknown column 'unit'"),
    ("name,atoms\na_thz.dat,1\n", "needs a 'file' column"),
    ("file,atoms\na_thz.dat,1.5\n", "line 2: atoms per formula unit must be a whole number"),
    ("file,atoms\nmissing.dat,1\n", "line 2: no such file"),
])
def test_batch_file_list_errors_name_the_line(two_units, tmp_path, capsys, text, message):
    listing = tmp_path / "files.csv"
    listing.write_text(text)
    assert main(["batch", "--file-list", str(listing), "--output", str(tmp_path / "out")]) == 2
    err = capsys.readouterr().err
    assert message in err and err.count("\n") == 1
    assert not (tmp_path / "out").exists()


def test_models_writes_to_output_refuses_overwrite_and_rounds(two_units, tmp_path, capsys):
    a, _ = two_units
    target = tmp_path / "m.json"
    assert main(["models", str(a), "--freq-unit", "THz", "--output", str(target)]) == 0
    full = json.loads(target.read_text())
    assert main(["models", str(a), "--freq-unit", "THz", "--output", str(target)]) == 2
    assert "refusing to overwrite" in capsys.readouterr().err
    assert main(["models", str(a), "--freq-unit", "THz", "--output", str(target), "--force", "--digits", "3"]) == 0
    short = json.loads(target.read_text())
    value = full["debye_theta_moment_2_K"]
    assert short["debye_theta_moment_2_K"] == float(f"{value:.3g}") != value
    csv_out = tmp_path / "m.csv"
    assert main(["models", str(a), "--freq-unit", "THz", "--format", "csv", "--output", str(csv_out),
                 "--digits", "5"]) == 0
    table, _ = read_exported_csv(csv_out)
    values = table.select_dtypes("number").to_numpy().ravel()
    values = values[np.isfinite(values)]
    assert all(v == float(f"{v:.5g}") for v in values) and any(v != float(f"{v:.4g}") for v in values)


@pytest.mark.parametrize("command", ["summary", "elastic", "calorimetry", "polynomial"])
def test_every_writing_command_takes_output_force_digits(command, capsys):
    from thermo.cli.main import build_parser
    sub = build_parser()._subparsers._group_actions[0].choices[command]
    assert {"--output", "--force", "--digits"} <= set(sub._option_string_actions)


def test_workspace_location_before_or_after_the_verb(two_units, tmp_path, capsys):
    a, _ = two_units
    store = tmp_path / "w.sqlite"
    assert main(["workspace", "--workspace", str(store), "add", str(a), "--freq-unit", "THz"]) == 0
    assert main(["--workspace", str(store), "workspace", "list", "--format", "json"]) == 0
    listed = json.loads(capsys.readouterr().out)
    assert [d["name"] for d in listed] == ["a_thz.dat"]
    assert main(["--space=other", "workspace", "--workspace", str(store), "list", "--format", "json"]) == 0
    assert json.loads(capsys.readouterr().out) == []
    assert main(["--workspace", str(store), "table", "ws:a_thz.dat", "--temperatures", "300"]) == 0


def test_placed_global_options_leaves_other_lines_alone():
    line = ["table", "x.dat", "--workspace", "w", "--per", "atom"]
    assert placed_global_options(line) == line
    assert placed_global_options(["--version"]) == ["--version"]
