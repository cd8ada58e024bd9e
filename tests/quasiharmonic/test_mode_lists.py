"""Quasi-harmonic manifests that list mode files instead of DOS files.

The invented demo crystal's volume set (sample_dos/volumes: springs k(V) = k0 (V0/V)^q, a
Birch–Murnaghan static energy) written as mode lists of 10³ and 16³ Γ-centred meshes: the
equilibrium volume, α and C_p at 300 K converge (the two meshes agree closely), and the mode-list
set agrees with the demo's 20³ smeared DOS set to the smearing's accuracy.
"""

from __future__ import annotations

import numpy as np

from sample_dos.generate_modes import mode_list_text
from sample_dos.volumes.generate_volumes import SPRINGS, V0, VOLUMES, static_energy
from thermo.quasiharmonic.solve import quasiharmonic_table
from tests.quasiharmonic.test_cli import DEMO


def _manifest(folder, n):
    rows = ["volume_A3,energy_eV,dos_file"]
    (k1, q1), (k2, q2) = SPRINGS
    for i, v in enumerate(VOLUMES):
        name = f"modes_{n}_{i:02d}.dat"
        lattice = (4.0 * v) ** (1 / 3)
        text = mode_list_text(n, lattice, (k1 * (V0 / v) ** q1, k2 * (V0 / v) ** q2))
        (folder / name).write_text(text)
        rows.append(f"{v:.4f},{static_energy(v):.8f},{name}")
    path = folder / f"set_{n}.csv"
    path.write_text("\n".join(rows) + "\n")
    return path


def test_mode_list_volume_sets_converge_and_match_the_dos_set(tmp_path):
    t = [300.0]
    coarse, fine = (quasiharmonic_table(_manifest(tmp_path, n), t) for n in (10, 16))
    smeared = quasiharmonic_table(DEMO, t)
    for column in ("volume_A3", "thermal_expansion_per_K", "heat_capacity_p_J_per_mol_K"):
        a, b, c = (float(df[column].iloc[0]) for df in (coarse, fine, smeared))
        assert abs(a / b - 1) < 1e-4, column
        assert abs(c / b - 1) < 0.01, column
