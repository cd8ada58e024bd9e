r"""Compare phases: ΔF(T) or ΔG(T, p) per atom (or per common formula unit), transitions, boundary.

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §§ 2, 4.
.. [2] H. B. Callen, *Thermodynamics and an Introduction to Thermostatistics*,
   2nd ed. (Wiley, 1985), § 9.3 (the Clausius–Clapeyron equation).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from itertools import combinations

import numpy as np
import pandas as pd
from scipy import constants as sc

from ..columns import column_name, error_key
from ..errors import OptionError
from .crossings import brackets, closest_approach, hermite_root, refine, transition
from .phase import J_PER_MOL_PER_EV, phase_curves

KB_EV = sc.k / sc.electron_volt
#: GPa per eV/Å³.
GPA_PER_EV_A3 = sc.electron_volt / sc.angstrom ** 3 / sc.giga


@dataclass(frozen=True)
class Basis:
    """Per atom (``atoms=None``: meV/atom, k_B/atom) or per formula unit of ``atoms`` atoms (kJ/mol, J/(mol K))."""

    atoms: int | None = None
    formula: str | None = None

    @property
    def per(self):
        return "atom" if self.atoms is None else "formula"

    def energy(self, ev):
        """eV/atom → the table's energy unit."""
        return ev * 1e3 if self.atoms is None else ev * self.atoms * J_PER_MOL_PER_EV / sc.kilo

    def entropy(self, ev_per_k):
        """eV/(K atom) → the table's entropy unit."""
        return ev_per_k / KB_EV if self.atoms is None else ev_per_k * self.atoms * J_PER_MOL_PER_EV

    def volume(self, a3):
        """Å³/atom → Å³ per atom or per common formula unit."""
        return a3 if self.atoms is None else a3 * self.atoms

    def describe(self):
        return ("per atom" if self.atoms is None else
                f"per formula unit of {self.formula or str(self.atoms) + ' atoms'} ({self.atoms} atoms)")


def basis_of(per_formula=None):
    """The :class:`Basis` of a comparison: per atom, or per formula unit of ``per_formula``.

    ``per_formula`` is a chemical formula (``"TiO2"``) or a whole number of atoms; None or ``"atom"``: per atom.

    Examples
    --------
    >>> basis_of("TiO2").atoms, basis_of("atom").per
    (3, 'atom')
    """
    if per_formula is None or str(per_formula).strip() in ("", "atom"):
        return Basis()
    if isinstance(per_formula, (int, np.integer)) or str(per_formula).strip().isdigit():
        n = int(per_formula)
        if n < 1:
            raise OptionError(f"a common formula unit needs at least one atom, not {n}")
        return Basis(n, None)
    from ..formula import formula_unit
    return Basis(int(formula_unit(str(per_formula))[1]), str(per_formula))


@dataclass
class Comparison:
    """Result of :func:`compare_phases`.

    Attributes
    ----------
    table : pandas.DataFrame
        One row per (phase other than the reference, pressure, temperature):
        ΔG (ΔF) against the reference phase with its error, ΔS, ΔH, ΔV, the
        stable phase and whether it is decided.
    transitions : list of dict
        Crossings where the stable phase changes (one per crossing and pressure).
    metastable_crossings : list of dict
        Crossings of two phases while a third is lower.
    no_crossing : list of dict
        Pairs (and pressures) without a crossing in range, with the closest approach.
    boundary : list of dict
        p–T boundary points with the Clausius–Clapeyron check (``boundary=True``).
    warnings : list of str
    """

    table: pd.DataFrame
    transitions: list
    metastable_crossings: list
    no_crossing: list
    boundary: list = field(default_factory=list)
    warnings: list = field(default_factory=list)
    settings: dict = field(default_factory=dict)


