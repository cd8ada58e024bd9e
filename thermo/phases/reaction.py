r"""Formation quantities of a compound from its elements' phases: ΔF_f(T), ΔS_f(T) (vibrational).

A reaction is written ``"AB = A + B"`` or ``"A2B3 = 2 A + 3 B"``: the compound
(one formula unit, left) formed from the other phases (right), each name a
phase of the comparison and each coefficient a number of formula units of that
phase.  Atoms must balance (atoms per formula unit of each phase).

References
----------
.. [1] A. van de Walle, G. Ceder, "The effect of lattice vibrations on
   substitutional alloy thermodynamics", Rev. Mod. Phys. 74, 11-45 (2002), § II
   (vibrational free energy and entropy of formation).
"""

from __future__ import annotations

import re

import numpy as np
import pandas as pd

from ..columns import column_name, error_key
from ..errors import OptionError
from .compare import _check, basis_of
from .phase import phase_curves

_TERM = re.compile(r"^\s*(?:(\d+(?:\.\d+)?)\s*\*?\s*)?([A-Za-z_][\w.\-]*)\s*$")


def parse_reaction(text, names=None):
    """``"AB = A + B"`` → ([(1.0, 'AB')], [(1.0, 'A'), (1.0, 'B')]).

    Parameters
    ----------
    text : str
        ``LEFT = RIGHT``, each side terms ``[N] NAME`` joined by ``+``.
    names : iterable of str, optional
        Phase names allowed.

    Raises
    ------
    OptionError
        Bad syntax, unknown name, or a left side with more than one phase.

    Examples
    --------
    >>> parse_reaction("A2B = 2 A + B")
    ([(1.0, 'A2B')], [(2.0, 'A'), (1.0, 'B')])
    """
    if text.count("=") != 1:
        raise OptionError(f"reaction {text!r}: write it as 'COMPOUND = [N] A + [M] B'")
    sides = []
    for side in text.split("="):
        terms = []
        for part in side.split("+"):
            m = _TERM.match(part)
            if not m:
                raise OptionError(f"reaction {text!r}: cannot read the term {part.strip()!r} (expected '[N] NAME')")
            coefficient = float(m.group(1) or 1.0)
            if coefficient <= 0:
                raise OptionError(f"reaction {text!r}: coefficients must be positive")
            terms.append((coefficient, m.group(2)))
        sides.append(terms)
    left, right = sides
    if len(left) != 1:
        raise OptionError(f"reaction {text!r}: the left side is one compound (its formula unit is formed)")
    if names is not None:
        unknown = [n for _, n in left + right if n not in set(names)]
        if unknown:
            raise OptionError(f"reaction {text!r}: no phase named {', '.join(unknown)} "
                              f"(phases: {', '.join(names)})")
    if left[0][1] in [n for _, n in right]:
        raise OptionError(f"reaction {text!r}: the compound appears on both sides")
    scale = left[0][0]                    # per one formula unit of the compound
    return [(1.0, left[0][1])], [(c / scale, n) for c, n in right]


def formation_table(phases, reaction, temperatures, pressure_gpa=None, per_formula=None, eos="birch-murnaghan",
                    errors=True):
    r"""Free energy, entropy and enthalpy of formation of a compound versus temperature.

    Parameters
    ----------
    phases : sequence of Phase
        The compound and its elements (all harmonic, or all volume sets).
    reaction : str
        ``"AB = A + B"`` style (see :func:`parse_reaction`).
    temperatures : array_like
        Temperatures [K].
    pressure_gpa : float, optional
        Pressure for volume sets [GPa] (default 0).
    per_formula : str or int, optional
        Basis: default per formula unit of the compound (kJ/mol, J/(mol K));
        ``"atom"`` per atom (meV/atom, k_B/atom); or a formula / atom count.
    eos, errors
        As :func:`~thermo.phases.compare.compare_phases`.

    Returns
    -------
    pandas.DataFrame
        ``temperature_K``, ΔF_f (ΔG_f for volume sets) and its error, ΔS_f,
        ΔH_f; ``attrs`` hold the reaction, the basis and warnings.

    Notes
    -----
    Per formula unit of the compound C formed from phases i (:math:`\nu_i` formula units each):

    .. math::
        \Delta X_f = X_C - \sum_i \nu_i X_i,\qquad u(\Delta F_f) = u(F_C) + \sum_i \nu_i u(F_i)

    with the atoms balanced: :math:`n_C = \sum_i \nu_i n_i`.  ΔF_f includes the
    static energies given (0 by default: then it is the vibrational part alone).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.phases.phase import Phase
    >>> nu = np.linspace(0.0, 6.0, 301)
    >>> a = Phase("A", PhononDOS(nu, 9 * nu**2 / 216, atoms=1))
    >>> ab = Phase("AB", PhononDOS(nu, 18 * nu**2 / 216, atoms=2))
    >>> t = formation_table([ab, a], "AB = 2 A", [300.0])
    >>> abs(float(t["entropy_formation_J_per_mol_K"][0])) < 1e-9     # same DOS per atom: nothing formed
    True
    """
    by_name = {p.name: p for p in phases}
    left, right = parse_reaction(reaction, list(by_name))
    used = [by_name[n] for _, n in left + right]
    t, quasi = _check(used, temperatures, min_temperatures=1)
    compound = by_name[left[0][1]]
    atoms_right = sum(c * by_name[n].atoms for c, n in right)
    if abs(atoms_right - compound.atoms) > 1e-9:
        raise OptionError(f"reaction {reaction!r}: atoms do not balance ({compound.atoms} in {compound.name}, "
                          f"{atoms_right:g} on the right)")
    p = [0.0 if pressure_gpa is None else float(pressure_gpa)]
    if not quasi and pressure_gpa is not None:
        raise OptionError("a pressure needs volume sets (quasi-harmonic phases)")
    total = {"g": np.zeros(t.size), "s": np.zeros(t.size), "u": np.zeros(t.size)}
    notes = []
    for sign, (coefficient, name) in [(1.0, left[0])] + [(-1.0, term) for term in right]:
        ph = by_name[name]
        c = phase_curves(ph, t, p, eos=eos, errors=errors)
        notes += list(c.warnings)
        scale = coefficient * ph.atoms            # per formula unit of this phase, times its count
        total["g"] += sign * scale * c.gibbs_ev[0]
        total["s"] += sign * scale * c.entropy_ev_per_k[0]
        total["u"] += scale * c.gibbs_error_ev[0]
    basis = basis_of(per_formula if per_formula is not None else compound.atoms)
    per_atom = 1.0 / compound.atoms
    key = "gibbs_energy_formation" if quasi else "helmholtz_energy_formation"
    g, s, u = (total[k] * per_atom for k in ("g", "s", "u"))
    table = pd.DataFrame({column_name("temperature"): t,
                          column_name(key, basis.per): basis.energy(g),
                          column_name(error_key(key), basis.per): basis.energy(u),
                          column_name("entropy_formation", basis.per): basis.entropy(s),
                          column_name("enthalpy_formation", basis.per): basis.energy(g + t * s)})
    table.attrs.update(reaction=reaction, compound=compound.name, basis=basis.describe()
                       if per_formula is not None else f"per formula unit of {compound.name} ({compound.atoms} atoms)",
                       pressure_GPa=p[0] if quasi else None, warnings=list(dict.fromkeys(notes)))
    return table
