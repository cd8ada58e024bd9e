"""Error estimate of a harmonic table, split into a numerical and a low-frequency part.

*Numerical*: the whole preparation is repeated on every second row of the
input (the low-frequency treatment re-fitted on that halved grid) and the
table recomputed; the difference is the estimate (conservative: for a rule of
order p the full grid's error is about :math:`1/(2^p-1)` of it, Richardson's
argument [1]_).

*Low-frequency*: the spread of the table over plausible treatments — the
automatic window placed at half and at twice its mode count, the fit's
standard error of :math:`A` carried through the analytic part, and, when the
treatment was switched off or set by hand, the automatic treatment.

For a mode list with a long-wave continuum the Planck sums over the modes
are exact; its error is that of the long-wave treatment and of the mesh
near Γ, estimated as the spread over the other plausible treatments kept on
the list (the blend into the mesh moved both ways, the sound speeds without
the Richardson step; :func:`mode_list_part`).

*Resolution* and *smearing* (:mod:`.resolution`): what a sampled DOS
cannot say — the modes below its lowest resolved frequency (first q-shell,
smearing width, bin width), bounded through the cumulative count, and the
change of the table when the data are smeared once more.  They are there
whether or not the ν² treatment is on, so the low-frequency error never
drops out when the fit switches itself off.

All parts are given absolute (in the table's units) and relative to the value
itself (no floor, so small values near T = 0 are judged too).  A row whose
combined relative error of C_v or S exceeds :data:`FLAG_SPREAD` is flagged
with the reason (the largest part).

References
----------
.. [1] L. F. Richardson, "The deferred approach to the limit", Phil. Trans.
   R. Soc. A 226, 299-361 (1927).
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..columns import column_name, lookup
from ..kernels.nu2 import analytic_part_sums

from ..kernels.sums import molar_values, thermal_sums
from ..preparation.lowfreq import WINDOW_MODES, WINDOW_SPREAD
from dataclasses import replace

from .rebuild import rebuild
from .resolution import analyse_resolution, resolution_parts, window_max
from .subgrid import MARGIN as SUBGRID_MARGIN, ROUNDING as SUBGRID_ROUNDING, envelope, sub_grid
from scipy import constants as sc

#: Quantities of the breakdown, in the order of :func:`thermo.kernels.sums.molar_values`.
QUANTITIES = ("heat_capacity_v", "entropy", "internal_energy", "helmholtz_energy")
#: Relative low-frequency spread (and combined error) above which a row is flagged.
FLAG_SPREAD = 0.01
#: Parts of the breakdown, each a column per quantity.
PARTS = ("numerical", "low_frequency", "resolution", "smearing")
#: What each part means, for the reason of a flagged row.
REASONS = {"numerical": "numerical (grid halving)", "low_frequency": "low-frequency ν² treatment",
           "resolution": "modes below the resolved frequency", "smearing": "smearing/binning of the data"}
_ENERGY = (False, False, True, True)
#: Mode lists: the spread over the blend positions is counted this many times ...
LIST_SAFETY = 1.25
#: ... and that of U and F (the zero-point energy's mesh error) this many times more.
LIST_ENERGY_FACTOR = 2.0
#: The relative error at T is the largest over T/LIST_ENVELOPE … T·LIST_ENVELOPE (a difference crosses zero).
LIST_ENVELOPE = 1.5


def _values(dos, t):
    return np.array(molar_values(thermal_sums(dos, t), t))


def _fit_part(dos, t):
    """Change of C_v, S, U, F when A moves by its standard error."""
    fit = dos.low_frequency
    if fit is None or fit.coefficient <= 0 or not np.isfinite(fit.coefficient_uncertainty):
        return np.zeros((4, t.size))
    out = np.zeros((4, t.size))
    hot = t > 0
    s = analytic_part_sums(fit, t[hot])
    rel = fit.coefficient_uncertainty / fit.coefficient
    r = sc.R
    out[:, hot] = rel * np.abs(np.array([r * s["heat_capacity"], r * (s["thermal_energy"] + s["log_partition"]),
                                         r * t[hot] * s["thermal_energy"], r * t[hot] * s["log_partition"]]))
    return out


def mode_list_part(dos, temperatures, sample=None, values=None):
    r"""Error of C_v, S, U, F of a mode list from its long-wave treatment and the mesh near Γ.

    Parameters
    ----------
    dos : PhononDOS
        A mode list (``dos.modes``) with a continuum and its alternative treatments.
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.
    sample : numpy.ndarray, optional
        Temperatures [K] at which the relative spread is sampled instead of ``temperatures``
        (:func:`thermo.accuracy.subgrid.sub_grid`; the window's largest is then raised by
        :data:`thermo.accuracy.subgrid.MARGIN`).
    values : numpy.ndarray, shape (4, M), optional
        C_v, S, U, F of the list at ``temperatures`` (needed with ``sample``).

    Returns
    -------
    numpy.ndarray, shape (4, M)
        Error bound of C_v, S [J/(mol·K)], U, F [J/mol] per mole of formula units
        (zeros when the list keeps no alternatives).

    Notes
    -----
    With :math:`\Delta_a = |Q_a - Q|` of each alternative a (factor :math:`f_a`),
    :math:`r = 1.25\max_{f_a=1}\Delta_a + \sum_{f_a<1} f_a\Delta_a`, doubled for U
    and F; the bound at T is :math:`|Q(T)|\max_{T'\in[T/1.5,\,1.5T]} r(T')/|Q(T')|`
    (F relative to U).  On the test crystals (8³–16³ meshes, 2–300 K) it covered
    the true error everywhere, at most 0.05 of C_v and S.

    References
    ----------
    .. [1] L. F. Richardson, Phil. Trans. R. Soc. A 226, 299-361 (1927).

    Examples
    --------
    >>> from thermo.spectrum import ModeList, PhononDOS
    >>> m = ModeList(np.array([1.0, 2.0]), np.array([1.5, 1.5]))
    >>> d = PhononDOS(np.array([0.0, 2.0]), np.array([0.0, 3.0]), 1, modes=m)
    >>> mode_list_part(d, [10.0]).tolist()
    [[0.0], [0.0], [0.0], [0.0]]
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float)).ravel()
    alternatives = dos.modes.alternatives() if dos.modes.alternatives is not None else ()
    if not alternatives:
        return np.zeros((4, t.size))
    hot = t[t > 0]
    points = t if sample is None else np.asarray(sample, dtype=float)
    aux = np.unique(np.concatenate([points, np.geomspace(hot.min() / LIST_ENVELOPE, hot.max() * LIST_ENVELOPE, 60)
                                    if hot.size else []]))
    base = _values(dos, aux)
    spread, added = np.zeros_like(base), np.zeros_like(base)
    for factor, listed in alternatives:
        diff = np.abs(_values(replace(dos, modes=listed), aux) - base)
        if factor >= 1.0:
            spread = np.maximum(spread, factor * diff)
        else:
            added += factor * diff
    raw = LIST_SAFETY * spread + added
    raw[2:] *= LIST_ENERGY_FACTOR
    scale = np.abs(base)
    scale[3] = scale[2]
    with np.errstate(divide="ignore", invalid="ignore"):
        rel = np.where(scale > 0, raw / scale, 0.0)
    if sample is None:
        at = scale[:, np.searchsorted(aux, t)]
        raise_by = 1.0
    else:                               # the window's largest relative error, sampled: raised (.subgrid)
        at = np.abs(np.asarray(values, dtype=float))
        at[3] = at[2]
        raise_by = 1.0 + SUBGRID_MARGIN
    out = np.zeros((4, t.size))
    warm = t > 0
    lo = np.searchsorted(aux, t[warm] / LIST_ENVELOPE, side="left")
    hi = np.searchsorted(aux, t[warm] * LIST_ENVELOPE, side="right")
    if sample is not None:              # one sample past each end: the window's edges lie between samples
        lo, hi = np.maximum(lo - 1, 0), np.minimum(hi + 1, aux.size)
    for i in range(4):
        out[i, warm] = at[i, warm] * raise_by * window_max(rel[i], lo, hi)
    if (~warm).any():
        out[:, ~warm] = at[:, ~warm] * raise_by * rel[:, aux == 0].max(axis=1, initial=0.0)[:, None]
    return out


