"""``batch``: one table per DOS file, an index, bad files in the middle, no silent overwrite.

External references: the Dulong–Petit limit C_v → 3R per atom at high T (textbook
fact, e.g. Kittel, *Introduction to Solid State Physics*, 8th ed., ch. 5) and R from
CODATA via ``scipy.constants``.  The rest checks that ``batch`` writes what the
single-file ``table`` command writes, and how it treats bad input.
"""

import csv
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest
from scipy import constants as sc

from thermo import load_dos, tabulate
from thermo.batch import INDEX_COLUMNS, INDEX_NAME, BatchOptions, output_names, run_batch
from thermo.cli.main import main
from thermo.io.readback import read_exported_csv

REPO = Path(__file__).resolve().parents[2]
TEMPS = (0.0, 10.0, 100.0, 300.0, 3000.0)


def _debye_text(cutoff_thz, points=400):
    # invented Debye-like spectrum, one atom (3 modes), demo data
    nu = np.linspace(0.0, cutoff_thz, points)
    g = 9 * nu ** 2 / cutoff_thz ** 3
    return "# frequency (THz) dos\n" + "\n".join(f"{a:.8g} {b:.8g}" for a, b in zip(nu, g)) + "\n"


@pytest.fixture
def inputs(tmp_path):
    src = tmp_path / "in"
    src.mkdir()
    (src / "a.dat").write_text(_debye_text(5.0))
    (src / "b.dat").write_text(_debye_text(6.0))
    (src / "c_bad.dat").write_text("# frequency (THz) dos\n0 0\n1 oops\n2 4\n")   # bad file in the middle
    (src / "d.dat").write_text(_debye_text(7.0))
    (src / "e.dat").write_text(_debye_text(8.0))
    return src


