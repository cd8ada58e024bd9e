"""Reading an electronic DOS: units, Fermi energy, spin columns, projections, and one-line errors."""

from __future__ import annotations

import io

import numpy as np
import pytest
from scipy import constants as sc

from thermo.electronic import load_electronic_dos
from thermo.errors import DosInputError, OptionError

RY_EV = sc.physical_constants["Rydberg constant times hc in eV"][0]   # CODATA via scipy.constants


def _rows(e, *cols):
    return "".join(" ".join(f"{v:.10g}" for v in row) + "\n" for row in zip(e, *cols))


E = np.linspace(-3.0, 2.0, 51)
G = 1.0 + 0.2 * E + 0.1 * E ** 2


def test_relative_energies_and_electron_count():
    d = load_electronic_dos("E-E_F (eV) total\n" + _rows(E, G))
    # ∫_{-3}^{0} (1 + 0.2E + 0.1E²) dE = 3 − 0.9 + 0.9 = 3.0 (closed form); the table is piecewise linear
    # with 0.1 eV steps, so the trapezoid error is (0.1²/12)·∫g'' = 0.1²/12·0.2·3 = 5e-4.
    assert d.electrons_below_fermi == pytest.approx(3.0 + 5e-4, abs=1e-9)
    assert d.dos_at_fermi_level == pytest.approx(1.0)
    assert d.source["energy_unit"] == "eV" and d.gap_ev is None


def test_mev_and_rydberg_give_the_same_dos_per_ev():
    ev = load_electronic_dos("E (eV) g\n" + _rows(E, G))
    mev = load_electronic_dos("# energies in meV, DOS in states/meV\n" + _rows(E * 1e3, G * 1e-3))
    ry = load_electronic_dos("# Fermi energy: 0.5 Ry\nenergy (Ry)  dos\n" + _rows(0.5 + E / RY_EV, G * RY_EV))
    for other in (mev, ry):
        np.testing.assert_allclose(other.energies_ev, ev.energies_ev, atol=1e-9)
        np.testing.assert_allclose(other.dos_per_ev, ev.dos_per_ev, rtol=1e-9)
        assert other.electrons_below_fermi == pytest.approx(ev.electrons_below_fermi, rel=1e-9)
    assert ry.fermi_energy_ev == pytest.approx(0.5 * RY_EV) and any("subtracted" in n for n in ry.notes)


def test_fermi_energy_option_wins_with_a_note():
    text = "# Fermi energy = 6.0 eV\nE (eV) total\n" + _rows(E + 5.5, G)
    d = load_electronic_dos(text, fermi_energy_ev=5.5)
    np.testing.assert_allclose(d.energies_ev, E, atol=1e-12)
    assert any("states a Fermi energy of 6 eV" in n for n in d.notes)


def test_spin_columns_summed_and_negative_down_read_by_magnitude():
    text = "E(eV)  dos_up  dos_down  d_up  d_down\n" + _rows(E, G / 2, -G / 2, G / 4, -G / 4)
    d = load_electronic_dos(text)
    np.testing.assert_allclose(d.dos_per_ev, G)
    assert list(d.partials) == ["d"] and np.allclose(d.partials["d"], G / 2)
    assert any("spin up and spin down" in n for n in d.notes) and any("negative" in n for n in d.notes)
    # without names, a third column is a projection unless told otherwise
    plain = "# energy unit: eV\n" + _rows(E, G / 2, G / 2)
    assert np.allclose(load_electronic_dos(plain).dos_per_ev, G / 2)
    assert np.allclose(load_electronic_dos(plain, spin="pair").dos_per_ev, G)


def test_formula_units_divide_the_dos():
    d = load_electronic_dos("E (eV) total\n" + _rows(E, G), formula_units=4)
    np.testing.assert_allclose(d.dos_per_ev, G / 4)


def test_xlsx_and_utf16_inputs():
    import openpyxl
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.append(["E-E_F (eV)", "total"])
    for a, b in zip(E, G):
        sheet.append([float(a), float(b)])
    raw = io.BytesIO()
    book.save(raw)
    from_xlsx = load_electronic_dos(raw.getvalue(), name="edos.xlsx")
    from_utf16 = load_electronic_dos(("E (eV) total\n" + _rows(E, G)).encode("utf-16"), name="edos.txt")
    for d in (from_xlsx, from_utf16):
        np.testing.assert_allclose(d.dos_per_ev, G)


@pytest.mark.parametrize("text, message", [
    (_rows(E, G), "the energy unit is not stated in the file"),
    ("E (eV) total\n" + _rows(E + 10.0, G), "the Fermi level lies outside the tabulated energies"),
    ("E (eV) total\n-1 1\n0 2\n0 3\n1 1\n", "line 4, column 1: energies must increase strictly"),
    ("E (eV) total\n-1 1\n0 -0.5\n1 1\n", "line 3, column 2: negative DOS -0.5"),
    ("E (eV) total\n-1 1\n0 x\n1 1\n", "line 3, column 2: 'x' is not a number"),
    ("E (eV) total\n-2 0\n-1 0\n1 1\n", "no states below the Fermi level"),
    ("# Fermi energy: 3 THz\nE (eV) total\n-1 1\n1 1\n", "the Fermi energy is given in 'THz'"),
    ("# Fermi energy: 3 eV\n# E_F = 4 eV\nE (eV) total\n-1 1\n1 1\n", "two different Fermi energies"),
])
def test_one_line_errors(text, message):
    with pytest.raises(DosInputError) as err:
        load_electronic_dos(text, name="edos.dat")
    assert message in str(err.value) and "\n" not in str(err.value) and str(err.value).startswith("edos.dat")


def test_tiny_negative_values_are_clipped_with_a_warning():
    g = G.copy()
    g[5] = -1e-5
    d = load_electronic_dos("E (eV) total\n" + _rows(E, g))
    assert d.dos_per_ev[5] == 0.0 and "1 negative values" in d.warnings[0]


def test_bad_options():
    with pytest.raises(OptionError, match="unknown energy unit"):
        load_electronic_dos("E (eV) total\n" + _rows(E, G), energy_unit="THz")
    with pytest.raises(OptionError, match="formula units"):
        load_electronic_dos("E (eV) total\n" + _rows(E, G), formula_units=0)
