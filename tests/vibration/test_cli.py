"""``modeheat displacements`` and ``modeheat elastic`` end to end (in-process and one subprocess)."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from tests.spectra import debye_table, dos_text
from tests.vibration.test_displacements import MASS, THETA, willis_pryor_msd
from thermo.cli.main import main
from thermo.io.readback import read_exported_csv

REPO = Path(__file__).resolve().parents[2]


@pytest.fixture
def debye_file(tmp_path):
    path = tmp_path / "debye.dat"
    path.write_text(dos_text(*debye_table(THETA)))   # invented test spectrum, one atom
    return path


def test_displacements_csv_matches_willis_pryor(debye_file, tmp_path, capsys):
    # Willis and Pryor (1975) eq. 4.66 evaluated with mpmath (see test_displacements.py).
    out = tmp_path / "u.csv"
    rc = main(["displacements", str(debye_file), "--masses", f"X={MASS}", "--temperatures", "0,32,320,960",
               "--lattice", "fcc:2.0", "--output", str(out)])
    assert rc == 0
    table, meta = read_exported_csv(out.read_bytes())
    want = [willis_pryor_msd(r) for r in (0.0, 0.1, 1.0, 3.0)]
    np.testing.assert_allclose(table["mean_square_displacement_A2"], want, rtol=1e-5)
    np.testing.assert_allclose(table["debye_waller_temperature_K"], THETA, rtol=1e-4)
    assert "Lindemann" in capsys.readouterr().err          # d = 1.41 Å: ratio above 0.1 at 960 K
    assert any("Lindemann" in w for w in meta["warnings"])
    assert meta["convention"].startswith("⟨u²⟩ is the total")


def test_displacements_refuses_bad_input_with_one_line(debye_file, capsys):
    assert main(["displacements", str(debye_file)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert err[-1].startswith("error: ") and "mass" in err[-1]
    assert main(["displacements", str(debye_file), "--masses", "X=-3"]) == 2
    assert main(["displacements", str(debye_file), "--masses", "X=3", "--species-columns", "Q"]) == 2
    assert "no partial-DOS column Q" in capsys.readouterr().err


def test_elastic_json_and_comparison(tmp_path, capsys):
    # Aluminium, 0 K constants (from memory, see test_elastic.py): θ_D ≈ 428 K within 1 %.
    dos = tmp_path / "d.dat"
    dos.write_text(dos_text(*debye_table(428.0)))
    rc = main(["elastic", "--c11", "114.3", "--c12", "61.92", "--c44", "31.62", "--density", "2.733",
               "--formula", "Al", "--dos", str(dos)])
    assert rc == 0
    rec = json.loads(capsys.readouterr().out)
    assert rec["elastic_theta_K"] == pytest.approx(428.0, rel=0.01)
    assert rec["comparison"]["dos_K"] == pytest.approx(428.0, rel=1e-6)
    assert abs(rec["comparison"]["relative_difference"]) < 0.01


def test_elastic_errors_exit_2_without_traceback():
    proc = subprocess.run([sys.executable, "-m", "thermo", "elastic", "--c11", "100", "--c12", "120",
                           "--c44", "3", "--density", "2", "--formula", "Al"],
                          cwd=REPO, capture_output=True, text=True, env={"PYTHONPATH": str(REPO), "PATH": ""})
    assert proc.returncode == 2
    assert proc.stderr.count("\n") == 1 and "Born stability" in proc.stderr and "Traceback" not in proc.stderr
