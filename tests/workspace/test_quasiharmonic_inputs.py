"""A volume-set manifest whose DOS files are workspace datasets (``ws:NAME``) gives the same table as the files."""

from __future__ import annotations

import contextlib
import io
from pathlib import Path

import pandas as pd

from thermo.cli.main import main

VOLUMES = Path(__file__).resolve().parents[2] / "sample_dos" / "volumes"


def _run(*argv):
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main([str(a) for a in argv])
    return code, out.getvalue(), err.getvalue()


def test_manifest_with_workspace_datasets_equals_manifest_with_files(tmp_path):
    store = tmp_path / "w.sqlite"
    manifest = VOLUMES / "springium_volumes.csv"
    lines = manifest.read_text().splitlines()
    files = sorted(VOLUMES.glob("springium_v*.dat"))
    code, _, err = _run("workspace", "add", *files, "--workspace", store)
    assert code == 0, err
    stored = tmp_path / "from_workspace.csv"
    stored.write_text("\n".join(line.replace("springium_v", "ws:springium_v") if line.endswith(".dat") else line
                                for line in lines) + "\n")
    options = ["--temperatures", "0:600:50", "--workspace", store]
    code_a, from_files, err_a = _run("quasiharmonic", manifest, *options)
    code_b, from_store, err_b = _run("quasiharmonic", stored, *options)
    assert code_a == 0 and code_b == 0, err_a + err_b
    a = pd.read_csv(io.StringIO(from_files), comment="#")
    b = pd.read_csv(io.StringIO(from_store), comment="#")
    pd.testing.assert_frame_equal(a, b)


def test_workspace_reference_without_the_dataset_is_one_line(tmp_path):
    stored = tmp_path / "m.csv"
    stored.write_text("volume_A3,energy_eV,dos_file\n" +
                      "".join(f"{17 + k},0.0{k},ws:missing{k}\n" for k in range(5)))
    store = tmp_path / "w.sqlite"
    assert _run("workspace", "add", VOLUMES / "springium_v01.dat", "--workspace", store)[0] == 0
    code, _, err = _run("quasiharmonic", stored, "--workspace", store)
    assert code == 2 and "missing0" in err and "Traceback" not in err and len(err.strip().splitlines()) == 1
