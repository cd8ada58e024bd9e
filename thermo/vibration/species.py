"""Species of a displacement calculation: masses, atom counts, shares and the per-species integrals.

The integrals combine the tabulated (blended) part of a prepared
:class:`~thermo.spectrum.PhononDOS` with its analytic low-frequency part,
as the thermodynamic sums do (:func:`thermo.kernels.sums.thermal_sums`).

References
----------
.. [1] B. T. M. Willis, A. W. Pryor, *Thermal Vibrations in
   Crystallography* (Cambridge University Press, 1975), ch. 4.
"""

from __future__ import annotations

import numpy as np

from ..errors import OptionError
from ..formula import formula_unit
from ..kernels.planck import H_OVER_K_THZ, occupation, reduced_frequency
from ..kernels.quadrature import trapezoid_weights
from ..preparation.lowfreq import window_shares
from .debye_waller import analytic_displacement_integral

#: Label of the mass-weighted mean over all atoms (no partial DOS).
ALL_ATOMS = "all atoms (mass-weighted mean)"
#: Frequency × temperature elements evaluated at once (about 32 MB a block): memory bounded at any size.
BLOCK = 1 << 22
#: Most frequency × temperature pairs one displacement sum evaluates (library, command line and pages; a few
#: seconds): a larger request is refused in one line rather than computed for minutes.
MAX_PAIRS = 2 * 10 ** 8


def _element_mass(name):
    try:
        mass, count = formula_unit(name)
    except OptionError:
        mass, count = None, 0
    if count != 1:
        raise OptionError(f"species {name!r} is not a chemical element; give its mass, e.g. {name}=12.0 (u)")
    return mass


def _counts_from_formula(formula):
    import periodictable
    parsed = periodictable.formula(str(formula))
    return {str(el): float(n) for el, n in parsed.atoms.items()}


