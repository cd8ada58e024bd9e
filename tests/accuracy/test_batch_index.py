"""batch's index.csv carries each file's key numbers (issue 23): C_v and S at 298.15 K with their
estimated errors, the low-frequency θ_D and the table's worst relative error.

The files are DOS files of the spring-model test crystal (tests/crystal.py; exact values from a
q-sphere integral near Γ plus a fine mesh, Ashcroft & Mermin 1976 ch. 23 for the T³ limit).
"""

import csv

import numpy as np
import pytest

from tests import crystal as C
from thermo import load_dos
from thermo.batch import INDEX_NAME, BatchOptions, run_batch
from thermo.tables import tabulate


def test_index_has_the_key_numbers_and_their_errors_cover_the_exact_values(tmp_path):
    src = tmp_path / "in"
    src.mkdir()
    for n in (8, 16):
        (src / f"bcc{n}.dat").write_text(C.dos_text(*C.gaussian_dos(C.BCC, n, 0.12)))
    out = tmp_path / "out"
    run_batch([str(src)], str(out), BatchOptions(temperatures=(5.0, 298.15), reading={"atoms": 1}),
              workers=1, progress=False)
    with open(out / INDEX_NAME, newline="", encoding="utf-8") as handle:
        rows = list(csv.DictReader(handle))
    exact = C.reference(C.BCC, [298.15])
    for row in rows:
        assert row["status"] == "ok"
        table = tabulate(load_dos(src / row["input"], atoms=1), [298.15])
        s, ds = float(row["entropy_298K_J_per_mol_K"]), float(row["entropy_298K_error_J_per_mol_K"])
        cv, dcv = float(row["heat_capacity_v_298K_J_per_mol_K"]), float(row["heat_capacity_v_298K_error_J_per_mol_K"])
        assert s == pytest.approx(table.entropy_J_per_mol_K[0], rel=1e-12)
        assert abs(s - exact["entropy"][0]) <= ds and abs(cv - exact["heat_capacity_v"][0]) <= dcv
        assert float(row["estimated_relative_error"]) > 0.01          # the 5 K row is not determined by an 8³-16³ mesh
    theta = [row["low_frequency_debye_temperature_K"] for row in rows]
    assert theta[0] == "" or np.isfinite(float(theta[0]))             # 8³: no ν² fit, so no θ_D


@pytest.mark.parametrize("temperatures", [(5.0, 298.15), (0.0, 100.0, 500.0)])
def test_one_error_breakdown_per_file(tmp_path, monkeypatch, temperatures):
    # issue 30 (bench P7): the provenance and the index's 298.15 K errors read one breakdown per file,
    # with or without 298.15 K in the table's temperatures; the index's errors equal a breakdown at 298.15 K
    from thermo.accuracy import breakdown as module
    from thermo.accuracy.rows import harmonic_row_errors
    src = tmp_path / "in"
    src.mkdir()
    (src / "bcc8.dat").write_text(C.dos_text(*C.gaussian_dos(C.BCC, 8, 0.12)))
    calls = []
    original = module.error_breakdown

    def counted(dos, t):
        calls.append(len(t))
        return original(dos, t)
    monkeypatch.setattr(module, "error_breakdown", counted)
    monkeypatch.setattr("thermo.accuracy.reuse.error_breakdown", counted)
    run_batch([str(src)], str(tmp_path / "out"), BatchOptions(temperatures=temperatures, reading={"atoms": 1}),
              workers=1, progress=False)
    assert len(calls) == 1
    with open(tmp_path / "out" / INDEX_NAME, newline="", encoding="utf-8") as handle:
        row = next(csv.DictReader(handle))
    alone = harmonic_row_errors(load_dos(src / "bcc8.dat", atoms=1), [298.15])
    for key in ("heat_capacity_v", "entropy"):
        assert float(row[f"{key}_298K_error_J_per_mol_K"]) >= alone[key][0] * (1 - 1e-9)
