r"""The free-energy surface F(V_k, T_m) of a volume set: a sum of parts, and its equation-of-state fit.

F is built as a sum of named parts at the sampled volumes — ``static``
(E(V), no temperature dependence) and ``vibrational`` (the harmonic F_vib,
zero-point energy included, with S and C_v) — so another contribution (an
electronic F_el(V,T), say) joins by passing one more :class:`SurfacePart`
to :func:`free_energy_surface`; nothing downstream changes.

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §§ 2, 4.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np
from scipy import constants as sc

from ..accuracy.rows import harmonic_row_errors
from ..columns import column_name
from ..kernels.sums import thermal_sums
from ..tables import check_temperatures, table_from_sums
from .eos import check_eos, fit_eos

#: J/mol per eV per formula unit.
J_PER_MOL_PER_EV = sc.N_A * sc.electron_volt
#: Keys of a part's error estimate (absolute, per sampled volume, eV and eV/K per formula unit).
ERROR_KEYS = ("helmholtz", "entropy", "heat_capacity")


@dataclass(frozen=True)
class SurfacePart:
    """One additive part of F(V,T) at the sampled volumes, per formula unit.

    Attributes
    ----------
    helmholtz_ev : numpy.ndarray, shape (K, M) or (K, 1)
        F of this part [eV] (a static energy broadcasts over temperatures).
    entropy_ev_per_k, heat_capacity_ev_per_k : numpy.ndarray, shape (K, M), optional
        Its S and C_v [eV/K]; None for a part without them (static energy).
    errors : dict, optional
        Estimated absolute errors of the part at each volume and temperature,
        keys of :data:`ERROR_KEYS` (eV, eV/K); None when not estimated.
    """

    helmholtz_ev: np.ndarray
    entropy_ev_per_k: np.ndarray | None = None
    heat_capacity_ev_per_k: np.ndarray | None = None
    errors: dict | None = None


@dataclass(frozen=True)
class FreeEnergySurface:
    """F(V_k, T_m) of a volume set as a sum of parts, and its fit, per formula unit.

    Attributes
    ----------
    volumes_a3 : numpy.ndarray, shape (K,)
    temperatures_k : numpy.ndarray, shape (M,)
    parts : dict of str to SurfacePart
        ``static``, ``vibrational`` and any added part.
    fit : EosFit
        Equation of state fitted to the summed F at each temperature.
    """

    volumes_a3: np.ndarray
    temperatures_k: np.ndarray
    parts: dict = field(default_factory=dict)
    fit: object = None

    def _sum(self, name):
        shape = (self.volumes_a3.size, self.temperatures_k.size)
        total = np.zeros(shape)
        for part in self.parts.values():
            value = getattr(part, name)
            if value is not None:
                total = total + np.broadcast_to(value, shape)
        return total

    @property
    def helmholtz_ev(self):
        """Summed F [eV], shape (K, M)."""
        return self._sum("helmholtz_ev")

    @property
    def entropy_ev_per_k(self):
        """Summed S [eV/K], shape (K, M)."""
        return self._sum("entropy_ev_per_k")

    @property
    def heat_capacity_ev_per_k(self):
        """Summed C_v [eV/K], shape (K, M)."""
        return self._sum("heat_capacity_ev_per_k")

    @property
    def errors(self):
        """Summed error estimates of the parts (keys :data:`ERROR_KEYS`, (K, M) each), or None if none has one."""
        estimated = [p.errors for p in self.parts.values() if p.errors is not None]
        if not estimated:
            return None
        shape = (self.volumes_a3.size, self.temperatures_k.size)
        return {key: sum(np.broadcast_to(e[key], shape) for e in estimated) for key in ERROR_KEYS}

    def refit(self, eos, start=None):
        """The same surface with another equation of state (Vinet from ``start`` parameters when given)."""
        return replace(self, fit=fit_eos(self.volumes_a3, self.helmholtz_ev, eos, start))

    def without(self, index):
        """The surface without the ``index``-th volume, refitted with the same form (leave-one-out)."""
        keep = np.arange(self.volumes_a3.size) != index

        def cut(a):
            return None if a is None else np.asarray(a)[keep]
        parts = {name: SurfacePart(cut(p.helmholtz_ev), cut(p.entropy_ev_per_k), cut(p.heat_capacity_ev_per_k),
                                   None if p.errors is None else {k: cut(v) for k, v in p.errors.items()})
                 for name, p in self.parts.items()}
        # a Vinet refit starts from the fit of all volumes: a few steps instead of a fit from scratch
        return replace(self, volumes_a3=self.volumes_a3[keep], parts=parts).refit(self.fit.kind,
                                                                                  self.fit.parameters)


def vibrational_part(doses, temperatures, method="auto", errors=False):
    r"""The harmonic F_vib, S, C_v of each DOS as a :class:`SurfacePart` (eV per formula unit).

    Parameters
    ----------
    doses : sequence of PhononDOS
        One per sampled volume.
    temperatures : numpy.ndarray, shape (M,)
        Temperatures [K].
    method : {'auto', 'direct', 'fast'}
        Evaluation of the mode sums.
    errors : bool
        Also estimate each value's error (:func:`thermo.accuracy.rows.harmonic_row_errors`).

    Notes
    -----
    .. math:: F_{vib}(V,T) = E_0(V) + k_BT\int g_V(\nu)\ln\left(1-e^{-h\nu/k_BT}\right)d\nu
    """
    rows_f, rows_s, rows_c, rows_e = [], [], [], []
    for dos in doses:
        table = table_from_sums(thermal_sums(dos, temperatures, method=method), temperatures, "formula", dos.atoms)
        rows_f.append(table[column_name("helmholtz_energy")].to_numpy() * sc.kilo / J_PER_MOL_PER_EV)
        rows_s.append(table[column_name("entropy")].to_numpy() / J_PER_MOL_PER_EV)
        rows_c.append(table[column_name("heat_capacity_v")].to_numpy() / J_PER_MOL_PER_EV)
        if errors:
            e = harmonic_row_errors(dos, temperatures)
            rows_e.append([e["helmholtz_energy"], e["entropy"], e["heat_capacity_v"]])
    estimate = None
    if errors:
        stacked = np.array(rows_e) / J_PER_MOL_PER_EV            # (K, 3, M)
        estimate = {key: stacked[:, i] for i, key in enumerate(ERROR_KEYS)}
    return SurfacePart(np.array(rows_f), np.array(rows_s), np.array(rows_c), estimate)


def free_energy_surface(volume_set, temperatures, eos="birch-murnaghan", method="auto", errors=False, parts=None):
    r"""F(V,T) on the sampled volumes and its equation-of-state fit.

    Parameters
    ----------
    volume_set : VolumeSet
        Volumes, static energies and DOS.
    temperatures : array_like
        Temperatures [K], >= 0.
    eos : {'birch-murnaghan', 'vinet', 'spline'}
        Equation of state fitted to F(V) at each temperature.
    method : {'auto', 'direct', 'fast'}
        Evaluation of the mode sums (see :func:`thermo.kernels.sums.grid_sums`).
    errors : bool
        Estimate the harmonic error of every volume too (for uncertainties).
    parts : dict of str to SurfacePart, optional
        Further additive parts of F (e.g. an electronic free energy), on the
        same volumes (ascending) and temperatures.

    Returns
    -------
    FreeEnergySurface

    Notes
    -----
    .. math:: F(V,T) = E(V) + F_{vib}(V,T)\;[+\,F_{el}(V,T)] + \sum F_{other}(V,T)

    with the electronic free energy of :func:`thermo.electronic.thermodynamics.volume_rows`
    when the volume set carries an electronic DOS at each volume (its numerical errors join the
    harmonic ones with ``errors``).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.quasiharmonic.volumeset import make_volume_set
    >>> nu = np.linspace(0.0, 5.0, 101)
    >>> vs = make_volume_set([(v, 0.0, PhononDOS(nu, 9 * nu**2 / 125, atoms=1)) for v in (18, 19, 20, 21, 22)])
    >>> s = free_energy_surface(vs, [0.0, 300.0])
    >>> s.helmholtz_ev.shape, bool(s.helmholtz_ev[0, 1] < s.helmholtz_ev[0, 0]), sorted(s.parts)
    ((5, 2), True, ['static', 'vibrational'])
    """
    t = check_temperatures(temperatures)
    eos = check_eos(eos)
    all_parts = {"static": SurfacePart(np.asarray(volume_set.energies_ev, dtype=float)[:, None]),
                 "vibrational": vibrational_part(volume_set.doses, t, method, errors)}
    if getattr(volume_set, "electronic", ()):     # metals: + F_el(V,T) from the electronic DOS at each volume
        from ..electronic.thermodynamics import volume_rows
        el = volume_rows(volume_set.electronic, t, errors=errors)
        all_parts["electronic"] = SurfacePart(el["helmholtz"], el["entropy"], el["heat_capacity"], el["errors"])
    all_parts.update(parts or {})
    surface = FreeEnergySurface(np.asarray(volume_set.volumes_a3, dtype=float), t, all_parts)
    return surface.refit(eos)
