"""Quasi-harmonic thermodynamics: F(V,T) = E(V) + F_vib(V,T) minimised at each temperature.

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §§ 2, 4.
.. [2] F. Birch, "Finite elastic strain of cubic crystals", Phys. Rev. 71,
   809-824 (1947).
.. [3] P. Vinet, J. Ferrante, J. H. Rose, J. R. Smith, "Compressibility of
   solids", J. Geophys. Res. 92, 9319-9325 (1987).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd
from scipy import constants as sc

from ..columns import column_name
from ..errors import OptionError
from ..kernels.sums import thermal_sums
from ..preparation.imaginary import UNSTABLE_SHARE
from ..tables import _convert, check_temperatures, table_from_sums
from .eos import GPA_PER_EV_A3, VolumePolynomial, check_eos, fit_eos

#: J/mol per eV per formula unit.
J_PER_MOL_PER_EV = sc.N_A * sc.electron_volt
#: Quantities of the quasi-harmonic table, in column order (see thermo.columns).
QUASIHARMONIC = ("temperature", "volume", "thermal_expansion", "bulk_modulus_T", "heat_capacity_p",
                 "heat_capacity_v", "entropy", "enthalpy", "gibbs_energy", "gruneisen_parameter",
                 "eos_fit_residual", "outside_volume_range")
_POINTS = 241          # volumes of the coarse search for the minimum
_MARGIN = 0.15         # the search runs 15 % beyond the sampled range on each side


@dataclass(frozen=True)
class FreeEnergySurface:
    """F(V_k, T_m) of a volume set and its fits, per formula unit.

    Attributes
    ----------
    volumes_a3 : numpy.ndarray, shape (K,)
    temperatures_k : numpy.ndarray, shape (M,)
    helmholtz_ev : numpy.ndarray, shape (K, M)
        E(V) + F_vib(V,T), zero-point energy included [eV].
    entropy_ev_per_k, heat_capacity_ev_per_k : numpy.ndarray, shape (K, M)
        S and C_v at each volume [eV/K].
    fit : EosFit
        Equation of state fitted to ``helmholtz_ev`` at each temperature.
    """

    volumes_a3: np.ndarray
    temperatures_k: np.ndarray
    helmholtz_ev: np.ndarray
    entropy_ev_per_k: np.ndarray
    heat_capacity_ev_per_k: np.ndarray
    fit: object


def free_energy_surface(volume_set, temperatures, eos="birch-murnaghan", method="auto"):
    r"""F(V,T) on the sampled volumes and its equation-of-state fit.

    Parameters
    ----------
    volume_set : VolumeSet
        Volumes, static energies and DOS.
    temperatures : array_like
        Temperatures [K], >= 0.
    eos : {'birch-murnaghan', 'vinet'}
        Equation of state fitted to F(V) at each temperature.
    method : {'auto', 'direct', 'fast'}
        Evaluation of the mode sums (see :func:`thermo.kernels.sums.grid_sums`).

    Returns
    -------
    FreeEnergySurface

    Notes
    -----
    .. math:: F(V,T) = E(V) + E_0(V) + k_BT\int g_V(\nu)\ln\left(1-e^{-h\nu/k_BT}\right)d\nu
              \;[+\,F_{el}(V,T)]

    with the electronic free energy of :func:`thermo.electronic.thermodynamics.volume_rows`
    when the volume set carries an electronic DOS at each volume.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.quasiharmonic.volumeset import make_volume_set
    >>> nu = np.linspace(0.0, 5.0, 101)
    >>> vs = make_volume_set([(v, 0.0, PhononDOS(nu, 9 * nu**2 / 125, atoms=1)) for v in (18, 19, 20, 21, 22)])
    >>> s = free_energy_surface(vs, [0.0, 300.0])
    >>> s.helmholtz_ev.shape, bool(s.helmholtz_ev[0, 1] < s.helmholtz_ev[0, 0])
    ((5, 2), True)
    """
    t = check_temperatures(temperatures)
    eos = check_eos(eos)
    rows_f, rows_s, rows_c = [], [], []
    for dos in volume_set.doses:
        table = table_from_sums(thermal_sums(dos, t, method=method), t, "formula", dos.atoms)
        rows_f.append(table[column_name("helmholtz_energy")].to_numpy() * sc.kilo / J_PER_MOL_PER_EV)
        rows_s.append(table[column_name("entropy")].to_numpy() / J_PER_MOL_PER_EV)
        rows_c.append(table[column_name("heat_capacity_v")].to_numpy() / J_PER_MOL_PER_EV)
    f = np.asarray(volume_set.energies_ev)[:, None] + np.array(rows_f)
    rows_s, rows_c = np.array(rows_s), np.array(rows_c)
    if volume_set.electronic:     # metals: + F_el(V,T) from the electronic DOS at each volume
        from ..electronic.thermodynamics import volume_rows
        el = volume_rows(volume_set.electronic, t)
        f, rows_s, rows_c = f + el["helmholtz"], rows_s + el["entropy"], rows_c + el["heat_capacity"]
    return FreeEnergySurface(np.asarray(volume_set.volumes_a3), t, f, rows_s, rows_c,
                             fit_eos(volume_set.volumes_a3, f, eos))


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
        V [Å³]; NaN where F + pV has no minimum in the searched range.

    Notes
    -----
    A coarse search on 241 volumes brackets the minimum, then Newton steps on
    :math:`P(V) = p` with :math:`dP/dV = -B/V` polish it.

    Examples
    --------
    >>> from thermo.quasiharmonic.eos import birch_murnaghan_energy
    >>> v = np.linspace(18.0, 22.0, 9)
    >>> fit = fit_eos(v, birch_murnaghan_energy(v, 0.0, 20.3, 0.6, 4.0)[:, None])
    >>> round(float(equilibrium_volume(fit, 0.0, 18.0, 22.0)[0]), 9)
    20.3
    """
    m = fit.residual_rms.size
    grid = np.linspace(v_low * (1 - _MARGIN), v_high * (1 + _MARGIN), _POINTS)
    g = fit.energy(np.broadcast_to(grid, (m, grid.size))) + pressure_ev_a3 * grid
    k = np.nanargmin(np.where(np.isfinite(g), g, np.inf), axis=1)
    interior = (k > 0) & (k < grid.size - 1)
    v = grid[k].astype(float)
    for _ in range(30):
        b = fit.bulk_modulus(v)
        step = (fit.pressure(v) - pressure_ev_a3) * v / np.where(b > 0, b, np.nan)
        step = np.clip(step, -0.01 * v, 0.01 * v)
        v = v + step
        if np.all(~np.isfinite(step) | (np.abs(step) < 1e-13 * v)):
            break
    ok = interior & np.isfinite(v) & (fit.bulk_modulus(v) > 0)
    return np.where(ok, v, np.nan)


