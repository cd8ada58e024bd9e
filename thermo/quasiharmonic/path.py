"""The minimum path: V(T) minimising F + pV, and B_T, α, S, C_v, C_p, G along it.

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §§ 2, 4.
"""

from __future__ import annotations

import numpy as np

from .splines import LogSpline

_POINTS = 241          # volumes of the coarse search for the minimum
_MARGIN = 0.15         # the search runs 15 % beyond the sampled range on each side
_NEWTON_STEPS = 50
_NEWTON_TOLERANCE = 1e-12     # relative volume step at which the minimum counts as converged


def equilibrium_volume(fit, pressure_ev_a3, v_low, v_high):
    """Volume minimising F + pV at each temperature.

    Parameters
    ----------
    fit : EosFit
        F(V) at M temperatures.
    pressure_ev_a3 : float
        Pressure [eV/Å³].
    v_low, v_high : float
        Sampled volume range [Å³]; the search extends 15 % beyond it.

    Returns
    -------
    numpy.ndarray, shape (M,)
        V [Å³]; NaN where F + pV has no minimum in the searched range or the
        Newton polish did not converge (see :func:`minimum_search`).

    Notes
    -----
    A coarse search on 241 volumes brackets the minimum, then Newton steps on
    :math:`P(V) = p` with :math:`dP/dV = -B/V` polish it.

    Examples
    --------
    >>> from thermo.quasiharmonic.eos import birch_murnaghan_energy, fit_eos
    >>> v = np.linspace(18.0, 22.0, 9)
    >>> fit = fit_eos(v, birch_murnaghan_energy(v, 0.0, 20.3, 0.6, 4.0)[:, None])
    >>> round(float(equilibrium_volume(fit, 0.0, 18.0, 22.0)[0]), 9)
    20.3
    """
    v, found, converged = minimum_search(fit, pressure_ev_a3, v_low, v_high)
    return np.where(found & converged, v, np.nan)


def minimum_search(fit, pressure_ev_a3, v_low, v_high):
    """The minimum of F + pV and its status: (V [Å³], found, converged), each shape (M,).

    ``found`` is False where the coarse search ends at the edge of the
    searched range or B <= 0 there; ``converged`` is False where the Newton
    steps did not settle to 1e-12 of V within 50 steps.
    """
    m = fit.residual_rms.size
    grid = np.linspace(v_low * (1 - _MARGIN), v_high * (1 + _MARGIN), _POINTS)
    g = fit.energy(np.broadcast_to(grid, (m, grid.size))) + pressure_ev_a3 * grid
    k = np.nanargmin(np.where(np.isfinite(g), g, np.inf), axis=1)
    interior = (k > 0) & (k < grid.size - 1)
    v = grid[k].astype(float)
    settled = np.zeros(m, dtype=bool)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        for _ in range(_NEWTON_STEPS):
            b = fit.bulk_modulus(v)
            step = (fit.pressure(v) - pressure_ev_a3) * v / np.where(b > 0, b, np.nan)
            step = np.clip(step, -0.01 * v, 0.01 * v)
            v = np.where(settled, v, v + np.nan_to_num(step))
            settled |= np.isfinite(step) & (np.abs(step) < _NEWTON_TOLERANCE * v)
            if np.all(settled | ~np.isfinite(step)):
                break
        found = interior & np.isfinite(v) & (fit.bulk_modulus(v) > 0)
    return v, found, settled | ~found


def path_values(surface, pressure_ev_a3):
    """V, B_T, α, S, C_v, C_p, G along the minimum path (eV, Å³, K units), per formula unit.

    Returns
    -------
    dict
        ``volume``, ``bulk_modulus``, ``alpha``, ``entropy``, ``cv``, ``cp``,
        ``gibbs`` (M,) — NaN where no converged minimum was found; ``found``
        and ``converged`` (M,) flags of the minimum search; ``carriers``, the
        :class:`~thermo.quasiharmonic.splines.LogSpline` of S and of C_v.
    """
    v_all = surface.volumes_a3
    fit = surface.fit
    t = surface.temperatures_k
    v, found, converged = minimum_search(fit, pressure_ev_a3, v_all.min(), v_all.max())
    bad = ~(found & converged)
    safe = np.where(bad, np.median(v_all), v)
    b = fit.bulk_modulus(safe)
    s_carrier = LogSpline(v_all, surface.entropy_ev_per_k)
    c_carrier = LogSpline(v_all, surface.heat_capacity_ev_per_k)
    alpha = s_carrier.derivative(safe) / b + 0.0     # + 0.0: no signed zero at T = 0
    s = s_carrier.value(safe)
    cv = c_carrier.value(safe)
    cp = cv + alpha ** 2 * b * safe * t
    g = fit.energy(safe) + pressure_ev_a3 * safe
    values = {"volume": safe, "bulk_modulus": b, "alpha": alpha, "entropy": s, "cv": cv, "cp": cp, "gibbs": g}
    out = {k: np.where(bad, np.nan, x) for k, x in values.items()}
    out.update(found=found, converged=converged, carriers=(s_carrier, c_carrier))
    return out
