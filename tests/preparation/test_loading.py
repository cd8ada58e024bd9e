"""Loading a DOS: units, delimiters, normalisation, imaginary modes, partials.

Unit conversions are checked against CODATA 2018 via scipy.constants
(1 THz = 33.35641 cm⁻¹ = 4.135667696 meV = 2π·10¹² rad/s = 47.99243 K).
"""

from __future__ import annotations

import io

import numpy as np
import openpyxl
import pytest
from scipy import constants as sc

from tests.spectra import debye_table, dos_text
from thermo import DosInputError, OptionError, load_dos, tabulate
from thermo.units import thz_to_unit

TEMPS = [5.0, 50.0, 300.0, 900.0]


def _reference_table():
    return tabulate(load_dos(dos_text(*debye_table(350.0, points=701))), TEMPS)


# Factors computed here from CODATA, independent of thermo.units.
CODATA_PER_THZ = {
    "THz": 1.0,
    "cm-1": 1e12 / sc.c / 100,
    "meV": sc.h * 1e12 / sc.e * 1e3,
    "rad/s": 2 * np.pi * 1e12,
    "K": sc.h * 1e12 / sc.k,
}


@pytest.mark.parametrize("unit", list(CODATA_PER_THZ))
def test_every_unit_gives_the_same_table(unit):
    nu, g = debye_table(350.0, points=701)
    f = CODATA_PER_THZ[unit]
    assert thz_to_unit(unit) == pytest.approx(f, rel=1e-12)
    text = dos_text(nu * f, g / f, header="freq dos")
    table = tabulate(load_dos(text, freq_unit=unit), TEMPS)
    assert np.allclose(table.to_numpy(), _reference_table().to_numpy(), rtol=1e-9)


@pytest.mark.parametrize("header, unit", [("frequency (cm-1) dos", "cm-1"), ("energy_meV total", "meV"),
                                          ("# nu [THz]\nnu g", "THz"), ("omega (rad/s) g", "rad/s")])
def test_unit_taken_from_header(header, unit):
    nu, g = debye_table(350.0, points=201)
    f = CODATA_PER_THZ[unit]
    dos = load_dos(dos_text(nu * f, g / f, header=header))
    assert dos.source["freq_unit"] == unit


def test_unit_missing_is_refused_with_the_choices():
    nu, g = debye_table(350.0, points=201)
    with pytest.raises(DosInputError, match="THz, cm-1, meV, eV, Hz, rad/s, rad/ps, K"):
        load_dos(dos_text(nu, g, header="x y"))


def test_explicit_unit_wins_over_header_with_a_warning():
    nu, g = debye_table(350.0, points=201)
    dos = load_dos(dos_text(nu, g, header="nu_meV g"), freq_unit="THz")
    assert dos.source["freq_unit"] == "THz"
    assert any("states meV" in w for w in dos.warnings)


def test_bad_unit_name_is_an_option_error():
    with pytest.raises(OptionError, match="choose one of"):
        load_dos(dos_text(*debye_table(350.0)), freq_unit="furlongs")


@pytest.mark.parametrize("delimiter", [" ", "\t", ",", ";", "   "])
def test_delimiters(delimiter):
    nu, g = debye_table(350.0, points=701)
    text = dos_text(nu, g, header=delimiter.join(["frequency_THz", "total"]), delimiter=delimiter)
    table = tabulate(load_dos(text), TEMPS)
    assert np.allclose(table.to_numpy(), _reference_table().to_numpy(), rtol=1e-12)


def test_xlsx_input(tmp_path):
    nu, g = debye_table(350.0, points=701)
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.append(["frequency (THz)", "dos"])
    for a, b in zip(nu, g):
        sheet.append([float(a), float(b)])
    path = tmp_path / "debye.xlsx"
    book.save(path)
    table = tabulate(load_dos(path), TEMPS)
    assert np.allclose(table.to_numpy(), _reference_table().to_numpy(), rtol=1e-12)


def test_arbitrary_normalisation_is_rescaled_and_atoms_inferred_or_asked():
    nu, g = debye_table(350.0, points=401, atoms=2)
    dos = load_dos(dos_text(nu, g))
    assert dos.atoms == 2 and dos.source["atoms_inferred"]
    with pytest.raises(DosInputError, match="atoms per formula unit"):
        load_dos(dos_text(nu, 0.37 * g))
    scaled = load_dos(dos_text(nu, 0.37 * g), atoms=2)
    assert scaled.mode_count == pytest.approx(6.0, rel=1e-12)
    assert scaled.source["scale_factor"] == pytest.approx(1 / 0.37, rel=1e-5)  # trapezoid O(Δ²) vs exact
    with pytest.raises(OptionError):
        load_dos(dos_text(nu, g), atoms=0)


