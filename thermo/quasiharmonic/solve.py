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

import numpy as np
import pandas as pd

from ..columns import column_name, error_key
from ..errors import OptionError
from ..preparation.imaginary import UNSTABLE_SHARE
from ..tables import _convert
from .eos import GPA_PER_EV_A3
from .path import equilibrium_volume, path_values
from .surface import J_PER_MOL_PER_EV, FreeEnergySurface, free_energy_surface
from .uncertainty import derived, path_uncertainty

#: Quantities of the quasi-harmonic table, in column order (see thermo.columns).
QUASIHARMONIC = ("temperature", "volume", "thermal_expansion", "bulk_modulus_T", "heat_capacity_p",
                 "heat_capacity_v", "entropy", "enthalpy", "gibbs_energy", "gruneisen_parameter",
                 "eos_fit_residual", "outside_volume_range")
#: Quantities that get an ``_error_`` column with ``errors=True``, in column order.
UNCERTAIN = ("volume", "thermal_expansion", "bulk_modulus_T", "heat_capacity_p", "heat_capacity_v", "entropy",
             "enthalpy", "gibbs_energy", "gruneisen_parameter")

__all__ = ["FreeEnergySurface", "QUASIHARMONIC", "UNCERTAIN", "equilibrium_volume", "free_energy_curves",
           "free_energy_surface", "path_values", "quasiharmonic_table", "quasiharmonic_tables"]


def quasiharmonic_table(volume_set, temperatures, pressure_gpa=0.0, eos="birch-murnaghan", per="formula",
                        formula=None, imaginary_tolerance=UNSTABLE_SHARE, method="auto", errors=False, parts=None):
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
    eos : {'birch-murnaghan', 'vinet', 'spline'}
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
    errors : bool
        Add the estimated error of V, α, B_T, C_p, C_v, S, H, G and γ in
        ``<quantity>_error_<unit>`` columns (:data:`UNCERTAIN`; see
        :func:`thermo.quasiharmonic.uncertainty.path_uncertainty`).
    parts : dict of str to SurfacePart, optional
        Further additive parts of F(V,T) (see
        :func:`thermo.quasiharmonic.surface.free_energy_surface`).

    Returns
    -------
    pandas.DataFrame
        Columns of :data:`QUASIHARMONIC` (names from :mod:`thermo.columns`):
        T [K], V [Å³/formula unit], α [1/K], B_T [GPa], C_p, C_v, S, H, G
        (basis units), γ [1], EOS fit rms residual [meV/formula unit] and a
        flag for minima outside the sampled volumes (those rows are
        extrapolated; NaN where no minimum was found); with ``errors`` the
        error columns follow.  ``attrs`` holds ``diagnostics`` (see
        :func:`thermo.quasiharmonic.diagnostics.diagnose`) and, with
        ``errors``, ``uncertainty`` (the largest share of each part).

    Raises
    ------
    OptionError
        Fewer than 5 volumes, bad pressure, basis or EOS name.

    Notes
    -----
    At each T the fitted :math:`F(V)` gives :math:`V(T)` from
    :math:`-\partial F/\partial V = p` and :math:`B_T = V\,\partial^2F/\partial V^2`.
    S and C_v at the sampled volumes are carried to V(T) by cubic splines of
    :math:`\ln S` and :math:`\ln C_v` in :math:`\ln V`
    (:class:`~thermo.quasiharmonic.splines.LogSpline`), and

    .. math::
        \alpha = \frac{1}{B_T}\left(\frac{\partial S}{\partial V}\right)_T,\quad
        C_p = C_v + \alpha^2 B_T V T,\quad
        \gamma = \frac{\alpha B_T V}{C_v},\quad
        G = F + pV,\ H = G + TS.

    The first follows from :math:`dV/dT = -F_{VT}/F_{VV}` along the minimum
    path (:math:`F_{VT} = -\partial S/\partial V`).  γ is NaN at T = 0.
    Quasi-harmonic values neglect explicit anharmonicity and fail near
    melting.

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
    surface = free_energy_surface(vs, temperatures, eos, method, errors=errors, parts=parts)
    return _table(vs, surface, p, per, formula, diagnose, imaginary_tolerance, pressure_gpa, errors)


