"""Shared helpers for the test suite: synthetic spectra written as DOS text."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import constants as sc

#: h/k_B in K per THz (CODATA via scipy.constants).
K_PER_THZ = sc.h * 1e12 / sc.k


def dos_text(frequency, *columns, header="frequency_THz total", delimiter=" "):
    """A DOS file body: one header line and numeric rows (full precision)."""
    rows = [delimiter.join(repr(float(v)) for v in row) for row in np.column_stack((frequency,) + columns)]
    return header + "\n" + "\n".join(rows) + "\n"


def debye_dos(theta_k, atoms=1, points=2001):
    """Debye DOS g = 9n ν²/ν_D³ on [0, ν_D] (states/THz per formula unit)."""
    nu_d = theta_k / K_PER_THZ
    nu = np.linspace(0.0, nu_d, points)
    return nu, 9 * atoms * nu ** 2 / nu_d ** 3


@pytest.fixture
def debye_text():
    def make(theta_k=400.0, atoms=1, points=2001):
        return dos_text(*debye_dos(theta_k, atoms, points))
    return make
