"""Generate the invented volume set of modeheat's quasi-harmonic demo.

Everything is made up: the monatomic fcc 'springium' ball-and-spring model of
``sample_dos/generate.py`` at eleven volumes, its springs stiffening under
compression as k(V) = k₀ (V₀/V)^q (q = 3.4 first neighbours, 4.4 second),
plus an invented static energy curve (third-order Birch–Murnaghan form with
E₀ = -3.85 eV, V₀ = 17.6 Å³, B₀ = 72 GPa, B₀' = 4.8).  Nothing describes a
real material.  Run ``python sample_dos/volumes/generate_volumes.py`` to
rewrite the files (deterministic).

Files
-----
- ``springium_volumes.csv``  the manifest (volume_A3, energy_eV, dos_file)
- ``springium_vNN.dat``      the DOS at each volume, THz, spaces
"""

from __future__ import annotations

import pathlib
import sys

import numpy as np
from scipy import constants as sc

HERE = pathlib.Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))
import generate  # noqa: E402  (the demo spring models)

V0, E0, B0_GPA, B0_PRIME = 17.6, -3.85, 72.0, 4.8
SPRINGS = ((11.8, 3.4), (2.1, 4.4))      # (k₀ [N/m], exponent q)
MASS_AMU = 47.1
VOLUMES = np.round(np.linspace(0.95, 1.09, 11) * V0, 4)


def static_energy(v):
    """Invented static energy [eV] (Birch–Murnaghan form, Phys. Rev. 71, 809 (1947))."""
    b0 = B0_GPA * sc.giga * sc.angstrom ** 3 / sc.electron_volt
    u = (V0 / v) ** (2.0 / 3.0)
    return E0 + 9.0 * V0 * b0 / 16.0 * ((u - 1) ** 3 * B0_PRIME + (u - 1) ** 2 * (6 - 4 * u))


def springium_at(v, mesh=20):
    """Frequencies [THz] and weights of springium with volume-scaled springs."""
    a = (4.0 * v / V0) ** (1.0 / 3.0) / 4.0 ** (1.0 / 3.0)     # relative lattice spacing
    (k1, q1), (k2, q2) = SPRINGS
    bonds = ([(0, 0, d, k1 * (V0 / v) ** q1) for d in generate._fcc_vectors(0.5 * a)]
             + [(0, 0, d, k2 * (V0 / v) ** q2) for d in generate._axis_vectors(1.0 * a)])
    return generate._frequencies(generate._kmesh(mesh, a), np.array([MASS_AMU]), bonds)


def main():
    rows = ["# modeheat demo data - INVENTED volume set of fcc 'springium' (ball-and-spring model)",
            f"# springs k(V) = k0 (V0/V)^q: 11.8 N/m q=3.4, 2.1 N/m q=4.4; static energy BM3 form E0={E0} eV, "
            f"V0={V0} A^3, B0={B0_GPA} GPa, B0'={B0_PRIME}",
            "volume_A3,energy_eV,dos_file"]
    for i, v in enumerate(VOLUMES, start=1):
        nu, w = springium_at(v)
        grid = np.linspace(0.0, 9.0, 361)
        dos = generate._smear(nu, w, grid, 0.12)[:, 0]
        name = f"springium_v{i:02d}.dat"
        (HERE / name).write_text(
            f"# modeheat demo data - INVENTED: 'springium' at V = {v:g} A^3 per atom; 20^3 k-mesh, "
            "0.12 THz Gaussian smearing\n# states per THz per atom\nfrequency_THz total\n"
            + "\n".join(f"{a:.6g} {b:.6g}" for a, b in zip(grid, dos)) + "\n", encoding="utf-8")
        rows.append(f"{v:.4f},{static_energy(v):.8f},{name}")
    (HERE / "springium_volumes.csv").write_text("\n".join(rows) + "\n", encoding="utf-8")


if __name__ == "__main__":
    main()
