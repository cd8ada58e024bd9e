"""Equations of state F(V): third-order Birch–Murnaghan, Vinet and a cubic spline, at many temperatures.

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
.. [3] C. de Boor, *A Practical Guide to Splines*, revised ed. (Springer,
   2001), ch. IV.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy import constants as sc

from ..errors import OptionError
from .splines import CardinalSpline
from .vinet import fit_vinet, vinet_bulk_modulus, vinet_energy, vinet_pressure, vinet_weights

#: GPa per eV/Å³.
GPA_PER_EV_A3 = sc.electron_volt / sc.angstrom ** 3 / sc.giga
#: Names of the equations of state (command-line spelling).
EOS_KINDS = ("birch-murnaghan", "vinet", "spline")


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
        raise OptionError(f"unknown equation of state {kind!r}; choose birch-murnaghan, vinet or spline")
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


def strain_basis(volume, reference):
    """Columns 1, x, x², x³ with :math:`x = (V_{ref}/V)^{2/3}` (the BM3 basis), shape (..., 4)."""
    x = (reference / np.asarray(volume, float)) ** (2.0 / 3.0)
    return np.stack([np.ones_like(x), x, x * x, x ** 3], axis=-1)


@dataclass(frozen=True)
class VolumePolynomial:
    """y(V) = Σ_k c_k x^k, x = (V_ref/V)^{2/3}, k = 0..3, one set per temperature.

    The third-order Birch–Murnaghan energy is exactly such a cubic [1], so a
    linear least-squares fit in this basis *is* the BM3 fit.

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

    def x_terms(self, volume):
        """x, y, dy/dx, d²y/dx² at ``volume`` (shape (M,) or (M, L))."""
        x = (self.reference / volume) ** (2.0 / 3.0)
        c = self.coefficients.reshape((4,) + (-1,) + (1,) * (np.ndim(volume) - 1))
        return (x, c[0] + x * (c[1] + x * (c[2] + x * c[3])), c[1] + x * (2 * c[2] + 3 * x * c[3]),
                2 * c[2] + 6 * x * c[3])

    def value(self, volume):
        """y at ``volume`` [unit of y]."""
        return self.x_terms(volume)[1]


@dataclass(frozen=True)
class EosFit:
    r"""Equation of state fitted to F(V) at each of M temperatures.

    Attributes
    ----------
    kind : {'birch-murnaghan', 'vinet', 'spline'}
    volumes : numpy.ndarray, shape (K,)
        The sampled volumes [Å³].
    polynomial : VolumePolynomial
        The BM3 fit (used directly for ``birch-murnaghan``, as a start for Vinet).
    parameters : numpy.ndarray, shape (4, M) or None
        Vinet E_0 [eV], V_0 [Å³], B_0 [eV/Å³], B_0' [1].
    residual_rms : numpy.ndarray, shape (M,)
        Root-mean-square misfit of the fit over the sampled volumes [eV]
        (0 for the spline, which passes through every point).
    values : numpy.ndarray, shape (K, M) or None
        F at the sampled volumes (the spline's knot values) [eV].

    Notes
    -----
    Birch–Murnaghan and spline are curves in :math:`x = (V_{ref}/V)^{2/3}`:
    :math:`P = rac{2x}{3V}F_x` and :math:`B = rac{2x}{9V}\left(5F_x + 2xF_{xx}
ight)`.
    """

    kind: str
    volumes: np.ndarray
    polynomial: VolumePolynomial
    parameters: np.ndarray | None
    residual_rms: np.ndarray
    values: np.ndarray | None = None

    def _x_terms(self, volume):
        if self.kind == "birch-murnaghan":
            return self.polynomial.x_terms(volume)
        x = (self.polynomial.reference / volume) ** (2.0 / 3.0)
        spline = self._spline()
        return (x, *(spline.evaluate(self.values, x, order) for order in (0, 1, 2)))

    def _spline(self):
        return CardinalSpline((self.polynomial.reference / self.volumes) ** (2.0 / 3.0))

    def energy(self, volume):
        """Fitted F [eV] at ``volume`` (shape (M,) or (M, L))."""
        if self.kind == "vinet":
            return vinet_energy(volume, *self._vinet(volume))
        return self._x_terms(volume)[1]

    def pressure(self, volume):
        """P = -dF/dV [eV/Å³]."""
        if self.kind == "vinet":
            _, v0, b0, bp = self._vinet(volume)
            return vinet_pressure(volume, v0, b0, bp)
        x, _, d1, _ = self._x_terms(volume)
        return 2.0 * x / (3.0 * volume) * d1

    def bulk_modulus(self, volume):
        """B = -V dP/dV = V d²F/dV² [eV/Å³]."""
        if self.kind == "vinet":
            _, v0, b0, bp = self._vinet(volume)
            return vinet_bulk_modulus(volume, v0, b0, bp)
        x, _, d1, d2 = self._x_terms(volume)
        return 2.0 * x / (9.0 * volume) * (5.0 * d1 + 2.0 * x * d2)

    def weights(self, volume):
        r"""Weights of the K sampled F values in F, dF/dV and d²F/dV² at ``volume`` (M,), each (M, K).

        Exact for the forms linear in the data (Birch–Murnaghan, spline); to
        first order for Vinet (:func:`~thermo.quasiharmonic.vinet.vinet_weights`).

        Notes
        -----
        With :math:`x_V = -2x/(3V)` and :math:`x_{VV} = 10x/(9V^2)`:
        :math:`w_V = w_x x_V`, :math:`w_{VV} = w_{xx}x_V^2 + w_x x_{VV}`.
        """
        v = np.asarray(volume, dtype=float)
        if self.kind == "vinet":
            return vinet_weights(self.volumes, self.parameters, v)
        x = (self.polynomial.reference / v) ** (2.0 / 3.0)
        if self.kind == "birch-murnaghan":
            inverse = np.linalg.pinv(strain_basis(self.volumes, self.polynomial.reference))      # (4, K)
            ones, zeros = np.ones_like(x), np.zeros_like(x)
            w = [np.stack(b, axis=-1) @ inverse for b in ((ones, x, x * x, x ** 3), (zeros, ones, 2 * x, 3 * x * x),
                                                           (zeros, zeros, 2 * ones, 6 * x))]
        else:
            spline = self._spline()
            w = [spline.weights(x, order) for order in (0, 1, 2)]
        xv, xvv = (-2.0 * x / (3.0 * v))[:, None], (10.0 * x / (9.0 * v * v))[:, None]
        return w[0], w[1] * xv, w[2] * xv * xv + w[1] * xvv

    def _vinet(self, volume):
        shape = (-1,) + (1,) * (np.ndim(volume) - 1)
        return tuple(p.reshape(shape) for p in self.parameters)


