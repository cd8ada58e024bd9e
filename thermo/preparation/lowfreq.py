r"""Low-frequency (acoustic, ν²) treatment of a tabulated phonon DOS.

Near ν = 0 every crystal's DOS is Debye-like: the long-wave expansion of the
acoustic dispersion gives the series :math:`g = A\nu^2(1 + b\nu^2 + c\nu^4 + \dots)`,
and that region alone sets the low-temperature :math:`T^3` law.  A smeared or
binned DOS carries spurious weight there (smearing by σ turns :math:`A\nu^2`
into :math:`A(\nu^2+\sigma^2)`; bins of width Δ into :math:`A(\nu^2+\Delta^2/12)`),
which makes :math:`C_v` nearly linear in T.

The treatment is a smooth function of the data, not of row counts:

1. the fit window :math:`[\nu_a, \nu_b]` is set by the DOS itself — its top
   :math:`\nu_b` is the frequency below which :data:`WINDOW_MODES` modes lie
   (a mode count, the same for any sampling of one spectrum), its bottom
   :math:`\nu_a = \max(\nu_b/4,\ 3\sqrt{C/A},\ \nu_{first})` clears the
   smearing width and the first tabulated row;
2. :math:`g = A\nu^2 + Ab\nu^4 + Ac\nu^6 + C` is fitted by least squares weighted with
   the trapezoid widths (an approximation of a frequency integral, hence
   sampling independent) and relative to :math:`\nu^2`;
3. below :math:`\nu_a` the DOS is the analytic :math:`A\nu^2(1+b\nu^2)`
   :math:`(1+c\nu^4)` (the offset :math:`C` is the artefact); on :math:`[\nu_a, 2\nu_a]` the
   tabulated DOS is blended into the data with a smooth step, so no jump is
   left at the seam.

The treatment is refused (off, with a caution) only when the DOS is not
ν²-like at all: :math:`A \le 0`, an offset outside
:math:`-0.02 - 3\sigma_C/(A\nu_a^2) \le C/(A\nu_a^2) \le 0.5` (σ_C the
standard error of C), a curvature :math:`|b|\nu_b^2 + |c|\nu_b^4 > 1`
(the higher terms would dominate) or a misfit above :data:`NOISY_TOLERANCE`.  These
are properties of the spectrum, converged integrals that do not move when the
same DOS is resampled.

References
----------
.. [1] P. Debye, "Zur Theorie der spezifischen Wärmen", Ann. Phys. 344,
   789-839 (1912).
.. [2] G. Grimvall, *Thermophysical Properties of Materials*, enlarged ed.
   (Elsevier, Amsterdam, 1999), ch. 6.
"""

from __future__ import annotations

import numpy as np

from ..errors import OptionError
from ..kernels.quadrature import trapezoid_weights
from ..spectrum import LowFrequencyFit

#: Modes below the window's top (2 % of the 3 acoustic branches): the top sits
#: near 0.27 ν_D of the acoustic Debye-equivalent spectrum.
WINDOW_MODES = 0.06
#: Window bottom = top / SPAN (at least).
SPAN = 4.0
#: The bottom stays this many smearing widths √(C/A) above zero.
SMEAR_CLEARANCE = 3.0
#: Misfit (relative rms) above which the fit comes with a caution.
TOLERANCE = 0.05
#: Misfit above which the DOS is not taken as ν²-like (treatment off).
NOISY_TOLERANCE = 0.15
#: Largest offset C accepted, as a share of Aν² at the window's bottom.
MAX_OFFSET = 0.5
#: Largest |b| ν_top² accepted (the ν² term must dominate in the window).
MAX_CURVATURE = 1.0
#: Plausible windows for the spread estimate: WINDOW_MODES times these.
WINDOW_SPREAD = (0.5, 2.0)
_OFF = ("no ν²-like (acoustic) region found at low frequency; "
        "low-frequency treatment is off and the T³ law is not enforced")


