"""Mode lists (one row per mode of a q-point mesh): reading, normalisation and exact mode sums.

References for the checks: the Einstein heat capacity of a single mode,
:math:`C = R x^2 e^x/(e^x-1)^2` (A. Einstein, Ann. Phys. 327, 180 (1907)),
with CODATA constants from ``scipy.constants``; the partition function of a
harmonic oscillator, :math:`S = R[x/(e^x-1) - \\ln(1-e^{-x})]` (textbook
statistical mechanics, common practice).
"""

from __future__ import annotations

import io

import numpy as np
import openpyxl
import pytest
from scipy import constants as sc

from thermo import load_dos, tabulate
from thermo.cli.main import main
from thermo.errors import DosInputError
from thermo.io.readback import read_exported_csv

FREQS = (1.5, 3.0, 4.5)    # THz, three modes per q-point


def _list_text(weights=(0.125, 0.375, 0.5), unit="THz", factor=1.0, header=None):
    rows = [f"{w} {f * factor}" for w in weights for f in FREQS]
    return (header or f"weight frequency_{unit}") + "\n" + "\n".join(rows) + "\n"


def _einstein(nu_thz, t):
    x = sc.h * nu_thz * 1e12 / (sc.k * t)
    cv = sc.R * x * x * np.exp(x) / np.expm1(x) ** 2
    s = sc.R * (x / np.expm1(x) - np.log(-np.expm1(-x)))
    return cv, s


@pytest.mark.parametrize("unit, factor", [("THz", 1.0), ("cm-1", 1e10 / sc.c)])
def test_mode_sums_equal_einstein_terms_whatever_the_weight_normalisation(unit, factor):
    t = np.array([5.0, 40.0, 300.0])
    dos = load_dos(_list_text(unit=unit, factor=factor))
    df = tabulate(dos, t)
    cv = sum(_einstein(f, t)[0] for f in FREQS)    # 3 modes, one each per formula unit
    s = sum(_einstein(f, t)[1] for f in FREQS)
    assert dos.atoms == 1 and dos.modes is not None
    assert np.allclose(df.heat_capacity_v_J_per_mol_K, cv, rtol=1e-9)
    assert np.allclose(df.entropy_J_per_mol_K, s, rtol=1e-9)


def test_atoms_from_the_modes_per_q_point_and_weights_normalised():
    rows = [f"0.5 {f} 0.1 0 {k}" for k in (0, 1) for f in FREQS + tuple(2 * f for f in FREQS)]
    dos = load_dos("weight frequency_THz qx_per_A qy_per_A qz_per_A\n" + "\n".join(rows) + "\n")
    assert dos.atoms == 2
    assert np.isclose(dos.modes.weight.sum(), 6.0)
    assert any("6 modes per q-point" in w for w in dos.warnings)


def test_imaginary_modes_follow_the_policy():
    text = "weight frequency_THz\n" + "\n".join(f"1 {f}" for f in (-0.5, 1.0, 2.0, 1.0, 2.0, 3.0)) + "\n"
    dropped = load_dos(text, atoms=2)
    assert np.isclose(dropped.modes.weight.sum(), 6.0)
    unscaled = load_dos(text, atoms=2, negative="drop-unscaled")
    assert np.isclose(unscaled.modes.weight.sum(), 5.0)
    with pytest.raises(DosInputError, match="imaginary"):
        load_dos(text, atoms=2, negative="refuse")


@pytest.mark.parametrize("text, where, what", [
    ("weight frequency_THz\n1 1\n-1 2\n1 3\n", "line 3, column 1", "weight -1 must be > 0"),
    ("weight frequency_THz\n1 1\n1 x\n1 3\n", "line 3, column 2", "not a number"),
    ("weight frequency_THz Fe\n1 1 0.5\n1 2 1.5\n1 3 0\n", "line 3, column 3", "projection 1.5"),
    ("weight frequency_THz qx_per_A\n1 1 0\n1 2 0\n1 3 0\n", "<text>:", "all three columns"),
    ("weight value\n1 1\n1 2\n1 3\n", "<text>:", "needs a frequency column"),
])
def test_bad_rows_give_one_line_errors_with_the_line(text, where, what):
    with pytest.raises(DosInputError) as err:
        load_dos(text)
    message = str(err.value)
    assert "\n" not in message and where in message and what in message


