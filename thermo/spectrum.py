"""The phonon DOS object handed between reading, physics and presentation."""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

from .kernels.planck import H_OVER_K_THZ

#: 48-point Gauss–Legendre rule of the taper integrals (computed once: building it costs more than using it).
_TAPER_RULE = np.polynomial.legendre.leggauss(48)


@dataclass(frozen=True)
class LowFrequencyFit:
    r"""Debye (ν²) form that replaces the DOS below ``cutoff_thz``.

    Attributes
    ----------
    coefficient : float
        :math:`A` in :math:`g(\nu) = A\nu^2` [states / THz³ per formula unit],
        after normalisation.
    cutoff_thz : float
        Below this frequency the DOS is :math:`A\nu^2` [THz].
    window_thz : tuple of float
        Frequency window the coefficient was fitted over [THz].
    offset : float
        Constant fitted beside :math:`A\nu^2` (smearing/binning) [states / THz].
    rms_relative_residual : float
        Relative rms misfit of the fit in the window [1].
    automatic : bool
        True when the window was chosen automatically.
    curvature : float
        :math:`b` in :math:`A\nu^2(1 + b\nu^2 + c\nu^4)` [1 / THz²].
    quartic : float
        :math:`c` in :math:`A\nu^2(1 + b\nu^2 + c\nu^4)` [1 / THz⁴].
    coefficient_uncertainty : float
        Standard error of :math:`A` from the fit [same unit as ``coefficient``].
    blend_top_thz : float or None
        Top of the zone above the cut-off where the form is blended into the
        data [THz].
    species_shares : dict of str to float
        Share of each partial column in the analytic part (its share of the
        DOS in the fit window) [1].
    smooth_taper : bool
        The step of :meth:`taper` is infinitely smooth (a mode list's
        continuum, whose complement is summed on a mesh), :math:`1/(1+e^{1/(1-s)-1/s})`, instead of
        :math:`1 - s^2(3-2s)`.
    """

    coefficient: float
    cutoff_thz: float
    window_thz: tuple
    offset: float = 0.0
    rms_relative_residual: float = 0.0
    automatic: bool = True
    curvature: float = 0.0
    quartic: float = 0.0
    coefficient_uncertainty: float = 0.0
    blend_top_thz: float | None = None
    species_shares: dict = field(default_factory=dict)
    smooth_taper: bool = False

    def form(self, frequency_thz):
        r"""The fitted form :math:`A\nu^2(1+b\nu^2+c\nu^4)` [states / THz]."""
        nu = np.asarray(frequency_thz, dtype=float)
        return self.coefficient * nu ** 2 * (1.0 + nu ** 2 * (self.curvature + self.quartic * nu ** 2))

    def taper(self, frequency_thz):
        """Share :math:`W` of the fitted form in the DOS: 1 below the cut-off, smooth step to 0 at ``blend_top_thz``."""
        nu = np.asarray(frequency_thz, dtype=float)
        top = self.blend_top_thz if self.blend_top_thz is not None else self.cutoff_thz
        if top <= self.cutoff_thz:
            return np.where(nu <= self.cutoff_thz, 1.0, 0.0)
        s = np.clip((nu - self.cutoff_thz) / (top - self.cutoff_thz), 0.0, 1.0)
        if self.smooth_taper:       # C^∞: 1 - e^{-1/s} / (e^{-1/s} + e^{-1/(1-s)})
            with np.errstate(divide="ignore", over="ignore", invalid="ignore"):
                return 1.0 / (1.0 + np.exp(1.0 / (1.0 - s) - 1.0 / s))
        return 1.0 - s * s * (3.0 - 2.0 * s)

    def taper_nodes(self):
        r"""Gauss–Legendre nodes [THz] and modes [1] of :math:`W\,A\nu^2(\dots)` above the cut-off.

        Examples
        --------
        >>> f = LowFrequencyFit(9.0, 1.0, (1.0, 4.0), blend_top_thz=2.0)
        >>> nodes, modes = f.taper_nodes()
        >>> round(float(modes.sum()), 10)       # ∫_1^2 9ν² (1 - 3s² + 2s³) dν = 9 · 13/15, s = ν - 1
        7.8
        """
        top = self.blend_top_thz if self.blend_top_thz is not None else self.cutoff_thz
        if top <= self.cutoff_thz:
            return np.zeros(0), np.zeros(0)
        x, w = _TAPER_RULE
        half = 0.5 * (top - self.cutoff_thz)
        nodes = self.cutoff_thz + half * (x + 1.0)
        return nodes, half * w * self.form(nodes) * self.taper(nodes)

    def analytic_moment(self, power=0) -> float:
        r""":math:`\int_0^{\nu_c} \nu^p A\nu^2(1+b\nu^2+c\nu^4)\,d\nu` [modes · THz^p].

        Examples
        --------
        >>> LowFrequencyFit(9.0, 1.0, (0.0, 1.0)).analytic_moment()
        3.0

        Includes the tapered part above the cut-off (:meth:`taper_nodes`).
        """
        nc = self.cutoff_thz
        nodes, modes = self.taper_nodes()
        return float(np.sum(modes * nodes ** power) + self.coefficient * (nc ** (3 + power) / (3 + power)
                                         + self.curvature * nc ** (5 + power) / (5 + power)
                                         + self.quartic * nc ** (7 + power) / (7 + power)))

    def prepared_sums(self):
        """The closed-form kernel sums of the analytic part, prepared on first use and kept.

        Returns
        -------
        tuple
            As :func:`thermo.kernels.nu2.prepared_analytic_part`.
        """
        prepared = self.__dict__.get("_prepared_sums")
        if prepared is None:
            from .kernels.nu2 import prepared_analytic_part
            prepared = prepared_analytic_part(self)
            self.__dict__["_prepared_sums"] = prepared      # beside the frozen fields, not one of them
        return prepared

    def scaled(self, factor):
        """The same fit with the DOS multiplied by ``factor`` [1]."""
        return replace(self, coefficient=self.coefficient * factor, offset=self.offset * factor,
                       coefficient_uncertainty=self.coefficient_uncertainty * factor)