def _with_imaginary(share):
    """A Debye DOS (3 modes) plus a flat block of imaginary modes at ν < 0."""
    nu, g = debye_table(350.0, points=701)
    step = nu[1] - nu[0]
    neg = -step * np.arange(60, 0, -1)
    width = 60 * step
    height = 3 * share / (1 - share) / width
    nu_all = np.concatenate([neg, nu])
    g_all = np.concatenate([np.full(neg.size, height), g])
    g_all[neg.size] = height  # the block reaches ν = 0
    return nu_all, g_all


def test_imaginary_modes_policies():
    nu, g = _with_imaginary(0.03)
    dropped = load_dos(dos_text(nu, g), atoms=1)
    share = dropped.source["negative_mode_fraction"]
    assert 0.025 < share < 0.035
    assert any("imaginary" in w for w in dropped.warnings)
    assert any("dynamically unstable" in w for w in dropped.warnings)
    assert dropped.mode_count == pytest.approx(3.0, rel=1e-9)
    kept = load_dos(dos_text(nu, g), atoms=1, negative="keep-count")
    assert kept.mode_count == pytest.approx(3.0 * (1 - share), rel=1e-6)
    # Dulong–Petit of the real modes only: C_v → R × (number of real modes).
    hot = tabulate(kept, [1e5]).heat_capacity_v_J_per_mol_K[0]
    assert hot == pytest.approx(sc.R * 3 * (1 - share), rel=1e-4)
    with pytest.raises(DosInputError, match="imaginary"):
        load_dos(dos_text(nu, g), atoms=1, negative="refuse")
    with pytest.raises(OptionError):
        load_dos(dos_text(nu, g), atoms=1, negative="ignore")


def test_small_imaginary_share_warns_without_instability_caution():
    nu, g = _with_imaginary(0.002)
    dos = load_dos(dos_text(nu, g), atoms=1)
    assert any("imaginary" in w for w in dos.warnings)
    assert not any("unstable" in w for w in dos.warnings)


def test_partial_columns_and_species_shares():
    from thermo.partials import species_contributions
    nu, g = debye_table(350.0, points=701, atoms=2)
    text = dos_text(nu, g, 0.25 * g, 0.75 * g, header="frequency_THz total Aa Bb")
    dos = load_dos(text)
    assert set(dos.partials) == {"Aa", "Bb"}
    df = species_contributions(dos, [10.0, 300.0])
    assert np.allclose(df["Aa_heat_capacity_share"], 0.25) and np.allclose(df["Bb_entropy_share"], 0.75)
    total = tabulate(dos, [10.0, 300.0]).heat_capacity_v_J_per_mol_K.to_numpy()
    summed = df["Aa_heat_capacity_v_J_per_mol_K"] + df["Bb_heat_capacity_v_J_per_mol_K"]
    assert np.allclose(summed, total, rtol=1e-9)


def test_narrow_peak_gives_the_einstein_closed_form():
    # Einstein (1907): C_v = 3R x² eˣ/(eˣ-1)², x = θ_E/T; at T = θ_E: 3R e/(e-1)² = 0.9207·3R.
    theta_e = 300.0
    nu0 = theta_e * sc.k / sc.h / 1e12
    nu = nu0 + np.linspace(-1e-4, 1e-4, 21)
    g = np.maximum(0.0, 1 - np.abs(nu - nu0) / 1e-4)
    dos = load_dos(dos_text(nu, g), atoms=1)
    cv = tabulate(dos, [theta_e]).heat_capacity_v_J_per_mol_K[0]
    assert cv == pytest.approx(3 * sc.R * np.e / (np.e - 1) ** 2, rel=1e-7)


def test_error_estimate_shrinks_with_a_finer_grid():
    from thermo import estimated_relative_error
    coarse = load_dos(dos_text(*debye_table(350.0, points=61)))
    fine = load_dos(dos_text(*debye_table(350.0, points=1201)))
    e_coarse = estimated_relative_error(coarse, np.linspace(5, 1000, 50))
    e_fine = estimated_relative_error(fine, np.linspace(5, 1000, 50))
    assert 0 < e_fine < e_coarse / 100


@pytest.mark.parametrize("content, message", [
    (b"", "empty"),
    (b"\x00\x01\x02binary", "binary"),
    ("frequency_THz total\n" + "\n".join(f"{i} {i*i}" for i in range(5)), "10"),
    ("frequency_THz total\n" + "\n".join(f"{i} 0" for i in range(20)), "zero"),
])
def test_bad_files_give_one_line_errors(content, message):
    with pytest.raises(DosInputError) as info:
        load_dos(content if isinstance(content, bytes) else io.StringIO(content).getvalue())
    assert message in str(info.value) and "\n" not in str(info.value)