def fit_eos(volumes, energies, kind="birch-murnaghan", start=None):
    """Fit an equation of state to F(V) at every temperature.

    Parameters
    ----------
    volumes : array_like, shape (K,)
        Sampled volumes [Å³].
    energies : array_like, shape (K, M)
        F at each volume and temperature [eV].
    kind : {'birch-murnaghan', 'vinet', 'spline'}
        Equation of state.
    start : numpy.ndarray, shape (4, M), optional
        Vinet parameters to start from (e.g. the fit of all volumes, for a
        leave-one-out refit); NaN columns and the default start from the
        Birch–Murnaghan minimum.

    Returns
    -------
    EosFit

    Notes
    -----
    Birch–Murnaghan: linear least squares in the basis
    :math:`1, x, x^2, x^3`, :math:`x = (V_{ref}/V)^{2/3}` [1].  Vinet [2]:
    nonlinear least squares in E_0, V_0, B_0, B_0' started from the
    Birch–Murnaghan minimum (:func:`thermo.quasiharmonic.vinet.fit_vinet`;
    NaN where it does not converge).  Spline: the not-a-knot cubic spline of F
    in x through every sampled point [3] — no assumed form, exact for a
    cubic in x, no smoothing.

    Examples
    --------
    >>> v = np.linspace(18.0, 22.0, 7)
    >>> e = birch_murnaghan_energy(v, -2.0, 20.0, 0.5, 4.2)[:, None]
    >>> [round(float(fit_eos(v, e, k).bulk_modulus(np.array([20.0]))[0]), 9) for k in ("birch-murnaghan", "spline")]
    [0.5, 0.5]
    """
    kind = check_eos(kind)
    v = np.asarray(volumes, float)
    f = np.asarray(energies, float)
    poly = VolumePolynomial.fit(v, f)
    if kind == "birch-murnaghan":
        misfit = poly.value(np.broadcast_to(v, (f.shape[1], v.size))).T - f
        return EosFit(kind, v, poly, None, np.sqrt(np.mean(misfit ** 2, axis=0)))
    if kind == "spline":
        return EosFit(kind, v, poly, None, np.where(np.all(np.isfinite(f), axis=0), 0.0, np.nan), f)
    first = _start_from_polynomial(v, poly)
    if start is not None:
        given = np.asarray(start, dtype=float)
        first = np.where(np.all(np.isfinite(given), axis=0), given, first)
    params = fit_vinet(v, f, first)
    misfit = vinet_energy(v[:, None], *params) - f
    return EosFit(kind, v, poly, params, np.sqrt(np.mean(misfit ** 2, axis=0)))


def _start_from_polynomial(v, poly):
    """E_0, V_0, B_0, B_0' (4, M) of the Birch–Murnaghan fits, the start of the Vinet fits."""
    m = poly.coefficients.shape[1]
    grid = np.linspace(v.min(), v.max(), 201)
    fit = EosFit("birch-murnaghan", v, poly, None, np.zeros(m))
    e = poly.value(np.broadcast_to(grid, (m, grid.size)))
    v0 = grid[np.argmin(e, axis=1)]
    for _ in range(8):      # Newton steps on P(V0) = 0: only a start, the Vinet fit checks its own result
        b = fit.bulk_modulus(v0)
        v0 = np.clip(v0 + fit.pressure(v0) * v0 / np.where(b > 0, b, np.nan), v.min() * 0.8, v.max() * 1.2)
    b0 = fit.bulk_modulus(v0)
    h = 1e-3 * v0
    bp = (fit.bulk_modulus(v0 + h) - fit.bulk_modulus(v0 - h)) / (fit.pressure(v0 + h) - fit.pressure(v0 - h))
    bp = np.where((bp > 1.5) & (bp < 15), bp, 4.0)
    start = np.array([poly.value(v0), v0, b0, bp])
    start[:, ~(b0 > 0)] = np.nan
    return start
