"""Invented spectra for the benchmark (a made-up spring model, demo only).

The 'spring crystal' has two atoms per formula unit: three acoustic branches
of Debye form up to 6 THz (ν² at low frequency) and two optical bands near
9 and 12 THz from made-up force constants.  None of it describes a real
material.
"""

from __future__ import annotations

import numpy as np
from scipy import special

#: Debye cut-off of the acoustic part of the spring crystal [THz].
ACOUSTIC_CUTOFF_THZ = 6.0


def spring_crystal(points, top_thz=14.0, acoustic_cutoff_thz=ACOUSTIC_CUTOFF_THZ):
    """Frequencies [THz] and DOS [states/THz] of the invented spring crystal.

    Acoustic part :math:`9\\nu^2/\\nu_a^3` (3 modes) with a soft edge, optical
    Gaussian bands with 3 modes in all; 6 modes = 3 × 2 atoms.
    """
    nu = np.linspace(0.0, top_thz, points)
    edge = 0.5 * special.erfc((nu - acoustic_cutoff_thz) / 0.15)
    acoustic = 9.0 * nu ** 2 / acoustic_cutoff_thz ** 3 * edge
    optical = (1.8 * np.exp(-0.5 * ((nu - 9.0) / 0.6) ** 2) / (0.6 * np.sqrt(2 * np.pi))
               + 1.2 * np.exp(-0.5 * ((nu - 12.0) / 0.4) ** 2) / (0.4 * np.sqrt(2 * np.pi)))
    return nu, acoustic + optical


def debye_solid(points, cutoff_thz):
    """Debye DOS :math:`9\\nu^2/\\nu_D^3` (one atom, 3 modes) on [0, ν_D]."""
    nu = np.linspace(0.0, cutoff_thz, points)
    return nu, 9.0 * nu ** 2 / cutoff_thz ** 3


def smeared_debye(points, cutoff_thz, sigma_thz):
    """Debye DOS convolved with a Gaussian of width σ, on [0, ν_D + 6σ].

    Closed form of :math:`\\int_0^{\\nu_D} 9\\nu'^2/\\nu_D^3\\, G_\\sigma(\\nu-\\nu')\\,d\\nu'`.
    """
    nu = np.linspace(0.0, cutoff_thz + 6 * sigma_thz, points)
    a, b = (0.0 - nu) / sigma_thz, (cutoff_thz - nu) / sigma_thz

    def moment(z):
        # ∫ (ν + σ z)² φ(z) dz antiderivative, φ the standard normal density
        phi = np.exp(-0.5 * z * z) / np.sqrt(2 * np.pi)
        cdf = 0.5 * special.erfc(-z / np.sqrt(2))
        return (nu ** 2 + sigma_thz ** 2) * cdf - sigma_thz * (2 * nu + sigma_thz * z) * phi

    return nu, 9.0 / cutoff_thz ** 3 * (moment(b) - moment(a))


def as_text(nu, g, header="# frequency (THz)  dos (states/THz)"):
    """The spectrum as a two-column text file."""
    body = "\n".join(f"{a:.9g} {b:.9g}" for a, b in zip(nu, g))
    return f"{header}\n{body}\n"
