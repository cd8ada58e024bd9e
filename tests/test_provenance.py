"""Every export carries the one provenance record of :mod:`thermo.provenance`.

The SHA-256 of each input is checked against :mod:`hashlib` over the file's
bytes (an independent computation), and each export is read back the way a user
would (CSV lines, JSON, YAML comment).
"""

from __future__ import annotations

import datetime
import hashlib
import json
from pathlib import Path

import pytest

from thermo.cli.main import main
from thermo.io.readback import read_exported_csv, read_exported_json
from thermo.provenance import COMMON_KEYS, input_record, provenance_record

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "sample_dos"
DOS = DEMO / "springium_fcc.dat"
MEASURED = DEMO / "measured" / "springium_cp.csv"
MANIFEST = DEMO / "volumes" / "springium_volumes.csv"


def sha256(path):
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


def check_record(record, files, settings=()):
    """The common keys in order, a parseable UTC time, and one input per file with its SHA-256."""
    assert list(record)[:len(COMMON_KEYS)] == list(COMMON_KEYS)
    assert record["tool"] == "modeheat" and record["version"]
    created = datetime.datetime.fromisoformat(record["created_utc"])
    assert created.utcoffset() == datetime.timedelta(0)
    assert [i["sha256"] for i in record["inputs"]] == [sha256(f) for f in files]
    assert all(isinstance(i["options"], dict) for i in record["inputs"])
    assert set(settings) <= set(record["settings"])
    assert isinstance(record["warnings"], list)


def run(capsys, *argv):
    assert main([str(a) for a in argv]) == 0
    return capsys.readouterr().out


def test_details_may_not_replace_common_keys():
    with pytest.raises(ValueError, match="tool"):
        provenance_record(tool="another")
    assert provenance_record(scale_factor=2.0)["scale_factor"] == 2.0


def test_input_record_hashes_bytes_and_paths(tmp_path):
    path = tmp_path / "x.dat"
    path.write_bytes(b"0 0\n1 3\n")
    by_path = input_record("x.dat", data=path)
    assert by_path == input_record("x.dat", data=path.read_bytes())
    assert by_path["sha256"] == sha256(path)


def test_table_csv(capsys):
    _, info = read_exported_csv(run(capsys, "table", DOS, "--temperatures", "0:300:100"))
    check_record(info, [DOS], ["basis", "formula", "temperatures_K"])
    assert info["settings"]["temperatures_K"] == {"min": 0.0, "max": 300.0, "points": 4}
    assert info["inputs"][0]["options"]["frequency_unit"] == "THz"


def test_models_json_and_csv(capsys):
    report = json.loads(run(capsys, "models", DOS, "--format", "json"))
    check_record(report["provenance"], [DOS], ["fit_range_K", "optical_terms"])
    _, info = read_exported_csv(run(capsys, "models", DOS, "--format", "csv", "--temperatures", "0:300:100"))
    check_record(info, [DOS], ["fit_range_K", "optical_terms", "temperatures_K"])
    assert info["debye_theta_K"] > 0


def test_quasiharmonic_records_manifest_and_every_dos(capsys):
    _, info = read_exported_csv(run(capsys, "quasiharmonic", MANIFEST, "--temperatures", "0:300:150"))
    volumes = sorted(MANIFEST.parent.glob("springium_v*.dat"))
    check_record(info, [MANIFEST, *volumes], ["equation_of_state", "pressure_GPa", "basis"])
    assert [i["role"] for i in info["inputs"]][0] == "manifest"


def test_calorimetry_records_the_measured_file_and_its_dos(capsys):
    report = json.loads(run(capsys, "calorimetry", MEASURED, "--dos", DOS))
    check_record(report["provenance"], [MEASURED, DOS], ["model", "fixed", "fit_range_K"])
    assert [i["role"] for i in report["provenance"]["inputs"]] == ["measured heat capacity", "lattice DOS"]
    _, info = read_exported_csv(run(capsys, "calorimetry", MEASURED, "--dos", DOS, "--format", "csv"))
    check_record(info, [MEASURED, DOS])


@pytest.mark.parametrize("fmt", ["json", "csv", "yaml"])
def test_polynomial_exports(capsys, fmt):
    text = run(capsys, "polynomial", DOS, "--format", fmt, "--formula", "Ar")
    if fmt == "json":
        record = json.loads(text)["provenance"]
    elif fmt == "csv":
        record = read_exported_csv(text)[1]
    else:
        first = text.splitlines()[0]
        assert first.startswith("# provenance: ")
        record = json.loads(first[len("# provenance: "):])
    check_record(record, [DOS], ["form", "range_K", "phase", "formula"])


def test_polynomial_from_a_cp_table_records_the_table(capsys, tmp_path):
    table = tmp_path / "cp.json"
    table.write_text(run(capsys, "table", DOS, "--format", "json", "--temperatures", "200:1600:10,298.15"))
    record = json.loads(run(capsys, "polynomial", table, "--cp-table"))["provenance"]
    check_record(record, [table])
    assert record["inputs"][0]["role"] == "heat-capacity table"


def test_displacements_and_batch(capsys, tmp_path):
    out = tmp_path / "u.json"
    run(capsys, "displacements", DOS, "--masses", "X=40", "--temperatures", "0,300", "--output", out)
    _, info = read_exported_json(out)
    check_record(info, [DOS], ["basis", "masses_amu", "nearest_neighbour_distance_A"])
    batch = tmp_path / "batch"
    assert main(["batch", str(DOS), "--output", str(batch), "--workers", "1", "--temperatures", "0:300:100"]) == 0
    _, info = read_exported_csv(batch / "springium_fcc.csv")
    check_record(info, [DOS], ["basis"])
