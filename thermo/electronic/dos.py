r"""The electronic DOS object and its preparation: units, Fermi level, spin sum, per formula unit, checks.

An :class:`ElectronicDOS` holds a spin-summed DOS per formula unit on energies
relative to the Fermi level, piecewise linear between the tabulated points
and zero outside them.  :func:`load_electronic_dos` makes one from a file
(through :func:`thermo.io.electronic_dos.read_electronic_table`);
:func:`make_electronic_dos` from arrays.

References
----------
.. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Holt, Rinehart and
   Winston, 1976), ch. 2 and 8.

Examples
--------
>>> d = make_electronic_dos([-2.0, 0.0, 2.0], [1.0, 1.5, 2.0])
>>> d.electrons_below_fermi, float(d.dos_at(0.0)), d.gap_ev
(2.5, 1.5, None)
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

import numpy as np

from ..errors import DosInputError, OptionError
from ..io.electronic_dos import read_electronic_table
from ..unit_names import ELECTRON_ENERGY_UNITS
from ..units import ELECTRON_ENERGY_EV, canonical_energy_unit

#: Largest |E − E_F| accepted [eV].
MAX_ENERGY_EV = 1.0e4
#: Largest DOS accepted [states/eV per formula unit].
MAX_DOS_PER_EV = 1.0e6
#: Negative DOS values down to this share of the largest value are set to 0 with a warning; below, refused.
NEGATIVE_TOLERANCE = 1.0e-3
#: Spin choices: None (from the column names), "summed" (columns already spin-summed), "pair" (2 and 3 = up, down).
SPIN_CHOICES = (None, "summed", "pair")

_UP = re.compile(r"(?:^|[^a-z])(?:up|spin\s*up|majority|maj)(?:$|[^a-z])|↑", re.IGNORECASE)
_DOWN = re.compile(r"(?:^|[^a-z])(?:down|dn|spin\s*down|minority)(?:$|[^a-z])|↓", re.IGNORECASE)


@dataclass(frozen=True)
class ElectronicDOS:
    """A spin-summed electronic DOS per formula unit, on energies relative to the Fermi level.

    Attributes
    ----------
    energies_ev : numpy.ndarray, shape (K,)
        E − E_F [eV], strictly increasing.
    dos_per_ev : numpy.ndarray, shape (K,)
        g(E) [states/eV per formula unit, both spins], ≥ 0.
    partials : dict of str to numpy.ndarray
        Projected DOS columns on the same energies [states/eV per formula unit].
    electrons_below_fermi : float
        :math:`\\int_{E_{min}}^{E_F} g\\,dE`: electrons per formula unit in the tabulated states below E_F.
    gap_ev : tuple of float or None
        (lower, upper) edge [eV] of the gap holding E_F, None for a metal.
    fermi_energy_ev : float or None
        The absolute Fermi energy subtracted [eV], None when the energies were relative.
    source : dict
        ``name``, ``sha256``, ``energy_unit``, ``spin``, ``formula_units``, ``sheet``, ``fermi_energy_from``.
    warnings : tuple of str
        What was done to the input and by how much (clipped values, gap).
    notes : tuple of str
        How the file was read (spin columns summed, Fermi energy subtracted).
    """

    energies_ev: np.ndarray
    dos_per_ev: np.ndarray
    partials: dict
    electrons_below_fermi: float
    gap_ev: tuple | None
    fermi_energy_ev: float | None = None
    source: dict = field(default_factory=dict)
    warnings: tuple = ()
    notes: tuple = ()

    def dos_at(self, energy_ev):
        """g at energies relative to E_F [states/eV per formula unit], linear between points, 0 outside."""
        return np.interp(energy_ev, self.energies_ev, self.dos_per_ev, left=0.0, right=0.0)

    @property
    def ground_state_potential_ev(self) -> float:
        """μ at 0 K relative to E_F [eV]: 0 for a metal, the middle of the gap when E_F lies in one."""
        return 0.0 if self.gap_ev is None else 0.5 * (self.gap_ev[0] + self.gap_ev[1])

    @property
    def dos_at_fermi_level(self) -> float:
        """g(E_F) [states/eV per formula unit]."""
        return float(self.dos_at(0.0))


def states_up_to(energies, dos, top):
    """∫ g dE from the first energy to ``top`` for a piecewise-linear g [states] (exact)."""
    e = np.asarray(energies, dtype=float)
    g = np.asarray(dos, dtype=float)
    keep = e < top
    x = np.append(e[keep], top) if keep.any() else np.array([top, top])
    y = np.interp(x, e, g, left=0.0, right=0.0)
    return float(np.sum(np.diff(x) * (y[1:] + y[:-1]) / 2))


def _gap(e, g, source):
    pos = np.flatnonzero(g > 0)
    below, above = pos[e[pos] < 0], pos[e[pos] > 0]
    if below.size == 0:
        raise DosInputError("no states below the Fermi level: the table must reach below E_F "
                            "(are the energies absolute? state '# Fermi energy: … eV')", source)
    if above.size == 0:
        raise DosInputError("no states above the Fermi level: the table must extend above E_F", source)
    if np.interp(0.0, e, g) > 0:
        return None
    low = e[below.max() + 1]
    high = e[above.min() - 1]
    return (float(low), float(high)) if high > low else None


def make_electronic_dos(energies_ev, dos_per_ev, partials=None, fermi_energy_ev=None, source=None,
                        warnings=(), notes=()):
    r"""A checked :class:`ElectronicDOS` from arrays on energies relative to E_F.

    Parameters
    ----------
    energies_ev : array_like, shape (K,)
        E − E_F [eV], strictly increasing, K ≥ 2.
    dos_per_ev : array_like, shape (K,)
        Spin-summed DOS [states/eV per formula unit], ≥ 0.
    partials : dict, optional
        Projected columns on the same energies.
    fermi_energy_ev : float, optional
        Absolute Fermi energy already subtracted (recorded only) [eV].
    source : dict, optional
        Provenance (name, sha256, options).
    warnings, notes : sequence of str
        Carried to the object.

    Returns
    -------
    ElectronicDOS

    Raises
    ------
    DosInputError
        Energies not increasing, non-finite or out-of-range values, negative
        DOS, or no states on one side of E_F.

    Examples
    --------
    >>> d = make_electronic_dos([-3.0, -1.0, -0.5, 0.5, 1.0, 3.0], [1, 1, 0, 0, 1, 1])
    >>> d.gap_ev, d.ground_state_potential_ev
    ((-0.5, 0.5), 0.0)
    """
    src = dict(source or {})
    name = src.get("name") or "<electronic DOS>"
    e = np.asarray(energies_ev, dtype=float).ravel()
    g = np.asarray(dos_per_ev, dtype=float).ravel()
    if e.size < 2 or e.size != g.size:
        raise DosInputError(f"an electronic DOS needs at least 2 points with one DOS value each "
                            f"(got {e.size} energies, {g.size} values)", name)
    if not (np.all(np.isfinite(e)) and np.all(np.isfinite(g))):
        raise DosInputError("energies and DOS must be finite numbers", name)
    if np.any(np.abs(e) > MAX_ENERGY_EV):
        raise DosInputError(f"energies reach {np.abs(e).max():.3g} eV from E_F; at most {MAX_ENERGY_EV:g} eV "
                            "are accepted (is the energy unit right?)", name)
    if np.any(np.diff(e) <= 0):
        k = int(np.argmax(np.diff(e) <= 0))
        raise DosInputError(f"energies must increase strictly: point {k + 2} ({e[k + 1]:g} eV) does not "
                            f"exceed point {k + 1} ({e[k]:g} eV)", name)
    if np.any(g < 0):
        raise DosInputError(f"the DOS is negative ({g.min():g} states/eV) at E − E_F = {e[np.argmin(g)]:g} eV",
                            name)
    if g.max() > MAX_DOS_PER_EV:
        raise DosInputError(f"the DOS reaches {g.max():.3g} states/eV; at most {MAX_DOS_PER_EV:g} are accepted "
                            "(is the energy unit right?)", name)
    gap = _gap(e, g, name)
    warns = list(warnings)
    if gap is not None:
        warns.append(f"the Fermi level lies in a gap from {gap[0]:+.4g} to {gap[1]:+.4g} eV "
                     f"({gap[1] - gap[0]:.4g} eV wide): the electronic terms are exponentially small at low "
                     "temperature; μ at 0 K is taken in the middle of the gap")
    parts = {str(k): np.asarray(v, dtype=float).ravel() for k, v in (partials or {}).items()}
    return ElectronicDOS(e, g, parts, states_up_to(e, g, 0.0), gap, fermi_energy_ev, src, tuple(warns),
                         tuple(notes))


def _spin_mode(names, width, spin, named):
    if spin not in SPIN_CHOICES:
        raise OptionError(f"spin must be 'summed' or 'pair' (or not given), not {spin!r}")
    if spin is not None:
        if spin == "pair" and width < 2:
            raise OptionError("spin 'pair' needs two DOS columns (spin up, spin down)")
        return spin
    if named and width >= 2 and _UP.search(names[0]) and _DOWN.search(names[1]):
        return "pair"
    return "summed"


def _columns(table, spin_mode):
    """(total, partials, notes) with spin pairs summed; down columns written as negative numbers flipped."""
    cols = table.columns
    names = table.names[1:]
    notes = []
    flipped = []

    def magnitude(k):
        col = cols[:, k]
        if np.all(col <= 0) and np.any(col < 0):
            flipped.append(names[k])
            return -col
        return col
    if spin_mode == "pair":
        total = magnitude(0) + magnitude(1)
        notes.append(f"columns {names[0]!r} and {names[1]!r} read as spin up and spin down and summed into "
                     "the total DOS")
        rest = list(range(2, cols.shape[1]))
        parts = {}
        while rest:
            k = rest.pop(0)
            if rest and _UP.search(names[k]) and _DOWN.search(names[rest[0]]):
                j = rest.pop(0)
                stem = _UP.sub(" ", names[k]).strip(" _-") or names[k]
                parts[stem] = magnitude(k) + magnitude(j)
            else:
                parts[names[k]] = magnitude(k)
    else:
        total = cols[:, 0]
        parts = {names[k]: cols[:, k] for k in range(1, cols.shape[1])}
    if flipped:
        notes.append("spin-down columns written as negative numbers were read by magnitude: "
                     + ", ".join(repr(n) for n in flipped))
    return total, parts, notes


def _clip_negative(table, total, parts, source):
    """Tiny negative values (smearing, interpolation) set to 0 with a warning; larger ones refused."""
    scale = float(np.max(total)) if total.size else 0.0
    warnings = []
    for name, col in [("total", total)] + list(parts.items()):
        if not np.any(col < 0):
            continue
        k = int(np.argmin(col))
        if col[k] < -NEGATIVE_TOLERANCE * scale:
            column = table.names.index(name) + 1 if name in table.names else 2
            raise DosInputError(f"negative DOS {col[k]:g} in column {name!r}", source,
                                table.line_numbers[k] if table.line_numbers else None, column)
        warnings.append(f"{int(np.sum(col < 0))} negative values of column {name!r} (down to {col[k]:.3g}, "
                        f"below {NEGATIVE_TOLERANCE:g} of the largest DOS) set to 0")
        col[col < 0] = 0.0
    return warnings


def load_electronic_dos(source, energy_unit=None, fermi_energy_ev=None, spin=None, formula_units=None,
                        name=None, sheet=None):
    r"""Read an electronic DOS file and prepare it: eV, relative to E_F, spin-summed, per formula unit.

    Parameters
    ----------
    source : str, pathlib.Path or bytes
        File path, raw bytes, or the text itself.
    energy_unit : {'eV', 'meV', 'Ry', 'Ha'}, optional
        Unit of the energy column (default: as the file states; never guessed).
        DOS columns are in states per this unit.
    fermi_energy_ev : float, optional
        Absolute Fermi energy [eV]; energies are then absolute and E_F is
        subtracted.  Default: the file's ``# Fermi energy: …`` statement,
        else the energies are taken as relative to E_F.
    spin : {None, 'summed', 'pair'}
        None: columns 2 and 3 are summed when their names say spin up and
        down; 'summed': the columns are already spin-summed; 'pair':
        columns 2 and 3 are up and down whatever their names.
    formula_units : float, optional
        Formula units in the cell the DOS is given for (the DOS is divided by
        it; default 1).
    name : str, optional
        Display name for messages.
    sheet : str or int, optional
        Worksheet of an ``.xlsx`` workbook.

    Returns
    -------
    ElectronicDOS

    Raises
    ------
    DosInputError
        Unreadable input, no energy unit, bad values (one line with file,
        line and column where known).
    OptionError
        Bad option values.

    Examples
    --------
    >>> text = "# Fermi energy: 5.0 eV\nE(eV) up down\n3.0 0.5 -0.5\n5.0 1.0 -1.0\n7.0 1.0 -1.0\n"
    >>> d = load_electronic_dos(text)
    >>> d.energies_ev.tolist(), d.dos_per_ev.tolist(), d.electrons_below_fermi
    ([-2.0, 0.0, 2.0], [1.0, 2.0, 2.0], 3.0)
    """
    table = read_electronic_table(source, name=name, sheet=sheet)
    src = table.source
    if energy_unit is not None:
        unit = canonical_energy_unit(energy_unit)
    elif table.energy_unit is not None:
        unit = table.energy_unit
    else:
        raise DosInputError("the energy unit is not stated in the file; write it in the first header cell "
                            "('E-E_F (eV)') or a line '# energy unit: eV', or set the energy unit option to one "
                            "of " + ", ".join(ELECTRON_ENERGY_UNITS), src)
    steps = np.diff(table.energies)
    if np.any(steps <= 0):
        k = int(np.argmax(steps <= 0)) + 1
        raise DosInputError(f"energies must increase strictly; {table.energies[k]:g} follows "
                            f"{table.energies[k - 1]:g}", src, table.line_numbers[k] if table.line_numbers else None, 1)
    notes = []
    if energy_unit is not None and table.energy_unit not in (None, unit):
        notes.append(f"the file states {table.energy_unit} but {unit} was chosen; using {unit}")
    ev = ELECTRON_ENERGY_EV[unit]
    count = 1.0 if formula_units is None else float(formula_units)
    if not (np.isfinite(count) and count > 0):
        raise OptionError(f"formula units per cell must be a positive number, not {formula_units!r}")
    mode = _spin_mode(table.names[1:], table.columns.shape[1], spin, table.named)
    total, parts, spin_notes = _columns(table, mode)
    notes += spin_notes
    warnings = _clip_negative(table, total, parts, src)
    fermi, origin = None, "relative energies"
    if fermi_energy_ev is not None:
        fermi, origin = float(fermi_energy_ev), "option"
        if table.fermi_energy is not None:
            stated = table.fermi_energy * ELECTRON_ENERGY_EV[table.fermi_unit]
            if abs(stated - fermi) > 1e-9 * max(1.0, abs(fermi)):
                notes.append(f"the file states a Fermi energy of {stated:g} eV; the given {fermi:g} eV is used")
    elif table.fermi_energy is not None:
        fermi, origin = table.fermi_energy * ELECTRON_ENERGY_EV[table.fermi_unit], "file"
    energies = table.energies * ev - (fermi or 0.0)
    if fermi is not None:
        notes.append(f"energies are absolute; the Fermi energy {fermi:g} eV ({origin}) is subtracted")
    if not energies[0] < 0.0 < energies[-1]:
        hint = "" if fermi is not None else ("; if the energies are absolute, state '# Fermi energy: … eV' "
                                             "or give the Fermi energy option")
        raise DosInputError(f"the Fermi level lies outside the tabulated energies {energies[0]:g} … "
                            f"{energies[-1]:g} eV (relative to E_F){hint}", src)
    if count != 1.0:
        notes.append(f"DOS divided by {count:g} formula units per cell")
    scale = 1.0 / (ev * count)
    source_info = {"name": src, "sha256": table.sha256, "energy_unit": unit, "spin": mode,
                   "formula_units": count, "sheet": table.sheet, "fermi_energy_from": origin}
    return make_electronic_dos(energies, total * scale, {k: v * scale for k, v in parts.items()}, fermi,
                               source_info, warnings, notes)
