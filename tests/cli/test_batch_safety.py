"""``batch`` safety: the index never collides with a table, no writing through symbolic links,
arguments are always paths, and index cells are inert (OWASP CSV-injection guidance,
owasp.org/www-community/attacks/CSV_Injection).  Input spectra are invented (Debye ν² form);
the Dulong–Petit check is common practice (C_v -> 3R per atom, R from scipy.constants/CODATA).
"""

from __future__ import annotations

import csv
from pathlib import Path

import numpy as np
import pytest
from scipy import constants as sc

from thermo.batch import INDEX_NAME, BatchOptions, run_batch
from thermo.cli.main import main
from thermo.io.readback import read_exported_csv


def _debye_text(cutoff_thz=5.0, points=200):
    nu = np.linspace(0.0, cutoff_thz, points)
    return "# frequency (THz) dos\n" + "\n".join(f"{a:.8g} {9 * a * a / cutoff_thz ** 3:.8g}" for a in nu) + "\n"


def _index(out):
    with open(out / INDEX_NAME, newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


@pytest.mark.parametrize("force", [False, True])
def test_input_named_index_does_not_collide(tmp_path, force):
    src = tmp_path / "in"
    src.mkdir()
    (src / "index.dat").write_text(_debye_text())
    (src / "INDEX.txt").write_text(_debye_text(6.0))
    out = tmp_path / "out"
    rows = run_batch([src], out, BatchOptions(temperatures=(3000.0,), force=force), workers=1)
    names = {Path(r["input"]).name: r["output"] for r in rows}
    assert names == {"INDEX.txt": "INDEX-2.csv", "index.dat": "index-3.csv"}   # letter case does not count
    index = _index(out)
    assert len(index) == 2 and {r["status"] for r in index} == {"ok"}
    table, _ = read_exported_csv(out / names["index.dat"])
    cv = table["heat_capacity_v_J_per_mol_K"].iloc[-1]
    assert abs(cv - 3 * sc.R) < 0.01 * 3 * sc.R     # one atom at 3000 K: Dulong–Petit


def test_force_never_writes_through_a_symlink(tmp_path):
    src = tmp_path / "in"
    src.mkdir()
    (src / "a.dat").write_text(_debye_text())
    outside = tmp_path / "precious.txt"
    outside.write_text("keep me")
    out = tmp_path / "out"
    out.mkdir()
    (out / "a.csv").symlink_to(outside)
    rows = run_batch([src], out, BatchOptions(temperatures=(300.0,), force=True), workers=1)
    assert outside.read_text() == "keep me"
    assert rows[0]["status"] == "failed" and "symbolic link" in rows[0]["error"]


def test_force_never_writes_the_index_through_a_symlink(tmp_path):
    src = tmp_path / "in"
    src.mkdir()
    (src / "a.dat").write_text(_debye_text())
    outside = tmp_path / "precious.txt"
    outside.write_text("keep me")
    out = tmp_path / "out"
    out.mkdir()
    (out / INDEX_NAME).symlink_to(outside)
    assert main(["batch", str(src), "--output", str(out), "--force", "--workers", "1"]) == 2
    assert outside.read_text() == "keep me"


def test_cli_argument_with_newline_is_a_path_not_text(tmp_path, capsys):
    text = _debye_text()
    assert main(["table", text]) == 2
    err = capsys.readouterr().err
    assert err.startswith("error: ") and err.count("\n") == 1 and "cannot read file" in err
    out = tmp_path / "out"
    assert main(["batch", text, "--output", str(out), "--workers", "1"]) == 2
    assert not (out / INDEX_NAME).exists()


def test_file_name_with_newline_is_read_as_a_file(tmp_path, capsys):
    weird = tmp_path / "two\nlines.dat"
    weird.write_text(_debye_text())
    assert main(["table", str(weird), "--temperatures", "300"]) == 0
    out = tmp_path / "out"
    assert main(["batch", str(weird), "--output", str(out), "--workers", "1", "--temperatures", "300"]) == 0
    assert [r["status"] for r in _index(out)] == ["ok"]


def test_index_cells_are_inert(tmp_path):
    src = tmp_path / "in"
    src.mkdir()
    (src / "=HYPERLINK(1).dat").write_text(_debye_text())
    (src / "@bad.dat").write_text("# frequency (THz) dos\n0 0\n1 =1+1\n")
    out = tmp_path / "out"
    run_batch([src], out, BatchOptions(temperatures=(300.0,)), workers=1)
    with open(out / INDEX_NAME, newline="", encoding="utf-8") as handle:
        cells = [c for row in csv.reader(handle) for c in row]
    assert not [c for c in cells if c.startswith(("=", "+", "-", "@", "\t", "\r"))]
    assert any(c.startswith("'=") for c in cells) and any(c.startswith("'@") for c in cells)


def test_text_outputs_never_write_through_a_symlink(tmp_path):
    # polynomial and calorimetry write their text through the same guarded writer as tables
    outside = tmp_path / "precious.txt"
    outside.write_text("keep me")
    link = tmp_path / "fit.json"
    link.symlink_to(outside)
    sample = Path(__file__).resolve().parents[2] / "sample_dos"
    assert main(["polynomial", str(sample / "springium_fcc.dat"), "--form", "shomate",
                 "--output", str(link), "--force"]) == 2
    assert main(["calorimetry", str(sample / "measured" / "springium_cp.csv"),
                 "--output", str(link), "--force"]) == 2
    assert outside.read_text() == "keep me"
