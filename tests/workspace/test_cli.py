"""``modeheat workspace add|list|export|remove|spaces`` and ``ws:`` inputs of ``table``/``models``."""

import csv
import hashlib
import io
import json

import numpy as np
from scipy import constants as sc

from thermo.workspace import Workspace

from .helpers import cli, debye_text, write_files


def test_add_twice_lists_once_with_sha_and_settings(tmp_path):
    files = write_files(tmp_path / "in", 3)
    w = tmp_path / "w.sqlite"
    first = cli("workspace", "add", *files, "--workspace", w, "--atoms", "1", "--group", "mesh")
    assert first.returncode == 0, first.stderr
    assert "added 3, already present 0" in first.stderr
    again = cli("workspace", "add", tmp_path / "in", "--workspace", w, "--atoms", "1")
    assert again.returncode == 0 and "added 0, already present 3" in again.stderr
    listed = cli("workspace", "list", "--format", "json", "--workspace", w)
    rows = json.loads(listed.stdout)
    assert [r["name"] for r in rows] == [p.name for p in files]
    for r, p in zip(rows, files):
        # FIPS 180-4 SHA-256, computed independently from the file on disk
        assert r["sha256"] == hashlib.sha256(p.read_bytes()).hexdigest()
        assert r["settings"]["atoms"] == 1 and r["group"] == "mesh" and r["added_utc"].endswith("Z")
    table = list(csv.DictReader(io.StringIO(cli("workspace", "list", "--format", "csv", "--workspace", w).stdout)))
    assert [t["sha256"] for t in table] == [r["sha256"] for r in rows] and table[0]["negative"] == "drop"


def test_add_refuses_a_bad_file_but_keeps_the_good(tmp_path):
    good = write_files(tmp_path, 1)[0]
    bad = tmp_path / "bad.dat"
    bad.write_text("# frequency (THz) dos\n0 0\n1 banana\n")
    w = tmp_path / "w.sqlite"
    r = cli("workspace", "add", good, bad, "--workspace", w)
    assert r.returncode == 2 and "bad.dat, line 3" in r.stderr and "Traceback" not in r.stderr
    assert [d.name for d in Workspace(w).local().datasets()] == [good.name]


def test_export_gives_the_original_bytes(tmp_path):
    src = write_files(tmp_path, 1)[0]
    w = tmp_path / "w.sqlite"
    cli("workspace", "add", src, "--name", "mesh 8", "--workspace", w)
    out = tmp_path / "back.dat"
    assert cli("workspace", "export", "mesh 8", "--output", out, "--workspace", w).returncode == 0
    assert out.read_bytes() == src.read_bytes()
    refused = cli("workspace", "export", "mesh 8", "--output", out, "--workspace", w)
    assert refused.returncode == 2 and "--force" in refused.stderr
    missing = cli("workspace", "export", "nothing", "--output", tmp_path / "n.dat", "--workspace", w)
    assert missing.returncode == 2 and missing.stderr.count("\n") == 1 and "no dataset 'nothing'" in missing.stderr


def test_remove_by_id(tmp_path):
    files = write_files(tmp_path, 2)
    w = tmp_path / "w.sqlite"
    cli("workspace", "add", *files, "--workspace", w)
    first = Workspace(w).local().datasets()[0]
    assert cli("workspace", "remove", first.id, "--workspace", w).returncode == 0
    assert [d.name for d in Workspace(w).local().datasets()] == [files[1].name]
    assert cli("workspace", "remove", first.id, "--workspace", w).returncode == 2


def test_spaces_prints_keys_of_named_workspaces(tmp_path):
    w = tmp_path / "w.sqlite"
    lab = Workspace(w).create_named("lab")
    Workspace(w).browser("private-browser-key")
    out = cli("workspace", "spaces", "--workspace", w).stdout
    assert f"{lab.name}\t{lab.key}" in out and lab.name.startswith("lab [") and "private-browser-key" not in out


def test_table_of_a_stored_dataset_equals_table_of_the_file(tmp_path):
    src = tmp_path / "debye.dat"
    src.write_text(debye_text(5.0, points=201))
    w = tmp_path / "w.sqlite"
    cli("workspace", "add", src, "--name", "deb", "--workspace", w)
    from_store = cli("table", "ws:deb", "--workspace", w, "--temperatures", "300,1000", "--format", "json")
    from_file = cli("table", src, "--temperatures", "300,1000", "--format", "json")
    assert from_store.returncode == 0, from_store.stderr
    a, b = json.loads(from_store.stdout), json.loads(from_file.stdout)
    assert a["columns"] == b["columns"] and a["data"] == b["data"]
    # Debye high-temperature series C/3R = 1 - x²/20 + x⁴/560, x = θ_D/T (Landau & Lifshitz,
    # Statistical Physics §64, from memory), θ_D = hν_max/k with CODATA h, k, R via scipy.constants
    x = sc.h * 5e12 / sc.k / 1000.0
    cv = [row[a["columns"].index(c)] for row in a["data"] for c in a["columns"] if c.startswith("heat_capacity")]
    assert np.isclose(cv[-1], 3 * sc.R * (1 - x ** 2 / 20 + x ** 4 / 560), rtol=2e-4)


def test_models_reads_stored_settings(tmp_path):
    src = tmp_path / "debye.dat"
    src.write_text(debye_text(5.0, points=201).replace("# frequency (THz) dos", "# frequency dos"))
    w = tmp_path / "w.sqlite"
    assert cli("workspace", "add", src, "--freq-unit", "THz", "--workspace", w).returncode == 0
    ok = cli("models", f"ws:{src.name}", "--workspace", w)
    assert ok.returncode == 0, ok.stderr
    # the unit is not in the header: without the stored setting the file itself is refused
    assert cli("models", src).returncode == 2


def test_same_file_names_in_folders_get_the_folder_name(tmp_path):
    a, b = tmp_path / "mesh8", tmp_path / "mesh12"
    for k, folder in enumerate((a, b)):
        folder.mkdir()
        (folder / "dos.dat").write_text(debye_text(tag=k))
    w = tmp_path / "w.sqlite"
    assert cli("workspace", "add", a / "dos.dat", b / "dos.dat", "--workspace", w).returncode == 0
    assert [d.name for d in Workspace(w).local().datasets()] == ["mesh8/dos.dat", "mesh12/dos.dat"]


def test_a_missing_workspace_is_not_created_by_list(tmp_path):
    w = tmp_path / "typo.sqlite"
    r = cli("workspace", "list", "--workspace", w)
    assert r.returncode == 2 and "no workspace at" in r.stderr and not w.exists()
    assert cli("table", "ws:x", "--workspace", w).returncode == 2 and not w.exists()
