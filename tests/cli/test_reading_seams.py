"""Reading options at the seams of the command line (issue 25, item 6).

- ``batch --sheet`` reads the sheet asked for;
- a ``ws:`` input can be set back to a default (``--negative drop``, ``--low-frequency auto``);
- a commented header row names the partial columns as a plain header row does.

External references: the Debye entropy by mpmath quadrature of
S/R = (9/y³)∫₀^y x²[x/(eˣ−1) − ln(1−e⁻ˣ)] dx, y = θ/T (P. Debye, Ann. Phys. 39, 789 (1912));
the Debye-crystal mean-square displacement of Willis and Pryor, *Thermal Vibrations in
Crystallography* (CUP 1975), eq. 4.66, by mpmath; standard atomic weights Mg 24.305, O 15.999
(IUPAC abridged values, from memory); CODATA constants via scipy.constants.  The spectra are
invented test data.
"""

from __future__ import annotations

import csv

import numpy as np
import openpyxl
import pytest

from tests.spectra import debye_entropy, debye_table, dos_text
from tests.vibration.test_displacements import willis_pryor_msd
from thermo.cli.main import main
from thermo.io.readback import read_exported_csv, read_exported_json


def _workbook(path, sheets):
    book = openpyxl.Workbook()
    book.remove(book.active)
    for title, (nu, g) in sheets.items():
        sheet = book.create_sheet(title)
        sheet.append(["frequency (THz)", "dos"])
        for a, b in zip(nu, g):
            sheet.append([float(a), float(b)])
    book.save(path)
    return path


def _entropy_298(table):
    t = table["temperature_K"].to_numpy()
    return float(table["entropy_J_per_mol_K"].to_numpy()[np.argmin(abs(t - 298.15))])


def test_batch_reads_the_sheet_it_is_given(tmp_path, capsys):
    # sheet 1 holds a θ = 250 K spectrum, sheet 2 (asked for) θ = 420 K: S(298.15 K) differs by ~40 %
    book = _workbook(tmp_path / "two.xlsx",
                     {"first": debye_table(250.0, points=801), "second": debye_table(420.0, points=801)})
    code = main(["batch", str(book), "--sheet", "2", "--temperatures", "298.15", "--output", str(tmp_path / "out"),
                 "--workers", "1"])
    assert code == 0, capsys.readouterr().err
    table, meta = read_exported_csv((tmp_path / "out" / "two.csv").read_bytes())
    assert _entropy_298(table) == pytest.approx(debye_entropy(420.0, 298.15), rel=1e-3)
    assert _entropy_298(table) != pytest.approx(debye_entropy(250.0, 298.15), rel=0.1)


def test_batch_carried_unit_yields_to_the_unit_a_file_states(tmp_path, capsys):
    # --freq-unit is for files that state none; a file whose header states cm-1 is read in cm-1
    nu, g = debye_table(300.0, points=801)
    per_thz = 1e12 / 2.99792458e10          # cm-1 per THz: c = 299 792 458 m/s (exact, SI)
    folder = tmp_path / "in"
    folder.mkdir()
    (folder / "stated.dat").write_text(dos_text(nu * per_thz, g / per_thz, header="omega(cm^-1) dos"))
    (folder / "bare.dat").write_text(dos_text(nu, g, header="x y"))
    code = main(["batch", str(folder), "--freq-unit", "THz", "--temperatures", "298.15",
                 "--output", str(tmp_path / "out"), "--workers", "1"])
    assert code == 0, capsys.readouterr().err
    for name in ("bare", "stated"):
        table, _ = read_exported_csv((tmp_path / "out" / f"{name}.csv").read_bytes())
        assert _entropy_298(table) == pytest.approx(debye_entropy(300.0, 298.15), rel=1e-3)
    with open(tmp_path / "out" / "index.csv", newline="", encoding="utf-8") as handle:
        rows = {r["input"].rsplit("/", 1)[-1]: r for r in csv.DictReader(handle)}
    assert "read in cm-1 as the file states" in rows["stated.dat"]["warnings"]


@pytest.fixture
def unstable_file(tmp_path):
    # a θ = 300 K Debye spectrum with 1 % of its modes at imaginary (negative) frequencies
    nu, g = debye_table(300.0, points=801)
    neg = -nu[1:41][::-1]
    g_neg = np.full(neg.size, 0.03 / (neg[-1] - neg[0]))
    path = tmp_path / "unstable.dat"
    path.write_text(dos_text(np.concatenate([neg, nu]), np.concatenate([g_neg, g])))
    return path


def test_a_workspace_input_can_be_set_back_to_the_default(unstable_file, tmp_path, capsys):
    store = str(tmp_path / "w.sqlite")
    assert main(["workspace", "add", str(unstable_file), "--negative", "refuse", "--low-frequency", "off",
                 "--unchecked", "--workspace", store]) == 0
    # stored settings are used when nothing is said ...
    assert main(["table", "ws:unstable.dat", "--workspace", store, "--temperatures", "298.15"]) == 2
    assert "refuse" in capsys.readouterr().err
    # ... and an option given now wins, even when it names the default
    out = tmp_path / "t.json"
    assert main(["table", "ws:unstable.dat", "--workspace", store, "--negative", "drop", "--low-frequency", "auto",
                 "--temperatures", "298.15", "--output", str(out)]) == 0
    table, meta = read_exported_json(out.read_bytes())
    used = meta["inputs"][0]["options"]
    assert used["negative"] == "drop" and used["low_frequency"] == "auto"
    # drop renormalises the real part to 3 modes: the θ = 300 K Debye entropy
    assert _entropy_298(table) == pytest.approx(debye_entropy(300.0, 298.15), rel=2e-3)


def test_a_commented_header_row_names_the_partial_columns(tmp_path, capsys):
    # each species' partial is a θ = 320 K Debye spectrum of 3 modes (one atom of each)
    nu, g = debye_table(320.0, points=1601)
    path = tmp_path / "mgo.dat"
    path.write_text("# invented two-species test spectrum\n" + dos_text(nu, 2 * g, g, g,
                                                                        header="# frequency(THz) total Mg O"))
    out = tmp_path / "u.csv"
    code = main(["displacements", str(path), "--formula", "MgO", "--temperatures", "0,320", "--output", str(out)])
    assert code == 0, capsys.readouterr().err
    table, _ = read_exported_csv(out.read_bytes())
    for species, mass in (("Mg", 24.305), ("O", 15.999)):
        rows = table[table["species"] == species]
        want = [willis_pryor_msd(r, 320.0, mass) for r in (0.0, 1.0)]
        np.testing.assert_allclose(rows["mean_square_displacement_A2"], want, rtol=2e-3)


@pytest.mark.parametrize("command", ["table", "batch", "displacements", "quasiharmonic"])
def test_the_temperature_help_describes_the_default_it_states(command, capsys):
    # issue 25 item 7: displacements --help said "default 0:1000:10: 0 to 1500 K every 5 K ..."
    import re

    from thermo.temperatures import parse_temperatures
    with pytest.raises(SystemExit):
        main([command, "--help"])
    text = " ".join(capsys.readouterr().out.split())
    spec, words = re.search(r"\(default ([0-9.:,]+): ([^)]*)\)", text).groups()
    grid = parse_temperatures(spec)
    assert f"{grid[0]:g} to {grid[-1]:g} K" in words
    step = spec.split(",")[0].split(":")[2]
    assert f"every {float(step):g} K" in words
    assert ("298.15" in words) == ("298.15" in spec)