def quasiharmonic_table(volume_set, temperatures, pressure_gpa=0.0, eos="birch-murnaghan", per="formula",
                        formula=None, imaginary_tolerance=UNSTABLE_SHARE, method="auto"):
    r"""Quasi-harmonic V, α, B_T, C_p, C_v, S, H, G and γ versus temperature.

    Parameters
    ----------
    volume_set : VolumeSet or str or pathlib.Path or list
        A :class:`VolumeSet`, a manifest path, or (volume [Å³], static energy
        [eV], PhononDOS) triples.
    temperatures : array_like
        Temperatures [K], >= 0.
    pressure_gpa : float
        Pressure p [GPa]; G = F + pV is minimised.
    eos : {'birch-murnaghan', 'vinet'}
        Equation of state fitted to F(V) at each temperature.
    per : {'formula', 'atom', 'gram'}
        Basis, as in :func:`thermo.tabulate`.
    formula : str, optional
        Chemical formula (for ``per='gram'``).
    imaginary_tolerance : float
        Share of imaginary modes above which a volume is listed in the
        diagnostics [1].
    method : {'auto', 'direct', 'fast'}
        Evaluation of the mode sums.

    Returns
    -------
    pandas.DataFrame
        Columns of :data:`QUASIHARMONIC` (names from :mod:`thermo.columns`):
        T [K], V [Å³/formula unit], α [1/K], B_T [GPa], C_p, C_v, S, H, G
        (basis units), γ [1], EOS fit rms residual [meV/formula unit] and a
        flag for minima outside the sampled volumes (those rows are
        extrapolated; NaN where no minimum was found).  ``attrs`` holds
        ``diagnostics`` (see :func:`thermo.quasiharmonic.diagnostics.diagnose`).

    Raises
    ------
    OptionError
        Fewer than 5 volumes, bad pressure, basis or EOS name.

    Notes
    -----
    At each T the fitted :math:`F(V)` gives :math:`V(T)` from
    :math:`-\partial F/\partial V = p` and :math:`B_T = V\,\partial^2F/\partial V^2`.
    S and C_v at the sampled volumes are carried to V(T) in the same
    strain basis as the Birch–Murnaghan fit, and

    .. math::
        \alpha = \frac{1}{B_T}\left(\frac{\partial S}{\partial V}\right)_T,\quad
        C_p = C_v + \alpha^2 B_T V T,\quad
        \gamma = \frac{\alpha B_T V}{C_v},\quad
        G = F + pV,\ H = G + TS.

    The first follows from :math:`dV/dT = -F_{VT}/F_{VV}` along the minimum
    path; with the Birch–Murnaghan fit it is the exact derivative of the
    fitted surface.  γ is NaN at T = 0.  Quasi-harmonic values neglect
    explicit anharmonicity and fail near melting.

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §§ 2, 4.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.quasiharmonic.eos import birch_murnaghan_energy
    >>> nu = np.linspace(0.0, 1.0, 201)
    >>> vols = np.linspace(19.0, 21.0, 7)
    >>> sets = [(v, float(birch_murnaghan_energy(v, 0.0, 20.0, 0.6, 4.0)),
    ...          PhononDOS(nu * 6.0 * (20.0 / v) ** 1.5, 9 * nu**2 / (6.0 * (20.0 / v) ** 1.5), atoms=1))
    ...         for v in vols]
    >>> df = quasiharmonic_table(sets, [300.0])
    >>> bool(df.volume_A3[0] > 20.0)       # thermal and zero-point expansion
    True
    """
    from .diagnostics import diagnose
    from .volumeset import VolumeSet, make_volume_set, read_manifest

    if isinstance(volume_set, VolumeSet):
        vs = volume_set
    elif isinstance(volume_set, (str, bytes)) or hasattr(volume_set, "__fspath__"):
        vs = read_manifest(volume_set)
    else:
        vs = make_volume_set(volume_set)
    try:
        p = float(pressure_gpa) / GPA_PER_EV_A3
    except (TypeError, ValueError):
        raise OptionError(f"pressure {pressure_gpa!r} must be a number in GPa") from None
    if not np.isfinite(p):
        raise OptionError("pressure must be finite")
    surface = free_energy_surface(vs, temperatures, eos, method)
    return _table(vs, surface, p, per, formula, diagnose, imaginary_tolerance, pressure_gpa)