def error_breakdown(dos, temperatures):
    r"""Numerical and low-frequency error of C_v, S, U and F at each temperature.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS (from :func:`thermo.load_dos`, whose input rows are
        kept for the re-preparation).
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.

    Returns
    -------
    pandas.DataFrame
        ``temperature_K``; for each quantity ``q`` of :data:`QUANTITIES`
        its value and its numerical, low-frequency, resolution and smearing
        errors (per mole of formula units: J/(mol·K), kJ/mol) and their
        relative forms [1], named by :func:`error_column`;
        ``low_frequency_flag``, True where the relative low-frequency part
        of C_v or S exceeds 1 %; ``error_flag`` and ``error_reason``, where
        the combined relative error of C_v or S exceeds 1 %, and why;
        ``attrs["resolution"]``: what the data resolve
        (:meth:`~thermo.accuracy.resolution.Resolution.as_dict`).

    Notes
    -----
    :math:`\delta_{num} = \max_{k=0,1} |Q_h - Q_{2h}^{(k)}|` over the two interleaved
    half grids (rows 0, 2, 4, … and 1, 3, 5, …, each re-prepared with its own fit);
    :math:`\delta_{lf} = \max_w |Q_w - Q| + |\partial Q/\partial A|\,\sigma_A`
    over the alternative treatments w; resolution and smearing parts as in
    :func:`~thermo.accuracy.resolution.resolution_parts`; relative:
    :math:`\delta/|Q|` (0 where Q = 0, at T = 0).  Over more than 20,000 temperatures the parts are
    evaluated on a sub-grid in :math:`\ln T` and bounded from above at each temperature
    (:mod:`thermo.accuracy.subgrid`); the values are those of every temperature.

    References
    ----------
    Richardson (1927).

    Examples
    --------
    >>> from thermo import load_dos
    >>> nu = np.linspace(0.0, 8.0, 401)
    >>> dos = load_dos("# THz\n" + "\n".join(f"{a} {9 * a * a / 512}" for a in nu))
    >>> b = error_breakdown(dos, [5.0, 300.0])
    >>> bool(b[error_column("heat_capacity_v", "numerical", relative=True)].max() < 1e-3)
    True
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float)).ravel()
    base = _values(dos, t)
    nodes = sub_grid(t)
    if nodes is None:
        parts, resolution = _parts(dos, t, base)
    else:             # many temperatures: the parts on a sub-grid in ln T, bounded from above (.subgrid)
        coarse, resolution = _parts(dos, nodes, _values(dos, nodes), widen=True)
        scale = np.abs(base)
        scale[3] = np.abs(base[2]) + t * np.abs(base[1])
        floor = SUBGRID_ROUNDING * scale          # where a part is two tables' rounding noise (subgrid notes)
        parts = {key: envelope(nodes, value, t) + np.any(value, axis=1)[:, None] * floor   # none where it is 0
                 for key, value in coarse.items()}
        del scale, floor
        if dos.modes is not None and not dos.source.get("histogram"):   # relative spread × the value at T
            parts["low_frequency"] = mode_list_part(dos, t, sample=nodes, values=base)
    return _frame(t, base, parts, resolution)


def _parts(dos, t, base, widen=False):
    """({part: (4, M) error bound}, resolution) of ``dos`` at ``t`` whose values are ``base`` (``widen``:
    ``t`` is a sub-grid, see :func:`~thermo.accuracy.resolution.resolution_parts`)."""
    if dos.modes is not None and not dos.source.get("histogram"):
        return _list_parts(dos, t, base, widen)
    numerical = np.zeros_like(base)
    for offset in (0, 1):      # both interleaved half grids: one difference alone can cancel by chance
        halved = rebuild(dos, every=2, offset=offset)
        if halved is not None:
            numerical = np.maximum(numerical, np.abs(base - _values(halved, t)))
    alternatives = []
    fit = dos.low_frequency
    if fit is not None and fit.automatic:
        alternatives = [rebuild(dos, window="auto", window_modes=WINDOW_MODES * f) for f in WINDOW_SPREAD]
    elif dos.input_dos is not None:
        alternatives = [rebuild(dos, window="auto")]
    spread = np.zeros_like(base)
    for alt in alternatives:
        if alt is not None and (alt.low_frequency is not None or fit is not None):
            spread = np.maximum(spread, np.abs(_values(alt, t) - base))
    low = spread + _fit_part(dos, t)
    resolution = analyse_resolution(dos)
    res, smear = resolution_parts(dos, t, resolution, widen)
    if resolution is not None and resolution.lost_share > 0:     # modes lost below 0, spread by the normalisation
        scale = np.abs(base)
        scale[3] = np.abs(base[2]) + t * np.abs(base[1])
        smear = smear + resolution.lost_share * scale
    return {"numerical": numerical, "low_frequency": low, "resolution": res, "smearing": smear}, resolution


def _list_parts(dos, t, base, widen=False):
    """The parts of a mode list: its sums are exact; long-wave part, or what it resolves without one."""
    zero = np.zeros_like(base)
    resolution = analyse_resolution(dos)
    res, smear = resolution_parts(dos, t, resolution, widen)
    lost = dos.source.get("left_out_share") or 0.0      # Γ's modes left out, the rest renormalised
    scale = np.abs(base)
    scale[3] = np.abs(base[2]) + t * np.abs(base[1])
    return {"numerical": zero, "low_frequency": mode_list_part(dos, t), "resolution": res + lost * scale,
            "smearing": smear}, resolution


def _frame(t, base, parts, resolution):
    """The breakdown table of values ``base`` and error ``parts`` (see :func:`error_breakdown`).

    The float columns are rows of one block, filled in place and handed to pandas without a copy (at 10⁶
    temperatures a column-by-column build held the table two and a half times).
    """
    names = [column_name("temperature")]
    for key in QUANTITIES:
        names.append(column_name(key))
        for part in PARTS:
            names += [error_column(key, part), error_column(key, part, relative=True)]
    block = np.zeros((len(names), t.size))
    columns = dict(zip(names, block))               # name -> its row (a view)
    columns[names[0]][:] = t
    scale = [1e-3 if energy else 1.0 for energy in _ENERGY]
    for i, key in enumerate(QUANTITIES):
        np.multiply(base[i], scale[i], out=columns[column_name(key)])
    for part in PARTS:
        errors = parts[part]
        for i, key in enumerate(QUANTITIES):
            np.multiply(errors[i], scale[i], out=columns[error_column(key, part)])
            np.divide(errors[i], np.abs(base[i]), out=columns[error_column(key, part, relative=True)],
                      where=base[i] != 0)
    low_flag = ((columns[error_column("heat_capacity_v", "low_frequency", True)] > FLAG_SPREAD)
                | (columns[error_column("entropy", "low_frequency", True)] > FLAG_SPREAD))
    flag, reason = _flags(columns, resolution)
    df = pd.DataFrame(block.T, columns=names, copy=False)
    df[column_name("low_frequency_flag")] = low_flag
    df[column_name("error_flag")] = flag
    df[column_name("error_reason")] = reason
    df.attrs["resolution"] = None if resolution is None else resolution.as_dict()
    return df


def _flags(columns, resolution):
    """(flag, reason) per row of the breakdown's ``columns`` (name → array): combined relative error of C_v or
    S above FLAG_SPREAD, and its largest part."""
    rows = len(columns[column_name("temperature")])
    flag = np.zeros(rows, dtype=bool)
    reason = np.full(rows, "", dtype=object)
    worst = np.zeros(rows)
    for key in ("heat_capacity_v", "entropy"):
        rel = np.array([np.asarray(columns[error_column(key, p, True)]) for p in PARTS])
        total = rel.sum(axis=0)
        for j in np.flatnonzero((total > FLAG_SPREAD) & (total > worst)):
            worst[j] = total[j]
            part = PARTS[int(np.argmax(rel[:, j]))]
            text = f"{lookup(column_name(key)).quantity.symbol} ±{100 * total[j]:.2g} %: {REASONS[part]}"
            if part == "resolution" and resolution is not None:
                text += (f" ({resolution.resolved_thz:.3g} THz; the data do not determine the table below "
                         f"{resolution.undetermined_below_k:.3g} K)")
            reason[j] = text
        flag |= total > FLAG_SPREAD
    return flag, reason


def error_column(key, part, relative=False):
    """Column name of the ``part`` ('numerical' or 'low_frequency') error of quantity ``key``.

    Examples
    --------
    >>> error_column("heat_capacity_v", "numerical")
    'heat_capacity_v_numerical_error_J_per_mol_K'
    >>> error_column("entropy", "low_frequency", relative=True)
    'entropy_low_frequency_relative_error'
    """
    return column_name(f"{key}_{part}_relative_error" if relative else f"{key}_{part}_error")


def estimated_relative_error(dos, temperatures, breakdown=None):
    r"""Largest relative error estimate (numerical + low-frequency) over the table.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    temperatures : array_like
        Temperatures [K].
    breakdown : pandas.DataFrame, optional
        A ready :func:`error_breakdown` of the same DOS and temperatures.

    Returns
    -------
    float
        :math:`\max (\delta_{num} + \delta_{lf} + \delta_{res} + \delta_{sm})/|Q|` over C_v, S and U at
        every T > 0, and over F relative to :math:`|U|` (F crosses zero) [1].

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0, 5, 201)
    >>> d = PhononDOS(nu, 9 * nu**2 / 125, atoms=1)
    >>> 1e-9 < estimated_relative_error(d, [100.0, 300.0]) < 1e-3
    True
    """
    b = _without_attrs(error_breakdown(dos, temperatures) if breakdown is None else breakdown)
    hot = b[column_name("temperature")].to_numpy() > 0
    if not hot.any():
        return 0.0
    worst = 0.0
    energy = np.abs(b[column_name("internal_energy")].to_numpy()[hot])
    for key in QUANTITIES:
        total = sum(b[error_column(key, p)].to_numpy() for p in PARTS if error_column(key, p) in b)[hot]
        ref = energy if key == "helmholtz_energy" else np.abs(b[column_name(key)].to_numpy()[hot])
        with np.errstate(divide="ignore", invalid="ignore"):
            rel = np.where(ref > 0, total / ref, 0.0)
        worst = max(worst, float(np.max(rel)))
    return worst


def breakdown_summary(breakdown):
    """JSON-able digest of :func:`error_breakdown`: worst parts per quantity and flagged rows.

    Examples
    --------
    >>> b = pd.DataFrame({"temperature_K": [1.0], "low_frequency_flag": [True],
    ...                   **{error_column(q, p, r): [0.0] for q in QUANTITIES
    ...                      for p in ("numerical", "low_frequency") for r in (False, True)}})
    >>> breakdown_summary(b)["flagged_temperatures_K"]
    [1.0]
    """
    resolution = breakdown.attrs.get("resolution")
    breakdown = _without_attrs(breakdown)
    t = breakdown[column_name("temperature")].to_numpy()
    out = {}
    for key in QUANTITIES:
        entry = {}
        for part in PARTS:
            if error_column(key, part, relative=True) not in breakdown:
                continue
            rel = breakdown[error_column(key, part, relative=True)].to_numpy()
            i = int(np.argmax(np.round(rel, 12))) if rel.size else 0     # ties (an envelope): the lowest T
            entry[part] = {"max_relative": float(rel[i]) if rel.size else 0.0,
                           "at_temperature_K": float(t[i]) if rel.size else None,
                           "max_absolute": _nan_max(breakdown[error_column(key, part)].to_numpy())}
        out[key] = entry
    out["flagged_temperatures_K"] = [float(v) for v in t[breakdown[column_name("low_frequency_flag")].to_numpy()]]
    if column_name("error_flag") in breakdown:
        flagged = breakdown[column_name("error_flag")].to_numpy()
        out["error_flagged_temperatures_K"] = [float(v) for v in t[flagged]]
    out["resolution"] = resolution
    return out


def _nan_max(values):
    """Largest value, NaN left out (as pandas' ``Series.max``); NaN when none is left."""
    kept = values[~np.isnan(values)]
    return float(kept.max()) if kept.size else float("nan")


def _without_attrs(frame):
    """A shallow view of ``frame`` without ``attrs`` (pandas deep-copies them on every column read)."""
    plain = frame.copy(deep=False)
    plain.attrs = {}
    return plain