def reduced_dos(frequency_thz, dos):
    r"""Reduced DOS :math:`g(\nu)/\nu^2`, flat for a Debye-like spectrum.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Frequencies [THz].
    dos : array_like, shape (N,)
        DOS [states / THz].

    Returns
    -------
    frequency : numpy.ndarray
        The frequencies > 0 [THz].
    reduced : numpy.ndarray
        :math:`g/\nu^2` at those frequencies [states / THz³].

    Notes
    -----
    A Debye spectrum :math:`g = 9N\nu^2/\nu_D^3` gives the constant
    :math:`9N/\nu_D^3`.

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).

    Examples
    --------
    >>> f, r = reduced_dos([0.0, 1.0, 2.0], [0.0, 3.0, 12.0])
    >>> r.tolist()
    [3.0, 3.0]
    """
    nu = np.asarray(frequency_thz, dtype=float)
    g = np.asarray(dos, dtype=float)
    pos = nu > 0
    return nu[pos], g[pos] / nu[pos] ** 2


def _weighted_fit(nu, g, widths, powers=3):
    """Fit g = aν² (+ a b ν⁴ + a q ν⁶) + C, relative to ν², weighted by the trapezoid widths.

    ``powers`` terms of the series in ν² are fitted (1 to 3).
    Returns (a, b, C, relative rms misfit, standard error of a, q, standard error of C).
    """
    basis = [nu ** 2, np.ones_like(nu)] + [nu ** (2 * k) for k in range(2, powers + 1)]
    x = np.column_stack(basis)
    sw = np.sqrt(widths) / nu ** 2
    xw = x * sw[:, None]
    coef, *_ = np.linalg.lstsq(xw, g * sw, rcond=None)
    a, c = float(coef[0]), float(coef[1])
    a2 = float(coef[2]) if powers >= 2 else 0.0
    a3 = float(coef[3]) if powers >= 3 else 0.0
    model = a * nu ** 2 + a2 * nu ** 4 + a3 * nu ** 6 + c
    if a <= 0 or np.any(model <= 0):
        return a, 0.0, c, np.inf, np.inf, 0.0, np.inf
    rho = float(np.sqrt(np.sum(widths * ((g - model) / model) ** 2) / np.sum(widths)))
    dof = max(nu.size - len(basis), 1)
    s2 = float(np.sum((sw * (g - model)) ** 2)) / dof
    cov = s2 * np.linalg.pinv(xw.T @ xw)
    return (a, a2 / a, c, rho, float(np.sqrt(max(cov[0, 0], 0.0))), a3 / a,
            float(np.sqrt(max(cov[1, 1], 0.0))))


def _cumulative(nu, g, total_modes):
    cum = np.concatenate([[0.0], np.cumsum(0.5 * (g[1:] + g[:-1]) * np.diff(nu))])
    return cum * (total_modes / cum[-1] if total_modes and cum[-1] > 0 else 1.0)


def _window_fit(nu, g, widths, lo, hi):
    """Fit in [lo, hi]: the shortest series whose misfit is within twice the least one.

    Only fits passing :func:`_acceptable` compete (the plain Aν² + C fit is
    returned when none does, to be judged by the caller).  Misfits are
    frequency integrals, so the choice does not move when the data are resampled.
    """
    sel = (nu >= lo) & (nu <= hi) & (nu > 0)
    count = int(sel.sum())
    if count < 3:
        return None, count
    most = 3 if count >= 8 else 2 if count >= 5 else 1
    fits = [_weighted_fit(nu[sel], g[sel], widths[sel], powers=p) for p in range(1, most + 1)]
    good = [f for f in fits if _acceptable(f, lo, hi)]
    if not good:
        return fits[0], count
    least = min(f[3] for f in good)
    return next(f for f in good if f[3] <= 2.0 * least), count


def _acceptable(fit, lo, hi):
    a, b, c, rho, _, q, sc = fit
    # a negative offset is allowed only within 2 % plus three standard errors (noise)
    return (np.isfinite(rho) and a > 0 and -0.02 * a * lo ** 2 - 3.0 * sc <= c <= MAX_OFFSET * a * lo ** 2
            and abs(b) * hi ** 2 + abs(q) * hi ** 4 <= MAX_CURVATURE and rho <= NOISY_TOLERANCE)


