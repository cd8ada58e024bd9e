"""Handbook plausibility: a Debye solid with a handbook θ_D against NIST-JANAF.

Reference data: NIST-JANAF Thermochemical Tables (M. W. Chase, Jr., J. Phys.
Chem. Ref. Data Monograph 9, 1998) as shipped by the `janaf` PyPI package:
C_p and S of the crystal at 298.15 K.

θ_D values are low-temperature calorimetric Debye temperatures from memory of
C. Kittel, *Introduction to Solid State Physics*, 8th ed. (Wiley, 2005),
Table 5.1 (Al 428 K, Cu 343 K, Pb 105 K) — from memory, not looked up.

Tolerance, honestly stated: the harmonic Debye C_v must lie below the
tabulated C_p by at most 10 %, and S below the tabulated S by at most 12 %.
C_p − C_v (thermal expansion), the electronic heat capacity, anharmonicity and
a temperature-dependent θ_D all push the measured values up; measured here:
Al C_v −6.8 %, S −9.9 %; Cu −4.4 %, −7.8 %; Pb −7.6 %, −8.4 %.
This is a plausibility check of magnitude and units, not a validation.
"""

from __future__ import annotations

import janaf
import pytest

from tests.spectra import debye_table, dos_text
from thermo import load_dos, tabulate


def janaf_row(index, temperature="298.15"):
    """C_p and S [J/mol/K] of a JANAF table at a tabulated temperature."""
    table = janaf.Table(index)
    for line in table.body.splitlines()[1:]:
        cells = line.split("\t")
        if cells[0] == temperature:
            return float(cells[1]), float(cells[2])
    raise LookupError(f"{index}: no row at {temperature} K")


@pytest.mark.parametrize("index, theta", [("Al-002", 428.0), ("Cu-002", 343.0), ("Pb-002", 105.0)])
def test_debye_solid_is_plausible_against_janaf(index, theta):
    assert "(cr)" in janaf.Table(index).formula
    cp, s_ref = janaf_row(index)
    row = tabulate(load_dos(dos_text(*debye_table(theta, points=1001))), [298.15]).iloc[0]
    cv, s = row.heat_capacity_v_J_per_mol_K, row.entropy_J_per_mol_K
    assert 0.90 * cp <= cv <= cp
    assert 0.88 * s_ref <= s <= s_ref
