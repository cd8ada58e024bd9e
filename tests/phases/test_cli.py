"""``modeheat phases``: the command of issue 27 on Debye DOS files and volume sets written by the test.

Truths: closed-form Debye free energy (Debye 1912) with mpmath (tests/phases/references.py); provenance SHA-256
against hashlib over the files.
"""

from __future__ import annotations

import hashlib
import json

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from tests.phases.references import crossing, debye_free_energy, volumes
from tests.phases.test_quasiharmonic import A, B, GUESS, reference
from tests.spectra import debye_table, dos_text
from thermo.cli.main import main
from thermo.io.readback import read_exported_csv

KJ_PER_MOL_EV = sc.kilo / (sc.N_A * sc.electron_volt)     # CODATA via scipy.constants


@pytest.fixture
def dos_files(tmp_path):
    (tmp_path / "alpha.dat").write_text(dos_text(*debye_table(400.0, 1, 2001)))
    (tmp_path / "beta.dat").write_text(dos_text(*debye_table(300.0, 2, 2001)))
    return tmp_path


def run(capsys, *argv):
    code = main(list(argv))
    out = capsys.readouterr()
    return code, out.out, out.err


def test_issue_command_json(dos_files, capsys, monkeypatch):
    monkeypatch.chdir(dos_files)
    code, out, err = run(capsys, "phases", "alpha=alpha.dat", "beta=beta.dat", "--static", "alpha=0", "--static",
                         "beta=6.0", "--energy-unit", "kJ/mol", "--atoms", "alpha=1", "--atoms", "beta=2",
                         "--temperatures", "0:1000:5", "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    [tr] = doc["transitions"]
    assert set(tr) >= {"low_phase", "high_phase", "temperature_K", "uncertainty_K", "pressure_GPa"}
    with mp.workdps(30):
        truth = crossing(lambda t: debye_free_energy(300, t) + mp.mpf(3.0 * KJ_PER_MOL_EV) - debye_free_energy(400, t),
                         300.0)
    assert (tr["low_phase"], tr["high_phase"], tr["pressure_GPa"]) == ("alpha", "beta", None)
    assert abs(tr["temperature_K"] - truth) < 0.5
    columns = doc["columns"]
    assert "helmholtz_energy_difference_error_meV_per_atom" in columns and "stable_phase_decided" in columns
    assert len(doc["table"]) == 201
    names = {i["name"]: i["sha256"] for i in doc["provenance"]["inputs"]}
    for f in ("alpha.dat", "beta.dat"):
        assert names[f] == hashlib.sha256((dos_files / f).read_bytes()).hexdigest()
    assert "T* =" in err


def test_csv_and_xlsx_exports_carry_provenance(dos_files, capsys):
    a, b = str(dos_files / "alpha.dat"), str(dos_files / "beta.dat")
    out = dos_files / "cmp.csv"
    code, _, err = run(capsys, "phases", f"alpha={a}", f"beta={b}", "--static", "beta=0.0622", "--atoms", "beta=2",
                       "--static-uncertainty", "beta=0.002", "--output", str(out))
    assert code == 0, err
    table, meta = read_exported_csv(out)
    assert meta["transitions"][0]["low_phase"] == "alpha"
    assert {i["sha256"] for i in meta["inputs"]} == {hashlib.sha256((dos_files / f).read_bytes()).hexdigest()
                                                    for f in ("alpha.dat", "beta.dat")}
    # static uncertainty 2 meV per formula unit of beta = 1 meV/atom enters every row
    assert table["helmholtz_energy_difference_error_meV_per_atom"].min() > 1.0
    xlsx = dos_files / "cmp.xlsx"
    assert run(capsys, "phases", f"alpha={a}", f"beta={b}", "--output", str(xlsx))[0] == 0
    import openpyxl
    book = openpyxl.load_workbook(xlsx)
    assert "provenance" in book.sheetnames


def test_bad_input_is_one_line(dos_files, capsys):
    a, b = str(dos_files / "alpha.dat"), str(dos_files / "beta.dat")
    for argv, text in ((["--static", "gamma=1"], "no phase named 'gamma'"), (["--static", "beta=x"], "not a number"),
                       (["--pressure", "1"], "volume sets"), (["--reaction", "beta = gamma"], "no phase named")):
        code, _, err = run(capsys, "phases", f"alpha={a}", f"beta={b}", *argv)
        errors = [line for line in err.splitlines() if line.startswith("error:")]
        assert code == 2 and len(errors) == 1 and text in errors[0] and "Traceback" not in err, err


def _manifest(folder, name, solid):
    rows = ["volume_A3,energy_eV,dos_file"]
    for v in volumes(solid):
        f = f"{name}_{v:.4f}.dat"
        (folder / f).write_text(dos_text(*debye_table(solid.theta(v), 1, 2001)))
        rows.append(f"{float(v)!r},{float(solid.static_energy(v))!r},{f}")
    path = folder / f"{name}_volumes.csv"
    path.write_text("\n".join(rows) + "\n")
    return path


def test_quasiharmonic_command_with_boundary(tmp_path, capsys):
    a, b = _manifest(tmp_path, "alpha", A), _manifest(tmp_path, "beta", B)
    code, out, err = run(capsys, "phases", f"alpha={a}", f"beta={b}", "--pressure", "0,2,5", "--boundary",
                         "--temperatures", "0:1100:10", "--format", "json", "--no-errors")
    assert code == 0, err
    doc = json.loads(out)
    got = {tr["pressure_GPa"]: tr["temperature_K"] for tr in doc["transitions"]}
    for p in (0.0, 2.0, 5.0):
        assert abs(got[p] - reference(p)[0]) < 2.0     # scipy minimisation of the BM + Debye solids
    assert len(doc["boundary"]) == 3 and all(abs(x["slope_relative_difference"]) < 0.1 for x in doc["boundary"])
    assert "pressure_GPa" in doc["columns"] and "volume_difference_A3" in doc["columns"]
    roles = [i.get("role", "") for i in doc["provenance"]["inputs"]]
    assert sum("manifest" in r for r in roles) == 2 and len(roles) == 2 + 2 * 11
    assert GUESS  # the same pair as test_quasiharmonic


def test_reaction_formation_against_closed_form(tmp_path, capsys):
    # Vibrational free energy and entropy of formation of AB (Debye θ 350 K, 2 atoms) from A (θ 300 K) and
    # B (θ 450 K): closed-form Debye F (mpmath), ΔS_f = -dΔF_f/dT (mpmath.diff)
    for name, theta, atoms in (("AB", 350.0, 2), ("A", 300.0, 1), ("B", 450.0, 1)):
        (tmp_path / f"{name}.dat").write_text(dos_text(*debye_table(theta, atoms, 2001)))
    code, out, err = run(capsys, "phases", *(f"{n}={tmp_path / n}.dat" for n in ("AB", "A", "B")),
                         "--reaction", "AB = A + B", "--temperatures", "100,300,1000", "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    cols = doc["columns"]
    rows = {r[0]: dict(zip(cols, r)) for r in doc["table"]}
    j_per_mol = sc.N_A * sc.electron_volt
    for t, row in rows.items():
        with mp.workdps(30):
            def df(x):
                return 2 * debye_free_energy(350, x) - debye_free_energy(300, x) - debye_free_energy(450, x)
            f_true = float(df(t)) * j_per_mol / 1e3
            s_true = -float(mp.diff(df, t)) * j_per_mol
        assert abs(row["helmholtz_energy_formation_kJ_per_mol"] - f_true) <= row[
            "helmholtz_energy_formation_error_kJ_per_mol"]
        assert row["entropy_formation_J_per_mol_K"] == pytest.approx(s_true, rel=1e-4, abs=1e-6)
    code, _, err = run(capsys, "phases", *(f"{n}={tmp_path / n}.dat" for n in ("AB", "A", "B")),
                       "--reaction", "AB = A")
    assert code == 2 and "atoms do not balance" in err


def test_reaction_per_atom_is_the_per_formula_value_over_its_atoms(tmp_path):
    # Bookkeeping (common practice): per atom = per formula unit of AB / 2 atoms, in k_B (R from CODATA via scipy)
    from thermo.phases import Phase, formation_table
    from thermo.preparation.loading import load_dos
    phases = [Phase(n, load_dos(dos_text(*debye_table(theta, atoms, 1001)), name=f"{n}.dat"))
              for n, theta, atoms in (("AB", 350.0, 2), ("A", 300.0, 1), ("B", 450.0, 1))]
    per_fu = formation_table(phases, "AB = A + B", [300.0, 600.0])
    per_atom = formation_table(phases, "AB = A + B", [300.0, 600.0], per_formula="atom")
    np.testing.assert_allclose(per_atom["entropy_formation_kB_per_atom"],
                               per_fu["entropy_formation_J_per_mol_K"] / (2 * sc.R), rtol=1e-12)