def _check(phases, temperatures, min_temperatures=2):
    names = [p.name for p in phases]
    if len(phases) < 2:
        raise OptionError("compare at least two phases")
    if len(set(names)) != len(names):
        raise OptionError(f"phase names must differ: {', '.join(names)}")
    kinds = {p.quasiharmonic for p in phases}
    if len(kinds) > 1:
        raise OptionError("phases must be all DOS files or tables (harmonic, fixed volume or one pressure) or "
                          "all volume sets (quasi-harmonic); a fixed-volume F cannot be compared with G(T, p)")
    from ..tables import check_temperatures
    t = np.unique(check_temperatures(temperatures))
    if t.size < min_temperatures:
        raise OptionError("give at least two temperatures (a crossing is searched between them)")
    return t, kinds.pop()


def _rows_of(curves, k, i):
    return curves.gibbs_ev[k], curves.entropy_ev_per_k[k], curves.volume_a3[k], curves.gibbs_error_ev[k]


def _stable(curves, k):
    """Index of the lowest G and whether it is decided (lower than every other by more than both errors)."""
    g = np.array([c.gibbs_ev[k] for c in curves])
    u = np.array([c.gibbs_error_ev[k] for c in curves])
    filled = np.where(np.isfinite(g), g, np.inf)
    best = np.argmin(filled, axis=0)
    cols = np.arange(g.shape[1])
    gap = filled - filled[best, cols]
    margin = u + u[best, cols]
    others = np.ones_like(g, dtype=bool)
    others[best, cols] = False
    decided = np.all(~others | (gap > margin), axis=0) & np.isfinite(g[best, cols])
    return best, decided


def _pair_crossings(t, ca, cb, k, exact_roots):
    """Crossings of phases a, b at pressure index k.

    Harmonic phases (``exact_roots``): Brent's method on the exact ΔF, finished
    here.  Volume sets: the root of the cubic Hermite interpolant, to be
    corrected by one batched Newton step (:func:`_newton`); returned pending.
    """
    ga, sa, _, ua = _rows_of(ca, k, 0)
    gb, sb, _, ub = _rows_of(cb, k, 0)
    dg, ds, u = gb - ga, sb - sa, ua + ub

    def exact(x):
        xa, xb = ca.evaluate(k, [x]), cb.evaluate(k, [x])
        return float(xb[0][0] - xa[0][0]), float(xb[1][0] - xa[1][0])
    found = []
    for low, high, hidden in brackets(t, dg, ds, lambda x: exact(x)[0]):
        if exact_roots:
            root, converged, width = refine(low, high, lambda x: exact(x)[0])
            found.append(transition(t, dg, ds, u, root, converged, width, exact(root)[1], hidden))
        else:
            root, converged = hermite_root(t, dg, ds, low, high)
            found.append({"pending": (t, dg, ds, u, root, converged, high - low, hidden, low, high)})
    return found, (dg, u)


def _newton(curves, pending):
    """Finish pending Hermite roots: ΔG, ΔS of every phase at all of them in one pass, one Newton step each."""
    ks = [x["k"] for x in pending]
    roots = [x["pending"][4] for x in pending]
    values = [c.evaluate_many(ks, roots) for c in curves]
    out = []
    for i, x in enumerate(pending):
        t, dg, ds, u, root, converged, width, hidden, low, high = x["pending"]
        a, b = x["pair"]
        d_g = values[b][0][i] - values[a][0][i]
        d_s = values[b][1][i] - values[a][1][i]
        step = d_g / d_s if d_s else np.inf
        new = root + step
        ok = converged and np.isfinite(new) and low - 1e-9 <= new <= high + 1e-9
        found = transition(t, dg, ds, u, new if ok else root, ok, width, d_s, hidden, step if ok else 0.0)
        out.append(dict(found, pair=(a, b), k=x["k"]))
    return out


