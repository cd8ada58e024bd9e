"""``modeheat polynomial`` end to end: JSON keys, YAML loaded by Cantera, CSV, C_p-table input, one-line errors.

Reference for the YAML check: Cantera 3.2 (https://cantera.org), an
independent thermochemistry library.  Input: the invented demo DOS
``sample_dos/lightheavy_rocksalt.tsv`` (for demos; the numbers checked here
compare our own outputs with Cantera and with each other).
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest

from thermo.cli.main import main
from thermo.io.writers import export_table
from thermo.polynomials import nasa7_properties, shomate_properties
from thermo.tables import tabulate
from thermo import load_dos

DOS = str(Path(__file__).resolve().parents[2] / "sample_dos" / "lightheavy_rocksalt.tsv")


def run(capsys, *argv):
    code = main(["polynomial", *argv])
    out, err = capsys.readouterr()
    return code, out, err


@pytest.mark.parametrize("form, keys", [("shomate", "ABCDEFGH"), ("nasa7", [f"a{i}" for i in range(1, 8)]),
                                        ("sgte", "abcdef")])
def test_json_has_the_documented_shape(capsys, form, keys):
    code, out, err = run(capsys, DOS, "--form", form, "--range", "298.15:1200")
    assert code == 0
    record = json.loads(out)
    assert record["form"] == form
    assert len(record["ranges"]) == (2 if form == "nasa7" else 1)
    assert record["ranges"][0]["T_min_K"] == 298.15 and record["ranges"][-1]["T_max_K"] == 1200.0
    assert list(record["ranges"][0]["coefficients"]) == list(keys)
    assert set(record["errors"]) == {"heat_capacity_p", "enthalpy_increment", "entropy"}
    assert record["errors"]["heat_capacity_p"]["max_relative"] < 1e-3
    assert "harmonic" in err    # the caution reaches the user


def test_yaml_output_loads_in_cantera_with_the_json_values(capsys, tmp_path):
    ct = pytest.importorskip("cantera")
    args = (DOS, "--form", "nasa7", "--formula", "NaCl", "--formation-enthalpy", "-411.2", "--mid", "800")
    code, out, _ = run(capsys, *args, "--format", "yaml", "--output", str(tmp_path / "nacl.yaml"))
    assert code == 0
    species = ct.Species.list_from_yaml((tmp_path / "nacl.yaml").read_text(), section="species")[0]
    assert species.name == "NaCl(cr)" and species.composition == {"Na": 1.0, "Cl": 1.0}
    record = json.loads(run(capsys, *args)[1])
    for t in (300.0, 600.0, 1000.0, 1500.0):
        rng = record["ranges"][0 if t <= 800.0 else 1]["coefficients"]
        ours = nasa7_properties(rng, t)
        assert species.thermo.cp(t) / 1e3 == pytest.approx(float(ours["heat_capacity_p"]), rel=1e-6)
        assert species.thermo.h(t) / 1e3 == pytest.approx(float(ours["enthalpy"]), rel=1e-6)
        assert species.thermo.s(t) / 1e3 == pytest.approx(float(ours["entropy"]), rel=1e-6)
    # H(298.15) is the formation enthalpy given
    assert species.thermo.h(298.15) / 1e6 == pytest.approx(-411.2, abs=1e-6)


def test_csv_rows_are_the_coefficients(capsys):
    code, out, _ = run(capsys, DOS, "--form", "shomate", "--format", "csv")
    assert code == 0
    rows = [line.split(",") for line in out.splitlines() if not line.startswith("#")]
    # the harmonic table carries its error estimate, so each coefficient has its propagated uncertainty
    assert rows[0] == ["range", "T_min_K", "T_max_K", "coefficient", "value", "uncertainty"]
    assert [r[3] for r in rows[1:]] == list("ABCDEFGH")
    record = json.loads(run(capsys, DOS, "--form", "shomate")[1])
    assert [float(r[4]) for r in rows[1:]] == list(record["ranges"][0]["coefficients"].values())
    assert [float(r[5]) for r in rows[1:]] == list(record["ranges"][0]["coefficient_uncertainties"].values())


def test_cp_table_input_gives_the_same_fit(capsys, tmp_path):
    # the harmonic table written out and read back as a (T, C_p, S) table fits the same polynomial
    dos = load_dos(DOS)
    table = tabulate(dos, np.arange(250.0, 1601.0, 5.0))
    path = tmp_path / "cp.csv"
    path.write_bytes(export_table(table, {"note": "harmonic table"}, "csv"))
    direct = json.loads(run(capsys, DOS, "--form", "shomate")[1])
    code, out, err = run(capsys, str(path), "--cp-table", "--form", "shomate")
    assert code == 0, err
    from_table = json.loads(out)
    for t in (300.0, 700.0, 1500.0):
        a = shomate_properties(direct["ranges"][0]["coefficients"], t)
        b = shomate_properties(from_table["ranges"][0]["coefficients"], t)
        for key in ("heat_capacity_p", "entropy"):
            assert float(b[key]) == pytest.approx(float(a[key]), rel=2e-4)
    assert "taken as C_p" in err


@pytest.mark.parametrize("argv, text", [
    (("--form", "sgte", "--format", "yaml"), "no sgte model"),
    (("--format", "yaml"), "needs --formula"),
    (("--range", "900:300"), "TMIN < TMAX"),
    (("--range", "0:300"), "0 < LO < HI"),
    (("--range", "abc"), "TMIN:TMAX"),
    (("--form", "nasa7", "--mid", "2000"), "must lie inside"),
])
def test_bad_options_end_with_one_line(capsys, argv, text):
    code, out, err = run(capsys, DOS, *argv)
    assert code == 2 and out == ""
    assert err.startswith("error: ") and text in err and err.count("\n") == 1


def test_cp_table_without_entropy_needs_the_298_value(capsys, tmp_path):
    path = tmp_path / "cp.csv"
    path.write_text("temperature_K,heat_capacity_p_J_per_mol_K\n" +
                    "".join(f"{t},{25 + 0.01 * t}\n" for t in range(250, 1600, 10)))
    code, _, err = run(capsys, str(path), "--cp-table")
    assert code == 2 and "S(298.15 K)" in err
    code, out, _ = run(capsys, str(path), "--cp-table", "--entropy-298", "33.0", "--range", "298.15:1500")
    assert code == 0
    c = json.loads(out)["ranges"][0]["coefficients"]
    # C_p = 25 + 10 t exactly in the Shomate form (t = T/1000): A = 25, B = 10
    assert c["A"] == pytest.approx(25.0, rel=1e-6) and c["B"] == pytest.approx(10.0, rel=1e-6)