@dataclass(frozen=True)
class ModeList:
    r"""The modes of a q-point mesh, summed one by one (no smearing).

    Attributes
    ----------
    frequency_thz : numpy.ndarray, shape (N,)
        Ascending real mode frequencies [THz], >= 0 (the acoustic modes of the
        innermost q-shell left out when ``continuum`` replaces them).
    weight : numpy.ndarray, shape (N,)
        Modes per formula unit each mode carries (its q-point weight after
        normalisation) [1].
    partials : dict of str to numpy.ndarray
        Each species' share of ``weight`` (projection × weight), same order [1].
    continuum : tuple of LowFrequencyFit
        The elastic continuum of each acoustic branch inside the innermost
        q-shell (empty when not built).
    cell_volume_a3 : float or None
        Cell volume stated by the file [Å³].
    resolved_thz : float
        Lowest frequency the list resolves: the lowest acoustic frequency of
        the innermost q-shell without Γ (or the lowest real mode) [THz].
    extra : tuple of numpy.ndarray
        Quadrature nodes [THz] and mode weights [1] (either sign) of the
        continuum's dispersion beyond :math:`A_j\nu^2`.
    velocities : dict
        The long-wave fit when a continuum was built: ``inverse_cube_mean``
        (direction mean of :math:`\sum_j c_j^{-3}`, [(100 m/s)⁻³] = [(Å·THz)⁻³]),
        ``points`` used, ``shell_radius_per_A``.
    alternatives : callable or None
        Builds ``((factor, ModeList), …)``: the same list under other
        plausible long-wave treatments, each with the factor its difference
        to this one is counted with in the error estimate
        (:mod:`thermo.accuracy.breakdown`); None without a continuum.

    Notes
    -----
    A sum over the list is :math:`\sum_i w_i K(h\nu_i/k_BT)` plus the
    closed-form integral of each continuum branch
    :math:`A_j\nu^2(1+b_j\nu^2)` on :math:`[0, \nu_{c,j}]`.

    Examples
    --------
    >>> m = ModeList(np.array([1.0, 2.0]), np.array([1.5, 1.5]))
    >>> m.mode_count
    3.0
    """

    frequency_thz: np.ndarray
    weight: np.ndarray
    partials: dict = field(default_factory=dict)
    continuum: tuple = ()
    cell_volume_a3: float | None = None
    resolved_thz: float = 0.0
    velocities: dict = field(default_factory=dict)
    extra: tuple = (np.zeros(0), np.zeros(0))
    alternatives: object = None

    @property
    def mode_count(self) -> float:
        """Modes carried by the list and its continuum [per formula unit]."""
        return self.moment(0)

    def moment(self, power) -> float:
        r""":math:`\sum_i w_i\nu_i^p` plus the continuum's :math:`\int \nu^p g\,d\nu` [modes · THz^p]."""
        nodes, modes = self.extra
        return float(np.sum(self.weight * self.frequency_thz ** power) + np.sum(modes * nodes ** power)) + sum(
            f.analytic_moment(power) for f in self.continuum)

    def species_shares(self) -> dict:
        """Each species' share of the continuum: its share of the modes below the top of the blend [1].

        Examples
        --------
        >>> m = ModeList(np.array([1.0, 2.0]), np.array([1.0, 1.0]), {"A": np.array([0.5, 1.0])})
        >>> m.species_shares()
        {'A': 0.0}
        """
        top = max((f.blend_top_thz or f.cutoff_thz for f in self.continuum), default=0.0)
        low = self.frequency_thz <= top
        whole = float(self.weight[low].sum())
        return {k: float(v[low].sum()) / whole if whole > 0 else 0.0 for k, v in self.partials.items()}

    def summary(self) -> dict:
        """What the list holds, for provenance: modes, continuum, velocities, resolved limit.

        Examples
        --------
        >>> ModeList(np.array([1.0, 2.0]), np.array([1.5, 1.5])).summary()["modes"]
        2
        """
        return {"modes": int(self.frequency_thz.size), "elastic_continuum": bool(self.continuum),
                "continuum_modes": float(sum(f.analytic_moment() for f in self.continuum) + np.sum(self.extra[1])),
                "resolved_THz": float(self.resolved_thz), "cell_volume_A3": self.cell_volume_a3,
                "inverse_cube_speed_mean_per_A3_THz3": self.velocities.get("inverse_cube_mean"),
                "dispersion_corrected": self.velocities.get("dispersion_corrected")}

    def continuum_debye_temperature_k(self, atoms) -> float | None:
        r"""Debye temperature of the continuum's summed :math:`A = \sum_j A_j` [K], or None."""
        a = sum(f.coefficient for f in self.continuum)
        return float(H_OVER_K_THZ * (9.0 * atoms / a) ** (1.0 / 3.0)) if a > 0 else None


