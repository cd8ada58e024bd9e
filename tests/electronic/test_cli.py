"""``modeheat electronic`` and ``modeheat table --electronic``: columns, key numbers, totals, one-line errors."""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest
from scipy import constants as sc

from tests.test_provenance import check_record
from thermo.cli.main import main
from thermo.columns import column_name, lookup
from thermo.io.readback import read_exported_csv

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "sample_dos" / "electronic" / "springium_edos.dat"
PHONONS = ROOT / "sample_dos" / "springium_fcc.dat"
KB_EV = sc.k / sc.electron_volt
GAMMA_FLAT = math.pi ** 2 / 3 * KB_EV ** 2 * sc.N_A * sc.electron_volt   # J/(mol K²) per state/eV (A&M ch. 2)


@pytest.fixture
def flat(tmp_path):
    path = tmp_path / "flat.dat"
    path.write_text("E-E_F (eV) total\n" + "".join(f"{a:g} 1.5\n" for a in np.linspace(-6, 6, 121)))
    return path


def test_json_carries_the_columns_and_the_key_numbers(flat, capsys):
    assert main(["electronic", str(flat), "--temperatures", "0:300:100", "--format", "json"]) == 0
    captured = capsys.readouterr()
    out = json.loads(captured.out)
    assert out["columns"][:6] == ["temperature_K", "heat_capacity_electronic_J_per_mol_K",
                                  "entropy_electronic_J_per_mol_K", "internal_energy_electronic_kJ_per_mol",
                                  "helmholtz_energy_electronic_kJ_per_mol", "chemical_potential_shift_eV"]
    for name in out["columns"]:
        lookup(name)                                       # every column is in the schema
    meta = out["provenance"]
    check_record(meta, [flat], ["basis", "formula", "temperatures_K"])
    assert meta["sommerfeld_gamma_mJ_per_mol_K2"]["value"] == pytest.approx(1.5 * GAMMA_FLAT * 1e3, rel=1e-12)
    assert meta["sommerfeld_gamma_mJ_per_mol_K2"]["uncertainty"] == 0.0        # a flat band is exact
    assert meta["dos_at_fermi_level_per_eV"] == {"value": 1.5, "uncertainty": 0.0}
    assert meta["electrons_below_fermi_level"] == pytest.approx(9.0)
    row = out["data"][3]
    # flat band: C = S = γT exactly (A&M ch. 2); 8 significant digits written
    assert row[1] == pytest.approx(1.5 * GAMMA_FLAT * 300.0, rel=1e-7)
    assert row[2] == pytest.approx(row[1], rel=1e-7)
    assert "γ = " in captured.err and "mJ/(mol K²)" in captured.err


def test_table_with_electronic_adds_columns_and_totals(tmp_path, capsys):
    out_path = tmp_path / "both.csv"
    assert main(["table", str(PHONONS), "--electronic", str(DEMO), "--temperatures", "0:1000:100",
                 "--output", str(out_path)]) == 0
    df, meta = read_exported_csv(out_path)
    for vib, el, total in (("heat_capacity_v", "heat_capacity_electronic", "heat_capacity_v_total"),
                           ("entropy", "entropy_electronic", "entropy_total"),
                           ("helmholtz_energy", "helmholtz_energy_electronic", "helmholtz_energy_total")):
        np.testing.assert_allclose(df[column_name(total)], df[column_name(vib)] + df[column_name(el)], rtol=1e-7)
    assert df[column_name("heat_capacity_electronic")].iloc[-1] > 0
    check_record(meta, [PHONONS, DEMO], ["basis", "temperatures_K"])       # one record, both inputs hashed
    assert meta["inputs"][1]["role"] == "electronic DOS" and meta["inputs"][1]["options"]["energy_unit"] == "eV"
    assert meta["electronic"]["sommerfeld_gamma_mJ_per_mol_K2"]["value"] > 0
    assert "electronic" in meta["model"]
    # the same electronic numbers as the electronic command alone
    capsys.readouterr()
    assert main(["electronic", str(DEMO), "--temperatures", "0:1000:100"]) == 0
    alone, _ = read_exported_csv(capsys.readouterr().out)
    np.testing.assert_allclose(df[column_name("entropy_electronic")], alone[column_name("entropy_electronic")])


def test_per_atom_basis(flat, capsys):
    assert main(["electronic", str(flat), "--per", "atom", "--atoms", "2", "--temperatures", "300"]) == 0
    df, _ = read_exported_csv(capsys.readouterr().out)
    # C/k_B per atom = γT/(R·2)
    expected = 1.5 * GAMMA_FLAT * 300.0 / (sc.R * 2)
    assert df[column_name("heat_capacity_electronic", "atom")].iloc[0] == pytest.approx(expected, rel=1e-7)


def test_errors_are_one_line(tmp_path, capsys):
    bad = tmp_path / "nounit.dat"
    bad.write_text("-1 1\n1 1\n")
    assert main(["electronic", str(bad)]) == 2
    err = capsys.readouterr().err.strip()
    assert err.startswith("error: nounit.dat: the energy unit is not stated") and "\n" not in err
    assert main(["electronic", str(bad), "--energy-unit", "THz"]) == 2
    assert "unknown energy unit" in capsys.readouterr().err