def quasiharmonic_tables(volume_set, temperatures, pressures_gpa, eos="birch-murnaghan", per="formula",
                         formula=None, imaginary_tolerance=UNSTABLE_SHARE, method="auto", errors=False):
    """:func:`quasiharmonic_table` at several pressures from one free-energy surface.

    Parameters
    ----------
    volume_set : VolumeSet
        Volumes, static energies and DOS.
    temperatures : array_like
        Temperatures [K], >= 0.
    pressures_gpa : array_like
        Pressures p [GPa].
    eos, per, formula, imaginary_tolerance, method, errors
        As :func:`quasiharmonic_table`.

    Returns
    -------
    list of pandas.DataFrame
        One table per pressure, in the order given (the same columns and
        ``attrs`` as :func:`quasiharmonic_table`).

    Notes
    -----
    F(V,T) and its fit do not depend on p; only the minimum of F + pV does,
    so the surface (and its harmonic error estimate) is computed once.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.quasiharmonic.eos import birch_murnaghan_energy
    >>> from thermo.quasiharmonic.volumeset import make_volume_set
    >>> nu = np.linspace(0.0, 5.0, 101)
    >>> vs = make_volume_set([(v, float(birch_murnaghan_energy(v, 0.0, 20.0, 0.6, 4.0)),
    ...                        PhononDOS(nu, 9 * nu**2 / 125, atoms=1)) for v in (18, 19, 20, 21, 22)])
    >>> low, high = quasiharmonic_tables(vs, [0.0], [0.0, 5.0])
    >>> bool(high.volume_A3[0] < low.volume_A3[0])
    True
    """
    from .diagnostics import diagnose
    pressures = np.atleast_1d(np.asarray(pressures_gpa, dtype=float))
    if not np.all(np.isfinite(pressures)):
        raise OptionError("pressures must be finite numbers in GPa")
    surface = free_energy_surface(volume_set, temperatures, eos, method, errors=errors)
    return [_table(volume_set, surface, p / GPA_PER_EV_A3, per, formula, diagnose, imaginary_tolerance, p, errors)
            for p in pressures]


def _table(vs, surface, p, per, formula, diagnose, tolerance, pressure_gpa, errors=False):
    t = surface.temperatures_k
    path = path_values(surface, p)
    values = derived(path, t)
    data = _columns(values, per, vs.atoms, formula)
    v_low, v_high = vs.volumes_a3.min(), vs.volumes_a3.max()
    outside = ~((path["volume"] >= v_low) & (path["volume"] <= v_high))
    data.update(temperature=t, eos_fit_residual=surface.fit.residual_rms * 1e3, outside_volume_range=outside)
    df = pd.DataFrame({column_name(k, per): np.asarray(data[k]) for k in QUASIHARMONIC})
    diagnostics = diagnose(vs, surface, outside, tolerance, ~path["converged"])
    df.attrs.update(per=per, formula=formula, pressure_GPa=float(pressure_gpa), eos=surface.fit.kind,
                    diagnostics=diagnostics)
    if errors:
        u = path_uncertainty(surface, path, p)
        err = _columns(u, per, vs.atoms, formula)
        for key in UNCERTAIN:
            df[column_name(error_key(key), per)] = np.asarray(err[key])
        df.attrs["uncertainty"] = u["summary"]
        diagnostics["warnings"].extend(u["warnings"])
    return df


def _columns(values, per, atoms, formula):
    """Values (or their errors) of :data:`~thermo.quasiharmonic.uncertainty.KEYS` (eV, Å³, K units)
    in the table's units on ``per``, by schema quantity."""
    molar = tuple(values[k] * J_PER_MOL_PER_EV for k in ("cv", "entropy", "enthalpy", "gibbs"))
    cv_out, s_out, h_out, g_out = _convert(molar, per, atoms, formula)
    cp_out = _convert((values["cp"] * J_PER_MOL_PER_EV, 0.0, 0.0, 0.0), per, atoms, formula)[0]
    return {"volume": values["volume"], "thermal_expansion": values["alpha"],
            "bulk_modulus_T": values["bulk_modulus"] * GPA_PER_EV_A3, "heat_capacity_p": cp_out,
            "heat_capacity_v": cv_out, "entropy": s_out, "enthalpy": h_out, "gibbs_energy": g_out,
            "gruneisen_parameter": values["gamma"]}


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
