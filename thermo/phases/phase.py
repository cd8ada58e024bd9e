r"""One phase of a comparison and its Gibbs (or Helmholtz) energy per atom.

A phase is a DOS at fixed volume (harmonic) or a volume set (quasi-harmonic),
a name, its static energy per formula unit and its atoms per formula unit;
optionally the uncertainty of the static energy and, for a harmonic phase, an
electronic DOS.  :func:`phase_curves` turns it into G(T, p) per atom with its
entropy, volume and estimated error, all in eV, eV/K and Å³ per atom.

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §§ 2, 4.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from scipy import constants as sc

from ..errors import OptionError

#: eV per unit of a static energy (CODATA via scipy.constants); kJ/mol is per mole of formula units.
ENERGY_UNITS = {
    "eV": 1.0,
    "kJ/mol": sc.kilo / (sc.N_A * sc.electron_volt),
    "Ry": sc.physical_constants["Rydberg constant times hc in eV"][0],
    "Ha": sc.physical_constants["Hartree energy in eV"][0],
}
#: J/mol per eV (per formula unit or per atom).
J_PER_MOL_PER_EV = sc.N_A * sc.electron_volt


def energy_in_ev(value, unit="eV"):
    """An energy given in ``unit`` (eV, kJ/mol, Ry, Ha) in eV per formula unit.

    Examples
    --------
    >>> round(energy_in_ev(96.485332, "kJ/mol"), 6)
    1.0
    """
    if unit not in ENERGY_UNITS:
        raise OptionError(f"unknown energy unit {unit!r}; choose {', '.join(ENERGY_UNITS)}")
    return float(value) * ENERGY_UNITS[unit]


@dataclass(frozen=True)
class Phase:
    """A phase to compare.

    Attributes
    ----------
    name : str
        Name shown in tables and transitions.
    source : PhononDOS, VolumeSet or TabulatedPhase
        DOS at fixed volume (harmonic), volume set (quasi-harmonic) or a table of G(T)
        (:mod:`thermo.phases.tabulated`, compared as DOS phases are: no pressure axis).
    static_ev : float
        Static (0 K, no zero-point) energy per formula unit of this phase [eV];
        for a volume set, added to its own energies (0: the manifest's).
    atoms : int
        Atoms per formula unit of this phase.
    static_uncertainty_ev : float
        Uncertainty of the static energy per formula unit [eV] (user given).
    electronic : ElectronicDOS or None
        Electronic DOS per formula unit (harmonic phases; a volume set carries
        its own through the manifest).
    inputs : tuple of dict
        Provenance records of the files this phase was read from.
    """

    name: str
    source: object
    static_ev: float = 0.0
    atoms: int | None = None
    static_uncertainty_ev: float = 0.0
    electronic: object = None
    inputs: tuple = field(default_factory=tuple)

    def __post_init__(self):
        if not str(self.name).strip():
            raise OptionError("a phase needs a name")
        atoms = self.atoms if self.atoms is not None else self.source_atoms
        if atoms is None or int(atoms) != atoms or atoms < 1:
            raise OptionError(f"phase {self.name}: atoms per formula unit must be a whole number >= 1, not {atoms}")
        object.__setattr__(self, "atoms", int(atoms))
        for what, value in (("static energy", self.static_ev), ("static uncertainty", self.static_uncertainty_ev)):
            if not np.isfinite(value):
                raise OptionError(f"phase {self.name}: the {what} must be a finite number")
        if self.static_uncertainty_ev < 0:
            raise OptionError(f"phase {self.name}: the static uncertainty must be >= 0")
        if getattr(self.source, "tabulated", False) and self.electronic is not None:
            raise OptionError(f"phase {self.name}: a table carries its own G; an electronic DOS cannot be added to it")
        if self.quasiharmonic and self.electronic is not None:
            raise OptionError(f"phase {self.name}: give the electronic DOS of a volume set in its manifest "
                              "(column electronic_dos_file), so that F_el follows the volume")
        if self.source_atoms is not None and self.source_atoms != self.atoms:
            raise OptionError(f"phase {self.name}: {self.atoms} atoms per formula unit given, but its DOS holds "
                              f"{self.source_atoms} (3N = {3 * self.source_atoms} modes); give the DOS per formula "
                              "unit of this phase")

    @property
    def quasiharmonic(self) -> bool:
        """True for a volume set."""
        return hasattr(self.source, "volumes_a3")

    @property
    def source_atoms(self):
        """Atoms per formula unit of the DOS (or volume set)."""
        return getattr(self.source, "atoms", None)


@dataclass(frozen=True)
class Curves:
    """G(T, p) of one phase per atom on a grid, with what the crossings need.

    Attributes
    ----------
    temperatures_k : numpy.ndarray, shape (M,)
    pressures_gpa : numpy.ndarray, shape (P,)
        ``[nan]`` for a harmonic phase (fixed volume, no pressure).
    gibbs_ev, gibbs_error_ev : numpy.ndarray, shape (P, M)
        G (F for a harmonic phase) and its estimated error [eV/atom].
    entropy_ev_per_k : numpy.ndarray, shape (P, M)
        S [eV/(K atom)].
    volume_a3 : numpy.ndarray, shape (P, M)
        V [Å³/atom] (NaN for a harmonic phase).
    evaluate : callable
        ``evaluate(k, T) -> (G, S, V)`` at pressure index k and any temperatures
        (array) [eV/atom, eV/(K atom), Å³/atom], without error estimate.
    evaluate_many : callable
        ``evaluate_many(ks, T) -> (G, S, V)`` at pairs (pressure index, temperature),
        in one pass (one free-energy surface for a volume set).
    """

    temperatures_k: np.ndarray
    pressures_gpa: np.ndarray
    gibbs_ev: np.ndarray
    gibbs_error_ev: np.ndarray
    entropy_ev_per_k: np.ndarray
    volume_a3: np.ndarray
    evaluate: object
    evaluate_many: object = None
    warnings: tuple = ()


def _harmonic_values(phase, t):
    """F, S per formula unit [eV, eV/K] of a harmonic phase (electronic term added when given)."""
    from ..columns import column_name
    from ..tables import tabulate
    table = tabulate(phase.source, t, per="formula")
    f = table[column_name("helmholtz_energy")].to_numpy() * sc.kilo / J_PER_MOL_PER_EV
    s = table[column_name("entropy")].to_numpy() / J_PER_MOL_PER_EV
    if phase.electronic is not None:
        from ..electronic.thermodynamics import fermi_dirac_state
        state = fermi_dirac_state(phase.electronic, t)
        f = f + state.helmholtz_energy_ev
        s = s + state.entropy_ev_per_k
    return f + phase.static_ev, s


def harmonic_curves(phase, temperatures, errors=True):
    """:class:`Curves` of a harmonic phase (no pressure axis), per atom.

    Notes
    -----
    :math:`F = E_{static} + F_{vib}(T)\\,[+ F_{el}(T)]` per formula unit,
    divided by the atoms per formula unit.  The error is the harmonic row
    error of F (:func:`thermo.accuracy.rows.harmonic_row_errors`), plus the
    numerical error of F_el, plus the static uncertainty.
    """
    t = np.asarray(temperatures, dtype=float)
    n = phase.atoms
    f, s = _harmonic_values(phase, t)
    u = np.full(t.shape, phase.static_uncertainty_ev)
    if errors:
        from ..accuracy.rows import harmonic_row_errors
        u = u + harmonic_row_errors(phase.source, t)["helmholtz_energy"] / J_PER_MOL_PER_EV
        if phase.electronic is not None:
            from ..electronic.thermodynamics import numerical_errors
            u = u + numerical_errors(phase.electronic, t)["helmholtz_energy"]

    def evaluate(_k, temps):
        ff, ss = _harmonic_values(phase, np.atleast_1d(np.asarray(temps, dtype=float)))
        return ff / n, ss / n, np.full(ff.shape, np.nan)
    return Curves(t, np.array([np.nan]), (f / n)[None], (u / n)[None], (s / n)[None],
                  np.full((1, t.size), np.nan), evaluate, lambda _ks, temps: evaluate(0, temps))


def _shifted(volume_set, static_ev):
    """The volume set with ``static_ev`` added to every static energy."""
    if static_ev == 0.0:
        return volume_set
    import dataclasses
    return dataclasses.replace(volume_set, energies_ev=np.asarray(volume_set.energies_ev) + static_ev)


def _qh_columns(table):
    from ..columns import column_name
    g = table[column_name("gibbs_energy")].to_numpy() * sc.kilo / J_PER_MOL_PER_EV
    s = table[column_name("entropy")].to_numpy() / J_PER_MOL_PER_EV
    v = table[column_name("volume")].to_numpy()
    return g, s, v


def quasiharmonic_curves(phase, temperatures, pressures_gpa, eos="birch-murnaghan", errors=True):
    """:class:`Curves` of a volume-set phase at each pressure, per atom.

    Notes
    -----
    :math:`G(T,p) = \\min_V [F(V,T) + pV]` from
    :func:`thermo.quasiharmonic.quasiharmonic_tables`; the error is its
    ``gibbs_energy`` error column plus the static uncertainty.  Rows without
    a converged minimum are NaN (and stated in ``warnings``).
    """
    from ..columns import column_name, error_key
    from ..quasiharmonic import quasiharmonic_table, quasiharmonic_tables
    t = np.asarray(temperatures, dtype=float)
    p = np.atleast_1d(np.asarray(pressures_gpa, dtype=float))
    vs = _shifted(phase.source, phase.static_ev)
    n = phase.atoms
    tables = quasiharmonic_tables(vs, t, p, eos=eos, per="formula", errors=errors)
    g, s, v, u, notes = [], [], [], [], []
    for pk, table in zip(p, tables):
        gg, ss, vv = _qh_columns(table)
        g.append(gg)
        s.append(ss)
        v.append(vv)
        err = (table[column_name(error_key("gibbs_energy"))].to_numpy() * sc.kilo / J_PER_MOL_PER_EV
               if errors else np.zeros(t.size))
        u.append(err + phase.static_uncertainty_ev)
        notes += [f"{phase.name} at {pk:g} GPa: {w}" for w in table.attrs["diagnostics"].get("warnings", [])]

    def evaluate(k, temps):
        table = quasiharmonic_table(vs, np.atleast_1d(np.asarray(temps, dtype=float)), pressure_gpa=p[k],
                                    eos=eos, per="formula")
        gg, ss, vv = _qh_columns(table)
        return gg / n, ss / n, vv / n

    def evaluate_many(ks, temps):
        ks, temps = np.asarray(ks, dtype=int), np.asarray(temps, dtype=float)
        grid, where = np.unique(temps, return_inverse=True)
        used = np.unique(ks)
        tables = quasiharmonic_tables(vs, grid, p[used], eos=eos, per="formula")
        cols = {k: _qh_columns(tab) for k, tab in zip(used, tables)}
        out = np.array([[cols[k][q][j] for k, j in zip(ks, where)] for q in range(3)]).reshape(3, -1)
        return out[0] / n, out[1] / n, out[2] / n
    return Curves(t, p, np.array(g) / n, np.array(u) / n, np.array(s) / n, np.array(v) / n, evaluate,
                  evaluate_many, tuple(dict.fromkeys(notes)))


def tabulated_curves(phase, temperatures, errors=True):
    """:class:`Curves` of a table phase (no pressure axis), per atom.

    Notes
    -----
    :math:`G = E_{static} + G_{table}(T)` per formula unit, divided by the atoms per formula unit;
    the error is the table's (:meth:`thermo.phases.tabulated.TabulatedPhase.values`) plus the static
    uncertainty.
    """
    t = np.asarray(temperatures, dtype=float)
    n = phase.atoms
    g, s, u = phase.source.values(t)
    u = phase.static_uncertainty_ev + (u if errors else 0.0 * u)

    def evaluate(_k, temps):
        gg, ss, _ = phase.source.values(temps)
        return (gg + phase.static_ev) / n, ss / n, np.full(gg.shape, np.nan)
    return Curves(t, np.array([np.nan]), ((g + phase.static_ev) / n)[None], (u / n)[None], (s / n)[None],
                  np.full((1, t.size), np.nan), evaluate, lambda _ks, temps: evaluate(0, temps))


def phase_curves(phase, temperatures, pressures_gpa=(0.0,), eos="birch-murnaghan", errors=True):
    """G(T, p) per atom of a phase, its entropy, volume and estimated error (:class:`Curves`).

    Parameters
    ----------
    phase : Phase
    temperatures : array_like
        Temperatures [K], >= 0, ascending.
    pressures_gpa : array_like
        Pressures [GPa] (volume sets only; a harmonic phase has none).
    eos : str
        Equation of state of a volume set.
    errors : bool
        Estimate the error of every row.

    Returns
    -------
    Curves

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 5.0, 201)
    >>> c = phase_curves(Phase("a", PhononDOS(nu, 9 * nu**2 / 125, atoms=1), static_ev=1.0), [0.0])
    >>> round(float(c.gibbs_ev[0, 0]), 4)     # static + zero-point energy 9/8 h nu_D
    1.0233
    """
    if phase.quasiharmonic:
        return quasiharmonic_curves(phase, temperatures, pressures_gpa, eos, errors)
    if getattr(phase.source, "tabulated", False):
        return tabulated_curves(phase, temperatures, errors)
    return harmonic_curves(phase, temperatures, errors)
