"""Rows missing inside a spectrum are reported once, with the share of modes across the hole.

Reference for the share: the Debye DOS g = 9ν²/ν_D³ (one atom, exact ν² law; Debye, Ann. Phys. 344,
789 (1912)) has ∫_a^b g dν = 9(b³ − a³)/(3ν_D³) modes out of 3 in closed form; a straight line
across the hole carries the trapezoid (g(a) + g(b))(b − a)/2 instead, computed here independently.
"""

from __future__ import annotations

import re

import numpy as np
import pytest

from tests.spectra import dos_text
from thermo import load_dos
from thermo.preparation.validation import hole_warnings

NU_D = 6.0


def _debye_rows(step, hole=None):
    nu = np.arange(0.0, NU_D + step / 2, step)
    if hole is not None:
        nu = nu[(nu <= hole[0] + 1e-9) | (nu >= hole[1] - 1e-9)]
    return nu, 9 * nu ** 2 / NU_D ** 3


@pytest.mark.parametrize("step", [0.01, 0.02, 0.05])
def test_hole_is_reported_once_with_the_share_of_a_straight_line(step):
    nu, g = _debye_rows(step, hole=(2.0, 3.0))
    dos = load_dos(dos_text(nu, g, header="frequency_THz dos"))
    notes = [w for w in dos.warnings if "rows missing" in w]
    assert len(notes) == 1
    assert "between 2 and 3" in notes[0]
    share = float(re.search(r"holds ([0-9.]+) %", notes[0]).group(1))
    trapezoid = 0.5 * (9 * 4 / NU_D ** 3 + 9 * 9 / NU_D ** 3) * 1.0      # modes on the straight line
    exact_total = 3.0 - 9 * (27 - 8) / (3 * NU_D ** 3) + trapezoid        # what the file integrates to
    assert share == pytest.approx(100 * trapezoid / exact_total, rel=5e-3)


def test_band_gap_and_logarithmic_grid_are_not_holes():
    # a gap with zero DOS at its edges is physics, not missing rows
    nu = np.r_[np.linspace(0, 2, 41), np.linspace(4, 6, 41)]
    g = np.where(nu <= 2, nu ** 2 * (2 - nu), (nu - 4) * (6 - nu))
    assert hole_warnings(nu, g) == ()
    # a smoothly growing (geometric) spacing
    nu = np.r_[0.0, np.geomspace(0.01, 6.0, 200)]
    assert hole_warnings(nu, nu ** 2) == ()


def test_uniform_grid_without_hole_has_no_warning():
    nu, g = _debye_rows(0.02)
    assert not [w for w in load_dos(dos_text(nu, g, header="frequency_THz dos")).warnings if "rows missing" in w]
