"""Synthetic spectra shared by the model tests (invented for testing only)."""

from __future__ import annotations

import numpy as np
import pytest

from thermo.kernels.planck import H_OVER_K_THZ
from thermo.spectrum import LowFrequencyFit, PhononDOS


def debye_dos(nu_d_thz, atoms=1):
    """Exact Debye spectrum 9n ν²/ν_D³ on [0, ν_D] (analytic ν² part, empty table)."""
    coefficient = 9.0 * atoms / nu_d_thz ** 3
    return PhononDOS(np.array([nu_d_thz, nu_d_thz * 1.5]), np.zeros(2), atoms=atoms,
                     low_frequency=LowFrequencyFit(coefficient, nu_d_thz, (0.0, nu_d_thz)))


def gaussian(nu, centre, width, modes):
    return modes * np.exp(-0.5 * ((nu - centre) / width) ** 2) / (width * np.sqrt(2 * np.pi))


def peak_dos(nu0_thz, width_thz=0.01, atoms=1):
    """3n modes in a narrow normalised Gaussian at ν₀ (Einstein-like spectrum)."""
    nu = np.linspace(nu0_thz - 12 * width_thz, nu0_thz + 12 * width_thz, 2401)
    return PhononDOS(nu, gaussian(nu, nu0_thz, width_thz, 3.0 * atoms), atoms=atoms)


def band_plus_peaks(nu_ac_thz, peaks_thz, width_thz=0.01):
    """3 acoustic modes in an exact Debye band to ν_ac plus 3 modes in each narrow peak."""
    atoms = 1 + len(peaks_thz)
    top = max(peaks_thz) + 20 * width_thz
    nu = np.concatenate([[nu_ac_thz], np.linspace(nu_ac_thz + 1e-9, top, 40001)])
    g = sum(gaussian(nu, p, width_thz, 3.0) for p in peaks_thz)
    g[0] = 0.0
    return PhononDOS(nu, g, atoms=atoms,
                     low_frequency=LowFrequencyFit(9.0 / nu_ac_thz ** 3, nu_ac_thz, (0.0, nu_ac_thz)))


def theta_of(nu_thz):
    """θ = hν/k_B [K] (CODATA h, k_B via scipy.constants)."""
    return H_OVER_K_THZ * nu_thz


def write_text(path, nu, g):
    path.write_text("# frequency (THz) dos\n" + "\n".join(f"{float(a)!r} {float(b)!r}" for a, b in zip(nu, g)) + "\n")
    return path


# The helpers are checked against closed forms so that the other tests can trust them.

def test_synthetic_spectra_carry_3n_modes():
    # ∫ 9n ν²/ν_D³ dν = 3n, and a normalised Gaussian carries its stated modes (closed forms).
    assert debye_dos(5.0, atoms=2).mode_count == pytest.approx(6.0, rel=1e-12)
    assert peak_dos(5.0).mode_count == pytest.approx(3.0, rel=1e-9)
    assert band_plus_peaks(3.0, [6.0, 9.0]).mode_count == pytest.approx(9.0, rel=1e-7)
