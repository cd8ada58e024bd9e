"""Units are never guessed from a comment, every load checks plausibility, partials must add up.

References outside the project:
- unit factors from CODATA 2018 via scipy.constants (computed here, not taken from thermo.units);
- Debye entropy by mpmath quadrature of S/R = (9/y³)∫₀^y x²[x/(eˣ−1) − ln(1−e⁻ˣ)] dx, y = θ/T
  (P. Debye, Ann. Phys. 39, 789 (1912));
- the entropy range of solids at 298.15 K, about 2.4 (diamond) to 85 (caesium) J/(mol K) per atom:
  CRC Handbook of Chemistry and Physics, section 5 (values from memory);
- projected DOS columns add up to the total DOS (common practice).
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy import constants as sc

from tests.spectra import debye_entropy, debye_table, dos_text
from thermo import DosInputError, load_dos, tabulate
from thermo.columns import column_name
from thermo.preparation.plausibility import max_frequency_readings, partial_sum_warnings, unit_warnings

THETA = 350.0
# Factors computed from CODATA here, independent of thermo.units.
PER_THZ = {"eV": sc.h * 1e12 / sc.e, "Hz": 1e12, "rad/ps": 2 * np.pi, "cm-1": 1e12 / sc.c / 100,
           "THz": 1.0, "rad/s": 2 * np.pi * 1e12}


_debye_entropy = debye_entropy


def _entropy_298(dos):
    return float(tabulate(dos, [298.15])[column_name("entropy")].iloc[0])


def _unit_warnings(dos):
    return [w for w in dos.warnings if "check the frequency unit" in w]


@pytest.mark.parametrize("comment", ["# Gaussian smearing sigma = 2 cm-1", "# sigma = 0.1 meV"])
def test_unit_merely_mentioned_in_a_comment_is_not_taken(comment):
    nu, g = debye_table(THETA, points=801)
    text = comment + "\n" + dos_text(nu, g, header="f g")
    with pytest.raises(DosInputError, match="line 1 mentions .*not as the frequency unit.*set the frequency unit"):
        load_dos(text)
    dos = load_dos(text, freq_unit="THz")
    assert _entropy_298(dos) == pytest.approx(_debye_entropy(THETA, 298.15), rel=1e-4)
    assert _unit_warnings(dos) == []


def test_explicit_unit_statement_is_taken():
    nu, g = debye_table(THETA, points=801)
    f = PER_THZ["cm-1"]
    text = "# frequencies in cm-1; smearing 0.1 meV\n" + dos_text(nu * f, g / f, header="f g")
    dos = load_dos(text)
    assert dos.source["freq_unit"] == "cm-1"
    assert _entropy_298(dos) == pytest.approx(_debye_entropy(THETA, 298.15), rel=1e-4)


@pytest.mark.parametrize("unit, header", [("eV", "E (eV) g"), ("Hz", "nu_Hz g"), ("rad/ps", "omega [rad/ps] g")])
def test_new_units_from_header_and_option(unit, header):
    nu, g = debye_table(THETA, points=801)
    f = PER_THZ[unit]
    for text, option in ((dos_text(nu * f, g / f, header=header), None),
                         (dos_text(nu * f, g / f, header="a b"), unit)):
        dos = load_dos(text, freq_unit=option)
        assert dos.source["freq_unit"] == unit
        assert _entropy_298(dos) == pytest.approx(_debye_entropy(THETA, 298.15), rel=1e-4)
        assert _unit_warnings(dos) == []


def test_wrong_unit_rad_per_second_is_refused_naming_the_range():
    # THz data read as rad/s: ν_max = 7.29 / (2π·10¹²) THz, far below any solid; the magnitude guard
    # refuses it (a warning would still let a nonsense table through)
    nu, g = debye_table(THETA, points=801)
    with pytest.raises(DosInputError, match=r"highest frequency is 1\.16e-12 THz, below the accepted .*frequency unit"):
        load_dos(dos_text(nu, g, header="f g"), freq_unit="rad/s")


def test_unit_readings_name_the_plausible_units():
    # the readings the warning quotes: 7.29 in each unit, in THz (CODATA factors via scipy.constants)
    readings = max_frequency_readings(7.29)
    assert readings["THz"][0] == pytest.approx(7.29)
    notes = unit_warnings(7.29, "rad/s", 772.0)   # the file value 7.29 read as rad/s
    assert len(notes) == 2 and "THz (ν_max 7.29 THz" in notes[0] and "per atom, outside the 1–100" in notes[1]


def test_thz_file_read_as_wavenumbers_is_warned_by_its_entropy():
    nu, g = debye_table(THETA, points=801)   # ν_max 7.29 THz, read as 7.29 cm-1 = 0.219 THz
    dos = load_dos(dos_text(nu, g, header="f g"), freq_unit="cm-1")
    assert _entropy_298(dos) > 100
    assert any("entropy at 298.15 K" in w for w in _unit_warnings(dos))


def test_max_frequency_readings_follow_codata():
    readings = max_frequency_readings(10.0)
    for unit, f in PER_THZ.items():
        nu, theta = readings[unit]
        assert nu == pytest.approx(10.0 / f, rel=1e-12)
        assert theta == pytest.approx(sc.h * nu * 1e12 / sc.k, rel=1e-12)


def test_cumulative_partial_column_is_named():
    nu, g = debye_table(THETA, points=801)
    cumulative = np.concatenate([[0.0], np.cumsum(0.5 * (g[1:] + g[:-1]) * np.diff(nu))])
    text = dos_text(nu, g, 0.5 * g, cumulative, header="f_THz total A B")
    notes = [w for w in load_dos(text).warnings if "partial" in w]
    assert "partial columns 'A', 'B' do not add up" in notes[0]
    assert "'B' follows the running integral of the total" in notes[1]
    assert len(notes) == 2


def test_partials_that_add_up_give_no_warning():
    nu, g = debye_table(THETA, points=801)
    text = dos_text(nu, g, 0.3 * g, 0.7 * g, header="f_THz total A B")
    assert not [w for w in load_dos(text).warnings if "partial" in w]
    # 1 % off: inside the stated 2 % tolerance; 5 % off: outside
    assert partial_sum_warnings(nu, g, {"A": 0.31 * g, "B": 0.7 * g}) == []
    assert len(partial_sum_warnings(nu, g, {"A": 0.35 * g, "B": 0.7 * g})) == 1


def test_atom_count_message_has_a_proper_plural():
    nu, g = debye_table(THETA, points=801)
    with pytest.raises(DosInputError, match="integrates to 1 mode, not 3n"):
        load_dos(dos_text(nu, g / 3, header="f_THz g"))
    dos = load_dos(dos_text(nu, 2 * g / 6, header="f_THz g"), atoms=2)   # normalised to 1, 2 atoms given
    assert dos.atoms == 2 and dos.mode_count == pytest.approx(6.0)


def test_old_policy_spelling_is_an_alias():
    nu = np.linspace(-0.5, 7.0, 751)
    g = np.where(nu < 0, 0.01, 9 * np.clip(nu, 0, None) ** 2 / 7.0 ** 3)
    old = load_dos(dos_text(nu, g, header="f_THz g"), atoms=1, negative="keep-count")
    new = load_dos(dos_text(nu, g, header="f_THz g"), atoms=1, negative="drop-unscaled")
    assert new.source["negative_policy"] == "drop-unscaled" == old.source["negative_policy"]
    share = new.source["negative_mode_fraction"]
    assert share > 0 and new.mode_count == pytest.approx(3 * (1 - share), rel=1e-9)
