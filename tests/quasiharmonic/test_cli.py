"""``modeheat quasiharmonic`` on the demo volume set and on refused input."""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest

from tests.quasiharmonic.test_volume_set import write_set
from thermo.cli.main import main
from thermo.io.readback import read_exported_csv

DEMO = Path(__file__).resolve().parents[2] / "sample_dos" / "volumes" / "springium_volumes.csv"
REQUIRED = ["temperature_K", "volume_A3", "thermal_expansion_per_K", "bulk_modulus_T_GPa",
            "heat_capacity_p_J_per_mol_K", "heat_capacity_v_J_per_mol_K", "entropy_J_per_mol_K",
            "gibbs_energy_kJ_per_mol"]


def test_csv_has_named_columns_and_provenance(tmp_path, capsys):
    out = tmp_path / "qh.csv"
    assert main(["quasiharmonic", str(DEMO), "--temperatures", "0:600:50", "--output", str(out)]) == 0
    table, info = read_exported_csv(out.read_bytes())
    assert set(REQUIRED) <= set(table.columns) and table.columns[0] == "temperature_K"
    assert info["tool"] == "modeheat" and info["inputs"][0]["name"] == "springium_volumes.csv"
    # the manifest, then every DOS file with its own SHA-256
    assert len(info["inputs"]) == 12 and len({i["sha256"] for i in info["inputs"]}) == 12
    assert len(info["volumes"]) == 11 and info["settings"]["equation_of_state"] == "birch-murnaghan"
    assert any("melting" in c for c in info["cautions"])
    # Common practice: C_p >= C_v, and both approach 3R = 24.94 J/(mol K) per atom from either side.
    assert np.all(table.heat_capacity_p_J_per_mol_K >= table.heat_capacity_v_J_per_mol_K - 1e-12)
    assert 24.0 < table.heat_capacity_v_J_per_mol_K.iloc[-1] < 24.95
    assert "rms residual" in capsys.readouterr().err


def test_json_and_vinet_and_pressure(capsys):
    assert main(["quasiharmonic", str(DEMO), "--temperatures", "300", "--eos", "vinet", "--format", "json"]) == 0
    assert json.loads(capsys.readouterr().out)["provenance"]["settings"]["equation_of_state"] == "vinet"
    assert main(["quasiharmonic", str(DEMO), "--temperatures", "300", "--format", "json"]) == 0
    at_zero = json.loads(capsys.readouterr().out)
    assert main(["quasiharmonic", str(DEMO), "--temperatures", "300", "--pressure", "2", "--format", "json"]) == 0
    at_two = json.loads(capsys.readouterr().out)
    col, bcol = at_zero["columns"].index("volume_A3"), at_zero["columns"].index("bulk_modulus_T_GPa")
    # d ln V = -dp / B_T (definition of B_T) integrated with B_T linear in p between the two runs
    # (Murnaghan, Proc. Natl. Acad. Sci. 30, 244 (1944)): ln(V_2/V_0) = -ln(B_2/B_0) / B', B' = ΔB/Δp
    b0, b2 = at_zero["data"][0][bcol], at_two["data"][0][bcol]
    change = np.log(at_two["data"][0][col] / at_zero["data"][0][col])
    assert change == pytest.approx(-np.log(b2 / b0) / ((b2 - b0) / 2.0), rel=1e-3)
    assert b2 > b0


def test_four_volumes_exit_2_one_line(tmp_path, capsys):
    from tests.quasiharmonic import debye_solid as ds
    path = write_set(tmp_path, volumes=ds.VOLUMES[:4])
    assert main(["quasiharmonic", str(path)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "at least 5" in err[0]


def test_outside_range_warned_on_stderr(capsys):
    assert main(["quasiharmonic", str(DEMO), "--temperatures", "300", "--pressure", "30"]) == 0
    captured = capsys.readouterr()
    assert "leaves the sampled range" in captured.err
    assert captured.out.strip().splitlines()[-1].endswith("True")


def test_default_grid_has_the_standard_temperature(capsys):
    # Common practice in thermochemical tables: a row at 298.15 K (issue 29).
    assert main(["quasiharmonic", str(DEMO), "--format", "json"]) == 0
    record = json.loads(capsys.readouterr().out)
    temperatures = [row[0] for row in record["data"]]
    assert 298.15 in temperatures and temperatures[-1] == 1000.0 and temperatures == sorted(temperatures)


def test_errors_option_adds_error_columns_and_their_record(tmp_path, capsys):
    out = tmp_path / "qh.csv"
    assert main(["quasiharmonic", str(DEMO), "--temperatures", "100,298.15,600", "--errors", "--output", str(out)]) == 0
    table, info = read_exported_csv(out.read_bytes())
    for column in ("volume_error_A3", "thermal_expansion_error_per_K", "bulk_modulus_T_error_GPa",
                   "heat_capacity_p_error_J_per_mol_K", "gibbs_energy_error_kJ_per_mol", "gruneisen_parameter_error"):
        assert column in table.columns and (table[column] > 0).all(), column
    assert set(info["uncertainty"]["parts"]) == {"harmonic", "equation_of_state", "volume_sampling", "edge"}
    assert info["uncertainty"]["largest_relative"]["thermal_expansion"]["total"] > 0
    assert main(["quasiharmonic", str(DEMO), "--temperatures", "300"]) == 0
    assert "volume_error_A3" not in capsys.readouterr().out
