"""Equivalent Debye temperature θ_D(T): the θ whose Debye C_v matches the DOS at T.

A Debye spectrum gives a flat θ_D(T); the structure of a real spectrum shows
up as dips and rises (a dip at low T from soft transverse modes, a rise
towards the high-T value set by θ_D(2)).

References
----------
.. [1] T. H. K. Barron, W. T. Berg, J. A. Morrison, Proc. R. Soc. Lond. A 242,
   478-492 (1957).
.. [2] G. Grimvall, *Thermophysical Properties of Materials*, enlarged ed.
   (Elsevier, Amsterdam, 1999), ch. 6.
.. [3] R. P. Brent, *Algorithms for Minimization without Derivatives*
   (Prentice-Hall, 1973), ch. 4 (bracketing a root).
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc

from ..columns import column_name
from ..tables import check_temperatures, tabulate
from .debye import debye_heat_capacity_fraction

#: Fractions of the classical limit at or above this are not inverted.
UPPER_FRACTION = 1.0 - 1e-12
#: Newton steps before the values still moving are halved instead.
NEWTON_STEPS = 12
#: Beyond y = θ/T = 60 the Debye C_v equals its T³ law to 1e-20.
_Y_T3 = 60.0
_T3_CONSTANT = 4.0 * np.pi ** 4 / 5.0


def _bracket_table():
    """D_c on a logarithmic y grid, computed once, to bracket the roots."""
    y = np.geomspace(1e-9, _Y_T3, 400)
    return y, debye_heat_capacity_fraction(y)


_BRACKET = None


def debye_y_from_fraction(fraction):
    r"""Invert the Debye heat-capacity fraction: y = θ_D/T with D_c(y) = f.

    Parameters
    ----------
    fraction : array_like
        :math:`f = C_v/(mR)`, 0 < f < 1 − 1e-12 [1].

    Returns
    -------
    numpy.ndarray
        :math:`y` [1], one per fraction; ``nan`` where f is outside
        (0, 1 − 1e-12) or not finite.

    Notes
    -----
    :math:`D_c(y) = 3y^{-3}\int_0^y x^4e^x(e^x-1)^{-2}dx` falls monotonically
    from 1 to 0.  For :math:`f \le D_c(60)`, :math:`y = (4\pi^4/5f)^{1/3}`
    (the T³ law, exact to 1e-20); otherwise Newton's method with
    :math:`D_c'(y) = -3D_c/y + 3y e^{-y}/(1-e^{-y})^2`, all fractions at once, kept
    inside the bracket of a 400-point table of :math:`D_c` on
    :math:`[10^{-9}, 60]` (a step leaving the bracket is a halving) until the step
    is within 4 ulp; a value still moving after 12 steps is halved until its bracket
    is 4 ulp wide.  Near f = 1,
    :math:`1 - f \approx y^2/20`, so a relative error ε in C_v moves y by
    :math:`\approx \varepsilon/(2(1-f))`: θ_D(T) far above θ_D is
    ill-conditioned.

    References
    ----------
    .. [1] R. P. Brent, *Algorithms for Minimization without Derivatives*
       (Prentice-Hall, 1973), ch. 4 (bracketing a root).

    Examples
    --------
    >>> debye_y_from_fraction(debye_heat_capacity_fraction([0.01, 2.5, 100.0])).round(10).tolist()
    [0.01, 2.5, 100.0]
    """
    f = np.atleast_1d(np.asarray(fraction, dtype=float))
    y = np.full(f.shape, np.nan)
    valid = np.isfinite(f) & (f > 0.0) & (f < UPPER_FRACTION)
    t3 = valid & (f <= float(debye_heat_capacity_fraction(_Y_T3)[0]))
    y[t3] = (_T3_CONSTANT / f[t3]) ** (1.0 / 3.0)
    inner = valid & ~t3
    if not inner.any():
        return y
    global _BRACKET
    if _BRACKET is None:
        _BRACKET = _bracket_table()
    grid, values = _BRACKET
    target = f[inner]
    k = np.clip(np.searchsorted(-values, -target), 1, grid.size - 1)   # values fall with y
    low, high = grid[k - 1].copy(), grid[k].copy()
    y[inner] = _newton_in_bracket(target, low, high)
    return y


def _fraction_slope(y, d):
    r""":math:`dD_c/dy = -3D_c/y + 3y\,e^{-y}/(1-e^{-y})^2` (its series :math:`-y/10 + y^3/140` below 0.01)."""
    e = np.exp(-y)
    with np.errstate(divide="ignore", invalid="ignore"):
        exact = -3.0 * d / y + 3.0 * y * e / (-np.expm1(-y)) ** 2
    return np.where(y < 1e-2, -y / 10.0 + y ** 3 / 140.0, exact)


def _newton_in_bracket(target, low, high):
    """y with D_c(y) = target inside [low, high]: Newton steps kept inside the shrinking bracket
    (a step outside is a halving), each value until its step is within 4 ulp; the few left after
    :data:`NEWTON_STEPS` steps are halved until their bracket is 4 ulp wide [3]."""
    eps = np.finfo(float).eps
    y = 0.5 * (low + high)
    todo = np.arange(target.size)
    for _ in range(NEWTON_STEPS):
        if not todo.size:
            return y
        yt, ft = y[todo], target[todo]
        d = debye_heat_capacity_fraction(yt)
        above = d > ft                                  # the root lies above yt
        low[todo] = np.where(above, yt, low[todo])
        high[todo] = np.where(above, high[todo], yt)
        with np.errstate(divide="ignore", invalid="ignore"):
            new = yt - (d - ft) / _fraction_slope(yt, d)
        lo, hi = low[todo], high[todo]
        new = np.where((new >= lo) & (new <= hi), new, 0.5 * (lo + hi))
        y[todo] = new
        done = (np.abs(new - yt) <= 4.0 * eps * new) | (hi - lo <= 4.0 * eps * hi) | (d == ft)
        todo = todo[~done]
    for _ in range(80):                                 # the rest: halvings, about 47 reach 4 ulp
        if not todo.size:
            break
        lo, hi = low[todo], high[todo]
        middle = 0.5 * (lo + hi)
        above = debye_heat_capacity_fraction(middle) > target[todo]
        low[todo], high[todo] = np.where(above, middle, lo), np.where(above, hi, middle)
        y[todo] = 0.5 * (low[todo] + high[todo])
        todo = todo[high[todo] - low[todo] > 4.0 * eps * high[todo]]
    return y


def invert_debye_heat_capacity(temperatures, heat_capacity, modes):
    r"""θ_D at each T such that the Debye C_v of ``modes`` modes equals the data.

    Parameters
    ----------
    temperatures : array_like, shape (M,)
        Temperatures [K].
    heat_capacity : array_like, shape (M,)
        C_v per mole of formula units [J/(mol K)].
    modes : float
        Modes per formula unit (3n) [1].

    Returns
    -------
    numpy.ndarray, shape (M,)
        θ_D(T) [K]; ``nan`` where undefined: T = 0, C_v ≤ 0, or
        C_v ≥ mR(1 − 1e-12) (the classical limit, where every θ fits).

    Notes
    -----
    Solves :math:`mR\,D_c(\theta_D/T) = C_v(T)` with
    :func:`debye_y_from_fraction`.

    References
    ----------
    .. [1] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.

    Examples
    --------
    >>> from thermo.models.debye import debye_heat_capacity
    >>> t = np.array([0.0, 10.0, 300.0])
    >>> invert_debye_heat_capacity(t, debye_heat_capacity(t, 250.0, 3), 3).round(9).tolist()
    [nan, 250.0, 250.0]
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float))
    fraction = np.atleast_1d(np.asarray(heat_capacity, dtype=float)) / (modes * sc.R)
    positive = t > 0
    theta = np.full(t.shape, np.nan)
    theta[positive] = t[positive] * debye_y_from_fraction(fraction[positive])
    return theta