def _auto_window(nu, g, widths, total_modes, window_modes):
    """Window (lo, hi) from the mode count and the smearing width, and its fit."""
    cum = _cumulative(nu, g, total_modes)
    first = float(nu[0])
    step = float(nu[nu > 0][0]) if np.any(nu > 0) else 0.0
    below, smear, result = 0.0, 0.0, None
    done = {}                   # a pass that lands on a window already fitted reuses that fit
    for _ in range(4):
        target = window_modes - below
        top = float(np.interp(target, cum, nu)) if target > 0 else 2.0 * max(first, step)
        # the bottom only moves up between passes, so the passes settle
        lo = max(top / SPAN, SMEAR_CLEARANCE * smear, first, step, result[0] if result else 0.0)
        hi = max(top, 3.0 * lo)
        if (lo, hi) not in done:
            done[(lo, hi)] = _window_fit(nu, g, widths, lo, hi)
        fit, _count = done[(lo, hi)]
        if fit is None or not np.isfinite(fit[3]):
            return lo, hi, None
        result = (lo, hi, fit)
        a, b, c = fit[0], fit[1], fit[2]
        below = a * first ** 3 / 3.0 * (1.0 if first > 0 else 0.0)
        smear = float(np.sqrt(max(c, 0.0) / a)) if a > 0 else 0.0
    return result


def fit_low_frequency(frequency_thz, dos, window=None, total_modes=None, window_modes=WINDOW_MODES):
    r"""Fit :math:`g = A\nu^2(1 + b\nu^2 + c\nu^4) + C` at low frequency.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Ascending frequencies >= 0 [THz].
    dos : array_like, shape (N,)
        DOS [states / THz], any normalisation.
    window : tuple of float, optional
        ``(low, high)`` window [THz] to fit over; automatic when None.
    total_modes : float, optional
        Modes the DOS stands for (3n); the mode count that places the window
        is taken on this scale (default: the DOS integral).
    window_modes : float
        Modes below the automatic window's top [1].

    Returns
    -------
    fit : LowFrequencyFit or None
        The fit (coefficient in the units of ``dos`` per THz²); below
        ``cutoff_thz`` (the window's bottom) the DOS becomes
        :math:`A\nu^2(1+b\nu^2)`, blended into the data up to
        ``blend_top_thz``; None when the DOS is not ν²-like.
    note : str or None
        A one-line caution about the fit (noisy data, no ν² region).

    Raises
    ------
    OptionError
        If a given window is malformed, holds fewer than 3 points or no
        positive ν² form fits it.

    Notes
    -----
    Weighted least squares of :math:`g` on :math:`\{\nu^2, \nu^4, \nu^6, 1\}`
    with weights :math:`\Delta_i/\nu_i^4` (trapezoid widths
    :math:`\Delta_i`), i.e. a discretised
    :math:`\int (g - M)^2/\nu^4\,d\nu`; the ν⁶ term is dropped when the
    window holds fewer than 8 rows, the ν⁴ term below 5 rows.  The window and the refusal criteria
    are those of the module docstring.

    References
    ----------
    .. [1] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6 (low-temperature limit of the phonon DOS).

    Examples
    --------
    >>> nu = np.linspace(0.0, 5.0, 501)
    >>> fit, note = fit_low_frequency(nu, 0.3 * (nu**2 + 0.01))   # smeared ν²
    >>> round(fit.coefficient, 6), round(fit.offset, 6), abs(round(fit.curvature, 9))
    (0.3, 0.003, 0.0)
    """
    nu = np.asarray(frequency_thz, dtype=float)
    g = np.asarray(dos, dtype=float)
    widths = trapezoid_weights(nu)
    if window is not None:
        lo, hi = (float(v) for v in window)
        if not (0.0 <= lo < hi):
            raise OptionError(f"low-frequency window {lo:g}:{hi:g} THz must have 0 <= low < high")
        fit, count = _window_fit(nu, g, widths, lo, hi)
        if fit is None:
            raise OptionError(f"low-frequency window {lo:g}:{hi:g} THz holds fewer than 3 points")
        if not np.isfinite(fit[3]):
            raise OptionError(f"no positive ν² form fits the DOS in {lo:g}:{hi:g} THz")
        cut = max(lo, hi / SPAN, float(nu[0]))
        return _record(fit, cut, (lo, hi), automatic=False), _caution(fit, lo, hi)
    if nu.size < 4 or not np.any(g > 0):
        return None, _OFF
    lo, hi, fit = _auto_window(nu, g, widths, total_modes, window_modes)
    if fit is None or not _acceptable(fit, lo, hi):
        return None, _OFF
    return _record(fit, lo, (lo, hi)), _caution(fit, lo, hi)


