"""Equations of state E(V): third-order Birch–Murnaghan and Vinet, fitted at many temperatures.

Every function is vectorised: parameters are arrays of shape (M,) (one set
per temperature) and volumes broadcast against them.  Energies are in eV,
volumes in Å³, pressures and bulk moduli in eV/Å³ (multiply by
:data:`GPA_PER_EV_A3` for GPa), all per formula unit.

References
----------
.. [1] F. Birch, "Finite elastic strain of cubic crystals", Phys. Rev. 71,
   809-824 (1947).
.. [2] P. Vinet, J. Ferrante, J. H. Rose, J. R. Smith, "Compressibility of
   solids", J. Geophys. Res. 92, 9319-9325 (1987).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy import constants as sc
from scipy.optimize import least_squares

from ..errors import OptionError

#: GPa per eV/Å³.
GPA_PER_EV_A3 = sc.electron_volt / sc.angstrom ** 3 / sc.giga
#: Names of the equations of state (command-line spelling).
EOS_KINDS = ("birch-murnaghan", "vinet")


def check_eos(kind):
    """Validate an equation-of-state name.

    Examples
    --------
    >>> check_eos("Vinet")
    'vinet'
    """
    name = str(kind).strip().lower().replace("_", "-")
    if name in ("bm3", "birch", "birch-murnaghan-3"):
        name = "birch-murnaghan"
    if name not in EOS_KINDS:
        raise OptionError(f"unknown equation of state {kind!r}; choose birch-murnaghan or vinet")
    return name


def birch_murnaghan_energy(volume, e0, v0, b0, b0_prime):
    r"""Third-order Birch–Murnaghan energy.

    Parameters
    ----------
    volume : array_like
        Volume [Å³].
    e0, v0, b0, b0_prime : array_like
        Minimum energy [eV], equilibrium volume [Å³], bulk modulus [eV/Å³],
        its pressure derivative [1].

    Returns
    -------
    numpy.ndarray
        Energy [eV].

    Notes
    -----
    With :math:`u = (V_0/V)^{2/3}`:

    .. math:: E = E_0 + \frac{9V_0B_0}{16}\left[(u-1)^3B_0' + (u-1)^2(6-4u)\right]

    Examples
    --------
    >>> float(birch_murnaghan_energy(20.0, -1.0, 20.0, 0.6, 4.0))
    -1.0
    """
    u = (np.asarray(v0, float) / np.asarray(volume, float)) ** (2.0 / 3.0)
    return e0 + 9.0 * v0 * b0 / 16.0 * ((u - 1) ** 3 * b0_prime + (u - 1) ** 2 * (6.0 - 4.0 * u))


def vinet_energy(volume, e0, v0, b0, b0_prime):
    r"""Vinet (universal) energy.

    Parameters
    ----------
    volume, e0, v0, b0, b0_prime : array_like
        As :func:`birch_murnaghan_energy`.

    Returns
    -------
    numpy.ndarray
        Energy [eV].

    Notes
    -----
    With :math:`\eta = (V/V_0)^{1/3}` and :math:`\xi = \tfrac32(B_0'-1)`:

    .. math:: E = E_0 + \frac{4B_0V_0}{(B_0'-1)^2}\left[1-(1+\xi(\eta-1))e^{\xi(1-\eta)}\right],
              \qquad P = 3B_0\frac{1-\eta}{\eta^2}e^{\xi(1-\eta)}

    Examples
    --------
    >>> float(vinet_energy(20.0, -1.0, 20.0, 0.6, 4.0))
    -1.0
    """
    eta = (np.asarray(volume, float) / v0) ** (1.0 / 3.0)
    xi = 1.5 * (b0_prime - 1.0)
    return e0 + 4.0 * b0 * v0 / (b0_prime - 1.0) ** 2 * (1.0 - (1.0 + xi * (eta - 1.0)) * np.exp(xi * (1.0 - eta)))


def _vinet_pressure(volume, v0, b0, b0_prime):
    eta = (volume / v0) ** (1.0 / 3.0)
    xi = 1.5 * (b0_prime - 1.0)
    return 3.0 * b0 * (1.0 - eta) / eta ** 2 * np.exp(xi * (1.0 - eta))


def _vinet_bulk(volume, v0, b0, b0_prime):
    eta = (volume / v0) ** (1.0 / 3.0)
    xi = 1.5 * (b0_prime - 1.0)
    return b0 / eta ** 2 * np.exp(xi * (1.0 - eta)) * (2.0 - eta + xi * eta * (1.0 - eta))


def strain_basis(volume, reference):
    """Columns 1, x, x², x³ with :math:`x = (V_{ref}/V)^{2/3}` (the BM3 basis), shape (..., 4)."""
    x = (reference / np.asarray(volume, float)) ** (2.0 / 3.0)
    return np.stack([np.ones_like(x), x, x * x, x ** 3], axis=-1)


@dataclass(frozen=True)
class VolumePolynomial:
    """y(V) = Σ_k c_k x^k, x = (V_ref/V)^{2/3}, k = 0..3, one set per temperature.

    The third-order Birch–Murnaghan energy is exactly such a cubic [1], so a
    linear least-squares fit in this basis *is* the BM3 fit; the same basis
    carries S(V) and C_v(V) between the sampled volumes.

    Attributes
    ----------
    coefficients : numpy.ndarray, shape (4, M)
    reference : float
        V_ref [Å³].
    """

    coefficients: np.ndarray
    reference: float

    @classmethod
    def fit(cls, volumes, values, reference=None):
        """Least-squares fit of ``values`` (K, M) sampled at ``volumes`` (K,)."""
        v = np.asarray(volumes, float)
        ref = float(np.median(v)) if reference is None else float(reference)
        coef, *_ = np.linalg.lstsq(strain_basis(v, ref), np.asarray(values, float), rcond=None)
        return cls(coef, ref)

    def _x(self, volume):
        return (self.reference / volume) ** (2.0 / 3.0)

    def value(self, volume):
        """y at ``volume`` (shape (M,) or (M, L)) [unit of y]."""
        x = self._x(volume)
        c = self.coefficients.reshape((4,) + (-1,) + (1,) * (np.ndim(volume) - 1))
        return c[0] + x * (c[1] + x * (c[2] + x * c[3]))

    def derivative(self, volume):
        """dy/dV [unit of y per Å³]."""
        x = self._x(volume)
        c = self.coefficients.reshape((4,) + (-1,) + (1,) * (np.ndim(volume) - 1))
        dydx = c[1] + x * (2 * c[2] + 3 * x * c[3])
        return dydx * (-2.0 * x / (3.0 * volume))

    def curvature_terms(self, volume):
        """x, dy/dx, d²y/dx² at ``volume``."""
        x = self._x(volume)
        c = self.coefficients.reshape((4,) + (-1,) + (1,) * (np.ndim(volume) - 1))
        return x, c[1] + x * (2 * c[2] + 3 * x * c[3]), 2 * c[2] + 6 * x * c[3]


@dataclass(frozen=True)
class EosFit:
    """Equation of state fitted to F(V) at each of M temperatures.

    Attributes
    ----------
    kind : {'birch-murnaghan', 'vinet'}
    polynomial : VolumePolynomial
        The BM3 fit (used directly for ``birch-murnaghan``, as a start for Vinet).
    parameters : numpy.ndarray, shape (4, M) or None
        Vinet E_0 [eV], V_0 [Å³], B_0 [eV/Å³], B_0' [1].
    residual_rms : numpy.ndarray, shape (M,)
        Root-mean-square misfit of the fit over the sampled volumes [eV].
    """

    kind: str
    polynomial: VolumePolynomial
    parameters: np.ndarray | None
    residual_rms: np.ndarray

    def energy(self, volume):
        """Fitted F [eV] at ``volume`` (shape (M,) or (M, L))."""
        if self.kind == "vinet":
            return vinet_energy(volume, *self._vinet(volume))
        return self.polynomial.value(volume)

    def pressure(self, volume):
        """P = -dF/dV [eV/Å³]."""
        if self.kind == "vinet":
            _, v0, b0, bp = self._vinet(volume)
            return _vinet_pressure(volume, v0, b0, bp)
        return -self.polynomial.derivative(volume)

    def bulk_modulus(self, volume):
        r"""B = -V dP/dV = V d²F/dV² [eV/Å³].

        Notes
        -----
        For the cubic in :math:`x = (V_{ref}/V)^{2/3}`:
        :math:`B = \frac{2x}{9V}\left(5F_x + 2xF_{xx}\right)`.
        """
        if self.kind == "vinet":
            _, v0, b0, bp = self._vinet(volume)
            return _vinet_bulk(volume, v0, b0, bp)
        x, d1, d2 = self.polynomial.curvature_terms(volume)
        return 2.0 * x / (9.0 * volume) * (5.0 * d1 + 2.0 * x * d2)

    def _vinet(self, volume):
        shape = (-1,) + (1,) * (np.ndim(volume) - 1)
        return tuple(p.reshape(shape) for p in self.parameters)


def fit_eos(volumes, energies, kind="birch-murnaghan"):
    """Fit an equation of state to F(V) at every temperature.

    Parameters
    ----------
    volumes : array_like, shape (K,)
        Sampled volumes [Å³].
    energies : array_like, shape (K, M)
        F at each volume and temperature [eV].
    kind : {'birch-murnaghan', 'vinet'}
        Equation of state.

    Returns
    -------
    EosFit

    Notes
    -----
    Birch–Murnaghan: linear least squares in the basis
    :math:`1, x, x^2, x^3`, :math:`x = (V_{ref}/V)^{2/3}` [1].  Vinet [2]:
    nonlinear least squares (trust region) in E_0, V_0, B_0, B_0' started from
    the Birch–Murnaghan minimum, one temperature after the other.

    Examples
    --------
    >>> v = np.linspace(18.0, 22.0, 7)
    >>> e = birch_murnaghan_energy(v, -2.0, 20.0, 0.5, 4.2)[:, None]
    >>> fit = fit_eos(v, e)
    >>> round(float(fit.bulk_modulus(np.array([20.0]))[0]), 9)
    0.5
    """
    kind = check_eos(kind)
    v = np.asarray(volumes, float)
    f = np.asarray(energies, float)
    poly = VolumePolynomial.fit(v, f)
    if kind == "birch-murnaghan":
        misfit = poly.value(np.broadcast_to(v, (f.shape[1], v.size))).T - f
        return EosFit(kind, poly, None, np.sqrt(np.mean(misfit ** 2, axis=0)))
    params = _fit_vinet(v, f, poly)
    misfit = vinet_energy(v[:, None], *params) - f
    return EosFit(kind, poly, params, np.sqrt(np.mean(misfit ** 2, axis=0)))


def _fit_vinet(v, f, poly):
    """Vinet parameters (4, M): Levenberg–Marquardt on all temperatures at once, per-T fallback."""
    start = _start_from_polynomial(v, poly)
    params = _levenberg_marquardt(v, f, start)
    bad = ~(np.all(np.isfinite(params), axis=0) & (params[2] > 0) & (params[3] > 1))
    for j in np.flatnonzero(bad):
        params[:, j] = _fit_vinet_one(v, f[:, j], start[:, j])
    return params


def _vinet_misfit(v, f, p):
    return vinet_energy(v[:, None], p[0], p[1], p[2], p[3]) - f


def _levenberg_marquardt(v, f, start, iterations=60):
    scale = np.abs(start) + np.array([1.0, 0.0, 0.0, 0.0])[:, None]
    x = start / scale
    lam = np.full(f.shape[1], 1e-3)
    with np.errstate(all="ignore"):
        r = _vinet_misfit(v, f, x * scale)
        cost = np.sum(r * r, axis=0)
        for _ in range(iterations):
            jac = np.empty(r.shape + (4,))
            for k in range(4):
                step = np.zeros_like(x)
                step[k] = 1e-7
                jac[..., k] = (_vinet_misfit(v, f, (x + step) * scale) - r) / 1e-7
            jt = np.moveaxis(jac, 0, 1)                              # (M, K, 4)
            a = np.einsum("mki,mkj->mij", jt, jt)
            g = np.einsum("mki,km->mi", jt, r)
            a_damped = a + lam[:, None, None] * np.eye(4) * np.diagonal(a, axis1=1, axis2=2)[:, :, None]
            delta = -np.linalg.solve(a_damped + 1e-300 * np.eye(4), g[..., None])[..., 0].T
            trial = x + delta
            r_trial = _vinet_misfit(v, f, trial * scale)
            cost_trial = np.sum(r_trial * r_trial, axis=0)
            better = np.isfinite(cost_trial) & (cost_trial <= cost)
            x = np.where(better, trial, x)
            r = np.where(better, r_trial, r)
            done = better & (np.max(np.abs(delta), axis=0) < 1e-12)
            cost = np.where(better, cost_trial, cost)
            lam = np.where(better, lam / 3, lam * 4)
            if np.all(done | (lam > 1e12)):
                break
    return x * scale


def _fit_vinet_one(v, col, start):
    if not np.all(np.isfinite(start)):
        return np.full(4, np.nan)
    scale = np.abs(start) + np.array([1.0, 0.0, 0.0, 0.0])

    def misfit(p):
        e0, v0, b0, bp = p * scale
        return vinet_energy(v, e0, v0, b0, bp) - col

    params = least_squares(misfit, start / scale, method="lm", xtol=1e-14, ftol=1e-14, gtol=1e-14).x * scale
    ok = np.all(np.isfinite(params)) and params[2] > 0 and params[3] > 1
    return params if ok else np.full(4, np.nan)


def _start_from_polynomial(v, poly):
    """E_0, V_0, B_0, B_0' (4, M) of the Birch–Murnaghan fits, the start of the Vinet fits."""
    m = poly.coefficients.shape[1]
    grid = np.linspace(v.min(), v.max(), 201)
    fit = EosFit("birch-murnaghan", poly, None, np.zeros(m))
    e = poly.value(np.broadcast_to(grid, (m, grid.size)))
    v0 = grid[np.argmin(e, axis=1)]
    for _ in range(8):      # Newton steps on P(V0) = 0
        b = fit.bulk_modulus(v0)
        v0 = np.clip(v0 + fit.pressure(v0) * v0 / np.where(b > 0, b, np.nan), v.min() * 0.8, v.max() * 1.2)
    b0 = fit.bulk_modulus(v0)
    h = 1e-3 * v0
    bp = (fit.bulk_modulus(v0 + h) - fit.bulk_modulus(v0 - h)) / (fit.pressure(v0 + h) - fit.pressure(v0 - h))
    bp = np.where((bp > 1.5) & (bp < 15), bp, 4.0)
    start = np.array([poly.value(v0), v0, b0, bp])
    start[:, ~(b0 > 0)] = np.nan
    return start