def _index(outdir):
    with open(outdir / INDEX_NAME, newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


@pytest.mark.parametrize("workers", [1, 2])
def test_tables_and_index_with_a_bad_file_in_the_middle(inputs, tmp_path, workers):
    out = tmp_path / "out"
    rows = run_batch([inputs], out, BatchOptions(temperatures=TEMPS), workers=workers, progress=False)
    assert [r["status"] for r in rows] == ["ok", "ok", "failed", "ok", "ok"]
    assert "line 3" in rows[2]["error"] and "c_bad.dat" in rows[2]["error"]
    index = _index(out)
    assert list(index[0]) == list(INDEX_COLUMNS)
    assert [Path(r["input"]).name for r in index] == ["a.dat", "b.dat", "c_bad.dat", "d.dat", "e.dat"]
    assert index[2]["status"] == "failed" and index[2]["output"] == ""
    assert sorted(p.name for p in out.iterdir()) == ["a.csv", "b.csv", "d.csv", "e.csv", INDEX_NAME]
    for row in index:
        if row["status"] != "ok":
            continue
        assert row["atoms"] == "1" and float(row["negative_mode_fraction"]) == 0.0
        table, info = read_exported_csv(out / row["output"])
        expected = tabulate(load_dos(row["input"]), TEMPS)
        np.testing.assert_allclose(table.to_numpy(float), expected.to_numpy(float), rtol=1e-12, atol=0)
        assert [i["name"] for i in info["inputs"]] == [Path(row["input"]).name]
        # Dulong–Petit: 3R per atom at T ≫ θ_D (θ_D ≤ 400 K here, T = 3000 K)
        assert table["heat_capacity_v_J_per_mol_K"].iloc[-1] == pytest.approx(3 * sc.R, rel=2e-3)


def test_cli_exit_codes_and_no_silent_overwrite(inputs, tmp_path, capsys):
    out = tmp_path / "out"
    args = ["batch", str(inputs), "--output", str(out), "--temperatures", "0:300:100", "--workers", "2"]
    assert main(args) == 1
    err = capsys.readouterr().err
    assert "c_bad.dat" in err and "Traceback" not in err
    assert "%|" not in err                       # no progress bar when stderr is not a terminal
    before = (out / "a.csv").read_bytes()
    assert main(args) == 2                       # outputs exist: refuse, write nothing
    assert "already exist" in capsys.readouterr().err
    assert (out / "a.csv").read_bytes() == before
    (inputs / "c_bad.dat").unlink()
    assert main(args + ["--force"]) == 0
    assert all(r["status"] == "ok" for r in _index(out))


def test_bad_options_write_nothing(inputs, tmp_path, capsys):
    out = tmp_path / "out"
    assert main(["batch", str(inputs), "--output", str(out), "--per", "gram"]) == 2
    assert main(["batch", str(tmp_path / "nothing*.dat"), "--output", str(out)]) == 2
    assert main(["batch", str(inputs), "--output", str(out), "--temperatures", "5:1"]) == 2
    assert main(["batch", str(inputs), "--output", str(out), "--workers", "0"]) == 2
    assert not out.exists()
    assert capsys.readouterr().err.count("error:") == 4


def test_names_never_collide_nor_land_on_inputs(tmp_path):
    for sub in ("x", "y"):
        (tmp_path / sub).mkdir()
        (tmp_path / sub / "s.csv").write_text(_debye_text(5.0))
    # the output directory is one of the input directories: s.csv must not be replaced
    rows = run_batch([tmp_path / "x", tmp_path / "y"], tmp_path / "x",
                     BatchOptions(temperatures=(300.0,)), workers=1, progress=False)
    assert [r["output"] for r in rows] == ["s-2.csv", "s-3.csv"]
    assert (tmp_path / "x" / "s.csv").read_text() == _debye_text(5.0)
    assert output_names(["p/q.dat", "r/q.dat"], "json", tmp_path) == ["q.json", "q-2.json"]


def test_command_line_entry_point(inputs, tmp_path):
    out = tmp_path / "out"
    proc = subprocess.run([sys.executable, "-m", "thermo", "batch", str(inputs / "*.dat"), "--output", str(out),
                           "--format", "json", "--temperatures", "300"],
                          cwd=REPO, capture_output=True, text=True, timeout=120)
    assert proc.returncode == 1
    assert "4 of 5 tables written" in proc.stderr and "Traceback" not in proc.stderr
    assert sorted(p.suffix for p in out.iterdir()) == [".csv"] + [".json"] * 4


def test_progress_bar_on_a_terminal(inputs, tmp_path):
    pty = pytest.importorskip("pty")
    import fcntl
    import os
    import struct
    import termios
    main_fd, child_fd = pty.openpty()
    fcntl.ioctl(child_fd, termios.TIOCSWINSZ, struct.pack("HHHH", 40, 100, 0, 0))   # a 100-column terminal
    proc = subprocess.Popen([sys.executable, "-m", "thermo", "batch", str(inputs), "--output", str(tmp_path / "out"),
                             "--temperatures", "300"], cwd=REPO, stdout=subprocess.DEVNULL, stderr=child_fd)
    proc.wait(timeout=120)
    os.close(child_fd)
    seen = b""
    while True:
        try:
            chunk = os.read(main_fd, 4096)
        except OSError:
            break
        if not chunk:
            break
        seen += chunk
    os.close(main_fd)
    text = seen.decode("utf-8", "replace")
    assert proc.returncode == 1
    assert "5/5" in text and "file/s" in text          # tqdm's bar reached the end
    assert "c_bad.dat" in text


def test_directory_takes_known_kinds_and_reports_skipped(inputs, tmp_path):
    (inputs / "helper.py").write_text("print('not a spectrum')\n")
    (inputs / "f.dos").write_text(_debye_text(5.5))
    out = inputs / "tables"          # output folder inside the input folder
    code = subprocess.run([sys.executable, "-m", "thermo", "batch", str(inputs), "--output", str(out),
                           "--temperatures", "300"], capture_output=True, text=True, cwd=REPO)
    assert code.returncode == 1      # c_bad.dat fails, helper.py is skipped, not failed
    assert "skipped 1 file of other kinds (helper.py)" in code.stderr
    assert "5 of 6 tables written" in code.stderr
    index = _index(out)
    assert {r["status"] for r in index if r["input"].endswith("helper.py")} == {"skipped"}
    again = subprocess.run([sys.executable, "-m", "thermo", "batch", str(inputs), "--output", str(out),
                            "--temperatures", "300", "--pattern", "*.dos", "--force"],
                           capture_output=True, text=True, cwd=REPO)
    assert again.returncode == 0, again.stderr
    assert "1 of 1 table written" in again.stderr
    assert [r["status"] for r in _index(out)].count("ok") == 1
