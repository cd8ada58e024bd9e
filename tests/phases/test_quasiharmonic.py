"""Quasi-harmonic phase comparison against two Debye solids with Birch–Murnaghan E(V) minimised directly.

References (tests/phases/references.py): Birch, Phys. Rev. 71, 809 (1947) for E(V); Debye, Ann. Phys. 344, 789
(1912) in closed form (mpmath) with θ = θ₀(V₀/V)^γ; G = min_V(F + pV) by scipy's bounded minimiser and T* by
brentq, both with their status checked; Clausius–Clapeyron dT/dp = ΔV/ΔS (Callen 1985, § 9.3).
Parameters are invented.
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np
import pytest
from scipy import constants as sc

from tests.phases.references import QHSolid, qh_transition, volumes
from tests.spectra import debye_table, dos_text
from thermo.phases import Phase, compare_phases
from thermo.preparation.loading import load_dos
from thermo.quasiharmonic import make_volume_set

A = QHSolid(20.0, 100.0, 4.5, 400.0, 1.6)
B = QHSolid(21.0, 80.0, 4.5, 300.0, 1.8, e0=0.03)
PRESSURES = (0.0, 2.0, 5.0)
GUESS = {0.0: 380.0, 2.0: 560.0, 5.0: 810.0}
K_PER_GPA = sc.angstrom ** 3 * sc.giga / sc.electron_volt     # CODATA via scipy.constants


def phase(name, solid, per_cell=1):
    entries = [(float(v) * per_cell, float(solid.static_energy(v)) * per_cell,
                load_dos(dos_text(*debye_table(solid.theta(v), per_cell, 2001)), name=f"{name}_{v:.3f}.dat"))
               for v in volumes(solid)]
    return Phase(name, make_volume_set(entries))


@lru_cache(maxsize=None)
def comparison():
    return compare_phases([phase("a", A), phase("b", B)], np.arange(0.0, 1100.1, 5.0), pressures_gpa=PRESSURES,
                          boundary=True)


@lru_cache(maxsize=None)
def reference(p):
    return qh_transition(A, B, p, GUESS[p] - 40.0, GUESS[p] + 40.0)


@pytest.mark.parametrize("p", PRESSURES)
def test_transition_temperature_at_pressure(p):
    [tr] = [x for x in comparison().transitions if x["pressure_GPa"] == p]
    truth, dv, _ = reference(p)
    print(f"p = {p} GPa: T* = {tr['temperature_K']:.4f} K, reference {truth:.4f} K, u = {tr['uncertainty_K']:.3g} K")
    assert (tr["low_phase"], tr["high_phase"]) == ("a", "b")
    assert abs(tr["temperature_K"] - truth) < 2.0
    assert abs(tr["temperature_K"] - truth) <= tr["uncertainty_K"]
    assert tr["volume_difference_A3"] == pytest.approx(dv, rel=1e-3)


@pytest.mark.parametrize("p", PRESSURES)
def test_clausius_clapeyron_slope(p):
    [point] = [x for x in comparison().boundary if x["pressure_GPa"] == p]
    _, dv, ds = reference(p)
    truth = dv / ds * K_PER_GPA
    print(f"p = {p} GPa: dT/dp = {point['clapeyron_slope_K_per_GPa']:.4f} K/GPa, reference {truth:.4f}")
    assert point["clapeyron_slope_K_per_GPa"] == pytest.approx(truth, rel=0.01)


def test_boundary_follows_the_slope_between_pressures():
    # T*(p) itself agrees with ∫ dT/dp: the trapezoid of the ΔV/ΔS slopes over 0-2 and 2-5 GPa (second order)
    points = {x["pressure_GPa"]: x for x in comparison().boundary}
    for p0, p1 in ((0.0, 2.0), (2.0, 5.0)):
        rise = points[p1]["temperature_K"] - points[p0]["temperature_K"]
        mean = 0.5 * (points[p0]["clapeyron_slope_K_per_GPa"] + points[p1]["clapeyron_slope_K_per_GPa"])
        assert rise == pytest.approx(mean * (p1 - p0), rel=0.02)


def test_per_atom_bookkeeping_for_volume_sets():
    # The same solid written with 2 formula units per cell: ΔG = 0 per atom (to the EOS fit's rounding)
    result = compare_phases([phase("one", A), phase("two", A, per_cell=2)], np.arange(0.0, 1000.1, 50.0),
                            pressures_gpa=[0.0, 5.0])
    dg = result.table["gibbs_energy_difference_meV_per_atom"].to_numpy()
    assert np.max(np.abs(dg)) * 1e-3 < 1e-9
    assert result.transitions == []