def _record(fit, cut, window, automatic=True):
    a, b, c, rho, sa, q, _sc = fit
    return LowFrequencyFit(a, float(cut), (float(window[0]), float(window[1])), c, rho, automatic,
                           curvature=b, quartic=q, coefficient_uncertainty=sa,
                           blend_top_thz=float(min(2.0 * cut, window[1])))


def _caution(fit, lo, hi):
    if fit[3] <= TOLERANCE:
        return None
    return (f"low-frequency DOS is noisy or structured (ν² fit misfit {100 * fit[3]:.1f} % rms over "
            f"{lo:.3g}-{hi:.3g} THz); low-temperature values are uncertain")


def blend_low_frequency(frequency_thz, arrays, fit):
    r"""Tabulated part above the cut-off: the data's share :math:`1 - W` of the blend.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Ascending frequencies [THz].
    arrays : sequence of array_like, each shape (N,)
        DOS columns [states / THz]: the total first, then partials.
    fit : LowFrequencyFit
        The fit; ``cutoff_thz`` = ν_a and ``blend_top_thz`` = ν_m.

    Returns
    -------
    frequency : numpy.ndarray
        Frequencies >= ν_a, starting exactly at it [THz].
    columns : list of numpy.ndarray
        The columns on that grid.

    Notes
    -----
    With :math:`M = A\nu^2(1+b\nu^2+c\nu^4)`, :math:`s = (\nu-\nu_a)/(\nu_m-\nu_a)`
    clipped to [0, 1] and the smooth step :math:`W = 1 - s^2(3-2s)`, the
    treated DOS is :math:`g' = WM + (1-W)g`.  The part :math:`WM` is analytic
    (:meth:`~thermo.spectrum.LowFrequencyFit.taper_nodes`); the tabulated
    part returned here is :math:`(1-W)g` (and :math:`(1-W)g_X` for each
    partial column), which starts at 0 with zero slope at ν_a, so the
    trapezoid rule has no end error at the seam.

    References
    ----------
    .. [1] W. H. Press et al., *Numerical Recipes*, 3rd ed. (CUP, 2007), §3.1.

    Examples
    --------
    >>> fit = LowFrequencyFit(1.0, 1.0, (1.0, 4.0), blend_top_thz=2.0)
    >>> f, (g,) = blend_low_frequency([0.0, 1.0, 2.0, 3.0], [[0.0, 1.5, 5.0, 9.0]], fit)
    >>> f.tolist(), g.tolist()
    ([1.0, 2.0, 3.0], [0.0, 5.0, 9.0])
    """
    nu = np.asarray(frequency_thz, dtype=float)
    lo = fit.cutoff_thz
    grid = np.concatenate([[lo], nu[nu > lo]])
    keep = 1.0 - fit.taper(grid)
    return grid, [keep * np.interp(grid, nu, np.asarray(col, float)) for col in arrays]


def window_shares(frequency_thz, partials, window_thz):
    r"""Each partial column's share of the DOS inside the fit window.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Frequencies [THz].
    partials : sequence of array_like, each shape (N,)
        Species-projected DOS columns [states / THz].
    window_thz : tuple of float
        Fit window [THz].

    Returns
    -------
    list of float
        Shares [1], adding up to 1 (equal shares if the window is empty).

    Notes
    -----
    :math:`\phi_X = \int_W g_X\,d\nu / \sum_Y \int_W g_Y\,d\nu`: at low
    frequency every species moves with the acoustic wave, so its share of the
    ν² modes is its share where the DOS is still ν²-like.

    References
    ----------
    .. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Saunders,
       1976), ch. 22.

    Examples
    --------
    >>> window_shares([0.0, 1.0, 2.0], [[0.0, 1.0, 4.0], [0.0, 3.0, 12.0]], (0.5, 2.0))
    [0.25, 0.75]
    """
    if len(partials) == 0:
        return []
    nu = np.asarray(frequency_thz, dtype=float)
    lo, hi = window_thz
    widths = trapezoid_weights(nu) * ((nu >= lo) & (nu <= hi))
    totals = [float(np.sum(widths * np.asarray(col, float))) for col in partials]
    whole = sum(totals)
    if whole <= 0:
        return [1.0 / len(partials)] * len(partials)
    return [v / whole for v in totals]