def test_q_points_with_different_mode_counts_are_named():
    text = "weight frequency_THz qx_per_A qy_per_A qz_per_A\n" + "\n".join(
        [f"1 {f} 0.1 0 0" for f in FREQS] + ["1 1 0.2 0 0", "1 2 0.2 0 0"]) + "\n"
    with pytest.raises(DosInputError, match=r"line 5: the q-point of this row has 2 modes"):
        load_dos(text)


def test_xlsx_mode_list_reads_as_text():
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.append(["weight", "frequency_THz"])
    for w in (0.125, 0.375, 0.5):
        for f in FREQS:
            sheet.append([w, f])
    buffer = io.BytesIO()
    book.save(buffer)
    t = [10.0, 200.0]
    a = tabulate(load_dos(buffer.getvalue(), name="modes.xlsx"), t)
    b = tabulate(load_dos(_list_text()), t)
    assert np.allclose(a.to_numpy(), b.to_numpy(), rtol=1e-14)


def test_cli_table_reads_a_mode_list(tmp_path, capsys):
    path = tmp_path / "modes.txt"
    path.write_text(_list_text())
    assert main(["table", str(path), "--temperatures", "50,300", "--digits", "12"]) == 0
    df, info = read_exported_csv(capsys.readouterr().out)
    cv = sum(_einstein(f, np.array([50.0, 300.0]))[0] for f in FREQS)
    assert np.allclose(df["heat_capacity_v_J_per_mol_K"], cv, rtol=1e-10)


@pytest.mark.parametrize("name", ["modes.txt", "dos.dat"])
def test_cli_table_with_an_elastic_anchor_writes_its_table(tmp_path, capsys, name):
    # the whole command (table, provenance, error breakdown) runs with the anchor on a mode list and a DOS
    path = tmp_path / name
    if name == "modes.txt":
        path.write_text(_list_text())
    else:
        nu = np.linspace(0.0, 6.0, 241)
        path.write_text("frequency_THz total\n" + "\n".join(f"{a} {9 * a * a / 216}" for a in nu) + "\n")
    assert main(["table", str(path), "--temperatures", "2,300", "--low-frequency", "elastic:250"]) == 0
    df, info = read_exported_csv(capsys.readouterr().out)
    assert info["inputs"][0]["options"]["low_frequency"] == "elastic:250.0"
    assert np.all(np.isfinite(df["heat_capacity_v_J_per_mol_K"]))


def test_species_contributions_of_a_mode_list_add_up_to_its_table():
    # projections of each mode sum to 1 over the species (completeness of the eigenvectors, common practice),
    # so the species' C_v and S, continuum shares included, add up to the table's
    import sys
    from pathlib import Path
    from thermo.partials import species_contributions
    sys.path.insert(0, str(Path(__file__).resolve().parents[2] / "sample_dos"))
    from generate import _kmesh, rocksalt       # invented two-atom spring crystal (12.4 and 88.6 u)
    nu, w = rocksalt(3.2)
    q = np.repeat(_kmesh(16), 6, axis=0)
    rows = [f"{1 / 4096} {f} {qi[0]} {qi[1]} {qi[2]} {a} {b}" for f, qi, (a, b) in zip(nu, q, w)]
    text = "# cell volume: 0.25 A^3\nweight frequency_THz qx_per_A qy_per_A qz_per_A Ly Hv\n" + "\n".join(rows)
    dos = load_dos(text + "\n")
    assert dos.modes.continuum and dos.atoms == 2
    t = [5.0, 50.0, 300.0]
    parts = species_contributions(dos, t)
    table = tabulate(dos, t)
    for q_name, col in (("heat_capacity_v_J_per_mol_K", "heat_capacity_v_J_per_mol_K"),
                        ("entropy_J_per_mol_K", "entropy_J_per_mol_K")):
        total = parts[f"Ly_{q_name}"] + parts[f"Hv_{q_name}"]
        assert np.allclose(total, table[col], rtol=1e-9)
    assert (parts["Hv_heat_capacity_share"][0] > 0.5)       # the heavy atom carries the cold acoustic modes