def compare_phases(phases, temperatures, pressures_gpa=None, per_formula=None, eos="birch-murnaghan",
                   errors=True, boundary=False):
    r"""ΔF(T) (harmonic) or ΔG(T, p) (quasi-harmonic) of phases, their transitions and uncertainties.

    Parameters
    ----------
    phases : sequence of Phase
        Two or more phases, all harmonic or all volume sets; the first is the
        reference of the Δ columns.
    temperatures : array_like
        Temperatures [K], >= 0 (sorted, repeats dropped).
    pressures_gpa : array_like, optional
        Pressures [GPa] for volume sets (default 0).
    per_formula : str or int, optional
        Compare per formula unit of this common composition (formula or atom
        count); default per atom.
    eos : str
        Equation of state of volume sets.
    errors : bool
        Estimate every row's error (and the transitions' uncertainty).
    boundary : bool
        Add the p–T boundary with the Clausius–Clapeyron check (volume sets,
        two or more pressures).

    Returns
    -------
    Comparison

    Notes
    -----
    Per atom, :math:`G_i = G_i^{fu}/n_i`.  At a crossing :math:`\Delta G(T^*) = 0`,

    .. math::
        u(T^*) = \frac{u(\Delta G)}{|\Delta S|},\quad u(\Delta G) = u(G_a) + u(G_b),\quad
        \Delta H = T^*\Delta S,\quad \frac{dT^*}{dp} = \frac{\Delta V}{\Delta S}.

    The row errors are estimates of the largest error (numerical, low-frequency,
    equation of state, volume sampling, the static uncertainty given), so they
    add.  A harmonic comparison is at fixed volumes: no thermal expansion.

    References
    ----------
    .. [1] H. B. Callen, *Thermodynamics and an Introduction to
       Thermostatistics*, 2nd ed. (Wiley, 1985), § 9.3.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.phases.phase import Phase
    >>> nu = np.linspace(0.0, 8.0, 401)
    >>> hard = Phase("hard", PhononDOS(nu, 9 * nu**2 / 512, atoms=1))
    >>> soft = Phase("soft", PhononDOS(nu / 2, 9 * nu**2 / 256, atoms=1), static_ev=0.05)
    >>> c = compare_phases([hard, soft], np.arange(0.0, 1001.0, 10.0))
    >>> t = c.transitions[0]
    >>> t["low_phase"], t["high_phase"], 200 < t["temperature_K"] < 330
    ('hard', 'soft', True)
    """
    t, quasi = _check(phases, temperatures)
    basis = basis_of(per_formula)
    p = np.atleast_1d(np.asarray([0.0] if pressures_gpa is None else pressures_gpa, dtype=float))
    if not quasi:
        if pressures_gpa is not None:
            raise OptionError("pressures need volume sets (quasi-harmonic phases); DOS files are at fixed volume")
        p = np.array([np.nan])
    curves = [phase_curves(ph, t, p, eos=eos, errors=errors) for ph in phases]
    warnings = [w for c in curves for w in c.warnings]
    frames, found_all, none = [], [], []
    for k, pk in enumerate(p):
        best, decided = _stable(curves, k)
        for j in range(1, len(phases)):
            frames.append(_frame(t, curves[0], curves[j], k, pk, phases[0].name, phases[j].name,
                                 [phases[i].name for i in best], decided, basis, quasi))
        for a, b in combinations(range(len(phases)), 2):
            found, (dg, u) = _pair_crossings(t, curves[a], curves[b], k, exact_roots=not quasi)
            found_all += [dict(x, pair=(a, b), k=k) for x in found]
            if not found:
                closest = closest_approach(t, dg, u)
                none.append({"phases": [phases[a].name, phases[b].name],
                             "pressure_GPa": None if np.isnan(pk) else float(pk),
                             "stable_phase": phases[b].name if closest and closest["delta_gibbs_eV"] < 0
                             else phases[a].name,
                             "closest_approach": _approach(closest, basis)})
    pending = [x for x in found_all if "pending" in x]
    done = [x for x in found_all if "pending" not in x] + (_newton(curves, pending) if pending else [])
    at = [c.evaluate_many([x["k"] for x in done], [x["temperature_K"] for x in done]) for c in curves] \
        if done else []
    crossings = [_record(x, phases, [[v[q][i] for q in range(3)] for v in at], basis, p[x["k"]])
                 for i, x in enumerate(done)]
    stable, metastable = [], []
    for c in sorted(crossings, key=lambda c: (c["pressure_GPa"] or 0.0, c["temperature_K"])):
        (stable if c.pop("_stable") else metastable).append(c)
    for c in stable + metastable:
        if not c["converged"]:
            warnings.append(f"{c['low_phase']}/{c['high_phase']}: the root near {c['temperature_K']:.6g} K did not "
                            "converge; its uncertainty covers the bracket")
    result = Comparison(pd.concat(frames, ignore_index=True), stable, metastable, none, warnings=warnings,
                        settings={"basis": basis.describe(), "reference_phase": phases[0].name,
                                  "equation_of_state": eos if quasi else None,
                                  "pressures_GPa": None if not quasi else p.tolist(), "errors": bool(errors)})
    if boundary:
        if not quasi or p.size < 2:
            raise OptionError("a p–T boundary needs volume sets and at least two pressures")
        from .boundary import phase_boundary
        result.boundary = phase_boundary(result.transitions, basis)
    for c in stable + metastable:
        c.pop("_raw")
    return result


