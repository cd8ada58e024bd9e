r"""The p–T boundary between two phases, checked against the Clausius–Clapeyron equation.

References
----------
.. [1] H. B. Callen, *Thermodynamics and an Introduction to Thermostatistics*,
   2nd ed. (Wiley, 1985), § 9.3.
"""

from __future__ import annotations

import numpy as np

from scipy import constants as sc

from ..columns import column_name

#: K/GPa per (Å³/atom) / (eV/(K atom)): dT/dp = ΔV/ΔS (CODATA via scipy.constants).
K_PER_GPA = sc.angstrom ** 3 * sc.giga / sc.electron_volt


def phase_boundary(transitions, basis):
    r"""T*(p) of each pair of phases along the pressures, with dT*/dp against ΔV/ΔS.

    Parameters
    ----------
    transitions : list of dict
        Transition records of :func:`thermo.phases.compare.compare_phases` (with
        their ``_raw`` ΔS [eV/(K atom)] and ΔV [Å³/atom], high − low).
    basis : Basis
        The comparison's basis (for the ΔV column).

    Returns
    -------
    list of dict
        One per pair and pressure: the pair, ``pressure_GPa``, ``temperature_K``,
        ``uncertainty_K``, ``pressure_uncertainty_GPa``, ΔV, ``clapeyron_slope_K_per_GPa``
        (ΔV/ΔS), ``boundary_slope_K_per_GPa`` (finite differences of T*(p)) and
        ``slope_relative_difference``.

    Notes
    -----
    .. math:: \frac{dT^*}{dp} = \frac{\Delta V}{\Delta S} = \frac{T^*\Delta V}{\Delta H}

    The finite-difference slope is second order on the pressures given
    (``numpy.gradient``); on a coarse pressure grid the two differ by the
    curvature of the boundary, which is what the relative difference shows.
    """
    groups = {}
    for x in transitions:
        if x["pressure_GPa"] is None:
            continue
        key = (x["low_phase"], x["high_phase"])
        groups.setdefault(key, {}).setdefault(x["pressure_GPa"], []).append(x)
    out = []
    for (low, high), by_p in groups.items():
        pressures = sorted(by_p)
        if len(pressures) < 2 or len({len(v) for v in by_p.values()}) != 1:
            continue
        for branch in range(len(by_p[pressures[0]])):
            rows = [by_p[q][branch] for q in pressures]
            t = np.array([r["temperature_K"] for r in rows])
            slope = np.gradient(t, np.array(pressures)) if len(rows) > 1 else np.full(1, np.nan)
            for q, r, s in zip(pressures, rows, slope):
                ds, dv = r["_raw"]["ds"], r["_raw"]["dv"]
                cc = dv / ds * K_PER_GPA if ds else np.nan
                out.append({"low_phase": low, "high_phase": high, "pressure_GPa": q,
                            "temperature_K": r["temperature_K"], "uncertainty_K": r["uncertainty_K"],
                            "pressure_uncertainty_GPa": r["pressure_uncertainty_GPa"],
                            column_name("volume_difference"): float(basis.volume(dv)),
                            "clapeyron_slope_K_per_GPa": float(cc), "boundary_slope_K_per_GPa": float(s),
                            "slope_relative_difference": float((s - cc) / cc) if cc else None})
    return out
