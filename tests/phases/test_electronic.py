"""The electronic term in the phase comparison: a free-electron-like DOS on one phase shifts T*.

Reference: Debye F in closed form (Debye 1912, mpmath) plus the free-electron F_el = U_el − T S_el at fixed
electron count from mpmath Fermi–Dirac integrals with μ(T) by mpmath's root finder
(tests/electronic/references.py; Ashcroft & Mermin 1976, ch. 2); T* by mpmath findroot.  Parameters invented.
"""

from __future__ import annotations

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from tests.electronic import references as el
from tests.phases.references import crossing, debye_free_energy
from tests.spectra import debye_table, dos_text
from thermo.electronic import make_electronic_dos
from thermo.phases import Phase, compare_phases
from thermo.preparation.loading import load_dos

KJ_PER_MOL_EV = sc.kilo / (sc.N_A * sc.electron_volt)     # eV per kJ/mol (CODATA via scipy.constants)
STATIC_BETA = 6.0 * KJ_PER_MOL_EV                         # per formula unit of beta (2 atoms)


def phases(electronic):
    alpha = Phase("alpha", load_dos(dos_text(*debye_table(400.0, 1, 2001)), name="alpha.dat"), atoms=1)
    beta = Phase("beta", load_dos(dos_text(*debye_table(300.0, 2, 2001)), name="beta.dat"), static_ev=STATIC_BETA,
                 atoms=2, electronic=make_electronic_dos(*el.free_electron_grid()) if electronic else None)
    return [alpha, beta]


def electronic_free_energy(t):
    """F_el per formula unit of beta [eV] (mpmath Fermi–Dirac integrals)."""
    _, u, s, _ = el.free_electron_exact(float(t))
    return mp.mpf(u) - mp.mpf(t) * mp.mpf(s)


def test_free_electron_term_shifts_the_transition_as_mpmath_says():
    grid = np.arange(0.0, 1000.1, 5.0)
    [plain] = compare_phases(phases(False), grid).transitions
    [with_el] = compare_phases(phases(True), grid).transitions
    with mp.workdps(30):
        def delta(t, extra=False):
            beta = debye_free_energy(300, t) + mp.mpf(STATIC_BETA) / 2
            if extra:
                beta += electronic_free_energy(t) / 2
            return beta - debye_free_energy(400, t)
        truth_plain = crossing(delta, 300.0)
        truth = crossing(lambda t: delta(t, True), truth_plain)
    print(f"T* without {plain['temperature_K']:.6f} (mpmath {truth_plain:.6f}), with the electronic term "
          f"{with_el['temperature_K']:.6f} (mpmath {truth:.6f}), u = {with_el['uncertainty_K']:.3g} K")
    assert truth < truth_plain - 1.0                      # the electronic entropy favours beta: T* moves down
    assert abs(with_el["temperature_K"] - truth) <= with_el["uncertainty_K"]
    assert abs(with_el["temperature_K"] - truth) < 0.01
    assert (with_el["temperature_K"] - plain["temperature_K"]) == pytest.approx(truth - truth_plain, abs=0.01)
