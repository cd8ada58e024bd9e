"""Manifest reading, refusals and diagnostics of the quasi-harmonic step."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import constants as sc

from tests.quasiharmonic import debye_solid as ds
from tests.spectra import debye_table, dos_text
from thermo.errors import DosInputError, OptionError
from thermo.quasiharmonic import quasiharmonic_table, read_manifest


def write_set(folder, volumes=ds.VOLUMES, energy_column="energy_eV", factor=1.0, delimiter=",", negative_at=None):
    lines = ["# invented Debye volume set", delimiter.join(["volume_A3", energy_column, "dos_file"])]
    for i, v in enumerate(volumes):
        nu, g = debye_table(ds.theta(v), 1, 801)
        if i == negative_at:      # 5 % of the 3 modes moved to imaginary frequencies (triangle of area 0.15)
            nu = np.concatenate([[-1.0, -0.5], nu])
            g = np.concatenate([[0.0, 0.3], g * 0.95])
        name = f"d{i}.dat"
        (folder / name).write_text(dos_text(nu, g), encoding="utf-8")
        lines.append(delimiter.join([repr(float(v)), repr(float(ds.static_energy(v)) / factor), name]))
    path = folder / "set.csv"
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


def test_energy_units_from_header(tmp_path):
    # Rydberg energy in eV: CODATA via scipy.constants ("Rydberg constant times hc in eV").
    ry = sc.physical_constants["Rydberg constant times hc in eV"][0]
    (tmp_path / "a").mkdir()
    (tmp_path / "b").mkdir()
    in_ev = read_manifest(write_set(tmp_path / "a"))
    in_ry = read_manifest(write_set(tmp_path / "b", energy_column="energy_Ry", factor=ry, delimiter=";"))
    np.testing.assert_allclose(in_ry.energies_ev, in_ev.energies_ev, rtol=1e-12)
    assert in_ev.volumes_a3.size == 11 and in_ev.atoms == 1


def test_kj_per_mol_column(tmp_path):
    # 1 eV per formula unit = N_A e / 1000 kJ/mol (CODATA via scipy.constants).
    kj = sc.kilo / (sc.N_A * sc.electron_volt)
    vs = read_manifest(write_set(tmp_path, energy_column="energy_kJ_per_mol", factor=kj, delimiter="\t"))
    np.testing.assert_allclose(vs.energies_ev, [float(ds.static_energy(v)) for v in ds.VOLUMES], rtol=1e-12)


def test_fewer_than_five_volumes_refused(tmp_path):
    with pytest.raises(OptionError, match="4 volumes.*at least 5"):
        read_manifest(write_set(tmp_path, volumes=ds.VOLUMES[:4]))


def test_bad_cell_names_line_and_column(tmp_path):
    path = write_set(tmp_path)
    text = path.read_text().splitlines()
    text[4] = text[4].replace(text[4].split(",")[1], "abc")
    path.write_text("\n".join(text) + "\n")
    with pytest.raises(DosInputError, match=r"set.csv, line 5, column 2: energy_eV is 'abc'"):
        read_manifest(path)


def test_missing_dos_file_and_header(tmp_path):
    path = write_set(tmp_path)
    (tmp_path / "d3.dat").unlink()
    with pytest.raises(DosInputError, match=r"line 6: dos_file 'd3.dat' not found"):
        read_manifest(path)
    path.write_text("volume,energy_eV,dos_file\n1,2,x\n")
    with pytest.raises(DosInputError, match="needs the columns volume_A3"):
        read_manifest(path)


def test_uploaded_files_are_matched_by_name(tmp_path):
    path = write_set(tmp_path)
    files = {p.name: p.read_bytes() for p in tmp_path.glob("d*.dat")}
    vs = read_manifest(path.read_bytes(), files=files, name="set.csv")
    assert vs.names[0] == "d0.dat" and vs.source["name"] == "set.csv"
    files.pop("d2.dat")
    with pytest.raises(DosInputError, match="'d2.dat' was not uploaded"):
        read_manifest(path.read_bytes(), files=files)


def test_imaginary_volume_listed(tmp_path):
    vs = read_manifest(write_set(tmp_path, negative_at=10), atoms=1)
    diag = quasiharmonic_table(vs, [300.0]).attrs["diagnostics"]
    assert diag["imaginary_volumes"] == [pytest.approx(ds.VOLUMES[-1])]
    assert any("imaginary" in w and "tolerance 1 %" in w for w in diag["warnings"])
    assert quasiharmonic_table(vs, [300.0], imaginary_tolerance=0.2).attrs["diagnostics"]["imaginary_volumes"] == []


def test_minimum_outside_sampled_volumes_is_marked(tmp_path):
    # Only compressed volumes: the p = 0 minimum (≈ 20.1 Å³ and up) lies beyond the largest one.
    vs = read_manifest(write_set(tmp_path, volumes=np.linspace(18.0, 19.6, 7)))
    df = quasiharmonic_table(vs, [0.0, 300.0])
    assert df.outside_volume_range.all()
    assert any("leaves the sampled range" in w for w in df.attrs["diagnostics"]["warnings"])
    # at 8 GPa the minimum moves inside the sampled range
    inside = quasiharmonic_table(vs, [300.0], pressure_gpa=8.0)
    assert not inside.outside_volume_range.any()


def test_resampled_dos_gives_the_same_table(tmp_path):
    # A heuristic (ν² window, search grid) must not make results jump when the DOS is merely resampled.
    (tmp_path / "a").mkdir()
    coarse = read_manifest(write_set(tmp_path / "a"))
    fine = ds.volume_entries(points=3001)
    a = quasiharmonic_table(coarse, [50.0, 300.0, 600.0])
    b = quasiharmonic_table(fine, [50.0, 300.0, 600.0])
    for name in ("volume_A3", "thermal_expansion_per_K", "bulk_modulus_T_GPa", "heat_capacity_p_J_per_mol_K"):
        np.testing.assert_allclose(a[name], b[name], rtol=2e-3, err_msg=name)


def test_per_atom_and_per_gram(tmp_path):
    vs = read_manifest(write_set(tmp_path))
    mol = quasiharmonic_table(vs, [300.0])
    atom = quasiharmonic_table(vs, [300.0], per="atom")
    # 1 k_B per atom = R J/(mol K) for one atom per formula unit (CODATA via scipy.constants)
    assert atom.heat_capacity_p_kB_per_atom[0] * sc.R == pytest.approx(mol.heat_capacity_p_J_per_mol_K[0])
    gram = quasiharmonic_table(vs, [300.0], per="gram", formula="Al")
    # Al standard atomic weight 26.9815385 g/mol (IUPAC 2013, from memory)
    assert gram.entropy_J_per_g_K[0] * 26.98 == pytest.approx(mol.entropy_J_per_mol_K[0], rel=1e-3)


def test_volumes_and_energies_out_of_range_are_refused_before_any_dos_is_read(tmp_path):
    # Found by the manifest fuzz: 1e-300..1e300 Å³ or a 1e308 eV energy overflowed inside the fit.
    path = write_set(tmp_path)
    lines = path.read_text().splitlines()
    tiny = [1e-300, 19.0, 20.0, 21.0, 22.0]
    huge = lines[:2] + [",".join([repr(v)] + row.split(",")[1:]) for v, row in zip(tiny, lines[2:7])]
    path.write_text("\n".join(huge) + "\n")
    for name in (f"d{k}.dat" for k in range(11)):
        (tmp_path / name).write_text("not a DOS")      # never read: the volumes are refused first
    with pytest.raises(OptionError, match=r"volume 1e-300 Å³ \(line 3\) is outside 0.01-1e\+06 Å³"):
        read_manifest(path)
    wide = lines[:2] + [",".join([repr(float(v))] + row.split(",")[1:]) for v, row in zip([1, 2, 3, 4, 50], lines[2:7])]
    path.write_text("\n".join(wide) + "\n")
    with pytest.raises(OptionError, match="span a factor 50"):
        read_manifest(path)
    big = lines[:2] + [",".join([row.split(",")[0], "1e308", row.split(",")[2]]) for row in lines[2:7]]
    path.write_text("\n".join(big) + "\n")
    with pytest.raises(OptionError, match=r"static energy 1e\+308 eV .* within ±1e\+08 eV"):
        read_manifest(path)
