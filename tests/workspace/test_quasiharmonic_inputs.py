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


def test_manifest_entries_use_each_dataset_stored_reading_options(tmp_path):
    """Issue 25 (seams): a ``ws:`` entry is read with the options it was stored with, as ``table ws:X`` is.

    The DOS files lose their unit header and are stored with ``--freq-unit THz``; the manifest naming
    them must give the table of the original files (truth: the same run on the files with their header).
    """
    store = tmp_path / "w.sqlite"
    manifest = VOLUMES / "springium_volumes.csv"
    lines = manifest.read_text().splitlines()
    bare = []
    for path in sorted(VOLUMES.glob("springium_v*.dat")):
        rows = [r for r in path.read_text().splitlines() if r and not r.startswith("#")][1:]
        target = tmp_path / path.name
        target.write_text("\n".join(rows) + "\n")       # numbers only: no unit anywhere
        bare.append(target)
    code, _, err = _run("workspace", "add", *bare, "--freq-unit", "THz", "--workspace", store)
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
