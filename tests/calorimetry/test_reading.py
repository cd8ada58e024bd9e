"""Reader of measured heat capacity: units, header fallbacks, one-line errors."""

import numpy as np
import pytest
from scipy import constants as sc

from thermo.calorimetry import heat_capacity_unit, read_heat_capacity
from thermo.errors import DosInputError, OptionError


def test_units_from_header_are_converted_to_J_per_mol_K():
    # Thermochemical calorie 4.184 J (IUPAC Green Book, 3rd ed., 2007, §7.2; scipy.constants.calorie).
    cal = read_heat_capacity("T (K)\tCp (cal/(mol K))\tu\n100\t2.0\t0.01\n200\t5.0\t0.02\n")
    assert cal.unit == "cal/(mol K)"
    assert cal.heat_capacity_J_per_mol_K == pytest.approx([2.0 * 4.184, 5.0 * 4.184], rel=1e-15)
    assert sc.calorie == 4.184
    assert cal.uncertainty_J_per_mol_K == pytest.approx([0.04184, 0.08368])
    milli = read_heat_capacity("# low-temperature run\nT,Cp [mJ mol-1 K-1]\n2,1.5\n3,4.0\n")
    assert milli.heat_capacity_J_per_mol_K == pytest.approx([1.5e-3, 4.0e-3])


def test_per_gram_needs_the_formula_and_uses_its_molar_mass():
    # Cu standard atomic weight 63.546 g/mol (IUPAC 2021, Pure Appl. Chem. 94, 573 (2022)).
    text = "temperature_K;heat_capacity_J_per_g_K\n300;0.385\n400;0.397\n"
    with pytest.raises(OptionError, match="formula"):
        read_heat_capacity(text)
    m = read_heat_capacity(text, formula="Cu")
    assert m.heat_capacity_J_per_mol_K[0] == pytest.approx(0.385 * 63.546, rel=1e-4)
    assert m.notes == []   # both units stated


def test_header_without_units_falls_back_with_notes_and_option_wins():
    m = read_heat_capacity("T,Cp\n20,1.0\n10,0.2\n")
    assert m.unit == "J/(mol K)"
    assert any("read as J/(mol K)" in n for n in m.notes) and any("read as K" in n for n in m.notes)
    assert m.temperature_K.tolist() == [10.0, 20.0] and any("sorted" in n for n in m.notes)
    forced = read_heat_capacity("T,Cp (J/(mol K))\n20,1.0\n30,2.0\n", cp_unit="mJ/(mol K)")
    assert forced.heat_capacity_J_per_mol_K.tolist() == [1e-3, 2e-3]
    assert any("header states J/(mol K)" in n for n in forced.notes)


def test_xlsx_is_read_like_text(tmp_path):
    openpyxl = pytest.importorskip("openpyxl")
    book = openpyxl.Workbook()
    sheet = book.active
    for row in (["T (K)", "Cp (J/(mol K))"], [50.0, 5.5], [100.0, 13.0]):
        sheet.append(row)
    path = tmp_path / "cp.xlsx"
    book.save(path)
    m = read_heat_capacity(path)
    assert m.heat_capacity_J_per_mol_K.tolist() == [5.5, 13.0] and m.uncertainty_J_per_mol_K is None


@pytest.mark.parametrize("text, message", [
    ("T,Cp\n10,1\n-5,2\n", "line 3, column 1: temperature must be > 0 K"),
    ("T,Cp\n10,1\n20,0\n", "line 3, column 2: heat capacity must be > 0"),
    ("T,Cp,u\n10,1,0.1\n20,2,0\n", "line 3, column 3: uncertainty must be > 0"),
    ("T,Cp\n10,1\n10,2\n", "line 3, column 1: temperature 10 K appears twice"),
    ("T,Cp\n10,1\n20,abc\n", "line 3, column 2: 'abc' is not a number"),
    ("T (°C),Cp\n10,1\n20,2\n", "is in °C"),
    ("10\n20\n", "temperature, C_p"),
    ("T,Cp\n10,1\n", "need at least 2"),
])
def test_bad_files_give_one_line_errors(text, message):
    with pytest.raises(DosInputError) as info:
        read_heat_capacity(text, name="cp.csv")
    assert message in str(info.value) and "\n" not in str(info.value)


def test_unit_spellings():
    assert heat_capacity_unit("J K-1 mol-1") == "J/(mol K)"
    assert heat_capacity_unit("Cp / J·mol⁻¹·K⁻¹") == "J/(mol K)"
    assert heat_capacity_unit("c_p (J/g/K)") == "J/(g K)"
    assert heat_capacity_unit("cal/mol/K") == "cal/(mol K)"
    assert heat_capacity_unit("frequency") is None
    with pytest.raises(OptionError, match="unknown heat-capacity unit"):
        read_heat_capacity("T,Cp\n1,2\n3,4\n", cp_unit="BTU/lb")


def test_restricted_range_refuses_too_few_points():
    m = read_heat_capacity("T,Cp\n10,1\n20,2\n30,3\n")
    assert m.restricted(15, 30).temperature_K.tolist() == [20.0, 30.0]
    with pytest.raises(OptionError, match="holds 1"):
        m.restricted(25, 40)
    assert np.all(m.temperature_K == [10, 20, 30])


def test_kilo_units_are_refused_not_misread():
    # A kJ header must not be read as J (a silent factor 1000).
    with pytest.raises(OptionError, match="not supported"):
        read_heat_capacity("T (K),Cp (kJ/(mol K))\n10,0.001\n20,0.002\n")
    with pytest.raises(OptionError, match="not supported"):
        heat_capacity_unit("kcal/(mol K)")
