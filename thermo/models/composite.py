"""Composite model: a Debye term for the acoustic branches plus Einstein terms.

Per formula unit of n atoms, a Debye spectrum carries the 3 acoustic modes
and K Einstein terms share the other 3n − 3 (optical) modes equally.  The
starting parameters come from the DOS — the acoustic θ_D from the ν²
coefficient, each θ_E from the logarithmic moment of its share of the
optical spectrum — and are then refined by least squares on C_v(T).

References
----------
.. [1] G. Grimvall, *Thermophysical Properties of Materials*, enlarged ed.
   (Elsevier, Amsterdam, 1999), ch. 6 (Debye plus Einstein description of
   acoustic and optical branches).
.. [2] P. Debye, Ann. Phys. 344, 789-839 (1912); A. Einstein, Ann. Phys. 327,
   180-190 (1907).
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field

import numpy as np
from scipy import constants as sc

from ..errors import OptionError
from ..kernels.direct import SUM_KEYS
from ..kernels.quadrature import mode_quadrature, trapezoid_weights
from ..kernels.planck import H_OVER_K_THZ
from .tabulation import model_table
from .debye import debye_sums
from .einstein import einstein_sums
from .fitting import fit_temperatures, least_squares_fit

#: Acoustic modes per formula unit (three branches).
ACOUSTIC_MODES = 3.0


@dataclass(frozen=True)
class CompositeModel:
    """Parameters of a Debye + Einstein(s) description of a DOS.

    Attributes
    ----------
    debye_theta_K : float
        θ_D of the acoustic Debye term [K].
    einstein_thetas_K : tuple of float
        θ_E of each optical Einstein term [K] (empty for one atom per
        formula unit).
    einstein_modes : tuple of float
        Modes carried by each Einstein term [1]; they add up to 3n − 3.
    debye_modes : float
        Modes of the Debye term (3) [1].
    debye_theta_uncertainty_K : float or None
        Standard uncertainty of θ_D from the C_v fit [K] (None if not fitted).
    einstein_uncertainties_K : tuple
        Standard uncertainties of the θ_E [K].
    initial : dict
        The DOS-derived starting values (``debye_theta_K``, ``einstein_thetas_K``).
    fit_range_K : tuple or None
        Temperature range of the refinement [K].
    rms_residual_J_per_mol_K : float or None
        rms C_v misfit of the refinement [J/(mol K)].
    """

    debye_theta_K: float
    einstein_thetas_K: tuple
    einstein_modes: tuple
    debye_modes: float = ACOUSTIC_MODES
    debye_theta_uncertainty_K: float | None = None
    einstein_uncertainties_K: tuple = ()
    initial: dict = field(default_factory=dict)
    fit_range_K: tuple | None = None
    rms_residual_J_per_mol_K: float | None = None

    def as_dict(self):
        """JSON-able dictionary of the parameters."""
        out = asdict(self)
        out["einstein_thetas_K"] = list(self.einstein_thetas_K)
        out["einstein_modes"] = list(self.einstein_modes)
        out["einstein_uncertainties_K"] = list(self.einstein_uncertainties_K)
        out["fit_range_K"] = None if self.fit_range_K is None else list(self.fit_range_K)
        return out

    @classmethod
    def from_dict(cls, data):
        """Rebuild a model from :meth:`as_dict` output (e.g. JSON in a browser store).

        Examples
        --------
        >>> m = CompositeModel(300.0, (600.0,), (3.0,))
        >>> CompositeModel.from_dict(m.as_dict()) == m
        True
        """
        values = dict(data)
        for key in ("einstein_thetas_K", "einstein_modes", "einstein_uncertainties_K"):
            values[key] = tuple(values.get(key) or ())
        if values.get("fit_range_K") is not None:
            values["fit_range_K"] = tuple(values["fit_range_K"])
        return cls(**values)


def composite_sums(model, temperatures):
    r"""Kernel sums of a composite model (Debye term + Einstein terms).

    Parameters
    ----------
    model : CompositeModel
        Parameters.
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.

    Returns
    -------
    dict
        As :func:`thermo.kernels.sums.thermal_sums` [1].

    Notes
    -----
    :math:`\Sigma_K = \Sigma_K^{D}(\theta_D, 3) + \sum_k \Sigma_K^{E}(\theta_k, m_k)`.

    Examples
    --------
    >>> m = CompositeModel(300.0, (600.0,), (3.0,))
    >>> round(float(composite_sums(m, [1e8])["heat_capacity"][0]), 6)
    6.0
    """
    parts = [debye_sums(model.debye_theta_K, model.debye_modes, temperatures)]
    parts += [einstein_sums(th, m, temperatures) for th, m in zip(model.einstein_thetas_K, model.einstein_modes)]
    return {key: sum(p[key] for p in parts) for key in SUM_KEYS + ("entropy", "zero_point_thz")}


def composite_table(model, temperatures, per="formula", atoms=None, formula=None):
    r"""C_v, S, U, F of a composite model, columns as ``tabulate``.

    Parameters
    ----------
    model : CompositeModel
        Parameters.
    temperatures : array_like
        Temperatures [K], >= 0.
    per, atoms, formula
        Basis, as in :func:`thermo.tables.tabulate`; ``atoms`` defaults to
        all modes / 3.

    Returns
    -------
    pandas.DataFrame
        Columns of :data:`thermo.tables.COLUMNS`.

    Notes
    -----
    Sum of the Debye table (3 modes, θ_D) and Einstein tables
    (:math:`m_k` modes, :math:`\theta_k`); see :func:`debye_table`,
    :func:`einstein_table`.

    References
    ----------
    .. [1] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.

    Examples
    --------
    >>> m = CompositeModel(300.0, (600.0,), (3.0,))
    >>> round(float(composite_table(m, [1e8]).heat_capacity_v_J_per_mol_K[0]) / (6 * 8.314462618), 6)
    1.0
    """
    modes = model.debye_modes + sum(model.einstein_modes)
    return model_table(composite_sums(model, temperatures), temperatures, per, atoms, formula, modes)


def _acoustic_theta(dos):
    """θ_D of the 3-mode acoustic Debye term and its ν² coefficient."""
    fit = dos.low_frequency
    if fit is not None and fit.coefficient > 0:
        coefficient = fit.coefficient
        return H_OVER_K_THZ * (9.0 / coefficient) ** (1.0 / 3.0), coefficient
    # No ν² fit: put the Debye edge where the lowest 3 modes are used up.
    nodes, weights = mode_quadrature(dos)
    cumulative = np.cumsum(weights)
    edge = float(nodes[min(np.searchsorted(cumulative, ACOUSTIC_MODES), nodes.size - 1)])
    return H_OVER_K_THZ * edge, 9.0 / edge ** 3


def _split_equal(weights, terms):
    """Split ascending node weights into ``terms`` groups of equal modes."""
    cumulative = np.cumsum(weights)
    total = cumulative[-1]
    groups = []
    for j in range(terms):
        low, high = j * total / terms, (j + 1) * total / terms
        groups.append(np.clip(cumulative, low, high) - np.clip(cumulative - weights, low, high))
    return groups


def optical_weights(dos, acoustic_coefficient, acoustic_cutoff_thz):
    r"""Mode weights of the DOS left after removing the acoustic Debye band.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    acoustic_coefficient : float
        :math:`A_{ac} = 9/\nu_{D,ac}^3` [1/THz³].
    acoustic_cutoff_thz : float
        :math:`\nu_{D,ac}` [THz].

    Returns
    -------
    nodes : numpy.ndarray
        Tabulated frequencies > 0 [THz].
    weights : numpy.ndarray
        :math:`\max(g - A_{ac}\nu^2\,[\nu<\nu_{D,ac}], 0)\,\Delta\nu` [modes].

    Notes
    -----
    The analytic ν² part of the DOS below its cut-off is acoustic by
    construction and carries no optical weight.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> d = PhononDOS(np.array([1.0, 2.0, 3.0]), np.array([1.0, 1.0, 1.0]), atoms=1)
    >>> optical_weights(d, 0.0, 1.0)[1].tolist()
    [0.5, 1.0, 0.5]
    """
    nu = np.asarray(dos.frequency_thz, float)
    acoustic = np.where(nu < acoustic_cutoff_thz, acoustic_coefficient * nu ** 2, 0.0)
    weights = np.clip(np.asarray(dos.dos, float) - acoustic, 0.0, None) * trapezoid_weights(nu)
    keep = nu > 0
    return nu[keep], weights[keep]


def composite_initial(dos, optical_terms=1):
    r"""Composite parameters taken directly from the DOS (no fit).

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS with n atoms per formula unit.
    optical_terms : int
        Number K of Einstein terms for the 3n − 3 optical modes (>= 1).

    Returns
    -------
    CompositeModel
        θ_D of the acoustic term and θ_E of each optical term.

    Notes
    -----
    Acoustic term: :math:`\theta_{D,ac} = (h/k_B)(9/A)^{1/3}` from the
    DOS's ν² coefficient A (3 modes in :math:`A\nu^2` up to
    :math:`\nu_{D,ac}`); without a ν² fit, :math:`\nu_{D,ac}` is the
    frequency below which 3 modes lie.  Optical part:
    :math:`g_{opt} = \max(g - A\nu^2\Theta(\nu_{D,ac}-\nu), 0)`, cut
    into K slices of equal modes (ascending ν); each slice's
    :math:`\theta_k = (h/k_B)\exp\langle\ln\nu\rangle_k` (entropy
    matching) and :math:`m_k = (3n-3)/K`.

    References
    ----------
    .. [1] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.
    .. [2] T. H. K. Barron, W. T. Berg, J. A. Morrison, Proc. R. Soc. Lond.
       A 242, 478-492 (1957) (logarithmic moment).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS, LowFrequencyFit
    >>> nu = np.linspace(3.0, 9.0, 6001)
    >>> peak = 3 * np.exp(-0.5 * ((nu - 8) / 0.02) ** 2) / (0.02 * np.sqrt(2 * np.pi))
    >>> d = PhononDOS(nu, peak, atoms=2, low_frequency=LowFrequencyFit(9 / 27, 3.0, (0.0, 3.0)))
    >>> m = composite_initial(d)
    >>> round(m.debye_theta_K / (3 * H_OVER_K_THZ), 9), round(m.einstein_thetas_K[0] / (8 * H_OVER_K_THZ), 5)
    (1.0, 1.0)
    """
    terms = int(optical_terms)
    if terms < 1:
        raise OptionError(f"optical terms must be >= 1, got {optical_terms}")
    theta_ac, coefficient = _acoustic_theta(dos)
    optical = 3.0 * dos.atoms - ACOUSTIC_MODES
    thetas, modes = (), ()
    if optical > 0:
        nodes, weights = optical_weights(dos, coefficient, theta_ac / H_OVER_K_THZ)
        if weights.sum() <= 0:
            from .moments import einstein_entropy_temperature
            thetas = (einstein_entropy_temperature(dos),) * terms
        else:
            thetas = tuple(float(H_OVER_K_THZ * np.exp(np.sum(w * np.log(nodes)) / np.sum(w)))
                           for w in _split_equal(weights, terms))
        modes = (optical / terms,) * terms
    return CompositeModel(debye_theta_K=float(theta_ac), einstein_thetas_K=thetas, einstein_modes=modes,
                          initial={"debye_theta_K": float(theta_ac), "einstein_thetas_K": list(thetas)})


def composite_model(dos, optical_terms=1, fit_range=None, refine=True):
    r"""Composite model of a DOS, refined by least squares on C_v(T).

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    optical_terms : int
        Number of Einstein terms for the optical modes.
    fit_range : tuple of float, optional
        (T_min, T_max) [K]; :func:`thermo.models.fitting.default_fit_range`
        when None.
    refine : bool
        False returns the DOS-derived values of :func:`composite_initial`.

    Returns
    -------
    CompositeModel
        Refined θ's with standard uncertainties, the fit range, the starting
        values in ``initial``.

    Notes
    -----
    Minimises :math:`\sum_j [C_v^{D}(T_j;\theta_D,3) + \sum_k C_v^{E}(T_j;\theta_k,m_k) - C_v^{DOS}(T_j)]^2`
    over :math:`\theta_D, \theta_1..\theta_K` with the mode counts fixed.

    References
    ----------
    .. [1] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.
    .. [2] W. H. Press et al., *Numerical Recipes*, 3rd ed. (2007), §15.4.

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> m = composite_model(debye_spectrum(300.0))     # one atom: the Debye term alone
    >>> round(m.debye_theta_K, 6), m.einstein_thetas_K
    (300.0, ())
    """
    start = composite_initial(dos, optical_terms)
    if not refine:
        return start
    t, cv = fit_temperatures(dos, fit_range)

    def model(tt, p):
        trial = CompositeModel(p[0], tuple(p[1:]), start.einstein_modes)
        return sc.R * composite_sums(trial, tt)["heat_capacity"]

    fit = least_squares_fit(model, t, cv, [start.debye_theta_K, *start.einstein_thetas_K])
    return CompositeModel(debye_theta_K=fit.parameters[0], einstein_thetas_K=fit.parameters[1:],
                          einstein_modes=start.einstein_modes, debye_theta_uncertainty_K=fit.uncertainties[0],
                          einstein_uncertainties_K=fit.uncertainties[1:], initial=start.initial,
                          fit_range_K=fit.fit_range_K, rms_residual_J_per_mol_K=fit.rms_residual_J_per_mol_K)
