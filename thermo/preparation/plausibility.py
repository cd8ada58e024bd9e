"""Plausibility checks run on every load: is the frequency unit believable, do partials add up?

A wrong frequency unit does not make a file unreadable: it scales every
frequency by a constant, and the thermodynamics that follow are wrong by a
large but silent amount.  Two facts about real solids catch that:

* the highest phonon frequency of a solid lies between a few tenths of a THz
  and a few tens of THz (soft molecular or heavy-atom crystals near the lower
  end, hydrogen stretching modes near 100 THz) — common practice;
* the standard entropy of solids at 298.15 K lies between about 2.4
  J/(mol·K) per atom (diamond) and about 85 J/(mol·K) per atom (caesium)
  [1]_ (values from memory of the handbook tables).

The bands used here are widened (0.3–100 THz; 1–100 J/(mol·K) per atom) so that
only a unit error or a broken file leaves them.  A warning says what was found
and what the maximum frequency would be in every other unit.

References
----------
.. [1] J. R. Rumble (ed.), *CRC Handbook of Chemistry and Physics*, 102nd ed.
   (CRC Press, 2021), section 5, "Standard thermodynamic properties of
   chemical substances".
"""

from __future__ import annotations

import numpy as np

from ..kernels.planck import H_OVER_K_THZ
from ..kernels.quadrature import mode_weights
from ..unit_names import FREQUENCY_UNITS
from ..units import thz_to_unit

#: Band of the highest phonon frequency of solids [THz] (widened common practice).
MAX_FREQUENCY_BAND_THZ = (0.3, 100.0)
#: Band of the entropy at 298.15 K per atom of solids [J/(mol K)] (widened, see module notes).
ENTROPY_BAND_PER_ATOM = (1.0, 100.0)
#: Largest accepted mismatch between the sum of partial columns and the total,
#: as a share of the integral of the total DOS.
PARTIAL_SUM_TOLERANCE = 0.02


def max_frequency_readings(max_value, units=FREQUENCY_UNITS):
    r"""Highest frequency and its temperature hν/k_B if the file were in each unit.

    Parameters
    ----------
    max_value : float
        Highest frequency of the file as written [file unit].
    units : sequence of str, optional
        Units to read it in.

    Returns
    -------
    dict of str to (float, float)
        Unit → (ν_max [THz], θ = hν_max/k_B [K]).

    Notes
    -----
    :math:`\nu_{\max} = x / f_u` with :math:`f_u` the number of units in one
    THz (:func:`thermo.units.thz_to_unit`) and :math:`\theta = h\nu_{\max}/k_B`,
    the Debye temperature of a Debye spectrum with that cut-off.

    Examples
    --------
    >>> nu, theta = max_frequency_readings(10.0)["THz"]
    >>> nu, round(theta, 1)
    (10.0, 479.9)
    """
    out = {}
    for unit in units:
        nu = float(max_value) / thz_to_unit(unit)
        out[unit] = (nu, nu * H_OVER_K_THZ)
    return out


def _plausible_units(max_value, chosen):
    lo, hi = MAX_FREQUENCY_BAND_THZ
    return [f"{u} (ν_max {nu:.3g} THz, θ {theta:.3g} K)"
            for u, (nu, theta) in max_frequency_readings(max_value).items()
            if u != chosen and lo <= nu <= hi]


def unit_warnings(max_value, unit, entropy_298_per_atom=None):
    """Warnings when the chosen unit gives an implausible spectrum.

    Parameters
    ----------
    max_value : float
        Highest frequency with a non-zero DOS, as written in the file [file unit].
    unit : str
        Unit the file is read in.
    entropy_298_per_atom : float, optional
        Harmonic entropy at 298.15 K per atom with that unit [J/(mol K)].

    Returns
    -------
    list of str
        Zero, one or two one-line warnings; each names the other units that
        would give a plausible maximum frequency.

    Examples
    --------
    >>> unit_warnings(20.0, "THz", 30.0)
    []
    >>> unit_warnings(20.0, "rad/s")[0].split(";")[0]
    'with the frequency unit rad/s the highest frequency is 3.18e-12 THz (θ 1.53e-10 K), outside the 0.3–100 THz of solids'
    """
    nu, theta = max_frequency_readings(max_value, [unit])[unit]
    lo, hi = MAX_FREQUENCY_BAND_THZ
    others = _plausible_units(max_value, unit)
    hint = ("; read in " + " or ".join(others) + " it would be plausible" if others
            else "; no frequency unit gives a plausible value")
    notes = []
    if not lo <= nu <= hi:
        notes.append(f"with the frequency unit {unit} the highest frequency is {nu:.3g} THz "
                     f"(θ {theta:.3g} K), outside the {lo:g}–{hi:g} THz of solids{hint}; "
                     "check the frequency unit")
    s_lo, s_hi = ENTROPY_BAND_PER_ATOM
    if entropy_298_per_atom is not None and not s_lo <= entropy_298_per_atom <= s_hi:
        notes.append(f"with the frequency unit {unit} the entropy at 298.15 K is "
                     f"{entropy_298_per_atom:.4g} J/(mol K) per atom, outside the {s_lo:g}–{s_hi:g} "
                     f"J/(mol K) per atom of solids{'' if notes else hint}; "
                     "check the frequency unit and the atom count")
    return notes