def equivalent_debye_temperature(dos, temperatures):
    r"""Equivalent Debye temperature θ_D(T) of a DOS [K].

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS with n atoms per formula unit.
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.

    Returns
    -------
    numpy.ndarray, shape (M,)
        θ_D(T) [K], ``nan`` where undefined (see
        :func:`invert_debye_heat_capacity`).

    Notes
    -----
    .. math:: 9nR\left(\frac{T}{\theta_D(T)}\right)^3
              \int_0^{\theta_D(T)/T}\frac{x^4e^x}{(e^x-1)^2}dx = C_v^{DOS}(T)

    with all 3n modes in the Debye spectrum.  As T → 0 it tends to the
    elastic (ν²) θ_D; as T → ∞ to θ_D(2) of the moments.

    References
    ----------
    .. [1] T. H. K. Barron, W. T. Berg, J. A. Morrison, Proc. R. Soc. Lond.
       A 242, 478-492 (1957).
    .. [2] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> from thermo.kernels.planck import H_OVER_K_THZ
    >>> d = debye_spectrum(2 * H_OVER_K_THZ)     # ν_D = 2 THz
    >>> (equivalent_debye_temperature(d, [5.0, 50.0]) / (2 * H_OVER_K_THZ)).round(9).tolist()
    [1.0, 1.0]
    """
    t = check_temperatures(temperatures)
    cv = tabulate(dos, t)[column_name("heat_capacity_v")].to_numpy()
    return invert_debye_heat_capacity(t, cv, 3 * dos.atoms)