def _frame(t, c0, cj, k, pk, name0, namej, stable, decided, basis, quasi):
    dg = cj.gibbs_ev[k] - c0.gibbs_ev[k]
    u = cj.gibbs_error_ev[k] + c0.gibbs_error_ev[k]
    ds = cj.entropy_ev_per_k[k] - c0.entropy_ev_per_k[k]
    key = "gibbs_energy_difference" if quasi else "helmholtz_energy_difference"
    data = {"phase": namej, "reference_phase": name0}
    if quasi:
        data[column_name("pressure")] = np.full(t.size, pk)
    data.update({
        column_name("temperature"): t,
        column_name(key, basis.per): basis.energy(dg),
        column_name(error_key(key), basis.per): basis.energy(u),
        column_name("entropy_difference", basis.per): basis.entropy(ds),
        column_name("enthalpy_difference", basis.per): basis.energy(dg + t * ds)})
    if quasi:
        data[column_name("volume_difference")] = basis.volume(cj.volume_a3[k] - c0.volume_a3[k])
    data.update({"stable_phase": stable, "stable_phase_decided": decided})
    return pd.DataFrame(data)


def _approach(closest, basis):
    if closest is None:
        return None
    key = basis.per
    return {"temperature_K": closest["temperature_K"],
            column_name("gibbs_energy_difference", key): float(basis.energy(closest["delta_gibbs_eV"])),
            column_name(error_key("gibbs_energy_difference"), key): float(basis.energy(closest["uncertainty_eV"]))}


def _record(x, phases, values, basis, pk):
    """A transition record: low_phase is stable below temperature_K; Δ = high − low.

    ``values`` are (G, S, V) of every phase at the crossing (per atom).
    """
    a, b = x["pair"]
    low, high = (b, a) if x["sign"] > 0 else (a, b)
    ds = abs(x["delta_entropy_eV_per_K"])
    tt = x["temperature_K"]
    dv = float(values[high][2] - values[low][2])
    g_pair = float(values[a][0])
    others = [float(v[0]) for i, v in enumerate(values) if i not in (a, b)]
    stable = all(o >= g_pair - 1e-12 * max(1.0, abs(g_pair)) for o in others if np.isfinite(o))
    per = basis.per
    return {"low_phase": phases[low].name, "high_phase": phases[high].name, "temperature_K": float(tt),
            "uncertainty_K": float(x["uncertainty_K"]), "pressure_GPa": None if np.isnan(pk) else float(pk),
            column_name("entropy_difference", per): float(basis.entropy(ds)),
            column_name("enthalpy_difference", per): float(basis.energy(tt * ds)),
            column_name("volume_difference"): None if np.isnan(dv) else float(basis.volume(dv)),
            column_name(error_key("gibbs_energy_difference"), per): float(basis.energy(x["delta_gibbs_uncertainty_eV"])),
            "pressure_uncertainty_GPa": (float(x["delta_gibbs_uncertainty_eV"] / abs(dv) * GPA_PER_EV_A3)
                                         if np.isfinite(dv) and dv != 0 else None),
            "converged": x["converged"], "hidden_in_grid_step": x["hidden"],
            "_stable": stable, "_raw": {"ds": ds, "dv": dv}}