def _coth_sum(nodes, coefficients, t):
    """``coefficients @ coth(hν/2k_BT)`` [(M,)] over the temperatures, a block of temperatures at a time."""
    pairs = nodes.size * t.size
    if pairs > MAX_PAIRS:
        raise OptionError(f"displacements: {nodes.size:,} frequencies × {t.size:,} temperatures = {pairs:.3g} "
                          f"pairs; at most {MAX_PAIRS:.3g} are computed (thermo.vibration.species.MAX_PAIRS): "
                          "ask for fewer temperatures or give a coarser DOS")
    out = np.empty(t.shape)
    step = max(1, BLOCK // max(nodes.size, 1))
    for lo in range(0, t.size, step):
        with np.errstate(divide="ignore"):
            coth = 1.0 + 2.0 * occupation(reduced_frequency(nodes, t[lo:lo + step]))
        out[lo:lo + step] = coefficients @ coth
    return out


def _mode_integrals(modes, weights, share, t):
    """:func:`_integrals` of a mode list: a sum over its modes plus ``share`` of its continuum."""
    nu, w = modes.frequency_thz, np.asarray(weights, float)
    extra_nu, extra_w = modes.extra
    nodes, counts = np.concatenate([nu, extra_nu]), np.concatenate([w, share * extra_w])
    pos = nodes > 0
    main = _coth_sum(nodes[pos], counts[pos] / nodes[pos], t)
    inverse_square = float(np.sum(counts[pos] / nodes[pos] ** 2))
    total = float(np.sum(counts))
    for fit in modes.continuum:
        main = main + share * analytic_displacement_integral(fit, t)
        inverse_square += share * fit.analytic_moment(-2)
        total += share * fit.analytic_moment(0)
    return main, inverse_square, total


def _integrals(dos, column, share, t):
    """∫ g coth(x/2)/ν dν [modes/THz] on T, ∫ g/ν² dν [modes/THz²] and modes of one column.

    For a mode list ``column`` holds the modes' weights of that column (:func:`_parts`).
    """
    if dos.modes is not None:
        return _mode_integrals(dos.modes, column, share, t)
    nu = np.asarray(dos.frequency_thz, float)
    column = np.asarray(column, float)
    w = column * trapezoid_weights(nu, dos.dos)
    pos = nu > 0
    main = _coth_sum(nu[pos], w[pos] / nu[pos], t)
    inverse_square = float(np.sum(w[pos] / nu[pos] ** 2))
    modes = float(np.sum(w))
    zero = np.flatnonzero(~pos)
    if zero.size and pos.any() and column[zero[0]] == 0:
        # Node at ν = 0 with g(0) = 0: the integrand's limit for g ≈ Aν² (A from the next node),
        # g coth(x/2)/ν → 2A k_BT/h and g/ν² → A.
        first = np.flatnonzero(pos)[0]
        reduced = column[first] / nu[first] ** 2
        half = trapezoid_weights(nu, dos.dos)[zero[0]]
        main = main + half * reduced * 2.0 * t / H_OVER_K_THZ
        inverse_square += half * reduced
    fit = dos.low_frequency
    if fit is not None:
        # the analytic part W·A ν²(1+bν²+cν⁴) below (and tapered above) the cut-off, as in the sums
        main = main + share * analytic_displacement_integral(fit, t)
        inverse_square += share * fit.analytic_moment(-2)
        modes += share * fit.analytic_moment(0)
    return main, inverse_square, modes


def _species_shares(dos):
    """Each partial's share of the analytic part, as fixed when the DOS was loaded (``species_shares``).

    For a mode list: each species' share of the modes below the top of the continuum's blend.
    """
    if dos.modes is not None:
        return {k: dos.modes.species_shares().get(k, 0.0) for k in dos.partials}
    fit = dos.low_frequency
    if fit is None:
        return {name: 0.0 for name in dos.partials}
    if fit.species_shares:
        return {name: float(fit.species_shares.get(name, 0.0)) for name in dos.partials}
    # a DOS built without loading: the shares in the fit window, from the input columns when kept
    names = list(dos.partials)
    if dos.input_frequency_thz is not None and all(k in dos.input_partials for k in names):
        nu, cols = dos.input_frequency_thz, [dos.input_partials[k] for k in names]
    else:
        nu, cols = dos.frequency_thz, [dos.partials[k] for k in names]
    return dict(zip(names, window_shares(nu, cols, fit.window_thz)))


def _parts(dos, formula, masses, species=None):
    """(label, column, share of the ν² part, mass [u], atoms per formula unit) per species."""
    masses = dict(masses or {})
    if species is not None:
        missing = [s for s in species if s not in dos.partials]
        if missing:
            raise OptionError(f"no partial-DOS column {', '.join(missing)}; the file has: "
                              + (", ".join(dos.partials) or "no partial columns"))
    if dos.partials:
        unknown = [k for k in masses if k not in dos.partials]
        if unknown:
            raise OptionError(f"mass given for {', '.join(unknown)}, which is not a partial-DOS column "
                              f"(columns: {', '.join(dos.partials)})")
        shares = _species_shares(dos)
        counts = _counts_from_formula(formula) if formula else {}
        parts = []
        for name, col in dos.partials.items():
            if species is not None and name not in species:
                continue
            col = dos.modes.partials[name] if dos.modes is not None else col
            mass = float(masses[name]) if name in masses else _element_mass(name)
            parts.append((name, col, shares[name], mass, counts.get(name)))
        return parts
    total = dos.modes.weight if dos.modes is not None else dos.dos     # a mode list: its modes' weights
    if formula:
        molar_mass, atoms = formula_unit(formula)
        counts = _counts_from_formula(formula)
        label = next(iter(counts)) if len(counts) == 1 else ALL_ATOMS
        return [(label, total, 1.0, molar_mass / atoms, float(atoms))]
    if len(masses) == 1:                      # one species, however many atoms per formula unit
        (name, mass), = masses.items()
        return [(name, total, 1.0, float(mass), float(dos.atoms))]
    if masses:
        raise OptionError(f"{len(masses)} masses given but the DOS has no partial columns; give the chemical "
                          "formula for the mass-weighted mean, or one mass for a one-species crystal")
    raise OptionError("atomic masses are needed: give the chemical formula, or the mass of each species")
