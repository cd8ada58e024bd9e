"""Read measured heat capacity C_p(T) (text, CSV or .xlsx) per mole of formula units.

The file is sniffed by the DOS reader :func:`thermo.io.readers.read_table`
(delimiters, comment lines, header row, ``.xlsx``); this module only gives
the columns their meaning and units:

* column 1: temperature [K];
* column 2: C_p in J/(mol K), J/(g K) (needs the chemical formula),
  cal/(mol K) (thermochemical calorie, 4.184 J) or mJ/(mol K);
* column 3 (optional): the standard uncertainty of C_p, same unit.

The C_p unit comes from the option, else from the header row or a commented
header row (``Cp (J/(mol K))``, ``heat_capacity_J_per_mol_K``,
``# T[K]  C[mJ/(mol K)]`` ...; the same rule as the DOS reader's unit, see
:mod:`thermo.io.unit_statements`), else J/(mol K) with a note.  Every problem
raises :class:`thermo.errors.DosInputError` with one line naming the file, line
and column.

Magnitudes are checked as for a DOS: temperatures from 0.1 K to 10⁵ K, C_p
finite, above the Debye T³ law of θ_D = 10⁵ K and below twice Dulong–Petit for
the largest formula unit accepted, uncertainties above 10⁻⁹ of the value, at
most :data:`thermo.io.limits.MAX_HEAT_CAPACITY_ROWS` points; once the atoms per formula unit are known,
:func:`check_heat_capacity_scale` refuses C_p above twice the Dulong–Petit
value plus electronic room, naming the unit the numbers were likely written in.

References
----------
.. [1] E. R. Cohen et al., *Quantities, Units and Symbols in Physical
   Chemistry* (IUPAC Green Book), 3rd ed. (RSC, 2007), §7.2 (the
   thermochemical calorie, 1 cal = 4.184 J).
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

import numpy as np
from scipy import constants as sc

from ..errors import DosInputError, OptionError
from ..io.limits import check_heat_capacity_rows
from ..io.readers import read_table
from ..io.unit_statements import commented_header
from ..preparation.atoms import MAX_ATOMS

#: C_p units accepted and their factor to J/(mol K) (J/(g K) also needs M).
CP_UNITS = {"J/(mol K)": 1.0, "J/(g K)": None, "cal/(mol K)": sc.calorie, "mJ/(mol K)": sc.milli}
_CP_PATTERN = re.compile(r"(mj|cal|j)/(mol/?k|k/?mol|g/?k|k/?g)")
_CELSIUS = re.compile(r"°c|degc|celsius|\(c\)|\[c\]|_c$")
#: Lowest and highest temperature accepted [K] (as for DOS tables: below 0.1 K no calorimeter
#: measures a solid's lattice term, above 10⁵ K no solid exists).
TEMPERATURE_RANGE_K = (0.1, 1e5)
#: Stiffest lattice considered [K]: no measured C_p lies below its Debye T³ law (diamond's θ_D is 2,230 K).
STIFFEST_K = 1e5
#: Room above 2 × 3nR for the electronic and anharmonic terms, per atom [J/(mol K²)]: C_p may reach
#: 2·3nR + n·ELECTRONIC_ROOM·T (γ of ordinary metals is 0.5-10 mJ/(mol K²), common practice).
ELECTRONIC_ROOM_J_PER_MOL_K2 = 0.05


@dataclass(frozen=True)
class MeasuredHeatCapacity:
    """Measured C_p(T), sorted by temperature, per mole of formula units.

    Attributes
    ----------
    temperature_K : numpy.ndarray
        Temperatures [K], > 0, strictly increasing.
    heat_capacity_J_per_mol_K : numpy.ndarray
        C_p [J/(mol K)].
    uncertainty_J_per_mol_K : numpy.ndarray or None
        Standard uncertainty of C_p [J/(mol K)], or None if not given.
    unit : str
        C_p unit the file was read in (a key of :data:`CP_UNITS`).
    source : str
        Display name of the input.
    sha256 : str
        SHA-256 of the raw bytes.
    notes : list of str
        What was assumed or changed while reading.
    """

    temperature_K: np.ndarray
    heat_capacity_J_per_mol_K: np.ndarray
    uncertainty_J_per_mol_K: np.ndarray | None
    unit: str
    source: str
    sha256: str = ""
    notes: list = field(default_factory=list)
    line_numbers: tuple = ()

    def restricted(self, low=None, high=None):
        """The points with ``low <= T <= high`` [K] (a new object)."""
        t = self.temperature_K
        keep = (t >= (-np.inf if low is None else low)) & (t <= (np.inf if high is None else high))
        if keep.sum() < 2:
            raise OptionError(f"the range {low}:{high} K holds {int(keep.sum())} measured point(s); need >= 2")
        sigma = None if self.uncertainty_J_per_mol_K is None else self.uncertainty_J_per_mol_K[keep]
        lines = tuple(np.asarray(self.line_numbers)[keep].tolist()) if len(self.line_numbers) else ()
        return MeasuredHeatCapacity(t[keep], self.heat_capacity_J_per_mol_K[keep], sigma, self.unit,
                                    self.source, self.sha256, list(self.notes), lines)


def heat_capacity_unit(text):
    """Canonical C_p unit named in a header cell or option, or None.

    Parameters
    ----------
    text : str
        ``"Cp (J/(mol K))"``, ``"heat_capacity_J_per_mol_K"``, ``"mJ/mol/K"``, ...

    Returns
    -------
    str or None
        A key of :data:`CP_UNITS`, or None when no unit is recognised.

    Raises
    ------
    OptionError
        A unit with kJ or kcal (not accepted, to avoid a silent factor 1000).

    Examples
    --------
    >>> heat_capacity_unit("heat_capacity_J_per_mol_K"), heat_capacity_unit("Cp [mJ mol-1 K-1]")
    ('J/(mol K)', 'mJ/(mol K)')
    >>> heat_capacity_unit("Cp") is None
    True
    """
    s = str(text).lower().replace("_per_", "/").replace(" per ", "/")
    s = re.sub(r"\^?-1|⁻¹", "-1", s)
    s = re.sub(r"(mol|k|g)-1", r"/\1", s)
    s = re.sub(r"[\s·.*()\[\]{}_]", "", s).replace("//", "/")
    m = _CP_PATTERN.search(s)
    if not m:
        return None
    if m.group(1) == "j" and s[max(0, m.start() - 1):m.start()] == "k" or "kcal/" in s:
        raise OptionError(f"heat-capacity unit in {str(text)!r} is not supported; "
                          f"give one of {', '.join(CP_UNITS)}")
    energy = {"mj": "mJ", "cal": "cal", "j": "J"}[m.group(1)]
    basis = "g" if "g" in m.group(2) else "mol"
    unit = f"{energy}/({basis} K)"
    if unit not in CP_UNITS:
        return None
    return unit


def _temperature_check(name, source):
    low = name.lower()
    if _CELSIUS.search(low.replace(" ", "")):
        raise DosInputError(f"temperature column {name!r} is in °C; give temperatures in K", source, None, 1)
    return bool(re.search(r"\(\s*k\s*\)|\[\s*k\s*\]|kelvin|_k$|\bk$", low))


def read_heat_capacity(source, cp_unit=None, formula=None, name=None):
    r"""Read measured C_p(T) [J/(mol K)] from a path, bytes or text.

    Parameters
    ----------
    source : str, pathlib.Path or bytes
        As :func:`thermo.io.readers.read_table`.
    cp_unit : str, optional
        C_p unit (overrides the header): J/(mol K), J/(g K), cal/(mol K),
        mJ/(mol K) in any common spelling.
    formula : str, optional
        Chemical formula of the formula unit; needed for J/(g K).
    name : str, optional
        Display name used in messages.

    Returns
    -------
    MeasuredHeatCapacity

    Raises
    ------
    DosInputError
        Malformed file, T <= 0, repeated T, C_p <= 0, uncertainty <= 0.
    OptionError
        Unknown unit, or J/(g K) without a formula.

    Notes
    -----
    :math:`C_p[\mathrm{J/(mol\,K)}] = f\,C_p[\mathrm{file}]` with
    f = 1, M [g/mol], 4.184, 10⁻³.  Rows are sorted by temperature.

    References
    ----------
    .. [1] IUPAC Green Book, 3rd ed. (2007), §7.2.

    Examples
    --------
    >>> m = read_heat_capacity("T,Cp (cal/(mol K))\n10,0.1\n20,0.8\n")
    >>> m.unit, round(float(m.heat_capacity_J_per_mol_K[1]), 4)
    ('cal/(mol K)', 3.3472)
    """
    try:
        raw = read_table(source, name)
    except DosInputError as exc:
        if "frequency, total DOS" not in exc.reason:
            raise
        raise DosInputError(exc.reason.replace("frequency, total DOS", "temperature, C_p"),
                            exc.source, exc.line, exc.column) from None
    where = raw.source
    notes = []
    check_heat_capacity_rows(raw.data.shape[0], where)
    width = raw.data.shape[1]
    if width > 3:
        notes.append(f"columns 4 to {width} ignored (only T, C_p and its uncertainty are read)")
    names = raw.names
    has_header = names[:2] != ["frequency", "total"]
    if not has_header:
        names = commented_header(raw.comments, width) or names
        has_header = names is not raw.names
    stated = heat_capacity_unit(names[1]) if has_header else None
    if cp_unit is not None:
        unit = heat_capacity_unit(cp_unit) or (cp_unit if cp_unit in CP_UNITS else None)
        if unit is None:
            raise OptionError(f"unknown heat-capacity unit {cp_unit!r}; choose one of {', '.join(CP_UNITS)}")
        if stated and stated != unit:
            notes.append(f"the header states {stated}; read as {unit} as requested")
    elif stated:
        unit = stated
    else:
        unit = "J/(mol K)"
        notes.append("no C_p unit stated in the header; read as J/(mol K)")
    if has_header:
        if not _temperature_check(names[0], where):
            notes.append("no temperature unit stated in the header; read as K")
    factor = CP_UNITS[unit]
    if factor is None:
        if not formula:
            raise OptionError("C_p in J/(g K) needs the chemical formula (molar mass) of the formula unit")
        from ..formula import formula_unit
        factor = formula_unit(formula)[0]
    t = raw.data[:, 0].astype(float)
    with np.errstate(over="ignore"):            # a unit factor times 1e308: not finite, refused below
        cp = raw.data[:, 1] * factor
        sigma = raw.data[:, 2] * factor if width >= 3 else None
    lines = raw.line_numbers or list(range(1, len(t) + 1))
    _check_values(t, cp, sigma, lines, where)
    order = np.argsort(t, kind="stable")
    if np.any(np.diff(order) < 0):
        notes.append("rows sorted by temperature")
    t, cp = t[order], cp[order]
    sigma = None if sigma is None else sigma[order]
    repeated = np.flatnonzero(np.diff(t) == 0)
    if repeated.size:
        line = lines[order[repeated[0] + 1]]
        raise DosInputError(f"temperature {t[repeated[0]]:g} K appears twice", where, line, 1)
    if t.size < 2:
        raise DosInputError(f"{t.size} measured point; need at least 2", where)
    return MeasuredHeatCapacity(t, cp, sigma, unit, where, raw.sha256, notes,
                                tuple(np.asarray(lines)[order].tolist()))


def _check_values(t, cp, sigma, lines, where):
    low, high = TEMPERATURE_RANGE_K
    with np.errstate(invalid="ignore", over="ignore"):
        most = heat_capacity_limit(np.clip(t, 0.0, high), MAX_ATOMS)
        least = 12 * np.pi ** 4 / 5 * sc.R * (np.clip(t, 0.0, high) / STIFFEST_K) ** 3
        checks = [(t <= 0, 1, "temperature must be > 0 K"),
                  (t < low, 1, f"temperature below {low:g} K; give temperatures in K from {low:g} K"),
                  (t > high, 1, f"temperature above {high:g} K; give temperatures in K"),
                  (~np.isfinite(cp), 2, "heat capacity is not a finite number"),
                  (cp <= 0, 2, "heat capacity must be > 0"),
                  (cp > most, 2, f"heat capacity above the largest possible for {MAX_ATOMS:,} atoms per formula "
                                 "unit; check the C_p unit"),
                  (cp < least, 2, f"heat capacity below the Debye T³ law of a solid with θ_D = {STIFFEST_K:g} K; "
                                  "check the C_p unit")]
        if sigma is not None:
            checks += [(~np.isfinite(sigma), 3, "uncertainty is not a finite number"),
                       (sigma <= 0, 3, "uncertainty must be > 0 (leave the column out if unknown)"),
                       (sigma > most, 3, "uncertainty above the largest possible heat capacity; check the unit"),
                       (sigma < 1e-9 * cp, 3, "uncertainty below 1e-9 of the value; leave the column out if unknown")]
    for bad, column, message in checks:
        if np.any(bad):
            k = int(np.flatnonzero(bad)[0])
            raise DosInputError(message, where, lines[k], column)


def heat_capacity_limit(temperatures, atoms):
    r"""Largest C_p accepted [J/(mol K)]: twice Dulong–Petit plus electronic room.

    Parameters
    ----------
    temperatures : array_like
        T [K].
    atoms : int
        Atoms per formula unit n.

    Returns
    -------
    numpy.ndarray
        :math:`2\cdot 3nR + n\,\gamma_{room}T` with
        :data:`ELECTRONIC_ROOM_J_PER_MOL_K2` as γ_room.

    Notes
    -----
    Common practice (no single source): a solid's C_p approaches 3nR
    (Dulong–Petit) and exceeds it by tens of per cent only near melting or at a
    transition; γT of a metal adds 0.5-10 mJ/(mol K²)·T per atom.

    Examples
    --------
    >>> round(float(heat_capacity_limit(300.0, 1)), 3)
    64.887
    """
    t = np.asarray(temperatures, dtype=float)
    return 6.0 * int(atoms) * sc.R + int(atoms) * ELECTRONIC_ROOM_J_PER_MOL_K2 * t


def check_heat_capacity_scale(measured, atoms):
    r"""Refuse measured C_p above :func:`heat_capacity_limit`, naming the unit the numbers were likely in.

    Parameters
    ----------
    measured : MeasuredHeatCapacity
    atoms : int
        Atoms per formula unit.

    Raises
    ------
    DosInputError
        One line: the file, line, the value, the limit for n atoms and the
        likely unit (a C_p unit of :data:`CP_UNITS` under which every value
        is plausible), or more atoms per formula unit.

    Examples
    --------
    >>> m = read_heat_capacity("T,Cp\n100,12000\n200,20000\n", name="cp.csv")
    >>> check_heat_capacity_scale(m, 1)
    Traceback (most recent call last):
    ...
    thermo.errors.DosInputError: cp.csv, line 3, column 2: C_p = 2e+04 J/(mol K) at 200 K is above twice the Dulong-Petit value plus electronic room (59.9 J/(mol K) for 1 atom per formula unit): the numbers are likely in mJ/(mol K) (give the unit in the header or as an option), or the formula unit has more atoms
    """
    t, cp = measured.temperature_K, measured.heat_capacity_J_per_mol_K
    limit = heat_capacity_limit(t, atoms)
    ratio = cp / limit
    if not np.any(ratio > 1.0):
        return
    k = int(np.argmax(ratio))
    read = CP_UNITS.get(measured.unit) or 1.0
    likely = [u for u, f in CP_UNITS.items() if f is not None and u != measured.unit
              and np.all(cp * f / read <= limit) and np.max(cp * f / read / limit) > 0.05]
    hint = (f"the numbers are likely in {likely[0]} (give the unit in the header or as an option), or "
            if likely else "check the C_p unit, or whether ")
    line = measured.line_numbers[k] if len(measured.line_numbers) else None
    raise DosInputError(f"C_p = {cp[k]:.4g} J/(mol K) at {t[k]:g} K is above twice the Dulong-Petit value plus "
                        f"electronic room ({limit[k]:.3g} J/(mol K) for {int(atoms)} atom"
                        f"{'' if int(atoms) == 1 else 's'} per formula unit): {hint}the formula unit has more atoms",
                        measured.source, line, 2)