def partial_sum_warnings(frequency, total, partials, tolerance=PARTIAL_SUM_TOLERANCE):
    r"""Warnings when the partial (projected) columns do not add up to the total DOS.

    Parameters
    ----------
    frequency : array_like, shape (N,)
        Ascending frequencies [any unit].
    total : array_like, shape (N,)
        Total DOS [states / unit].
    partials : dict of str to array_like
        Partial DOS columns by name [states / unit].
    tolerance : float, optional
        Accepted mismatch as a share of the integral of the total.

    Returns
    -------
    list of str
        One warning naming the columns when
        :math:`\int |\sum_k g_k - g| \,d\nu > \epsilon \int g \,d\nu`,
        plus, in that case, a note on each column that equals (within 5 %
        of its end value) the running integral of another column: a
        cumulative count rather than a density.

    Notes
    -----
    Projected densities of states partition the modes, so
    :math:`\sum_k g_k(\nu) = g(\nu)` at every frequency (common practice;
    a column of another kind, e.g. an integrated count, breaks it).

    Examples
    --------
    >>> nu = np.linspace(0, 1, 11)
    >>> partial_sum_warnings(nu, 2 * nu, {"A": nu, "B": nu})
    []
    >>> partial_sum_warnings(nu, 2 * nu, {"A": nu})[0][:60]
    "partial column 'A' does not add up to the total DOS: their s"
    """
    if not partials:
        return []
    nu = np.asarray(frequency, float)
    g = np.asarray(total, float)
    whole = float(mode_weights(nu, g).sum())
    names = list(partials)
    summed = np.sum([np.asarray(partials[k], float) for k in names], axis=0)
    mismatch = float(mode_weights(nu, np.abs(summed - g)).sum()) / whole if whole > 0 else np.inf
    notes = []
    if mismatch > tolerance:
        ratio = float(mode_weights(nu, summed).sum()) / whole if whole > 0 else np.inf
        listed = ", ".join(repr(k) for k in names)
        word = "partial column" if len(names) == 1 else "partial columns"
        notes.append(f"{word} {listed} {'does' if len(names) == 1 else 'do'} not add up to the total DOS: "
                     f"their sum differs by {100 * mismatch:.3g} % of the total's integral (tolerance "
                     f"{100 * tolerance:g} %; sum/total = {ratio:.4g}); species results may be wrong")
    if notes:
        running = {"the total": _running_integral(nu, g)}
        running.update({repr(k): _running_integral(nu, np.asarray(partials[k], float)) for k in names})
        for k in names:
            col = np.asarray(partials[k], float)
            for what, integral in running.items():
                if what != repr(k) and integral[-1] > 0 and \
                        np.max(np.abs(col - integral)) <= 0.05 * integral[-1]:
                    notes.append(f"partial column {k!r} follows the running integral of {what}: it is a "
                                 "cumulative count, not a density of states")
                    break
    return notes


def _running_integral(nu, g):
    """Trapezoid running integral of g over ν (0 at the first point)."""
    return np.concatenate([[0.0], np.cumsum(0.5 * (g[1:] + g[:-1]) * np.diff(nu))])


def entropy_298_per_atom(dos):
    """Harmonic entropy at 298.15 K per atom [J/(mol K)] of a normalised DOS (for the unit check).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 8.0, 801)
    >>> s = entropy_298_per_atom(PhononDOS(nu, 9 * nu ** 2 / 8.0 ** 3, atoms=1))
    >>> 20 < s < 40
    True
    """
    from ..kernels.sums import molar_values, thermal_sums   # kernels only: no cycle through the tables
    t = np.array([298.15])
    sums = thermal_sums(dos, t, keys=("thermal_energy", "log_partition"))    # S needs no C_v
    return float(molar_values({**sums, "heat_capacity": np.zeros(1)}, t)[1][0]) / dos.atoms
