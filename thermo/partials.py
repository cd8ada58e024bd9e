"""Shares of heat capacity and entropy carried by each species."""

from __future__ import annotations

import numpy as np
import pandas as pd
from scipy import constants as sc

from .kernels.direct import direct_grid_sums
from .kernels.nu2 import analytic_part_sums
from .kernels.quadrature import trapezoid_weights
from .kernels.sums import mode_list_sums
from .tables import check_temperatures


def _window_shares(dos):
    """Each partial's share of the analytic ν² part (set when the DOS was loaded)."""
    fit = dos.low_frequency
    if fit is None or not dos.partials:
        return {name: 0.0 for name in dos.partials}
    if fit.species_shares:
        return {name: float(fit.species_shares.get(name, 0.0)) for name in dos.partials}
    lo, hi = fit.window_thz
    nu = dos.frequency_thz
    sel = (nu >= lo) & (nu <= hi)
    if sel.sum() < 2:
        sel = np.arange(min(3, nu.size))
    totals = {name: float(np.sum(col[sel])) for name, col in dos.partials.items()}
    whole = sum(totals.values())
    return {name: (v / whole if whole > 0 else 0.0) for name, v in totals.items()}


def species_contributions(dos, temperatures):
    r"""Heat capacity and entropy carried by each species-projected DOS.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS with ``partials``.
    temperatures : array_like
        Temperatures [K].

    Returns
    -------
    pandas.DataFrame
        ``temperature_K`` and, for each species ``X``,
        ``X_heat_capacity_v_J_per_mol_K``, ``X_entropy_J_per_mol_K`` and
        their shares of the sum over species, ``X_heat_capacity_share``
        and ``X_entropy_share`` [1] (NaN at T = 0).

    Notes
    -----
    .. math:: C_{v,X} = R\int g_X(\nu)\,c(x)\,d\nu, \qquad
              S_X = R\int g_X(\nu)\,s(x)\,d\nu

    The analytic :math:`A\nu^2` part below the cut-off is shared among
    species in proportion to their weight in the fitted window.  A mode
    list sums each species' share of every mode and of its continuum
    (:meth:`~thermo.spectrum.ModeList.species_shares`).

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 2.0, 21)
    >>> d = PhononDOS(nu, 1.5 * nu, atoms=1, partials={"A": nu, "B": 0.5 * nu})
    >>> df = species_contributions(d, [300.0])
    >>> round(float(df["A_heat_capacity_share"][0]), 6)
    0.666667
    """
    t = check_temperatures(temperatures)
    if dos.modes is not None:
        return _table(t, {name: mode_list_sums(dos.modes, t, weights=dos.modes.partials[name],
                                               continuum_share=share)
                          for name, share in dos.modes.species_shares().items()})
    hot = t > 0
    fit = dos.low_frequency
    low = (analytic_part_sums(fit, t[hot])
           if dos.low_frequency is not None else None)
    shares = _window_shares(dos)
    weights = trapezoid_weights(dos.frequency_thz, dos.dos)
    values = {}
    for name, col in dos.partials.items():
        sums = direct_grid_sums(dos.frequency_thz, col * weights, t[hot])
        cv = sums["heat_capacity"]
        s = sums["thermal_energy"] + sums["log_partition"]
        if low is not None:
            cv = cv + shares[name] * low["heat_capacity"]
            s = s + shares[name] * (low["thermal_energy"] + low["log_partition"])
        values[name] = (np.zeros_like(t), np.zeros_like(t))
        values[name][0][hot] = sc.R * cv
        values[name][1][hot] = sc.R * s
    return _shares_frame(t, values)


def _table(t, sums):
    """The frame of :func:`species_contributions` from each species' mode-list sums."""
    values = {name: (sc.R * s["heat_capacity"], sc.R * s["entropy"]) for name, s in sums.items()}
    return _shares_frame(t, values)


def _shares_frame(t, values):
    """Columns per species: C_v and S [J/(mol·K)] and their shares of the sum over species."""
    columns = {"temperature_K": t}
    cv_all = sum(v[0] for v in values.values()) if values else np.zeros_like(t)
    s_all = sum(v[1] for v in values.values()) if values else np.zeros_like(t)
    with np.errstate(divide="ignore", invalid="ignore"):
        for name, (cv, s) in values.items():
            columns[f"{name}_heat_capacity_v_J_per_mol_K"] = cv
            columns[f"{name}_entropy_J_per_mol_K"] = s
            columns[f"{name}_heat_capacity_share"] = np.where(cv_all > 0, cv / cv_all, np.nan)
            columns[f"{name}_entropy_share"] = np.where(s_all > 0, s / s_all, np.nan)
    return pd.DataFrame(columns)
