"""Read measured heat capacity C_p(T) (text, CSV or .xlsx) per mole of formula units.

The file is sniffed by the DOS reader :func:`thermo.io.readers.read_table`
(delimiters, comment lines, header row, ``.xlsx``); this module only gives
the columns their meaning and units:

* column 1: temperature [K];
* column 2: C_p in J/(mol K), J/(g K) (needs the chemical formula),
  cal/(mol K) (thermochemical calorie, 4.184 J) or mJ/(mol K);
* column 3 (optional): the standard uncertainty of C_p, same unit.

The C_p unit comes from the option, else from the header (``Cp (J/(mol K))``,
``heat_capacity_J_per_mol_K``, ``Cp [mJ/mol/K]`` ...), else J/(mol K) with a
note.  Every problem raises :class:`thermo.errors.DosInputError` with one line
naming the file, line and column.

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
from ..io.readers import read_table

#: C_p units accepted and their factor to J/(mol K) (J/(g K) also needs M).
CP_UNITS = {"J/(mol K)": 1.0, "J/(g K)": None, "cal/(mol K)": sc.calorie, "mJ/(mol K)": sc.milli}
_CP_PATTERN = re.compile(r"(mj|cal|j)/(mol/?k|k/?mol|g/?k|k/?g)")
_CELSIUS = re.compile(r"°c|degc|celsius|\(c\)|\[c\]|_c$")


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

    def restricted(self, low=None, high=None):
        """The points with ``low <= T <= high`` [K] (a new object)."""
        t = self.temperature_K
        keep = (t >= (-np.inf if low is None else low)) & (t <= (np.inf if high is None else high))
        if keep.sum() < 2:
            raise OptionError(f"the range {low}:{high} K holds {int(keep.sum())} measured point(s); need >= 2")
        sigma = None if self.uncertainty_J_per_mol_K is None else self.uncertainty_J_per_mol_K[keep]
        return MeasuredHeatCapacity(t[keep], self.heat_capacity_J_per_mol_K[keep], sigma, self.unit,
                                    self.source, self.sha256, list(self.notes))


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
    width = raw.data.shape[1]
    if width > 3:
        notes.append(f"columns 4 to {width} ignored (only T, C_p and its uncertainty are read)")
    has_header = raw.names[:2] != ["frequency", "total"]
    stated = heat_capacity_unit(raw.names[1]) if has_header else None
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
        if not _temperature_check(raw.names[0], where):
            notes.append("no temperature unit stated in the header; read as K")
    factor = CP_UNITS[unit]
    if factor is None:
        if not formula:
            raise OptionError("C_p in J/(g K) needs the chemical formula (molar mass) of the formula unit")
        from ..formula import formula_unit
        factor = formula_unit(formula)[0]
    t = raw.data[:, 0].astype(float)
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
    return MeasuredHeatCapacity(t, cp, sigma, unit, where, raw.sha256, notes)


def _check_values(t, cp, sigma, lines, where):
    checks = [(t <= 0, 1, "temperature must be > 0 K"), (cp <= 0, 2, "heat capacity must be > 0")]
    if sigma is not None:
        checks.append((sigma <= 0, 3, "uncertainty must be > 0 (leave the column out if unknown)"))
    for bad, column, message in checks:
        if np.any(bad):
            k = int(np.flatnonzero(bad)[0])
            raise DosInputError(message, where, lines[k], column)
