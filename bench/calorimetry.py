"""Figure P9: a 200-point measured C_p set fitted with 3 free parameters (median time)."""

from __future__ import annotations

import numpy as np

from .timing import median_seconds


def p9(repeat=7):
    """Median wall time [s] of one Debye + γT + Nernst–Lindemann fit to 200 noisy points.

    The data are synthetic (θ_D 380 K, γ 1.2 mJ/(mol K²), A 5e-6 mol/J, 0.3 %
    scatter, 5-600 K); the time covers the start-value scan, the fit and the
    covariance, not reading the file.
    """
    from thermo.calorimetry import HeatCapacityModel, MeasuredHeatCapacity, fit_measured_heat_capacity
    model = HeatCapacityModel(atoms=1, electronic=True)
    t = np.linspace(5.0, 600.0, 200)
    cp = model.heat_capacity_p(t, {"theta_D_K": 380.0, "gamma_J_per_mol_K2": 1.2e-3, "dilation_A_mol_per_J": 5e-6})
    sigma = 0.003 * cp
    data = MeasuredHeatCapacity(t, cp + np.random.default_rng(9).normal(0, sigma), sigma, "J/(mol K)", "bench")
    fits = []
    seconds = median_seconds(lambda: fits.append(fit_measured_heat_capacity(data, model)), repeat)
    if len(fits[-1].free) != 3:
        raise RuntimeError("the P9 fit did not have 3 free parameters")
    return {"p9_calorimetry_fit_s": seconds,
            "p9_case": f"200 points, 3 free parameters ({', '.join(fits[-1].free)}), median of {repeat}"}
