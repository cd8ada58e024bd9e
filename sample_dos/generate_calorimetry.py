"""Generate the invented measured heat-capacity demo file of modeheat.

INVENTED data for demonstration only: an imaginary metal, "springium", whose
lattice is the ball-and-spring DOS in ``springium_fcc.dat`` with every
frequency softened by 4 % (as if the computed springs were a little stiff),
plus a made-up electronic term γ = 1.1 mJ/(mol K²) and a made-up
Nernst–Lindemann dilation term A = 6e-6 mol/J, sampled like a calorimetry
campaign (1 K steps at low temperature, 5 K steps above) with 0.4 % Gaussian
scatter (fixed seed) and a stated standard uncertainty of 0.5 %.  Nothing
describes a real material.  Run ``python sample_dos/generate_calorimetry.py``
to rewrite ``measured/springium_cp.csv`` (deterministic; a folder of its own so that
the dashboard does not offer it as a DOS demo).
"""

from __future__ import annotations

import pathlib
import sys

import numpy as np

HERE = pathlib.Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))

SCALE, GAMMA, A = 0.96, 1.1e-3, 6e-6


def main():
    from thermo import load_dos
    from thermo.calorimetry import HeatCapacityModel

    dos = load_dos(HERE / "springium_fcc.dat")
    model = HeatCapacityModel(atoms=1, lattice="dos", dos=dos)
    t = np.concatenate([np.arange(2.0, 20.0, 1.0), np.arange(20.0, 350.1, 5.0)])
    cp = model.heat_capacity_p(t, {"scale": SCALE, "gamma_J_per_mol_K2": GAMMA, "dilation_A_mol_per_J": A})
    measured = cp * (1 + 0.004 * np.random.default_rng(13).standard_normal(t.size))
    lines = ["# modeheat demo data - INVENTED: measured-like C_p of the imaginary metal 'springium'",
             "# lattice = springium_fcc.dat DOS softened by 4 %; gamma 1.1 mJ/(mol K^2); "
             "Nernst-Lindemann A 6e-6 mol/J; 0.4 % scatter",
             "temperature_K,heat_capacity_J_per_mol_K,uncertainty_J_per_mol_K"]
    lines += [f"{a:.2f},{b:.6g},{0.005 * b:.3g}" for a, b in zip(t, measured)]
    (HERE / "measured" / "springium_cp.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")


if __name__ == "__main__":
    main()
