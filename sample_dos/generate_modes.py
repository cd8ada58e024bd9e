"""Generate the invented demo mode list of modeheat: ``springium_modes.dat``.

The monatomic fcc 'springium' of ``generate.py`` (47.1 amu, made-up central
springs 11.8 and 2.1 N/m), given an invented lattice constant of 3.90 Å, on an
8³ Γ-centred q-point mesh: one row per mode with its q-point weight, frequency
and Cartesian wave vector (1/Å, 2π included), and the cell volume.  Nothing
describes a real material.  ``python sample_dos/generate_modes.py`` rewrites the
file (deterministic); :func:`mode_list_text` gives any mesh (the bench uses 16³).
"""

from __future__ import annotations

import pathlib

import numpy as np

try:
    from .generate import _axis_vectors, _fcc_vectors, _frequencies
except ImportError:                      # run as a script
    from generate import _axis_vectors, _fcc_vectors, _frequencies

HERE = pathlib.Path(__file__).resolve().parent
#: Invented lattice constant of the demo crystal [Å].
LATTICE_A = 3.90


def mode_list_text(n, lattice=LATTICE_A, springs=(11.8, 2.1)):
    """The mode list of an n³ Γ-centred mesh as file text (springs [N/m] of the two neighbour shells)."""
    cell = np.array([[0, 1, 1], [1, 0, 1], [1, 1, 0]], float) * lattice / 2
    recip = 2 * np.pi * np.linalg.inv(cell).T
    f = np.arange(n) / n
    f = f - np.round(f)
    q = np.array(np.meshgrid(f, f, f, indexing="ij")).reshape(3, -1).T @ recip
    bonds = ([(0, 0, d, springs[0]) for d in _fcc_vectors(0.5 * lattice)]
             + [(0, 0, d, springs[1]) for d in _axis_vectors(lattice)])
    nu, _ = _frequencies(q, np.array([47.1]), bonds)
    nu = nu.reshape(-1, 3)
    rows = [f"{1 / len(q):.10g} {v:.6f} {qi[0]:.6f} {qi[1]:.6f} {qi[2]:.6f}" for qi, modes in zip(q, nu) for v in modes]
    head = ["# modeheat demo data - INVENTED: monatomic fcc 'springium' (47.1 amu), ball-and-spring model",
            f"# made-up springs {springs[0]:g} and {springs[1]:g} N/m, invented lattice constant {lattice:g} A; "
            f"{n}^3 Gamma-centred mesh",
            f"# cell volume: {abs(np.linalg.det(cell)):.6f} A^3",
            "weight frequency_THz qx_per_A qy_per_A qz_per_A"]
    return "\n".join(head + rows) + "\n"


def main():
    (HERE / "springium_modes.dat").write_text(mode_list_text(8), encoding="utf-8")


if __name__ == "__main__":
    main()
