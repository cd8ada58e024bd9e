"""Synthetic spectra shared by the test suite (invented for testing only), as DOS text or PhononDOS."""

from __future__ import annotations

import mpmath as mp
import numpy as np
from scipy import constants as sc

from thermo.kernels.planck import H_OVER_K_THZ
from thermo.spectrum import LowFrequencyFit, PhononDOS

#: h/k_B in K per THz (CODATA via scipy.constants).
K_PER_THZ = sc.h * 1e12 / sc.k


def dos_text(frequency, *columns, header="frequency_THz total", delimiter=" "):
    """A DOS file body: one header line and numeric rows (full precision)."""
    rows = [delimiter.join(repr(float(v)) for v in row) for row in np.column_stack((frequency,) + columns)]
    return header + "\n" + "\n".join(rows) + "\n"


def debye_table(theta_k, atoms=1, points=2001):
    """Debye DOS g = 9n ν²/ν_D³ on [0, ν_D] (states/THz per formula unit)."""
    nu_d = theta_k / K_PER_THZ
    nu = np.linspace(0.0, nu_d, points)
    return nu, 9 * atoms * nu ** 2 / nu_d ** 3

def debye_entropy(theta_k, t_k):
    """Debye entropy [J/(mol K) per mole of atoms] by mpmath quadrature (P. Debye, Ann. Phys. 39, 789 (1912)):
    S/R = (9/y³)∫₀^y x²[x/(eˣ−1) − ln(1−e⁻ˣ)] dx, y = θ/T; R from CODATA via scipy.constants."""
    with mp.workdps(25):       # local precision: the global mpmath setting of other tests is left alone
        y = mp.mpf(theta_k) / t_k
        integral = mp.quad(lambda x: x ** 2 * (x / mp.expm1(x) - mp.log(-mp.expm1(-x))), [0, y])
        return float(sc.R * 9 / y ** 3 * integral)


def debye_spectrum(nu_d_thz, atoms=1):
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
