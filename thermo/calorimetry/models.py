r"""Model of the measured heat capacity: lattice + electronic + dilation terms.

.. math::
    C_v = C_{lat}(T) + \gamma T,\qquad C_p = C_v + \Delta_{dil}(T)

with the lattice part from a DOS whose frequencies are scaled by s
(:math:`C_{lat}(T) = C_v^{DOS}(T/s)`, exact since C_v depends on hν/k_BT
only) or from a Debye model with θ_D; the dilation term
:math:`C_p - C_v` either given (user values, or :math:`\alpha^2B_TVT` from a
quasi-harmonic result, :func:`dilation_from_expansion`) or of the
Nernst–Lindemann form :math:`C_p - C_v = A C_p^2 T`, solved for C_p:

.. math:: C_p = \frac{2C_v}{1 + \sqrt{1 - 4ATC_v}}.

References
----------
.. [1] W. Nernst, F. A. Lindemann, "Spezifische Wärme und Quantentheorie",
   Z. Elektrochem. 17, 817-827 (1911).
.. [2] P. Debye, "Zur Theorie der spezifischen Wärmen", Ann. Phys. 344,
   789-839 (1912).
.. [3] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Saunders, 1976),
   ch. 2 (electronic heat capacity γT) and ch. 23 (C/T = γ + βT²).
.. [4] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §2
   (C_p − C_v = α²B_T V T).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from scipy import constants as sc

from ..errors import OptionError
from .dos_curve import DosHeatCapacity
from ..models.debye import debye_heat_capacity, debye_heat_capacity_fraction

#: Parameter names (JSON keys) and their short aliases for ``--fix``.
PARAMETERS = {"theta_D_K": ("theta_D", "theta", "theta_d"), "scale": ("s",),
              "gamma_J_per_mol_K2": ("gamma",), "dilation_A_mol_per_J": ("A", "dilation_A", "a")}
LATTICES = ("debye", "dos")
DILATIONS = ("none", "nernst-lindemann", "values")
#: Starting values of the fitted parameters.
STARTS = {"theta_D_K": 300.0, "scale": 1.0, "gamma_J_per_mol_K2": 1e-3, "dilation_A_mol_per_J": 3e-6}
#: Physical range of each parameter, (low, high): a held or fitted value outside is refused.  θ_D from
#: 0.1 K to 10⁵ K, the frequency scale 10⁻³-10³, γ up to 10 J/(mol K²) per formula unit (heavy-fermion
#: compounds reach ~1), A up to 10⁻² mol/J (common practice: 10⁻⁶-10⁻⁵ for elements).
LIMITS = {"theta_D_K": (0.1, 1e5), "scale": (1e-3, 1e3), "gamma_J_per_mol_K2": (0.0, 10.0),
          "dilation_A_mol_per_J": (0.0, 1e-2)}
#: Parameters that enter linearly or nearly so and may be 0 (fitted on a linear scale, held at 0 if < 0).
MAY_BE_ZERO = ("gamma_J_per_mol_K2", "dilation_A_mol_per_J")


def debye_scan(temperatures, lattice_heat_capacity, modes, weights, thetas=None):
    """θ_D [K] of a log-spaced grid that best matches a lattice C_v (one vectorised pass, a fit's start).

    Parameters
    ----------
    temperatures, lattice_heat_capacity : array_like, shape (N,)
        T [K] and the lattice C [J/(mol K)].
    modes : int
        3n.
    weights : array_like, shape (N,)
        1/σ of each point.
    thetas : array_like, optional
        The grid [K]; default 400 values from 1 K to 10⁵ K.

    Examples
    --------
    >>> t = np.array([20.0, 50.0, 100.0])
    >>> abs(debye_scan(t, debye_heat_capacity(t, 300.0, 3), 3, np.ones(3)) / 300.0 - 1) < 0.015   # grid step 2.9 %
    True
    """
    grid = np.geomspace(1.0, 1e5, 400) if thetas is None else np.asarray(thetas, dtype=float)
    t = np.asarray(temperatures, dtype=float)
    model = modes * sc.R * debye_heat_capacity_fraction((grid[:, None] / t[None, :]).ravel()).reshape(grid.size, -1)
    cost = np.sum(((model - np.asarray(lattice_heat_capacity)) * np.asarray(weights)) ** 2, axis=1)
    return float(grid[int(np.argmin(cost))])


def parameter_name(text):
    """JSON key of a parameter named in full or by its alias.

    Examples
    --------
    >>> parameter_name("gamma"), parameter_name("A")
    ('gamma_J_per_mol_K2', 'dilation_A_mol_per_J')
    """
    for key, aliases in PARAMETERS.items():
        if text == key or text in aliases:
            return key
    names = ", ".join(f"{k} ({'/'.join(a)})" for k, a in PARAMETERS.items())
    raise OptionError(f"unknown parameter {text!r}; choose {names}")


def dilation_from_expansion(alpha_per_K, bulk_modulus_Pa, molar_volume_m3_per_mol, temperatures):
    r"""Dilation term :math:`C_p - C_v = \alpha^2 B_T V T` [J/(mol K)].

    The hook for a quasi-harmonic result: arrays of the volumetric thermal
    expansion, isothermal bulk modulus and molar volume at each temperature.

    Parameters
    ----------
    alpha_per_K : array_like
        Volumetric thermal expansion coefficient α [1/K].
    bulk_modulus_Pa : array_like
        Isothermal bulk modulus B_T [Pa].
    molar_volume_m3_per_mol : array_like
        Volume per mole of formula units V [m³/mol].
    temperatures : array_like
        T [K].

    Returns
    -------
    numpy.ndarray
        :math:`\alpha^2 B_T V T` [J/(mol K)].

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §2.

    Examples
    --------
    >>> float(dilation_from_expansion(7e-5, 7.6e10, 1e-5, 300.0))  # doctest: +ELLIPSIS
    1.117...
    """
    a, b, v, t = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in
                                       (alpha_per_K, bulk_modulus_Pa, molar_volume_m3_per_mol, temperatures)))
    return a * a * b * v * t


def nernst_lindemann_cp(cv, temperatures, a_mol_per_J):
    r"""C_p from C_v with :math:`C_p - C_v = A C_p^2 T` [J/(mol K)].

    Parameters
    ----------
    cv : array_like
        C_v [J/(mol K)].
    temperatures : array_like
        T [K].
    a_mol_per_J : float
        A [mol/J], >= 0.

    Returns
    -------
    numpy.ndarray
        :math:`C_p = 2C_v/(1+\sqrt{1-4ATC_v})`; where :math:`4ATC_v > 1`
        (no real root, far outside the form's use) the root is clipped to 2C_v.

    References
    ----------
    .. [1] W. Nernst, F. A. Lindemann, Z. Elektrochem. 17, 817 (1911).

    Examples
    --------
    >>> cp = nernst_lindemann_cp(24.0, 300.0, 4e-6)
    >>> round(float(cp - 24.0 - 4e-6 * cp**2 * 300.0), 12)
    0.0
    """
    cv = np.asarray(cv, dtype=float)
    x = 4.0 * a_mol_per_J * np.asarray(temperatures, dtype=float) * cv
    return 2.0 * cv / (1.0 + np.sqrt(np.clip(1.0 - x, 0.0, None)))


@dataclass(frozen=True)
class HeatCapacityModel:
    """Which terms make up C_p(T), and their fixed inputs.

    Attributes
    ----------
    atoms : int
        Atoms per formula unit n (the Debye lattice carries 3n modes).
    lattice : {'debye', 'dos'} or None
        Lattice part: Debye(θ_D) or the DOS scaled by s; None leaves it out.
    electronic : bool
        Include γT (a metal); default False: an insulator's data carry no γ,
        and a fitted one would leak into the extrapolation below the first
        point.
    dilation : {'none', 'nernst-lindemann', 'values'}
        Dilation term; ``'values'`` interpolates ``dilation_table``.
    dos : PhononDOS, optional
        Needed for ``lattice='dos'``.
    dilation_table : tuple of arrays, optional
        (T [K], C_p − C_v [J/(mol K)]) for ``dilation='values'``, e.g. from
        :func:`dilation_from_expansion`; linear interpolation, a straight line
        to 0 at 0 K below the first value, refused above the last.
    """

    atoms: int = 1
    lattice: str | None = "debye"
    electronic: bool = False
    dilation: str = "nernst-lindemann"
    dos: object = None
    dilation_table: tuple | None = field(default=None, repr=False)
    _curve: object = field(default=None, init=False, repr=False, compare=False)

    def __post_init__(self):
        if self.lattice not in LATTICES + (None,):
            raise OptionError(f"unknown lattice part {self.lattice!r}; choose debye or dos")
        if self.dilation not in DILATIONS:
            raise OptionError(f"unknown dilation term {self.dilation!r}; choose {', '.join(DILATIONS)}")
        if self.lattice == "dos" and self.dos is None:
            raise OptionError("the DOS lattice part needs a DOS (--dos)")
        if self.dilation == "values" and self.dilation_table is None:
            raise OptionError("the dilation term 'values' needs a table of T and C_p - C_v")
        if int(self.atoms) < 1:
            raise OptionError(f"atoms per formula unit must be >= 1, got {self.atoms}")
        if self.lattice == "dos":          # its sums computed once, for every trial scale of a fit
            object.__setattr__(self, "_curve", DosHeatCapacity(self.dos))

    @property
    def parameters(self):
        """Names of this model's parameters, in fit order."""
        names = {"debye": ["theta_D_K"], "dos": ["scale"], None: []}[self.lattice]
        if self.electronic:
            names.append("gamma_J_per_mol_K2")
        if self.dilation == "nernst-lindemann":
            names.append("dilation_A_mol_per_J")
        return tuple(names)

    @property
    def description(self):
        """The terms in words, e.g. ``'Debye + γT + Nernst–Lindemann'``."""
        words = {"debye": ["Debye(θ_D)"], "dos": ["DOS(ν·s)"], None: []}[self.lattice]
        if self.electronic:
            words.append("γT")
        words += {"none": [], "nernst-lindemann": ["Nernst–Lindemann A·C_p²·T"],
                  "values": ["given C_p − C_v"]}[self.dilation]
        return " + ".join(words) or "nothing"

    def parts(self, temperatures, values):
        """Each term at T for parameter ``values`` (dict by name) [J/(mol K)].

        Returns
        -------
        dict
            ``lattice``, ``electronic``, ``heat_capacity_v``, ``dilation``,
            ``heat_capacity_p``, arrays like ``temperatures``.

        Examples
        --------
        >>> m = HeatCapacityModel(atoms=1, electronic=True, dilation="none")
        >>> p = m.parts([1e6], {"theta_D_K": 300.0, "gamma_J_per_mol_K2": 1e-3})
        >>> round(float(p["heat_capacity_p"][0] - 1e3) / (3 * 8.314462618), 6)
        1.0
        """
        t = np.atleast_1d(np.asarray(temperatures, dtype=float))
        return self.completed(t, self.lattice_part(t, values), values)

    def lattice_part(self, temperatures, values):
        """The lattice term alone at T [J/(mol K)] (Debye(θ_D) or the scaled DOS; 0 without one)."""
        t = np.atleast_1d(np.asarray(temperatures, dtype=float))
        if self.lattice == "debye":
            return debye_heat_capacity(t, values["theta_D_K"], 3 * int(self.atoms))
        if self.lattice == "dos":
            return sc.R * self._curve(t / values["scale"])
        return np.zeros_like(t)

    def completed(self, temperatures, lattice, values):
        """All terms given the lattice term; arrays of any shape (broadcast) [J/(mol K)], as :meth:`parts`."""
        t = np.asarray(temperatures, dtype=float)
        electronic = values["gamma_J_per_mol_K2"] * t if self.electronic else np.zeros_like(t)
        cv = lattice + electronic
        if self.dilation == "nernst-lindemann":
            cp = nernst_lindemann_cp(cv, t, values["dilation_A_mol_per_J"])
        elif self.dilation == "values":
            cp = cv + self._given_dilation(t)
        else:
            cp = cv
        return {"lattice": lattice, "electronic": electronic, "heat_capacity_v": cv,
                "dilation": cp - cv, "heat_capacity_p": cp}

    def heat_capacity_p(self, temperatures, values):
        """C_p(T) [J/(mol K)] for parameter ``values`` (dict by name)."""
        return self.parts(temperatures, values)["heat_capacity_p"]

    def _given_dilation(self, t):
        tt, dc = (np.asarray(v, dtype=float) for v in self.dilation_table)
        order = np.argsort(tt)
        tt, dc = tt[order], dc[order]
        if np.any(t > tt.max() * (1 + 1e-12)):
            raise OptionError(f"the given C_p - C_v values end at {tt.max():g} K; "
                              f"the model is needed up to {t.max():g} K")
        if tt[0] > 0:   # C_p - C_v vanishes at 0 K: straight line to 0 below the first value
            tt, dc = np.concatenate([[0.0], tt]), np.concatenate([[0.0], dc])
        return np.interp(t, tt, dc)


def low_temperature_analysis(temperatures, heat_capacity, atoms, sigma=None, t_max=None):
    r"""γ, β and θ_D from a straight line C/T = γ + βT² at low temperature.

    Parameters
    ----------
    temperatures, heat_capacity : array_like
        T [K] and C_p [J/(mol K)] (C_p ≈ C_v at low T).
    atoms : int
        Atoms per formula unit n.
    sigma : array_like, optional
        Standard uncertainties of C [J/(mol K)]; weights 1/(σ/T)².
    t_max : float, optional
        Highest temperature used [K]; default all points given.

    Returns
    -------
    dict
        ``gamma_J_per_mol_K2``, ``beta_J_per_mol_K4``, ``theta_D_K``, each
        ``{value, uncertainty}``, plus ``points`` and ``range_K``.

    Notes
    -----
    :math:`\theta_D = (12\pi^4 nR/(5\beta))^{1/3}`,
    :math:`u(\theta_D) = \theta_D\,u(\beta)/(3\beta)`.  Valid only well
    below θ_D/50 (common practice); above that the T⁵ terms bend the line.

    References
    ----------
    .. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (1976), ch. 23.

    Examples
    --------
    >>> t = np.linspace(1.0, 5.0, 9)
    >>> beta = 12 * np.pi**4 * 8.314462618 / 5 / 400.0**3
    >>> r = low_temperature_analysis(t, 1e-3 * t + beta * t**3, 1)
    >>> round(r["theta_D_K"]["value"], 6), round(r["gamma_J_per_mol_K2"]["value"], 9)
    (400.0, 0.001)
    """
    t = np.asarray(temperatures, dtype=float)
    c = np.asarray(heat_capacity, dtype=float)
    keep = t <= (np.inf if t_max is None else t_max)
    if keep.sum() < 3:
        raise OptionError(f"the C/T analysis needs >= 3 points below {t_max} K, found {int(keep.sum())}")
    t, c = t[keep], c[keep]
    y = c / t
    w = np.ones_like(t) if sigma is None else t / np.asarray(sigma, dtype=float)[keep]
    design = np.column_stack([np.ones_like(t), t * t]) * w[:, None]
    coef, *_ = np.linalg.lstsq(design, y * w, rcond=None)
    resid = (design @ coef - y * w)
    dof = t.size - 2
    scale = float(resid @ resid) / dof if (sigma is None and dof > 0) else 1.0
    if sigma is not None and dof > 0:
        scale = max(1.0, float(resid @ resid) / dof)
    cov = np.linalg.inv(design.T @ design) * scale
    gamma, beta = (float(v) for v in coef)
    ug, ub = (float(np.sqrt(max(cov[k, k], 0.0))) for k in range(2))
    theta = (12 * np.pi ** 4 * int(atoms) * sc.R / (5 * beta)) ** (1 / 3) if beta > 0 else float("nan")
    return {"gamma_J_per_mol_K2": {"value": gamma, "uncertainty": ug},
            "beta_J_per_mol_K4": {"value": beta, "uncertainty": ub},
            "theta_D_K": {"value": float(theta), "uncertainty": float(theta * ub / (3 * beta)) if beta > 0
                          else float("nan")},
            "points": int(t.size), "range_K": [float(t.min()), float(t.max())]}
