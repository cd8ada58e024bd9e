"""Heat-capacity sources for the polynomial fits: a harmonic table or any (T, C_p) table.

A source is a :class:`HeatCapacityData`: C_p, S and H − H(298.15 K) on one
temperature grid, per mole of formula units, with their estimated errors
when the source has them (a table's ``_error_`` columns, or the error
estimate of a harmonic table); :func:`~thermo.polynomials.fitting.fit_polynomial`
carries those into the coefficients.  Any result that gives C_p
versus T (harmonic table, quasi-harmonic C_p, a calorimetry fit) becomes a
source through :func:`heat_capacity_source` or :func:`source_from_table`.

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.interpolate import CubicSpline

from ..columns import error_column_for, find
from ..errors import OptionError
from .forms import T_STANDARD

#: Caution carried by every fit of a harmonic table.
HARMONIC_CAUTION = ("C_p is taken as the harmonic C_v at fixed volume (no thermal expansion, "
                    "anharmonicity, electrons or defects); at high T the real C_p is larger, "
                    "most near melting — check against validated data before design use")


@dataclass(frozen=True)
class HeatCapacityData:
    """C_p, S and H − H(298.15 K) of one phase on a temperature grid.

    Attributes
    ----------
    temperature : numpy.ndarray
        Increasing temperatures [K].
    heat_capacity : numpy.ndarray
        C_p [J/(mol·K)].
    entropy : numpy.ndarray
        S [J/(mol·K)].
    enthalpy_increment : numpy.ndarray
        H − H(298.15 K) [J/mol].
    label : str
        What the values are (shown in reports).
    notes : tuple of str
        Cautions that travel with every fit of this source.
    uncertainty : dict or None
        Estimated errors (>= 0) of ``heat_capacity``, ``entropy`` and
        ``enthalpy_increment`` at every temperature [J/(mol·K), J/mol];
        None when the source has none.
    """

    temperature: np.ndarray
    heat_capacity: np.ndarray
    entropy: np.ndarray
    enthalpy_increment: np.ndarray
    label: str = "heat-capacity table"
    notes: tuple = ()
    uncertainty: dict | None = None

    def within(self, t_min, t_max):
        """The points with t_min <= T <= t_max (a new :class:`HeatCapacityData`)."""
        keep = (self.temperature >= t_min - 1e-9) & (self.temperature <= t_max + 1e-9)
        u = None if self.uncertainty is None else {k: v[keep] for k, v in self.uncertainty.items()}
        return HeatCapacityData(self.temperature[keep], self.heat_capacity[keep], self.entropy[keep],
                                self.enthalpy_increment[keep], self.label, self.notes, u)


def fit_grid(t_min, t_max, points=400):
    """Fit temperatures [K]: ``points`` evenly spaced on [t_min, t_max], plus 298.15 K inside.

    Examples
    --------
    >>> g = fit_grid(200.0, 400.0, 3)
    >>> g.tolist()
    [200.0, 298.15, 300.0, 400.0]
    """
    t = np.linspace(float(t_min), float(t_max), int(points))
    if t_min < T_STANDARD < t_max:
        t = np.union1d(t, [T_STANDARD])
    return t


def harmonic_source(dos, t_min, t_max, points=400, errors=True):
    r"""Heat-capacity source of a phonon DOS in the harmonic approximation.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS (see :func:`thermo.load_dos`).
    t_min, t_max : float
        Temperature range [K].
    points : int
        Grid points over the range.
    errors : bool
        Carry the table's error estimate
        (:func:`thermo.accuracy.rows.harmonic_row_errors`) as the source's uncertainty.

    Returns
    -------
    HeatCapacityData
        C_p ≈ C_v, S and H − H(298.15) ≈ U − U(298.15) per mole of formula units.

    Notes
    -----
    In the harmonic crystal at zero pressure :math:`C_p = C_v` and
    :math:`H = U` (no thermal expansion, :math:`PV` negligible for a solid
    at 1 bar) [1]_, so :math:`H - H_{298.15} = U(T) - U(298.15\,\mathrm{K}) = \int_{298.15}^T C_v\,dT'`,
    with error :math:`|\int_{298.15}^T \delta C_v\,dT'|` (0 at 298.15 K, where the increment is 0 by definition).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 5.0, 501)
    >>> src = harmonic_source(PhononDOS(nu, 9 * nu ** 2 / 125, atoms=1), 298.15, 1000.0, 50)
    >>> round(float(src.enthalpy_increment[0]), 6)
    0.0
    """
    from ..tables import tabulate

    t = fit_grid(t_min, t_max, points)
    table = tabulate(dos, np.union1d(t, [T_STANDARD]))
    temps = table[find(table, "temperature")].to_numpy()
    u = table[find(table, "internal_energy", "formula")].to_numpy() * 1e3
    u_ref = float(np.interp(T_STANDARD, temps, u))
    keep = np.isin(temps, t)
    notes = (HARMONIC_CAUTION,) + tuple(dos.warnings)
    uncertainty = None
    if errors:
        from ..accuracy.rows import harmonic_row_errors
        e = harmonic_row_errors(dos, temps)
        increment = CubicSpline(temps, e["heat_capacity_v"]).antiderivative()
        uncertainty = {"heat_capacity": e["heat_capacity_v"][keep], "entropy": e["entropy"][keep],
                       "enthalpy_increment": np.abs(increment(temps) - increment(T_STANDARD))[keep]}
    return HeatCapacityData(temps[keep], table[find(table, "heat_capacity_v", "formula")].to_numpy()[keep],
                            table[find(table, "entropy", "formula")].to_numpy()[keep],
                            (u - u_ref)[keep], f"harmonic table of {dos.source.get('name') or 'the DOS'}", notes,
                            uncertainty)


def heat_capacity_source(temperature, heat_capacity, entropy=None, entropy_298=None,
                         label="C_p table", notes=(), heat_capacity_uncertainty=None, entropy_uncertainty=None):
    r"""Heat-capacity source from any (T, C_p) table.

    Parameters
    ----------
    temperature : array_like
        Increasing temperatures [K]; the range must include 298.15 K (added as
        a point, by the spline, when it is not one).
    heat_capacity : array_like
        C_p [J/(mol·K)] per mole of formula units.
    entropy : array_like, optional
        S [J/(mol·K)] at the same temperatures (e.g. a third-law entropy).
    entropy_298 : float, optional
        S(298.15 K) [J/(mol·K)], needed when ``entropy`` is not given.
    label : str
        Description for reports.
    notes : sequence of str
        Cautions to carry.
    heat_capacity_uncertainty, entropy_uncertainty : array_like, optional
        Estimated errors of C_p and S at the same temperatures [J/(mol·K)];
        with the first the source carries an uncertainty (see Notes).

    Returns
    -------
    HeatCapacityData

    Raises
    ------
    OptionError
        Fewer than 4 points, temperatures not increasing, 298.15 K outside the
        table, or no entropy reference.

    Notes
    -----
    A cubic spline of C_p is integrated exactly:
    :math:`H - H_{298.15} = \int_{298.15}^{T} C_p\,dT'` and, without a given
    entropy, :math:`S = S_{298.15} + \int_{298.15}^{T} (C_p/T')\,dT'`.
    The errors integrate the same way with one sign throughout (the worst
    case): :math:`\delta H = |\int_{298.15}^{T}\delta C_p\,dT'|`, and without a
    given entropy error :math:`\delta S = |\int_{298.15}^{T}(\delta C_p/T')\,dT'|`
    (S(298.15 K) itself is then taken as exact).

    Examples
    --------
    >>> t = np.linspace(250.0, 500.0, 11)
    >>> src = heat_capacity_source(t, np.full(11, 25.0), entropy_298=30.0)
    >>> round(float(src.enthalpy_increment[-1]), 3)     # 25 (500 - 298.15)
    5046.25
    """
    t = np.asarray(temperature, dtype=float).ravel()
    cp = np.asarray(heat_capacity, dtype=float).ravel()
    if t.size < 4 or cp.size != t.size:
        raise OptionError(f"a C_p table needs at least 4 (T, C_p) rows of equal length, got {t.size}")
    if not (np.all(np.isfinite(t)) and np.all(np.isfinite(cp))):
        raise OptionError("the C_p table has values that are not finite numbers")
    if np.any(np.diff(t) <= 0) or t[0] <= 0:
        raise OptionError("the C_p table's temperatures must be positive and increasing")
    if not t[0] <= T_STANDARD <= t[-1]:
        raise OptionError(f"the C_p table ({t[0]:g}–{t[-1]:g} K) must include 298.15 K, where H and S are referenced")
    spline = CubicSpline(t, cp)
    extra = {k: None if v is None else np.asarray(v, dtype=float).ravel()
             for k, v in (("entropy", entropy), ("heat_capacity", heat_capacity_uncertainty),
                          ("entropy_error", entropy_uncertainty))}
    shown = {"entropy": "entropy", "heat_capacity": "C_p error", "entropy_error": "entropy error"}
    for key, values in extra.items():
        if values is not None and (values.size != t.size or not np.all(np.isfinite(values))):
            raise OptionError(f"the {shown[key]} column must be finite numbers beside every temperature")
    if not np.any(t == T_STANDARD):     # hold the reference point itself (H and S are anchored there)
        at = int(np.searchsorted(t, T_STANDARD))
        extra = {k: None if v is None else np.insert(v, at, CubicSpline(t, v)(T_STANDARD)) for k, v in extra.items()}
        t, cp = np.insert(t, at, T_STANDARD), np.insert(cp, at, spline(T_STANDARD))
    entropy = extra["entropy"]
    dh = spline.antiderivative()
    h = dh(t) - dh(T_STANDARD)
    if entropy is not None:
        s = entropy
    else:
        if entropy_298 is None:
            raise OptionError("a C_p table without entropy needs S(298.15 K): give entropy_298 in J/(mol·K)")
        ds = CubicSpline(t, cp / t).antiderivative()
        s = float(entropy_298) + ds(t) - ds(T_STANDARD)
    u_cp = extra["heat_capacity"]
    if u_cp is None:
        return HeatCapacityData(t, cp, s, h, label, tuple(notes))
    u_cp = np.abs(u_cp)
    dh, du_s = CubicSpline(t, u_cp).antiderivative(), CubicSpline(t, u_cp / t).antiderivative()
    u_s = np.abs(extra["entropy_error"]) if extra["entropy_error"] is not None else np.abs(du_s(t) - du_s(T_STANDARD))
    uncertainty = {"heat_capacity": u_cp, "entropy": u_s, "enthalpy_increment": np.abs(dh(t) - dh(T_STANDARD))}
    return HeatCapacityData(t, cp, s, h, label, tuple(notes), uncertainty)


def source_from_table(table, entropy_298=None, label="C_p table"):
    """Heat-capacity source from a table whose columns follow :mod:`thermo.columns`.

    Parameters
    ----------
    table : pandas.DataFrame
        Columns ``temperature_K`` and ``heat_capacity_p_J_per_mol_K`` (or
        ``heat_capacity_p_model_J_per_mol_K``, or ``heat_capacity_v_J_per_mol_K``,
        then taken as C_p with a note); an entropy column is optional:
        ``entropy_third_law_J_per_mol_K`` (S° from measured data) is taken
        before ``entropy_J_per_mol_K``, with a note naming both.  Columns are
        found by quantity through :mod:`thermo.columns`; the label says which
        ones were used.  The ``_error_`` column beside each
        (``heat_capacity_p_error_J_per_mol_K``, ``entropy_error_J_per_mol_K``)
        is optional, and then carried as the source's uncertainty.
    entropy_298 : float, optional
        S(298.15 K) [J/(mol·K)] when the table has no entropy.
    label : str
        Description for reports.

    Returns
    -------
    HeatCapacityData

    Raises
    ------
    OptionError
        Missing columns (named), or as :func:`heat_capacity_source`.

    Examples
    --------
    >>> import pandas as pd
    >>> df = pd.DataFrame({"temperature_K": [250.0, 300, 400, 500], "heat_capacity_p_J_per_mol_K": [25.0] * 4})
    >>> round(float(source_from_table(df, entropy_298=30.0).entropy[2]), 4)
    30.1546
    """
    t = find(table, "temperature")
    notes = []
    cp, cp_key, _ = _first_column(table, _HEAT_CAPACITY_CHOICES)
    if cp is None:
        raise OptionError("the table has no heat_capacity_p_J_per_mol_K (or heat_capacity_p_model_J_per_mol_K of a "
                          "calorimetry fit, or heat_capacity_v_J_per_mol_K) column; values per mole of formula "
                          "units are needed")
    if cp_key != "heat_capacity_p":
        notes.append(f"column {cp} ({_HEAT_CAPACITY_CHOICES[cp_key]}) taken as C_p")
    entropy_column, entropy_key, passed = _first_column(table, _ENTROPY_CHOICES)
    s = None if entropy_column is None else table[entropy_column].to_numpy(dtype=float)
    if passed:
        notes.append(f"S from column {entropy_column} ({_ENTROPY_CHOICES[entropy_key]}); "
                     + "; ".join(f"column {name} ({_ENTROPY_CHOICES[key]}) not used" for name, key in passed))
    label = f"{label} (C_p: {cp}; S: " + (entropy_column or "S(298.15 K) given, C_p/T integrated") + ")"
    temperature, heat = table[t].to_numpy(dtype=float), table[cp].to_numpy(dtype=float)
    errors = {key: None if column is None else table[column].to_numpy(dtype=float)
              for key, column in (("cp", error_column_for(table, cp)),
                                  ("s", None if entropy_column is None else error_column_for(table, entropy_column)))}
    if errors["cp"] is not None and s is not None and errors["s"] is None:
        notes.append(f"column {entropy_column} has no error column: S(298.15 K) is taken as exact, its "
                     "uncertainty elsewhere integrated from that of C_p")
        s_known = None
    else:
        s_known = errors["s"]
    keep = (temperature > 0) & np.isfinite(heat) & (np.isfinite(s) if s is not None else True)
    for values in errors.values():
        if values is not None:
            keep &= np.isfinite(values)
    if (temperature <= 0).any():
        notes.append(f"{int((temperature <= 0).sum())} row(s) at T <= 0 K left out (C_p/T is not defined there)")
    empty = int((~keep & (temperature > 0)).sum())
    if empty:
        notes.append(f"{empty} row(s) without finite C_p or S left out")
    outside = "outside_volume_range"
    if outside in table.columns:      # quasi-harmonic rows extrapolated beyond the sampled volumes
        marked = table[outside].astype(bool).to_numpy()
        if (marked & keep).any():
            notes.append(f"{int((marked & keep).sum())} quasi-harmonic row(s) outside the sampled volumes left out")
        keep &= ~marked
    return heat_capacity_source(temperature[keep], heat[keep], entropy=None if s is None else s[keep],
                                entropy_298=entropy_298, label=label, notes=notes,
                                heat_capacity_uncertainty=None if errors["cp"] is None else errors["cp"][keep],
                                entropy_uncertainty=None if s_known is None else s_known[keep])


#: C_p columns a table may carry, in the order they are taken (quantity key -> what it is).
_HEAT_CAPACITY_CHOICES = {"heat_capacity_p": "C_p",
                          "heat_capacity_p_model": "the fitted model of a calorimetry table",
                          "heat_capacity_v": "C_v"}
#: Entropy columns, in the order they are taken: the third-law S° from measured C_p before any other.
_ENTROPY_CHOICES = {"entropy_third_law": "third-law entropy integrated from the measured data",
                    "entropy": "entropy of the table's own model, e.g. the harmonic S of a DOS"}


def _first_column(table, quantities):
    """``(name, quantity key, others)`` of the first of ``quantities`` (per mole of formula units) in
    ``table`` — chosen by quantity through :mod:`thermo.columns`, never by a name match — with the
    ``(name, key)`` of the later ones also present; ``(None, None, [])`` when there is none."""
    present = []
    for quantity in quantities:
        try:
            present.append((find(table, quantity, "formula"), quantity))
        except OptionError:
            continue
    if not present:
        return None, None, []
    return present[0][0], present[0][1], present[1:]