@dataclass(frozen=True)
class PhononDOS:
    """A normalised phonon DOS ready for thermodynamic integration.

    The spectrum is ``A ν² (1 + b ν² + c ν⁴)`` on ``[0, cutoff]`` (when ``low_frequency`` is set)
    followed by the piecewise-linear tabulated part ``frequency_thz``/``dos``
    (which then starts at the cut-off).  Its total integral is ``3 * atoms``
    minus the imaginary modes dropped under policy ``drop-unscaled``.

    Attributes
    ----------
    frequency_thz : numpy.ndarray, shape (N,)
        Ascending frequencies of the tabulated part [THz], all >= 0.
    dos : numpy.ndarray, shape (N,)
        DOS [states / THz per formula unit].
    partials : dict of str to numpy.ndarray
        Species-projected DOS on the same grid and scale [states / THz].
    atoms : int
        Atoms per formula unit, n.
    low_frequency : LowFrequencyFit or None
        The ν² replacement below the cut-off, or None when switched off.
    source : dict
        Provenance: ``name``, ``sha256``, ``freq_unit``, ``raw_integral``,
        ``scale_factor``, ``negative_mode_fraction``, ``negative_policy``,
        ``atoms_inferred``.
    warnings : tuple of str
        One-line cautions gathered while loading.
    input_frequency_thz, input_dos : numpy.ndarray
        The spectrum as read (all frequencies, including negative ones),
        converted to THz and scaled by the same normalisation factor, for plots.
    input_partials : dict of str to numpy.ndarray
        The partial columns as read, on ``input_frequency_thz``, same scale.
    modes : ModeList or None
        For a mode list: the modes the sums run over; ``frequency_thz``/``dos``
        then hold a histogram of them for plots and moment-based models.
    """

    frequency_thz: np.ndarray
    dos: np.ndarray
    atoms: int
    partials: dict = field(default_factory=dict)
    low_frequency: LowFrequencyFit | None = None
    source: dict = field(default_factory=dict)
    warnings: tuple = ()
    input_frequency_thz: np.ndarray | None = None
    input_dos: np.ndarray | None = None
    input_partials: dict = field(default_factory=dict)
    modes: ModeList | None = None

    def __getstate__(self):
        """Pickled without what is kept beside the fields for speed (derived, rebuilt on first use)."""
        return {k: v for k, v in self.__dict__.items() if k not in ("_prepared_grid", "_rebuilt", "_error_digests")}

    @property
    def mode_count(self) -> float:
        """Number of real modes carried by the spectrum [per formula unit]."""
        if self.modes is not None:
            return self.modes.mode_count
        from .kernels.quadrature import mode_weights
        total = float(mode_weights(self.frequency_thz, self.dos).sum())
        if self.low_frequency is not None:
            total += self.low_frequency.analytic_moment()
        return total

    def low_frequency_debye_temperature_k(self) -> float | None:
        r"""Debye temperature from the fitted ν² coefficient (elastic limit) [K].

        Notes
        -----
        For 3 acoustic branches, :math:`g(\nu) \to 9 N \nu^2/\nu_D^3` with
        :math:`N` the atoms per formula unit when every one of the :math:`3N`
        modes is counted in a single Debye spectrum, hence
        :math:`\theta_D = (h/k_B)(9N/A)^{1/3}`.

        References
        ----------
        .. [1] P. Debye, "Zur Theorie der spezifischen Wärmen", Ann. Phys.
           344, 789-839 (1912).
        """
        if self.modes is not None:
            return self.modes.continuum_debye_temperature_k(self.atoms)
        if self.low_frequency is None or self.low_frequency.coefficient <= 0:
            return None
        return float(H_OVER_K_THZ * (9.0 * self.atoms / self.low_frequency.coefficient) ** (1.0 / 3.0))
