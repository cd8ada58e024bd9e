r"""A phase given by a table of G(T): a quasi-harmonic table or a calorimetry table, as modeheat writes them.

A quasi-harmonic table (``modeheat quasiharmonic``) carries G(T) at its pressure and S(T); a
calorimetry table (``modeheat calorimetry --format csv``) carries the third-law S°(T) and
H°(T) − H°(0) from the measured data, whence G − H°(0) = (H° − H°(0)) − T S°.  Either becomes
the source of a :class:`~thermo.phases.Phase` of the fixed kind (no pressure axis), compared
with DOS phases and other tables at the table's temperatures and between them.

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), § 2.
.. [2] F. N. Fritsch and R. E. Carlson, "Monotone piecewise cubic interpolation",
   SIAM J. Numer. Anal. 17, 238–246 (1980) (cubic Hermite interpolation).
"""

from __future__ import annotations

import hashlib
from dataclasses import dataclass

import numpy as np
from scipy import constants as sc
from scipy.interpolate import CubicHermiteSpline

from ..columns import error_column_for, find, lookup
from ..errors import OptionError

#: J/mol per eV (per formula unit).
_J_PER_MOL_PER_EV = sc.N_A * sc.electron_volt


@dataclass(frozen=True)
class TabulatedPhase:
    """G(T) and S(T) of one phase per formula unit, read from a table.

    Attributes
    ----------
    name : str
        The table's file name.
    kind : str
        What the table is (``quasi-harmonic table`` or ``calorimetry table``).
    temperatures_k : numpy.ndarray, shape (M,)
        Temperatures of the rows [K], ascending.
    gibbs_ev, gibbs_error_ev : numpy.ndarray, shape (M,)
        G per formula unit and its estimated error [eV] (a calorimetry table: G − H°(0)).
    entropy_ev_per_k : numpy.ndarray, shape (M,)
        S per formula unit [eV/K].
    atoms : int or None
        Atoms per formula unit the table states (None: not stated).
    sha256 : str
        SHA-256 of the table's bytes.
    warnings : tuple of str
        What was done to the table (rows left out, the energy zero).
    """

    name: str
    kind: str
    temperatures_k: np.ndarray
    gibbs_ev: np.ndarray
    gibbs_error_ev: np.ndarray
    entropy_ev_per_k: np.ndarray
    atoms: int | None
    sha256: str
    warnings: tuple = ()
    #: Marks a table source for :func:`thermo.phases.phase_curves`.
    tabulated = True

    def values(self, temperatures):
        r"""G, S and the error of G per formula unit at ``temperatures`` [eV, eV/K, eV].

        Notes
        -----
        G is the cubic Hermite interpolant of the rows with slopes
        :math:`\partial G/\partial T = -S` [2]_, S its negative derivative.  The
        error is the table's own (linear between rows) plus the interpolation
        part :math:`|G_{Hermite} - G_{linear}|`, an over-estimate of the
        interpolation error (zero on the rows).

        References
        ----------
        .. [2] Fritsch and Carlson, SIAM J. Numer. Anal. 17, 238 (1980).

        Examples
        --------
        >>> t = np.array([0.0, 100.0, 200.0])
        >>> tab = TabulatedPhase("x", "test", t, -0.5 * t**2 / 1e4, np.zeros(3), t / 1e4, 1, "")
        >>> g, s, u = tab.values([150.0])
        >>> round(float(g[0]), 6), round(float(s[0]), 6)
        (-1.125, 0.015)
        """
        t = np.atleast_1d(np.asarray(temperatures, dtype=float))
        low, high = self.temperatures_k[0], self.temperatures_k[-1]
        outside = (t < low - 1e-9) | (t > high + 1e-9)
        if outside.any():
            raise OptionError(f"phase table {self.name}: its rows cover {low:g}–{high:g} K, "
                              f"{t[outside][0]:g} K is outside; choose temperatures inside")
        spline = CubicHermiteSpline(self.temperatures_k, self.gibbs_ev, -self.entropy_ev_per_k)
        g = spline(t)
        linear = np.interp(t, self.temperatures_k, self.gibbs_ev)
        error = np.interp(t, self.temperatures_k, self.gibbs_error_ev) + np.abs(g - linear)
        return g, -spline.derivative()(t), error


def _energy_ev(table, name):
    """A column of energies (kJ/mol per formula unit, or meV per atom) in eV per formula unit (or per atom)."""
    column = lookup(name)
    if column.basis == "gram":
        raise OptionError(f"column {name}: a table per gram cannot be a phase; export it per formula unit")
    factor = sc.kilo / _J_PER_MOL_PER_EV if column.basis == "formula" else 1e-3
    return table[name].to_numpy(dtype=float) * factor


def _entropy_ev_per_k(table, name):
    """A column of entropies (J/(mol K) per formula unit, or k_B per atom) in eV/K per formula unit (or per atom)."""
    column = lookup(name)
    if column.basis == "gram":
        raise OptionError(f"column {name}: a table per gram cannot be a phase; export it per formula unit")
    factor = 1.0 / _J_PER_MOL_PER_EV if column.basis == "formula" else sc.k / sc.electron_volt
    return table[name].to_numpy(dtype=float) * factor


def _error(table, name, convert):
    err = error_column_for(table, name)
    return np.zeros(len(table)) if err is None else convert(table, err)