def path_values(surface, pressure_ev_a3):
    """V, B_T, α, S, C_v, C_p, G along the minimum path (eV, Å³, K units), per formula unit."""
    v_all = surface.volumes_a3
    fit = surface.fit
    t = surface.temperatures_k
    v = equilibrium_volume(fit, pressure_ev_a3, v_all.min(), v_all.max())
    safe = np.where(np.isfinite(v), v, np.median(v_all))
    b = fit.bulk_modulus(safe)
    s_fit = VolumePolynomial.fit(v_all, surface.entropy_ev_per_k, fit.polynomial.reference)
    c_fit = VolumePolynomial.fit(v_all, surface.heat_capacity_ev_per_k, fit.polynomial.reference)
    alpha = s_fit.derivative(safe) / b + 0.0     # + 0.0: no signed zero at T = 0
    s = s_fit.value(safe)
    cv = c_fit.value(safe)
    cp = cv + alpha ** 2 * b * safe * t
    g = fit.energy(safe) + pressure_ev_a3 * safe
    bad = ~np.isfinite(v)
    values = {"volume": v, "bulk_modulus": b, "alpha": alpha, "entropy": s, "cv": cv, "cp": cp, "gibbs": g}
    return {k: np.where(bad, np.nan, x) for k, x in values.items()}


