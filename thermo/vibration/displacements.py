"""Mean-square atomic displacements ⟨u²⟩, U_iso and Debye–Waller B per species.

Conventions (see :mod:`.debye_waller`): ⟨u²⟩ is the total mean-square
displacement of one atom (three Cartesian directions), U_iso = ⟨u²⟩/3,
B = 8π² U_iso, all in Å².  The partial DOS g_s of species s carries
3 n_s modes per formula unit (n_s atoms of s); without partials the total
DOS gives the exact mass-weighted mean Σ n_s m_s ⟨u_s²⟩ / Σ n_s m_s.

Harmonic approximation: anharmonic crystals have larger ⟨u²⟩ at high T;
near melting (Lindemann ratio above ~0.1, see :mod:`.lindemann`) the
numbers are not meaningful.  Compare with refined displacement parameters
and validated data before a design decision.

References
----------
.. [1] B. T. M. Willis, A. W. Pryor, *Thermal Vibrations in
   Crystallography* (Cambridge University Press, 1975), ch. 4.
.. [2] A. A. Maradudin, E. W. Montroll, G. H. Weiss, I. P. Ipatova, *Theory
   of Lattice Dynamics in the Harmonic Approximation*, 2nd ed. (Academic
   Press, 1971), ch. 4.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
from scipy import constants as sc

from ..columns import column_name
from ..errors import OptionError
from ..preparation.imaginary import split_at_zero
from ..preparation.loading import treat_spectrum
from ..preparation.lowfreq import WINDOW_MODES, WINDOW_SPREAD
from ..spectrum import PhononDOS
from ..tables import check_temperatures
from .debye_waller import _amplitude, debye_waller_temperature
from .lindemann import lindemann_ratio, lindemann_warnings
from .species import ALL_ATOMS, _integrals, _parts  # noqa: F401  (ALL_ATOMS: public label, kept here)

ROOM_K = 298.15
_OMEGA_PER_THZ = 2.0 * np.pi * 1e12


def mean_square_displacement(dos, temperatures, formula=None, masses=None, species=None):
    r"""Total ⟨u²⟩(T) of each species, and its classical high-T limit [Å²].

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS, with species-projected ``partials`` when available.
    temperatures : array_like
        Temperatures [K], >= 0.
    formula : str, optional
        Chemical formula of the formula unit (masses and atom counts via
        ``periodictable``).
    masses : dict of str to float, optional
        Mass of each species [u]; overrides the element mass (isotopes,
        invented species).
    species : sequence of str, optional
        Partial-DOS columns to report (default all).

    Returns
    -------
    dict of str to dict
        Per species: ``mass_amu``, ``atoms`` (per formula unit),
        ``msd`` (⟨u²⟩ on the temperatures) and ``classical``
        (:math:`k_BT\langle\omega^{-2}\rangle`-limit) [Å²], and
        ``modes_found`` (modes carried by the partial DOS).

    Notes
    -----
    .. math:: \langle u_s^2\rangle = \frac{\hbar}{2 m_s n_s}\int
              \frac{g_s(\omega)}{\omega}\coth\frac{\hbar\omega}{2k_BT}\,d\omega,
              \qquad
              \langle u_s^2\rangle_{cl} = \frac{k_BT}{m_s n_s}\int
              \frac{g_s(\omega)}{\omega^2}\,d\omega

    The analytic part of the prepared DOS (the fitted
    :math:`A\nu^2(1+b\nu^2+c\nu^4)` below the cut-off in closed form,
    its taper above on Gauss–Legendre nodes,
    :func:`.debye_waller.analytic_displacement_integral`) is added to the
    sum over the tabulated, blended part, as in the thermodynamic sums; it
    is shared among species by ``low_frequency.species_shares``.  The
    classical limit and the mode count take the same part's moments
    (:meth:`~thermo.spectrum.LowFrequencyFit.analytic_moment`).  Without a formula, n_s is the
    partial's mode count / 3.

    References
    ----------
    Willis and Pryor (1975), eq. 4.48; Maradudin et al. (1971), ch. 4.

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> d = debye_spectrum(300.0)
    >>> r = mean_square_displacement(d, [0.0], masses={"X": 50.0})["X"]
    >>> from thermo.vibration.debye_waller import debye_mean_square_displacement as dmsd
    >>> round(float(r["msd"][0] / dmsd(0.0, 300.0, 50.0)), 12)
    1.0
    """
    t = check_temperatures(temperatures)
    out = {}
    for name, col, share, mass, atoms in _parts(dos, formula, masses, species):
        main, inverse_square, modes = _integrals(dos, col, share, t)
        n = atoms if atoms else modes / 3.0
        if not n > 0:
            raise OptionError(f"the partial DOS of {name} carries no modes")
        m = mass * sc.atomic_mass
        classical = sc.k * t * inverse_square / (m * n * _OMEGA_PER_THZ ** 2) * 1e20
        out[name] = {"mass_amu": mass, "atoms": n, "modes_found": modes,
                     "msd": _amplitude(main, m) / n, "classical": classical}
    return out


def displacement_table(dos, temperatures, formula=None, masses=None, distance_a=None, species=None):
    r"""⟨u²⟩, U_iso, B, classical ⟨u²⟩, θ_M (and Lindemann ratio) per species and T.

    Parameters
    ----------
    dos, temperatures, formula, masses, species
        As :func:`mean_square_displacement`.
    distance_a : float, optional
        Nearest-neighbour distance d [Å]; adds the Lindemann ratio
        :math:`\sqrt{\langle u^2\rangle}/d`.

    Returns
    -------
    pandas.DataFrame
        Long format, one row per species and temperature; columns named by
        :mod:`thermo.columns` (``species``, ``temperature_K``,
        ``mean_square_displacement_A2``, ``isotropic_displacement_A2``,
        ``debye_waller_b_A2``, ``classical_mean_square_displacement_A2``,
        ``debye_waller_temperature_K`` and ``lindemann_ratio``).

    Notes
    -----
    :math:`U_{iso} = \langle u^2\rangle/3`, :math:`B = 8\pi^2 U_{iso}`;
    :math:`\theta_M` from :func:`.debye_waller.debye_waller_temperature`.

    References
    ----------
    Willis and Pryor (1975), §1.4 and §4.6.

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> df = displacement_table(debye_spectrum(300.0), [0.0, 300.0], masses={"X": 50.0})
    >>> np.round(df["debye_waller_temperature_K"].to_numpy(), 6).tolist()
    [300.0, 300.0]
    """
    t = check_temperatures(temperatures)
    frames = []
    for name, r in mean_square_displacement(dos, t, formula, masses, species).items():
        u = r["msd"]
        cols = {
            column_name("species"): [name] * t.size,
            column_name("temperature"): t,
            column_name("mean_square_displacement"): u,
            column_name("isotropic_displacement"): u / 3.0,
            column_name("debye_waller_b"): 8.0 * np.pi ** 2 * u / 3.0,
            column_name("classical_mean_square_displacement"): r["classical"],
            column_name("debye_waller_temperature"): debye_waller_temperature(u, t, r["mass_amu"]),
        }
        if distance_a is not None:
            cols[column_name("lindemann_ratio")] = lindemann_ratio(u, distance_a)
        frames.append(pd.DataFrame(cols))
    return pd.concat(frames, ignore_index=True)


def _refitted(dos, window, window_modes=WINDOW_MODES):
    """The DOS prepared again from its input rows by :func:`~thermo.preparation.loading.treat_spectrum`.

    ``window`` is ``"auto"`` (with ``window_modes``) or a (low, high) window
    [THz]; returns None when no ν² form results.
    """
    names = list(dos.partials)
    cols = [dos.input_dos] + [dos.input_partials[k] for k in names]
    _, nu, cols = split_at_zero(dos.input_frequency_thz, cols)
    share = float(dos.source.get("negative_mode_fraction") or 0.0)
    policy = dos.source.get("negative_policy") or "drop"
    grid, cut, fit, scale, _notes = treat_spectrum(nu, cols, names, dos.atoms, share, policy, window,
                                                   window_modes=window_modes)
    if fit is None:
        return None
    return PhononDOS(grid, cut[0] * scale, dos.atoms, {k: c * scale for k, c in zip(names, cut[1:])},
                     fit, dos.source, dos.warnings)


#: Factors applied to the (start, stop) of a window given by hand when measuring the sensitivity.
WINDOW_MOVES = ((0.7, 1.0), (1.4, 1.0), (1.0, 0.7), (1.0, 1.4), (0.7, 0.7), (1.4, 1.4))


def _alternatives(dos, moves):
    """(description, prepared DOS or None) of the other plausible low-frequency treatments."""
    fit = dos.low_frequency
    if fit.automatic:
        how = "the automatic window's mode count is varied ×" + " and ×".join(f"{f:g}" for f in WINDOW_SPREAD)
        return how, [_refitted(dos, "auto", WINDOW_MODES * f) for f in WINDOW_SPREAD]
    lo, hi = fit.window_thz
    found = []
    for move in moves:
        try:
            found.append(_refitted(dos, (lo * move[0], hi * move[1])))
        except OptionError:
            found.append(None)
    how = "the window's ends are moved by " + ", ".join(f"×{a:g}/×{b:g}" for a, b in moves)
    return how, found


def window_sensitivity(dos, temperatures, formula=None, masses=None, moves=WINDOW_MOVES, species=None):
    r"""Largest relative change of ⟨u²⟩ under the other plausible low-frequency treatments.

    Parameters
    ----------
    dos, temperatures, formula, masses, species
        As :func:`mean_square_displacement`; ``dos`` keeps its input arrays.
    moves : sequence of (float, float)
        For a window given by hand: factors on its start and stop.  An
        automatic window is instead refitted with its mode count
        :data:`~thermo.preparation.lowfreq.WINDOW_MODES` times each factor of
        :data:`~thermo.preparation.lowfreq.WINDOW_SPREAD`.  Each alternative
        is prepared again by :func:`~thermo.preparation.loading.treat_spectrum`
        (fit, blend, species shares, normalisation); those where no ν² form
        fits are skipped.

    Returns
    -------
    dict
        ``per_species``: {species: max |Δ⟨u²⟩|/⟨u²⟩ over alternatives and T} [1],
        ``windows_THz``: the windows tried, ``varied``: what was varied,
        ``note``: why none was tried, or None.

    Notes
    -----
    The :math:`1/\omega` weighting makes ⟨u²⟩ far more sensitive to the
    lowest frequencies than :math:`C_v` or :math:`S`; this measures it.

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> window_sensitivity(debye_spectrum(300.0), [300.0], masses={"X": 50.0})["note"]
    'the DOS has no input table to refit'
    """
    t = check_temperatures(temperatures)
    if dos.low_frequency is None:
        return {"per_species": {}, "windows_THz": [], "varied": None, "note": "low-frequency treatment is off"}
    if dos.input_frequency_thz is None or dos.input_dos is None:
        return {"per_species": {}, "windows_THz": [], "varied": None, "note": "the DOS has no input table to refit"}
    base = mean_square_displacement(dos, t, formula, masses, species)
    worst = {name: 0.0 for name in base}
    windows = []
    how, others = _alternatives(dos, moves)
    for other in others:
        if other is None:
            continue
        windows.append(list(other.low_frequency.window_thz))
        for name, r in mean_square_displacement(other, t, formula, masses, species).items():
            worst[name] = max(worst[name], float(np.max(np.abs(r["msd"] / base[name]["msd"] - 1.0))))
    note = None if windows else "no ν² form fits the other windows"
    return {"per_species": worst, "windows_THz": windows, "varied": how, "note": note}


def displacement_summary(dos, formula=None, masses=None, distance_a=None, temperatures=None, species=None):
    """Key numbers per species: zero-point ⟨u²⟩, B and θ_M at 298.15 K, cautions.

    Parameters
    ----------
    dos, formula, masses, distance_a, species
        As :func:`displacement_table`.
    temperatures : array_like, optional
        Temperatures [K] scanned for the Lindemann caution and the window
        sensitivity (default 0-1000 K in 10 K steps).

    Returns
    -------
    dict
        JSON-able: ``convention``, ``species`` {name: {mass_amu, atoms,
        msd_zero_point_A2, msd_298K_A2, b_298K_A2, b_zero_point_A2,
        theta_m_298K_K, theta_m_zero_point_K}}, ``window_sensitivity``,
        ``warnings`` (list of str).

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> s = displacement_summary(debye_spectrum(300.0), masses={"X": 50.0})
    >>> round(s["species"]["X"]["theta_m_298K_K"], 6)
    300.0
    """
    t = check_temperatures(np.arange(0.0, 1001.0, 10.0) if temperatures is None else temperatures)
    key = check_temperatures([0.0, ROOM_K])
    table = displacement_table(dos, key, formula, masses, distance_a, species)
    per_species = {}
    results = mean_square_displacement(dos, key, formula, masses, species)
    b_col, u_col = column_name("debye_waller_b"), column_name("mean_square_displacement")
    th_col = column_name("debye_waller_temperature")
    for name, r in results.items():
        rows = table[table[column_name("species")] == name]
        per_species[name] = {
            "mass_amu": r["mass_amu"], "atoms": r["atoms"],
            "msd_zero_point_A2": float(rows[u_col].iloc[0]), "msd_298K_A2": float(rows[u_col].iloc[1]),
            "b_zero_point_A2": float(rows[b_col].iloc[0]), "b_298K_A2": float(rows[b_col].iloc[1]),
            "theta_m_zero_point_K": float(rows[th_col].iloc[0]), "theta_m_298K_K": float(rows[th_col].iloc[1]),
        }
    notes = list(caution_lines(dos, displacement_table(dos, t, formula, masses, distance_a, species), results))
    sens = window_sensitivity(dos, key, formula, masses, species=species)
    worst = max(sens["per_species"].values(), default=0.0)
    if worst > 0.02:
        notes.append(f"⟨u²⟩ changes by up to {100 * worst:.1f} % under other plausible low-frequency "
                     f"windows ({sens['varied']}); the acoustic part of the DOS limits its accuracy")
    if sens["note"]:
        notes.append(f"window sensitivity of ⟨u²⟩ not measured: {sens['note']}")
    return {"convention": CONVENTION, "species": per_species, "window_sensitivity": sens, "warnings": notes,
            "low_frequency_debye_temperature_K": dos.low_frequency_debye_temperature_k()}


#: One line stating the conventions, for tables and pages.
CONVENTION = ("⟨u²⟩ is the total mean-square displacement (sum of three directions); "
              "U_iso = ⟨u²⟩/3 per direction; B = 8π²U_iso; harmonic approximation")


def caution_lines(dos, table, results=None):
    """Cautions for a displacement table: Lindemann ratio, partial mode counts, imaginary modes, ν = 0."""
    notes = list(lindemann_warnings(table))
    for name, r in (results or {}).items():
        if r["atoms"] and abs(r["modes_found"] / (3.0 * r["atoms"]) - 1.0) > 0.02:
            notes.append(f"the partial DOS of {name} carries {r['modes_found']:.4g} modes, not "
                         f"3 × {r['atoms']:g}; its ⟨u²⟩ is scaled per atom of the formula")
    share = float(dos.source.get("negative_mode_fraction") or 0.0)
    if share > 0:
        notes.append(f"{100 * share:.3g} % of the modes are imaginary (dropped): the lattice is unstable and "
                     "its ⟨u²⟩, dominated by the softest modes, is not meaningful")
    if dos.low_frequency is None and dos.frequency_thz[0] == 0 and dos.dos[0] > 0:
        notes.append("the DOS is nonzero at ν = 0 and no ν² (acoustic) form is applied: ⟨u²⟩, weighted "
                     "by 1/ω, depends on the lowest points and is unreliable")
    return notes


def displacement_provenance(dos, temperatures, formula=None, masses=None, distance_a=None, summary=None,
                            species=None):
    """Provenance record for an exported displacement table (JSON-able).

    Parameters
    ----------
    dos, temperatures, formula, masses, distance_a, species
        As :func:`displacement_table`.
    summary : dict, optional
        :func:`displacement_summary` result, computed when None.

    Returns
    -------
    dict
        :func:`thermo.tables.provenance` with the displacement settings
        (basis, masses, distance), convention, per-species key numbers,
        window sensitivity and warnings.
    """
    from ..tables import provenance
    info = provenance(dos, temperatures, formula=formula)
    summary = summary or displacement_summary(dos, formula, masses, distance_a, temperatures, species)
    info["settings"].update({
        "basis": "per atom of each species", "masses_amu": {k: v["mass_amu"] for k, v in summary["species"].items()},
        "nearest_neighbour_distance_A": distance_a})
    info["warnings"] = list(dos.warnings) + summary["warnings"]
    info.update({
        "convention": CONVENTION,
        "model": "harmonic: ⟨u²⟩ = ħ/(2 m n) ∫ g(ω)/ω coth(ħω/2k_BT) dω per species; no anharmonic terms",
        "displacement_key_numbers": summary["species"],
        "window_sensitivity": summary["window_sensitivity"],
    })
    return info
