"""Published Shomate coefficients evaluated by our evaluator against tabulated values.

Coefficients FROM MEMORY (not looked up during this work) of the NIST Chemistry
WebBook (NIST Standard Reference Database 69, condensed-phase Shomate
equations):
- copper, solid, 298–1358 K: A 17.72891, B 28.09870, C −31.25289, D 13.97243,
  E 0.068611, F −6.056591, G 47.89592, H 0.0;
- aluminium oxide (corundum), solid, 298–2327 K: A 102.4290, B 38.74980,
  C −15.91090, D 2.628181, E −3.007551, F −1717.930, G 146.9970, H −1675.690.
The WebBook's own table for copper, also from memory: C_p 24.47 and S 33.17
J/(mol·K) at 298.15 K, C_p 28.62 and S 64.99 J/(mol·K) at 1000 K (printed to
0.01).  Independent check: NIST-JANAF Thermochemical Tables (M. W. Chase,
J. Phys. Chem. Ref. Data Monograph 9, 1998), via the `janaf` package; the
WebBook fits reproduce JANAF to a few tenths of a per cent (tolerance 0.5 %).
"""

from __future__ import annotations

import janaf
import pytest

from thermo.polynomials import FitRange, PolynomialFit

COPPER = dict(A=17.72891, B=28.09870, C=-31.25289, D=13.97243, E=0.068611, F=-6.056591, G=47.89592, H=0.0)
CORUNDUM = dict(A=102.4290, B=38.74980, C=-15.91090, D=2.628181, E=-3.007551, F=-1717.930, G=146.9970,
                H=-1675.690)


def janaf_row(index, temperature):
    """C_p, S [J/(mol·K)] and H − H298 [kJ/mol] of a JANAF table at a tabulated temperature."""
    for line in janaf.Table(index).body.splitlines()[1:]:
        cells = line.split("\t")
        if cells[0] == temperature:
            return float(cells[1]), float(cells[2]), float(cells[4])
    raise LookupError(f"{index}: no row at {temperature} K")


def _webbook_fit(coefficients, t_max):
    return PolynomialFit("shomate", (FitRange(298.0, t_max, coefficients),),
                         formation_enthalpy_kJ_per_mol=coefficients["H"])


@pytest.mark.parametrize("temperature, cp, s", [(298.15, 24.47, 33.17), (1000.0, 28.62, 64.99)])
def test_copper_reproduces_the_webbook_table(temperature, cp, s):
    row = _webbook_fit(COPPER, 1358.0).evaluate([temperature]).iloc[0]
    assert row.heat_capacity_p_J_per_mol_K == pytest.approx(cp, abs=0.006)
    assert row.entropy_J_per_mol_K == pytest.approx(s, abs=0.006)


@pytest.mark.parametrize("coefficients, t_max, index", [(COPPER, 1358.0, "Cu-002"), (CORUNDUM, 2327.0, "Al-096")])
@pytest.mark.parametrize("temperature", ["298.15", "1000"])
def test_webbook_coefficients_agree_with_janaf(coefficients, t_max, index, temperature):
    cp, s, dh = janaf_row(index, temperature)
    row = _webbook_fit(coefficients, t_max).evaluate([float(temperature)]).iloc[0]
    assert row.heat_capacity_p_J_per_mol_K == pytest.approx(cp, rel=5e-3)
    assert row.entropy_J_per_mol_K == pytest.approx(s, rel=5e-3)
    assert row.enthalpy_increment_kJ_per_mol == pytest.approx(dh, rel=5e-3, abs=0.05)
    # absolute H(298.15) is the formation enthalpy H of the WebBook convention
    if temperature == "298.15":
        assert row.enthalpy_kJ_per_mol == pytest.approx(coefficients["H"], abs=0.05)
