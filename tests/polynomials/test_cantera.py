"""The YAML block loaded by Cantera (open-source thermochemistry library, test dependency).

Cantera 3.2 (D. G. Goodwin et al., https://cantera.org) reads the species
block exactly as written; its C_p, H, S at 300, 600, 1000, 1500 K must equal
ours to 1e-6 relative.  The block is also placed, unchanged, in a
``fixed-stoichiometry`` phase (Cantera's model for a pure condensed phase).
The input is a synthetic two-atom spectrum (invented; tests/spectra.py).
"""

from __future__ import annotations

import numpy as np
import pytest

from tests.spectra import band_plus_peaks
from thermo.errors import OptionError
from thermo.polynomials.cantera_yaml import cantera_yaml
from thermo.polynomials import fit_polynomial, harmonic_source

ct = pytest.importorskip("cantera")
TEMPERATURES = (300.0, 600.0, 1000.0, 1500.0)


@pytest.fixture(scope="module")
def source():
    return harmonic_source(band_plus_peaks(4.0, [9.0]), 298.15, 1500.0)


@pytest.mark.parametrize("form", ["nasa7", "shomate"])
def test_cantera_species_matches_our_evaluation(source, form):
    fit = fit_polynomial(source, form, (298.15, 1500.0), formation_enthalpy=-601.6, phase="cr")
    text = cantera_yaml(fit, "MgO")
    species = ct.Species.list_from_yaml(text, section="species")
    assert [sp.name for sp in species] == ["MgO(cr)"]
    thermo = species[0].thermo
    ours = fit.properties(np.array(TEMPERATURES))
    for i, t in enumerate(TEMPERATURES):
        # Cantera works per kmol
        assert thermo.cp(t) / 1e3 == pytest.approx(ours["heat_capacity_p"][i], rel=1e-6)
        assert thermo.h(t) / 1e3 == pytest.approx(ours["enthalpy"][i], rel=1e-6)
        assert thermo.s(t) / 1e3 == pytest.approx(ours["entropy"][i], rel=1e-6)


@pytest.mark.parametrize("form", ["nasa7", "shomate"])
def test_block_loads_unchanged_in_a_fixed_stoichiometry_phase(source, form):
    fit = fit_polynomial(source, form, (298.15, 1500.0), t_mid=900.0, formation_enthalpy=0.0)
    phase = ("phases:\n- name: solid\n  thermo: fixed-stoichiometry\n  elements: [Mg, O]\n"
             "  species: [MgO(cr)]\n  density: 3.58 g/cm^3\n")
    solid = ct.Solution(yaml=phase + cantera_yaml(fit, "MgO"))
    ours = fit.properties(np.array(TEMPERATURES))
    for i, t in enumerate(TEMPERATURES):
        solid.TP = t, 1e5   # the block's reference pressure: no P·V correction
        assert solid.cp_mole / 1e3 == pytest.approx(ours["heat_capacity_p"][i], rel=1e-6)
        assert solid.enthalpy_mole / 1e3 == pytest.approx(ours["enthalpy"][i], rel=1e-6, abs=1e-6)
        assert solid.entropy_mole / 1e3 == pytest.approx(ours["entropy"][i], rel=1e-6)
        assert solid.gibbs_mole / 1e3 == pytest.approx(ours["gibbs_energy"][i], rel=1e-6)


def test_two_range_shomate_loads_in_cantera(source):
    fit = fit_polynomial(source, "shomate", (298.15, 1500.0), t_mid=700.0, formation_enthalpy=-601.6)
    assert len(fit.ranges) == 2
    thermo = ct.Species.list_from_yaml(cantera_yaml(fit, "MgO"), section="species")[0].thermo
    ours = fit.properties(np.array(TEMPERATURES))
    for i, t in enumerate(TEMPERATURES):
        assert thermo.cp(t) / 1e3 == pytest.approx(ours["heat_capacity_p"][i], rel=1e-6)
        assert thermo.h(t) / 1e3 == pytest.approx(ours["enthalpy"][i], rel=1e-6)
        assert thermo.s(t) / 1e3 == pytest.approx(ours["entropy"][i], rel=1e-6)


def test_sgte_has_no_cantera_model(source):
    fit = fit_polynomial(source, "sgte", (298.15, 1500.0))
    with pytest.raises(OptionError, match="no sgte model"):
        cantera_yaml(fit, "MgO")
