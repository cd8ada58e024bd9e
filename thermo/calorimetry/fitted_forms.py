r"""Low-temperature forms fitted over the lowest measured points: Debye, acoustic + optical, scaled DOS.

Each form is C = γT + Σ_k g_k(T/p_k): lattice parts that depend on T only
through T/p_k (a Debye part of m modes with p = θ_D, an Einstein part with
p = θ_E, the DOS with p = s).  That gives every derivative in closed form:

* :math:`\partial C/\partial\ln p = -T\,\partial C/\partial T`; for a Debye
  part :math:`3mR\,[c(y) - D_c(y)]` (y = θ/T, c the Einstein function), for
  an Einstein part :math:`mR\,c(x)\,[2 - x\coth(x/2)]`;
* :math:`\partial S(T_1)/\partial\ln p = -C(T_1)` and
  :math:`\partial H(T_1)/\partial\ln p = H(T_1) - T_1C(T_1)` (S is a
  function of T/p; H = p·h(T/p)),

so the fit (Levenberg–Marquardt in ln p, status checked) costs one kernel
evaluation per step and the uncertainty of S(T₁), H(T₁) none more.

A form is *admissible* when it describes the points it was fitted to (rms
relative misfit at most :data:`ADMISSIBLE_MISFIT`, or χ² consistent with
stated uncertainties, 99th percentile) and they fix it (u of S(T₁) below S(T₁)).

References
----------
.. [1] P. Debye, "Zur Theorie der spezifischen Wärmen", Ann. Phys. 344,
   789-839 (1912).
.. [2] A. Einstein, "Die Plancksche Theorie der Strahlung und die Theorie der
   spezifischen Wärme", Ann. Phys. 327, 180-190 (1907).
.. [3] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Saunders, 1976),
   ch. 23 (acoustic and optical branches in the heat capacity).
.. [4] W. H. Press et al., *Numerical Recipes*, 3rd ed. (Cambridge University
   Press, 2007), §15.4-15.5 (covariance of least-squares parameters).
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc
from scipy import stats

from ..errors import FitError
from ..kernels.planck import heat_capacity_kernel
from ..models.debye import debye_heat_capacity_fraction, debye_sums
from ..models.einstein import einstein_sums
from ..models.fitting import checked_least_squares
from .extrapolation import LowTemperatureForm, lowest_points
from .models import debye_scan

#: A fitted form is admissible when its rms relative misfit over the lowest points is at most this, or
#: its χ² is consistent with the stated uncertainties (99th percentile).  Beyond it the form does not
#: describe the data it is continued from (a Debye form of 3n modes misses a compound's optical rise).
ADMISSIBLE_MISFIT = 0.02


class _Debye:
    """Debye part of ``modes`` modes, parameter θ_D."""

    def __init__(self, modes):
        self.modes = modes

    def heat_capacity(self, t, p):
        y = p / t
        d = debye_heat_capacity_fraction(y)
        return self.modes * sc.R * d, 3.0 * self.modes * sc.R * (heat_capacity_kernel(y) - d)

    def sums(self, t1, p):
        return debye_sums(p, self.modes, [t1])


class _Einstein:
    """Einstein part of ``modes`` modes, parameter θ_E."""

    def __init__(self, modes):
        self.modes = modes

    def heat_capacity(self, t, p):
        x = p / t
        c = heat_capacity_kernel(x)
        return self.modes * sc.R * c, self.modes * sc.R * c * (2.0 - x / np.tanh(0.5 * x))

    def sums(self, t1, p):
        return einstein_sums(p, self.modes, [t1])


class _ScaledDos:
    """The DOS with frequencies scaled by s (C(T/s)); derivative by a difference in ln s."""

    def __init__(self, dos):
        self.dos = dos

    def heat_capacity(self, t, p):
        from ..kernels.sums import thermal_sums
        step = 1e-5
        both = sc.R * thermal_sums(self.dos, np.concatenate([t / p, t / (p * np.exp(step))]))["heat_capacity"]
        return both[:t.size], (both[t.size:] - both[:t.size]) / step

    def sums(self, t1, p):
        from ..kernels.sums import thermal_sums
        return thermal_sums(self.dos, np.array([t1 / p]))


def _admissible(relative_misfit, chi2, points, free, absolute):
    """rms relative misfit and whether the form describes its points."""
    rms = float(np.sqrt(np.mean(np.asarray(relative_misfit) ** 2)))
    dof = points - free
    consistent = absolute and dof > 0 and chi2 <= stats.chi2.ppf(0.99, dof)
    return rms, bool(rms <= ADMISSIBLE_MISFIT or consistent)


def _variance_factor(chi2, points, free, absolute):
    """max(1, χ²_ν) with stated σ (Birge), χ²_ν with relative weights only (0 without degrees of freedom)."""
    dof = points - free
    if dof < 1:
        return 1.0 if absolute else 0.0
    return max(1.0, chi2 / dof) if absolute else chi2 / dof


def fit_form(name, parts, data, start, labels, gamma=0.0, gamma_uncertainty=0.0, absolute=True):
    r"""Fit a lattice form over the lowest points; S(T₁), H(T₁) − H(0) with their uncertainties.

    Parameters
    ----------
    name : str
        Name of the form.
    parts : list
        Lattice parts, one parameter each (see the module notes).
    data : tuple of arrays
        (T [K], C_p [J/(mol K)], σ), increasing T; the lowest points are used.
    start : sequence of float
        Starting parameters.
    labels : sequence of str
        Parameter names for the description.
    gamma, gamma_uncertainty : float
        γ [J/(mol K²)] held in the form and its standard uncertainty.
    absolute : bool
        σ are standard uncertainties (True) or relative weights (False).

    Returns
    -------
    LowTemperatureForm

    Raises
    ------
    FitError
        The fit did not converge.

    Notes
    -----
    Σ from the pseudo-inverse of JᵀJ: a parameter the points do not fix
    (an Einstein part far above them) has no weight in S(T₁) either.
    :math:`u(S)^2 = g^T\Sigma g + (\partial S/\partial\gamma)^2u_\gamma^2`
    with Σ the covariance of ln p and
    :math:`\partial S/\partial\gamma = T_1 + g^T\,\partial\ln p/\partial\gamma`,
    :math:`\partial\ln p/\partial\gamma = -(J^TJ)^{-1}J^T(T/\sigma)` (the
    lattice parts take up what γT leaves).

    References
    ----------
    .. [1] W. H. Press et al., *Numerical Recipes*, 3rd ed. (2007), §15.4-15.5.
    """
    temperatures, heat_capacity, sigma = data
    k = lowest_points(temperatures)
    t = np.asarray(temperatures, dtype=float)[:k]
    c = np.asarray(heat_capacity, dtype=float)[:k]
    s = np.asarray(sigma, dtype=float)[:k]
    lattice = c - gamma * t
    start = np.asarray(start, dtype=float)
    cache = {}

    def evaluate(x):
        key = x.tobytes()
        if key not in cache:
            p = start * np.exp(np.clip(x, -30.0, 30.0))
            pieces = [part.heat_capacity(t, q) for part, q in zip(parts, p)]
            cache.clear()
            cache[key] = (sum(v for v, _ in pieces), np.column_stack([d for _, d in pieces]))
        return cache[key]

    result = checked_least_squares(lambda x: (evaluate(x)[0] - lattice) / s, np.zeros(start.size),
                                   f"{', '.join(labels)} of the '{name}' form over the lowest points",
                                   jac=lambda x: evaluate(x)[1] / s[:, None], method="lm",
                                   xtol=1e-12, ftol=1e-12, gtol=1e-12)
    p = start * np.exp(np.clip(result.x, -30.0, 30.0))
    model, jac = evaluate(result.x)
    jac = jac / s[:, None]
    chi2 = float(np.sum(((model - lattice) / s) ** 2))
    # A parameter the points do not fix (θ_E far above them) has no weight in S(T₁) either: pseudo-inverse.
    inverse = np.linalg.pinv(jac.T @ jac, rcond=1e-12, hermitian=True)
    cov = inverse * _variance_factor(chi2, k, p.size, absolute)
    t1 = float(t[0])
    sums = [part.sums(t1, q) for part, q in zip(parts, p)]
    entropy = np.array([sc.R * float(x["entropy"][0]) for x in sums])
    enthalpy = np.array([sc.R * t1 * float(x["thermal_energy"][0]) for x in sums])
    heat = np.array([sc.R * float(x["heat_capacity"][0]) for x in sums])
    grads = {"entropy": -heat, "enthalpy": enthalpy - t1 * heat}
    values = {"entropy": float(entropy.sum()) + gamma * t1, "enthalpy": float(enthalpy.sum()) + gamma * t1 * t1 / 2}
    by_gamma = {"entropy": t1, "enthalpy": t1 * t1 / 2}
    shift = -inverse @ (jac.T @ (t / s))                                  # ∂ln p/∂γ
    u = {}
    for key, g in grads.items():
        with np.errstate(invalid="ignore"):
            part = float(g @ cov @ g)
        dgamma = by_gamma[key] + float(g @ shift)
        u[key] = float(np.sqrt(max(part, 0.0) + (dgamma * gamma_uncertainty) ** 2))
    rms, admissible = _admissible((model - lattice) / c, chi2, k, p.size, absolute)
    admissible = admissible and u["entropy"] < abs(values["entropy"])      # a form its points do not fix: out
    shown = ", ".join(f"{label} = {v:.4g}" for label, v in zip(labels, p))
    return LowTemperatureForm(name, values["entropy"], u["entropy"], values["enthalpy"], u["enthalpy"],
                              f"{shown} over {t[0]:g}-{t[-1]:g} K", float(p[0]), rms, admissible)


def debye_form(temperatures, heat_capacity, sigma, atoms, gamma=0.0, gamma_uncertainty=0.0, absolute=True):
    r"""Form C = γT + Debye C_v(θ) of 3n modes, θ fitted over the lowest points.

    Returns
    -------
    LowTemperatureForm or None
        None when no lowest point lies between 0 and the classical limit
        3nR, or the fit does not converge.

    Notes
    -----
    :math:`S(T_1) = \gamma T_1 + S_D(\theta/T_1)`,
    :math:`H(T_1) - H(0) = \gamma T_1^2/2 + U_D^{th}(T_1)` (thermal part of
    the Debye energy), from :func:`thermo.models.debye.debye_sums`.

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).

    Examples
    --------
    >>> from thermo.models.debye import debye_heat_capacity
    >>> t = np.array([20.0, 25.0, 30.0])
    >>> f = debye_form(t, debye_heat_capacity(t, 300.0, 3), 1e-3 * t, 1)
    >>> f.detail.startswith("θ_D = 300 ")
    True
    """
    modes = 3 * int(atoms)
    k = lowest_points(temperatures)
    t = np.asarray(temperatures, dtype=float)[:k]
    lattice = np.asarray(heat_capacity, dtype=float)[:k] - gamma * t
    if not np.any((lattice > 0) & (lattice < modes * sc.R)):
        return None
    start = debye_scan(t, lattice, modes, 1.0 / np.asarray(sigma, dtype=float)[:k])
    try:
        return fit_form("debye", [_Debye(modes)], (temperatures, heat_capacity, sigma), [start], ["θ_D"], gamma,
                        gamma_uncertainty, absolute)
    except FitError:
        return None


def optical_form(temperatures, heat_capacity, sigma, atoms, gamma=0.0, gamma_uncertainty=0.0, absolute=True):
    r"""Form C = γT + Debye C_v(θ_a) of 3 acoustic modes + Einstein C_v(θ_E) of 3n − 3 optical modes.

    The two-part form of a compound (n >= 2) fitted over the lowest points:
    its T³ law comes from the acoustic branches alone, so it continues the data
    to 0 K differently from a Debye form carrying all 3n modes.

    Returns
    -------
    LowTemperatureForm or None
        None for one atom per formula unit (the form is the Debye form), with
        fewer than 3 lowest points, or when no fit converges.

    Notes
    -----
    :math:`S(T_1) = \gamma T_1 + S_D(\theta_a/T_1) + S_E(\theta_E/T_1)`, H
    likewise from the thermal energies; both θ fitted in ln θ, started from
    the best pair of a 90 × 90 log grid with θ_E above θ_a and from the best
    with θ_E below (two basins); the better fit is kept.

    References
    ----------
    .. [1] A. Einstein, Ann. Phys. 327, 180 (1907); P. Debye, Ann. Phys. 344, 789 (1912).
    .. [2] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (1976), ch. 23.

    Examples
    --------
    >>> from thermo.models.debye import debye_heat_capacity
    >>> from thermo.models.einstein import einstein_heat_capacity
    >>> t = np.array([40.0, 50.0, 60.0, 70.0])
    >>> c = debye_heat_capacity(t, 250.0, 3) + einstein_heat_capacity(t, 300.0, 3)
    >>> f = optical_form(t, c, 1e-3 * c, 2)
    >>> f.detail.startswith("θ_a = 250, θ_E = 300 ")
    True
    """
    n = int(atoms)
    k = lowest_points(temperatures)
    if n < 2 or k < 3:
        return None
    t = np.asarray(temperatures, dtype=float)[:k]
    lattice = np.asarray(heat_capacity, dtype=float)[:k] - gamma * t
    if not np.all(lattice > 0):
        return None
    weights = 1.0 / np.asarray(sigma, dtype=float)[:k]
    grid = np.geomspace(max(t[0] / 20.0, 1.0), 1e4, 90)
    acoustic = 3 * sc.R * debye_heat_capacity_fraction((grid[:, None] / t[None, :]).ravel()).reshape(grid.size, k)
    optical = (3 * n - 3) * sc.R * heat_capacity_kernel(grid[:, None] / t[None, :])
    cost = np.sum(((acoustic[:, None, :] + optical[None, :, :] - lattice) * weights) ** 2, axis=2)
    above = grid[None, :] > grid[:, None]                 # θ_E above θ_a, and below: two basins
    best = None
    for side in (above, ~above):
        i, j = np.unravel_index(int(np.argmin(np.where(side, cost, np.inf))), cost.shape)
        try:
            form = fit_form("acoustic + optical", [_Debye(3), _Einstein(3 * n - 3)],
                            (temperatures, heat_capacity, sigma), [grid[i], grid[j]], ["θ_a", "θ_E"], gamma,
                            gamma_uncertainty, absolute)
        except FitError:
            continue
        if best is None or form.misfit < best.misfit:
            best = form
    return best


def dos_form(dos, temperatures, heat_capacity, sigma, gamma=0.0, gamma_uncertainty=0.0, absolute=True):
    r"""Form C = γT + C_v of the DOS with frequencies scaled by s, s fitted over the lowest points.

    Returns
    -------
    LowTemperatureForm or None
        None when the fit does not converge.

    Notes
    -----
    C_v depends on hν/k_BT only, so :math:`C(T) = C_v^{DOS}(T/s)`,
    :math:`S(T_1) = S^{DOS}(T_1/s)` and
    :math:`H(T_1) - H(0) = s\,U^{th}_{DOS}(T_1/s)`.

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912) (the scaling argument).
    """
    try:
        return fit_form("dos", [_ScaledDos(dos)], (temperatures, heat_capacity, sigma), [1.0], ["s"], gamma,
                        gamma_uncertainty, absolute)
    except FitError:
        return None