def _columns(table):
    """``(kind, basis, G, u(G), S)`` of a table, the columns found by quantity (column schema)."""
    keys = {lookup(n).quantity.key: n for n in table.columns if _known(n)}
    if "gibbs_energy" in keys and "entropy" in keys:
        g, s = keys["gibbs_energy"], keys["entropy"]
        return ("quasi-harmonic table", lookup(s).basis, _energy_ev(table, g), _error(table, g, _energy_ev),
                _entropy_ev_per_k(table, s))
    if "enthalpy_from_zero" in keys and "entropy_third_law" in keys:
        h, s = keys["enthalpy_from_zero"], keys["entropy_third_law"]
        t = table[find(table, "temperature")].to_numpy(dtype=float)
        entropy = _entropy_ev_per_k(table, s)
        u_h = _energy_ev(table, keys["enthalpy_from_zero_error"]) if "enthalpy_from_zero_error" in keys else 0.0
        u_s = _entropy_ev_per_k(table, keys["entropy_third_law_error"]) if "entropy_third_law_error" in keys else 0.0
        # G − H°(0) = (H° − H°(0)) − T S°; the errors add linearly (never smaller than the real one)
        return ("calorimetry table", lookup(s).basis, _energy_ev(table, h) - t * entropy,
                np.abs(u_h) + t * np.abs(u_s), entropy)
    raise OptionError("the table has neither G and S (a quasi-harmonic table) nor H° − H°(0) and S° "
                      "(a calorimetry table): it cannot be a phase")


def _known(name):
    try:
        lookup(name)
    except OptionError:
        return False
    return True


def tabulated_phase(table, provenance=None, name="table", sha256=""):
    """The :class:`TabulatedPhase` of an exported table (read back by :mod:`thermo.io.readback`).

    Parameters
    ----------
    table : pandas.DataFrame
        A quasi-harmonic table (G and S) or a calorimetry table (H° − H°(0) and S°), per formula
        unit or per atom.
    provenance : dict, optional
        Its provenance record (``atoms`` is read from it).
    name : str
        The table's file name.
    sha256 : str
        SHA-256 of its bytes.

    Returns
    -------
    TabulatedPhase

    Raises
    ------
    OptionError
        Neither kind of table, per gram, a per-atom table without an atom count, fewer than two
        usable rows.

    Notes
    -----
    Rows with a missing G or S (a quasi-harmonic row without a minimum) are left out and said
    in the warnings.  Per atom, values are multiplied by the stated atoms per formula unit.

    Examples
    --------
    >>> import pandas as pd
    >>> t = pd.DataFrame({"temperature_K": [0.0, 100.0], "gibbs_energy_kJ_per_mol": [-96.485, -97.0],
    ...                   "entropy_J_per_mol_K": [0.0, 10.0]})
    >>> round(float(tabulated_phase(t, {"atoms": 1}).gibbs_ev[0]), 4)
    -1.0
    """
    from ..provenance import stated_atoms
    atoms = stated_atoms(provenance)
    kind, basis, g, u, s = _columns(table)
    if basis == "atom":
        if atoms is None:
            raise OptionError(f"{name}: a table per atom needs its atoms per formula unit (not stated in it)")
        g, u, s = g * atoms, u * atoms, s * atoms
    t = table[find(table, "temperature")].to_numpy(dtype=float)
    keep = np.isfinite(t) & np.isfinite(g) & np.isfinite(s)
    notes = []
    if not keep.all():
        notes.append(f"{name}: {int((~keep).sum())} of {t.size} rows without G or S left out")
    t, g, u, s = t[keep], g[keep], np.nan_to_num(u[keep], nan=0.0), s[keep]
    order = np.argsort(t, kind="stable")
    t, g, u, s = t[order], g[order], u[order], s[order]
    if t.size < 2 or np.any(np.diff(t) <= 0):
        raise OptionError(f"{name}: a phase table needs two or more rows at distinct temperatures")
    if kind == "calorimetry table":
        notes.append(f"{name}: G is counted from the phase's own H°(0) = static + zero-point energy; give that "
                     "energy as the phase's static energy to compare it with other phases")
    return TabulatedPhase(name, kind, t, g, u, s, atoms, sha256, tuple(notes))


def read_phase_table(source, name=None):
    """The :class:`TabulatedPhase` of a CSV table modeheat wrote (path or bytes).

    Examples
    --------
    >>> text = b"# atoms: 1\\ntemperature_K,gibbs_energy_kJ_per_mol,entropy_J_per_mol_K\\n0,0,0\\n10,-0.01,1\\n"
    >>> read_phase_table(text, "g.csv").kind
    'quasi-harmonic table'
    """
    from pathlib import Path

    from ..io.readback import read_exported_csv
    raw = source if isinstance(source, bytes) else Path(source).read_bytes()
    table, provenance = read_exported_csv(raw)
    label = name or (Path(source).name if not isinstance(source, bytes) else "table")
    return tabulated_phase(table, provenance, label, hashlib.sha256(raw).hexdigest())


def is_phase_table(head):
    """True when a file's first bytes are a modeheat export (``# tool: modeheat`` first).

    Examples
    --------
    >>> is_phase_table(b"# tool: modeheat\\n# version: 0.3.0\\n")
    True
    """
    text = head.decode("utf-8-sig", errors="replace") if isinstance(head, bytes) else str(head)
    return text.lstrip().startswith("# tool: modeheat")

