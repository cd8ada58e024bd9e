r"""Fermi–Dirac thermodynamics of an electronic DOS at fixed electron count.

At each temperature the chemical potential μ(T) keeps the electron count of
the ground state; the electronic heat capacity, entropy, internal and
Helmholtz energy then follow from exact integrals over the piecewise-linear
DOS (:mod:`thermo.electronic.segments`).  Energies are relative to the
ground state (0 K) of the same DOS, so that F_el adds directly to a static
energy computed at 0 K and to the vibrational free energy.

References
----------
.. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Holt, Rinehart and
   Winston, 1976), ch. 2 (Sommerfeld theory: μ(T), U, C = γT,
   γ = (π²/3) k_B² g(E_F)).
.. [2] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §§ 2, 4
   (the electronic free energy beside the lattice term).

Examples
--------
>>> from thermo.electronic.dos import make_electronic_dos
>>> d = make_electronic_dos([-5.0, 5.0], [1.0, 1.0])           # flat band, 1 state/eV
>>> s = fermi_dirac_state(d, [10.0])
>>> round(float(s.heat_capacity_ev_per_k[0] / (sommerfeld_gamma(d) / J_PER_MOL_PER_EV * 10.0)), 9)
1.0
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy import constants as sc

from ..errors import ModeheatError
from .dos import make_electronic_dos
from .segments import between_fermi_level_and, thermal_sums

#: Boltzmann constant [eV/K] (CODATA via scipy.constants).
KB_EV = sc.k / sc.electron_volt
#: J/mol per eV per formula unit.
J_PER_MOL_PER_EV = sc.N_A * sc.electron_volt
#: γ [J/(mol K²)] of one state/eV per formula unit: (π²/3) k_B² N_A / e.
GAMMA_PER_STATE = np.pi ** 2 / 3 * sc.k ** 2 * sc.N_A / sc.electron_volt
#: The μ solver stops when its step is below this [eV] (plus the same relative to |μ|).
MU_TOLERANCE_EV = 1.0e-12
MAX_STEPS = 200
#: A table edge closer to μ than this many k_BT is reported (states beyond it would be occupied).
EDGE_KT = 20.0


@dataclass(frozen=True)
class ElectronicState:
    """Electronic thermodynamics per formula unit at a set of temperatures (all arrays shape (M,)).

    Attributes
    ----------
    temperatures_k : numpy.ndarray
        T [K].
    chemical_potential_ev : numpy.ndarray
        μ(T) − E_F [eV].
    heat_capacity_ev_per_k, entropy_ev_per_k : numpy.ndarray
        C_el and S_el [eV/K].
    internal_energy_ev, helmholtz_energy_ev : numpy.ndarray
        U_el(T) − U_el(0) and F_el(T) − U_el(0) [eV].
    """

    temperatures_k: np.ndarray
    chemical_potential_ev: np.ndarray
    heat_capacity_ev_per_k: np.ndarray
    entropy_ev_per_k: np.ndarray
    internal_energy_ev: np.ndarray
    helmholtz_energy_ev: np.ndarray

    def values(self):
        """(C, S, U, F) per mole of formula units [J/(mol K), J/(mol K), J/mol, J/mol]."""
        return (self.heat_capacity_ev_per_k * J_PER_MOL_PER_EV, self.entropy_ev_per_k * J_PER_MOL_PER_EV,
                self.internal_energy_ev * J_PER_MOL_PER_EV, self.helmholtz_energy_ev * J_PER_MOL_PER_EV)


def _temperatures(temperatures):
    from ..tables import check_temperatures
    return check_temperatures(temperatures)


def _residual(e, g, mu, kt):
    sums = thermal_sums(e, g, mu, kt, full=False)
    shift, _ = between_fermi_level_and(e, g, mu)
    return sums["count"] + shift, sums["dcount"]


def solve_chemical_potential(energies, dos, mu0, kt):
    r"""μ at each k_BT keeping the ground-state electron count (safeguarded Newton, vectorised).

    Parameters
    ----------
    energies, dos : numpy.ndarray, shape (K,)
        Piecewise-linear DOS [eV relative to E_F, states/eV].
    mu0 : float
        μ at 0 K [eV] (0, or the middle of a gap holding E_F).
    kt : numpy.ndarray, shape (M,)
        :math:`k_BT` [eV], > 0.

    Returns
    -------
    numpy.ndarray, shape (M,)
        μ [eV].

    Raises
    ------
    ModeheatError
        If a temperature has not converged after :data:`MAX_STEPS` steps.

    Notes
    -----
    Solves :math:`\Phi(\mu) = \int g\,[f - \theta(-E)]\,dE = 0` with
    :math:`\Phi' = \int g f(1-f)\,dE/k_BT \ge 0`; a Newton step leaving the
    bracket (or with :math:`\Phi' = 0`) is replaced by bisection.

    Examples
    --------
    >>> e = np.array([-5.0, 5.0]); g = np.array([1.0, 3.0])      # g rises: μ falls as T rises
    >>> mu = solve_chemical_potential(e, g, 0.0, np.array([0.01]))
    >>> round(float(mu[0] / (-np.pi**2 / 6 * 0.01**2 * 0.2 / 2.0)), 5)   # Sommerfeld: −(π²/6)(k_BT)² g'/g
    1.0
    """
    e, g = np.asarray(energies, float), np.asarray(dos, float)
    kt = np.asarray(kt, float)
    mu = np.full(kt.shape, float(mu0))
    lo = e[0] - 40.0 * kt
    hi = e[-1] + 40.0 * kt
    active = np.ones(kt.shape, bool)
    phi = np.zeros(kt.shape)
    for _ in range(MAX_STEPS):
        idx = np.flatnonzero(active)
        if idx.size == 0:
            return mu
        m = mu[idx]
        p, d = _residual(e, g, m, kt[idx])
        phi[idx] = p
        lo[idx] = np.where(p < 0, m, lo[idx])
        hi[idx] = np.where(p > 0, m, hi[idx])
        with np.errstate(divide="ignore", invalid="ignore"):
            step = p / d
        tolerance = MU_TOLERANCE_EV * (1.0 + np.abs(m))
        small = (p == 0) | (np.isfinite(step) & (np.abs(step) <= tolerance))
        newton = m - np.where(np.isfinite(step), step, 0.0)
        inside = np.isfinite(step) & (newton > lo[idx]) & (newton < hi[idx])
        new = np.where(small | inside, newton, 0.5 * (lo[idx] + hi[idx]))
        mu[idx] = new
        done = small | (np.abs(new - m) <= tolerance)
        active[idx[done]] = False
    k = int(np.flatnonzero(active)[0])
    raise ModeheatError(f"the chemical potential did not converge at k_BT = {kt[k]:.4g} eV after {MAX_STEPS} "
                        f"steps (electron count off by {abs(phi[k]):.3g})")


def _state_on(energies, dos, mu0, t):
    """ElectronicState arrays (μ, C, S, U, F) of a piecewise-linear DOS at temperatures t (≥ 0)."""
    hot = t > 0
    mu = np.full(t.shape, float(mu0))
    c, s, u = (np.zeros(t.shape) for _ in range(3))
    if hot.any():
        kt = KB_EV * t[hot]
        m = solve_chemical_potential(energies, dos, mu0, kt)
        sums = thermal_sums(energies, dos, m, kt, full=True)
        n_shift, u_shift = between_fermi_level_and(energies, dos, m)
        residual = sums["count"] + n_shift
        b0 = sums["b0"]
        with np.errstate(divide="ignore", invalid="ignore"):
            spread = np.where(b0 > 0, sums["b1"] ** 2 / b0, 0.0)
        mu[hot] = m
        c[hot] = KB_EV * np.maximum(sums["b2"] - spread, 0.0)
        s[hot] = KB_EV * sums["entropy"]
        u[hot] = sums["energy"] + u_shift + m * residual
    return ElectronicState(t, mu, c, s, u, u - t * s)


def fermi_dirac_state(edos, temperatures):
    r"""Electronic μ(T), C_el, S_el, U_el, F_el of an electronic DOS at fixed electron count.

    Parameters
    ----------
    edos : ElectronicDOS
        Spin-summed DOS per formula unit, energies relative to E_F.
    temperatures : array_like
        T [K], ≥ 0; T = 0 is exact (all terms zero, μ = E_F or mid-gap).

    Returns
    -------
    ElectronicState
        Per formula unit: μ − E_F [eV], C_el and S_el [eV/K], U_el and F_el
        relative to the 0 K ground state [eV].

    Raises
    ------
    OptionError
        Bad temperatures.
    ModeheatError
        μ did not converge (one line).

    Notes
    -----
    With :math:`f = 1/(e^{(E-\mu)/k_BT}+1)` and μ from
    :math:`\int g f\,dE = N = \int_{-\infty}^{E_F} g\,dE`:

    .. math::
        U_{el} = \int g\,E\,[f - \theta(E_F - E)]\,dE,\quad
        S_{el} = -k_B\int g\,[f\ln f + (1-f)\ln(1-f)]\,dE,\quad
        F_{el} = U_{el} - TS_{el},

        C_{el} = \frac{1}{k_BT^2}\left[\int g\,h\,(E-\mu)^2\,dE
                 - \frac{\left(\int g\,h\,(E-\mu)\,dE\right)^2}{\int g\,h\,dE}\right],\quad h = f(1-f),

    the last being :math:`dU_{el}/dT` at fixed N (the second term is the
    shift of μ).  At low T, :math:`C_{el} \to \gamma T` with
    :math:`\gamma = (\pi^2/3)k_B^2 g(E_F)` (Ashcroft & Mermin, ch. 2).
    The DOS is taken at fixed volume: no electron–phonon renormalisation and
    no thermal change of the bands.

    Examples
    --------
    >>> from thermo.electronic.dos import make_electronic_dos
    >>> d = make_electronic_dos([-5.0, 5.0], [2.0, 2.0])
    >>> s = fermi_dirac_state(d, [0.0, 300.0])
    >>> float(s.entropy_ev_per_k[0]), bool(np.isclose(s.entropy_ev_per_k[1], s.heat_capacity_ev_per_k[1]))
    (0.0, True)
    """
    t = _temperatures(temperatures)
    return _state_on(edos.energies_ev, edos.dos_per_ev, edos.ground_state_potential_ev, t)


def sommerfeld_gamma(edos):
    r"""Sommerfeld coefficient γ of an electronic DOS [J/(mol K²)] per mole of formula units.

    Notes
    -----
    .. math:: \gamma = \frac{\pi^2}{3}k_B^2\,g(E_F)

    with g per formula unit (both spins); 1 state/eV gives 2.357 mJ/(mol K²).
    This is the bare band value: a measured γ carries the electron–phonon
    enhancement (1 + λ) besides.

    Examples
    --------
    >>> from thermo.electronic.dos import make_electronic_dos
    >>> round(sommerfeld_gamma(make_electronic_dos([-1.0, 1.0], [1.0, 1.0])) * 1e3, 4)
    2.3571
    """
    return float(GAMMA_PER_STATE * edos.dos_at_fermi_level)


def half_grids(edos):
    """The two interleaved half grids (points 0, 2, 4, … and 1, 3, 5, …) as ElectronicDOS; a half that
    cannot hold E_F with states on both sides is left out."""
    out = []
    for offset in (0, 1):
        e, g = edos.energies_ev[offset::2], edos.dos_per_ev[offset::2]
        try:
            out.append(make_electronic_dos(e, g, source=edos.source))
        except ModeheatError:
            continue
    return out


def numerical_errors(edos, temperatures, state=None):
    r"""Numerical error of C_el, S_el, U_el, F_el and g(E_F) from the two interleaved half grids.

    Returns
    -------
    dict
        ``heat_capacity``, ``entropy`` [eV/K], ``internal_energy``,
        ``helmholtz_energy`` [eV] (arrays over T) and ``dos_at_fermi_level``
        [states/eV]: :math:`\max_k |Q_h - Q^{(k)}_{2h}|`.  With no usable half
        grid, the error is |Q| itself (nothing is claimed).

    Notes
    -----
    For a smooth DOS the linear interpolation error grows as h², so the
    half-grid difference is about three times the error of the full grid:
    the estimate errs on the large side.  A DOS with kinks converges as h,
    and the difference is then about the full grid's error.

    Examples
    --------
    >>> from thermo.electronic.dos import make_electronic_dos
    >>> e = np.linspace(-4.0, 4.0, 81)
    >>> d = make_electronic_dos(e, 1.0 + 0.1 * e ** 2)
    >>> err = numerical_errors(d, [300.0])
    >>> bool(err["dos_at_fermi_level"] < 3e-3), bool(err["heat_capacity"][0] > 0)
    (True, True)
    """
    t = _temperatures(temperatures)
    base = state if state is not None else fermi_dirac_state(edos, t)
    keys = ("heat_capacity", "entropy", "internal_energy", "helmholtz_energy")
    values = dict(zip(keys, (base.heat_capacity_ev_per_k, base.entropy_ev_per_k, base.internal_energy_ev,
                             base.helmholtz_energy_ev)))
    halves = half_grids(edos)
    if not halves:
        out = {k: np.abs(v) for k, v in values.items()}
        out["dos_at_fermi_level"] = edos.dos_at_fermi_level
        return out
    out = {k: np.zeros_like(v) for k, v in values.items()}
    out["dos_at_fermi_level"] = 0.0
    for half in halves:
        other = fermi_dirac_state(half, t)
        for k, v in zip(keys, (other.heat_capacity_ev_per_k, other.entropy_ev_per_k, other.internal_energy_ev,
                               other.helmholtz_energy_ev)):
            out[k] = np.maximum(out[k], np.abs(values[k] - v))
        out["dos_at_fermi_level"] = max(out["dos_at_fermi_level"],
                                        abs(edos.dos_at_fermi_level - half.dos_at_fermi_level))
    return out


def edge_warnings(edos, state):
    """Warnings where the thermal window (±:data:`EDGE_KT` k_BT about μ) passes an end of the table."""
    t = state.temperatures_k
    hot = t > 0
    if not hot.any():
        return []
    kt = KB_EV * t[hot]
    mu = state.chemical_potential_ev[hot]
    e = edos.energies_ev
    notes = []
    for label, distance, edge in (("upper", (e[-1] - mu) / kt, e[-1]), ("lower", (mu - e[0]) / kt, e[0])):
        close = np.flatnonzero(distance < EDGE_KT)
        if close.size:
            first = float(t[hot][close].min())
            notes.append(f"from {first:g} K the {label} end of the table ({edge:+.4g} eV from E_F) lies within "
                         f"{EDGE_KT:g} k_BT of μ: states beyond it are missing, so C_el and S_el are too low "
                         "there; extend the DOS table")
    return notes


def volume_rows(edoses, temperatures, errors=False):
    r"""F_el, S_el, C_el of the electronic DOS at each sampled volume (quasi-harmonic step, phases).

    Parameters
    ----------
    edoses : sequence of ElectronicDOS
        One per volume, each per formula unit.
    temperatures : array_like, shape (M,)
        T [K], ≥ 0.
    errors : bool
        Also return each value's numerical error (:func:`numerical_errors`).

    Returns
    -------
    dict
        ``helmholtz`` [eV], ``entropy``, ``heat_capacity`` [eV/K], each shape
        (K, M), per formula unit, F_el from each volume's own electronic
        ground state; ``errors``: None, or the same keys with the estimated
        absolute errors.

    Notes
    -----
    The static energy E(V) of a volume set is a 0 K total energy, which holds
    the electronic ground state; F_el(V,T) adds the thermal part only:
    :math:`F(V,T) = E(V) + F_{vib}(V,T) + F_{el}(V,T)`.

    Examples
    --------
    >>> from thermo.electronic.dos import make_electronic_dos
    >>> rows = volume_rows([make_electronic_dos([-5.0, 5.0], [g, g]) for g in (1.0, 2.0)], [0.0, 300.0])
    >>> rows["helmholtz"].shape, bool(rows["helmholtz"][1, 1] < rows["helmholtz"][0, 1] < 0)
    ((2, 2), True)
    """
    t = _temperatures(temperatures)
    rows = {"helmholtz": [], "entropy": [], "heat_capacity": []}
    errs = {k: [] for k in rows}
    for edos in edoses:
        state = fermi_dirac_state(edos, t)
        for key, value in zip(rows, (state.helmholtz_energy_ev, state.entropy_ev_per_k,
                                     state.heat_capacity_ev_per_k)):
            rows[key].append(value)
        if errors:
            e = numerical_errors(edos, t, state)
            for key, source in zip(errs, ("helmholtz_energy", "entropy", "heat_capacity")):
                errs[key].append(e[source])
    out = {k: np.array(v) for k, v in rows.items()}
    out["errors"] = {k: np.array(v) for k, v in errs.items()} if errors else None
    return out