def _table(vs, surface, p, per, formula, diagnose, tolerance, pressure_gpa):
    t = surface.temperatures_k
    path = path_values(surface, p)
    with np.errstate(invalid="ignore", divide="ignore"):
        gamma = np.where(path["cv"] > 0, path["alpha"] * path["bulk_modulus"] * path["volume"]
                         / np.where(path["cv"] > 0, path["cv"], 1.0), np.nan)
    h = path["gibbs"] + t * path["entropy"]
    molar = (path["cv"] * J_PER_MOL_PER_EV, path["entropy"] * J_PER_MOL_PER_EV,
             h * J_PER_MOL_PER_EV, path["gibbs"] * J_PER_MOL_PER_EV)
    cv, s, h_out, g_out = _convert(molar, per, vs.atoms, formula)
    cp = _convert((path["cp"] * J_PER_MOL_PER_EV, 0.0, 0.0, 0.0), per, vs.atoms, formula)[0]
    v_low, v_high = vs.volumes_a3.min(), vs.volumes_a3.max()
    outside = ~((path["volume"] >= v_low) & (path["volume"] <= v_high))
    data = {"temperature": t, "volume": path["volume"], "thermal_expansion": path["alpha"],
            "bulk_modulus_T": path["bulk_modulus"] * GPA_PER_EV_A3, "heat_capacity_p": cp,
            "heat_capacity_v": cv, "entropy": s, "enthalpy": h_out, "gibbs_energy": g_out,
            "gruneisen_parameter": gamma, "eos_fit_residual": surface.fit.residual_rms * 1e3,
            "outside_volume_range": outside}
    df = pd.DataFrame({column_name(k, per): np.asarray(data[k]) for k in QUASIHARMONIC})
    df.attrs.update(per=per, formula=formula, pressure_GPa=float(pressure_gpa), eos=surface.fit.kind,
                    diagnostics=diagnose(vs, surface, outside, tolerance))
    return df


def free_energy_curves(surface, pressure_gpa=0.0, points=81):
    """F(V) at the sampled volumes, its fitted curve and the minimum, for plots.

    Parameters
    ----------
    surface : FreeEnergySurface
        From :func:`free_energy_surface` (usually at a few temperatures).
    pressure_gpa : float
        Pressure [GPa]; the curves show G = F + pV.
    points : int
        Volumes of each fitted curve.

    Returns
    -------
    dict
        ``volumes_A3`` (K,), ``sampled_eV`` (K, M), ``curve_volumes_A3`` (points,),
        ``curve_eV`` (M, points), ``minimum_volume_A3`` and ``minimum_eV`` (M,),
        all per formula unit; NaN where no minimum was found.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.quasiharmonic.eos import birch_murnaghan_energy
    >>> from thermo.quasiharmonic.volumeset import make_volume_set
    >>> nu = np.linspace(0.0, 5.0, 101)       # the same DOS at every volume: F_vib does not move the minimum
    >>> vs = make_volume_set([(v, float(birch_murnaghan_energy(v, 0.0, 20.0, 0.6, 4.0)), PhononDOS(nu, 9 * nu**2 / 125, atoms=1))
    ...                       for v in (18, 19, 20, 21, 22)])
    >>> curves = free_energy_curves(free_energy_surface(vs, [0.0]))
    >>> round(float(curves["minimum_volume_A3"][0]), 6)
    20.0
    """
    p = float(pressure_gpa) / GPA_PER_EV_A3
    v = surface.volumes_a3
    grid = np.linspace(v.min(), v.max(), int(points))
    m = surface.temperatures_k.size
    v_min = equilibrium_volume(surface.fit, p, v.min(), v.max())
    safe = np.where(np.isfinite(v_min), v_min, np.median(v))
    g_min = np.where(np.isfinite(v_min), surface.fit.energy(safe) + p * safe, np.nan)
    return {"volumes_A3": v, "sampled_eV": surface.helmholtz_ev + p * v[:, None], "curve_volumes_A3": grid,
            "curve_eV": surface.fit.energy(np.broadcast_to(grid, (m, grid.size))) + p * grid,
            "minimum_volume_A3": v_min, "minimum_eV": g_min}
