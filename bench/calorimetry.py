"""Figure P9: calorimetry — a 200-point fit, a whole 41-point run, and a 6,000-row file (time and memory)."""

from __future__ import annotations

import tracemalloc
from pathlib import Path

import numpy as np

from .timing import median_seconds

DEMO = Path(__file__).resolve().parents[1] / "sample_dos" / "measured" / "springium_cp.csv"


def _synthetic(points, low=5.0, high=600.0, seed=9):
    from thermo.calorimetry import HeatCapacityModel, MeasuredHeatCapacity
    model = HeatCapacityModel(atoms=1, electronic=True)
    t = np.linspace(low, high, points)
    cp = model.heat_capacity_p(t, {"theta_D_K": 380.0, "gamma_J_per_mol_K2": 1.2e-3, "dilation_A_mol_per_J": 5e-6})
    sigma = 0.003 * cp
    return model, MeasuredHeatCapacity(t, cp + np.random.default_rng(seed).normal(0, sigma), sigma, "J/(mol K)",
                                       "bench")


def p9(repeat=7):
    """Median times [s] of: a Debye + γT + Nernst–Lindemann fit to 200 noisy points; a whole analysis
    (fit, S° and H° of both routes, low-temperature forms) of 41 points of the invented demo measurement;
    the whole analysis of 6,000 points, with its peak traced memory [MB].

    The synthetic data: θ_D 380 K, γ 1.2 mJ/(mol K²), A 5e-6 mol/J, 0.3 % scatter, 5-600 K; times
    exclude reading files.
    """
    from thermo.calorimetry import HeatCapacityModel, fit_measured_heat_capacity, read_heat_capacity
    from thermo.calorimetry.report import analyse
    model, data = _synthetic(200)
    fits = []
    seconds = median_seconds(lambda: fits.append(fit_measured_heat_capacity(data, model)), repeat)
    if len(fits[-1].free) != 3:
        raise RuntimeError("the P9 fit did not have 3 free parameters")
    demo = read_heat_capacity(DEMO)
    keep = np.arange(1, demo.temperature_K.size, 2)[:41]
    run41 = type(demo)(demo.temperature_K[keep], demo.heat_capacity_J_per_mol_K[keep],
                       demo.uncertainty_J_per_mol_K[keep], demo.unit, demo.source)
    metal = HeatCapacityModel(atoms=1, electronic=True)
    run_seconds = median_seconds(lambda: analyse(run41, metal), repeat)
    big_model, big = _synthetic(6000, 2.0, 600.0)
    big_seconds = median_seconds(lambda: analyse(big, big_model), max(1, repeat // 3))
    tracemalloc.start()
    analyse(big, big_model)
    peak = tracemalloc.get_traced_memory()[1] / 1e6
    tracemalloc.stop()
    return {"p9_calorimetry_fit_s": seconds, "p9_run_41_points_s": run_seconds,
            "p9_rows_6000_s": big_seconds, "p9_rows_6000_peak_mb": peak,
            "p9_case": f"fit: 200 points, 3 free parameters ({', '.join(fits[-1].free)}), median of {repeat}; "
                       f"run: 41 demo points {run41.temperature_K[0]:g}-{run41.temperature_K[-1]:g} K, whole "
                       "analysis; 6,000 points: whole analysis, peak traced memory (main: 4.7 GB, 73 s on the CLI)"}
