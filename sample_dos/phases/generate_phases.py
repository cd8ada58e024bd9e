"""Generate the invented second phase of modeheat's phase-comparison demo.

Everything is made up: 'springium-β', a simple-cubic polymorph of the demo's monatomic
ball-and-spring 'springium' (47.1 amu), with first-neighbour springs along the cube axes and
second-neighbour springs along the face diagonals, both softer than the fcc phase's and
stiffening under compression as k(V) = k₀ (V₀/V)^q, at eleven volumes; plus an invented static
energy curve (third-order Birch–Murnaghan form, 45 meV above the fcc phase at its minimum, larger
V₀, softer B₀).  The fcc phase (α) is the volume set of ``sample_dos/volumes``.  Nothing describes
a real material.  Run ``python sample_dos/phases/generate_phases.py`` to rewrite the files
(deterministic).

Files
-----
- ``springium_beta_volumes.csv``   the manifest (volume_A3, energy_eV, dos_file)
- ``springium_beta_vNN.dat``       the DOS at each volume, THz, spaces
"""

from __future__ import annotations

import pathlib
import sys

import numpy as np
from scipy import constants as sc

HERE = pathlib.Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))
import generate  # noqa: E402  (the demo spring models)

V0, E0, B0_GPA, B0_PRIME = 18.3, -3.805, 60.0, 5.0
SPRINGS = ((7.2, 3.6), (3.1, 4.6))      # (k₀ [N/m], exponent q): cube axes, face diagonals
MASS_AMU = 47.1
VOLUMES = np.round(np.linspace(0.95, 1.10, 11) * V0, 4)


def static_energy(v):
    """Invented static energy [eV] (Birch–Murnaghan form, Phys. Rev. 71, 809 (1947))."""
    b0 = B0_GPA * sc.giga * sc.angstrom ** 3 / sc.electron_volt
    u = (V0 / v) ** (2.0 / 3.0)
    return E0 + 9.0 * V0 * b0 / 16.0 * ((u - 1) ** 3 * B0_PRIME + (u - 1) ** 2 * (6 - 4 * u))


def simple_cubic_mesh(n, lattice):
    """Monkhorst–Pack style mesh of the simple-cubic reciprocal cell (offset ½)."""
    f = (np.arange(n) + 0.5) / n
    return np.array(np.meshgrid(f, f, f, indexing="ij")).reshape(3, -1).T * (2 * np.pi / lattice)


def beta_at(v, mesh=24):
    """Frequencies [THz] and weights of springium-β with volume-scaled springs."""
    a = (v / V0) ** (1.0 / 3.0)                 # relative lattice spacing
    (k1, q1), (k2, q2) = SPRINGS
    bonds = ([(0, 0, d, k1 * (V0 / v) ** q1) for d in generate._axis_vectors(a)]
             + [(0, 0, d, k2 * (V0 / v) ** q2) for d in generate._fcc_vectors(a)])
    return generate._frequencies(simple_cubic_mesh(mesh, a), np.array([MASS_AMU]), bonds)


def main():
    rows = ["# modeheat demo data - INVENTED volume set of simple-cubic 'springium-beta' (ball-and-spring model)",
            f"# springs k(V) = k0 (V0/V)^q: {SPRINGS[0][0]} N/m q={SPRINGS[0][1]} (axes), {SPRINGS[1][0]} N/m "
            f"q={SPRINGS[1][1]} (face diagonals); static energy BM3 form E0={E0} eV, V0={V0} A^3, B0={B0_GPA} GPa, "
            f"B0'={B0_PRIME}",
            "volume_A3,energy_eV,dos_file"]
    for i, v in enumerate(VOLUMES, start=1):
        nu, w = beta_at(v)
        grid = np.linspace(0.0, 9.0, 361)
        dos = generate._smear(nu, w, grid, 0.12)[:, 0]
        name = f"springium_beta_v{i:02d}.dat"
        (HERE / name).write_text(
            f"# modeheat demo data - INVENTED: 'springium-beta' at V = {v:g} A^3 per atom; 24^3 k-mesh, "
            "0.12 THz Gaussian smearing\n# states per THz per atom\nfrequency_THz total\n"
            + "\n".join(f"{a:.6g} {b:.6g}" for a, b in zip(grid, dos)) + "\n", encoding="utf-8")
        rows.append(f"{v:.4f},{static_energy(v):.8f},{name}")
    (HERE / "springium_beta_volumes.csv").write_text("\n".join(rows) + "\n", encoding="utf-8")


if __name__ == "__main__":
    main()
