"""Low-frequency (acoustic, ν²) treatment of a tabulated phonon DOS.

Near ν = 0 every crystal's DOS is Debye-like, :math:`g = A\\nu^2`, and that
region alone sets the low-temperature :math:`T^3` law.  A smeared or binned
DOS carries spurious weight there (smearing by σ turns :math:`A\\nu^2` into
:math:`A(\\nu^2+\\sigma^2)`; bins of width Δ into :math:`A(\\nu^2+\\Delta^2/12)`),
which makes :math:`C_v` nearly linear in T.  This module finds a window where
the DOS follows :math:`A\\nu^2 + C`, fits it, and replaces the DOS below the
window's top by :math:`A\\nu^2` — the offset :math:`C` is the artefact.

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
from ..spectrum import LowFrequencyFit

#: Relative rms misfit below which a window is taken as ν²-like.
TOLERANCE = 0.02
#: Largest misfit accepted (with a warning) when no window meets TOLERANCE.
NOISY_TOLERANCE = 0.15
#: A window whose DOS stays below this share of the maximum carries no modes
#: that matter (the far flank of a peak) and is not taken as acoustic.
RELEVANT_SHARE = 1e-3
#: Largest offset C accepted, as a share of Aν² at the window's start (smearing
#: by σ gives σ²/a², binning by Δ gives Δ²/12a²; a larger C means the data
#: are not ν²-like, e.g. the flank of a broad peak).
MAX_OFFSET = 0.5
#: The search stays below the frequency under which this share of modes lies.
SEARCH_SHARE = 0.2
_MIN_POINTS = 8


def reduced_dos(frequency_thz, dos):
    """Reduced DOS :math:`g(\\nu)/\\nu^2`, flat for a Debye-like spectrum.

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
        :math:`g/\\nu^2` at those frequencies [states / THz³].

    Notes
    -----
    A Debye spectrum :math:`g = 9N\\nu^2/\\nu_D^3` gives the constant
    :math:`9N/\\nu_D^3`.

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


def _fit(nu, g, offset=True):
    """Least-squares A (and C) of g = Aν² (+ C) and the relative rms misfit."""
    columns = [nu * nu, np.ones_like(nu)] if offset else [nu * nu]
    coef, *_ = np.linalg.lstsq(np.column_stack(columns), g, rcond=None)
    a, c = float(coef[0]), float(coef[1]) if offset else 0.0
    model = a * nu * nu + c
    lowest = a * nu.min() ** 2
    if a <= 0 or np.any(model <= 0) or not (-0.02 * lowest <= c <= MAX_OFFSET * lowest):
        return a, c, np.inf
    return a, c, float(np.sqrt(np.mean(((g - model) / model) ** 2)))


def _search_limit(nu, g):
    cumulative = np.concatenate([[0.0], np.cumsum(0.5 * (g[1:] + g[:-1]) * np.diff(nu))])
    return float(nu[np.searchsorted(cumulative, SEARCH_SHARE * cumulative[-1])])


def _in(nu, lo, hi):
    return (nu >= lo) & (nu <= hi)


def _windows(nu, limit, span):
    """Candidate windows [a, span·a] holding enough points, lowest first."""
    positive = nu[nu > 0]
    if positive.size < _MIN_POINTS:
        return []
    starts = np.geomspace(positive[0], max(limit / span, positive[0]), 48)
    return [(a, span * a) for a in starts if _in(nu, a, span * a).sum() >= _MIN_POINTS]


def _first_clean_octave(nu, g, limit):
    """Lowest octave where g = Aν² + C holds within TOLERANCE, or None."""
    for start, stop in _windows(nu, limit, 2.0):
        sel = _in(nu, start, stop)
        if g[sel].max() >= RELEVANT_SHARE * g.max() and _fit(nu[sel], g[sel])[2] <= TOLERANCE:
            return start, stop
    return None


def _least_misfit_window(nu, g, limit):
    """Two-octave window of least misfit (structured or noisy data)."""
    best = None
    for start, stop in _windows(nu, limit, 4.0):
        sel = _in(nu, start, stop)
        if g[sel].max() < RELEVANT_SHARE * g.max():
            continue
        rho = _fit(nu[sel], g[sel])[2]
        if best is None or rho < best[2]:
            best = (start, stop, rho)
    return best


def _widen(nu, g, start, stop, limit):
    """Move the window's top up while the ν² + C form still fits."""
    for top in np.geomspace(stop, max(limit, stop), 24)[1:]:
        sel = _in(nu, start, top)
        if _fit(nu[sel], g[sel])[2] > TOLERANCE:
            break
        stop = top
    return stop


def fit_low_frequency(frequency_thz, dos, window=None):
    """Fit :math:`g = A\\nu^2 + C` at low frequency and choose the cut-off.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Ascending frequencies >= 0 [THz].
    dos : array_like, shape (N,)
        DOS [states / THz], any normalisation.
    window : tuple of float, optional
        ``(low, high)`` window [THz] to fit over; automatic when None.

    Returns
    -------
    fit : LowFrequencyFit or None
        The fit (coefficient in the units of ``dos`` per THz²) with
        ``cutoff_thz`` equal to the window's top, or None when no ν² region
        exists.
    note : str or None
        A one-line caution about the fit (noisy data, no ν² region).

    Raises
    ------
    OptionError
        If a given window is malformed or holds fewer than 3 points.

    Notes
    -----
    Least squares on :math:`g(\\nu) = A\\nu^2 + C` over the window; the
    automatic window is the lowest octave :math:`[a, 2a]` (at least 8 points)
    whose relative rms misfit is at most 2 % with an offset
    :math:`-0.02 \\le C/(Aa^2) \\le 0.5` (smearing and binning only add weight), widened upward while the misfit
    stays below 2 %, inside the lowest 20 % of the modes.  Where no octave is
    that clean (k-mesh structure, noise) the two-octave window of least
    misfit to :math:`A\\nu^2 + C` is used if its misfit is below 15 %, with
    a caution; otherwise the treatment is off.

    References
    ----------
    .. [1] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6 (low-temperature limit of the phonon DOS).

    Examples
    --------
    >>> nu = np.linspace(0.0, 5.0, 501)
    >>> fit, note = fit_low_frequency(nu, 0.3 * (nu**2 + 0.01))   # smeared ν²
    >>> round(fit.coefficient, 6), round(fit.offset, 6)
    (0.3, 0.003)
    """
    nu = np.asarray(frequency_thz, dtype=float)
    g = np.asarray(dos, dtype=float)
    if window is not None:
        lo, hi = (float(v) for v in window)
        if not (0.0 <= lo < hi):
            raise OptionError(f"low-frequency window {lo:g}:{hi:g} THz must have 0 <= low < high")
        sel = _in(nu, lo, hi) & (nu > 0)
        if sel.sum() < 3:
            raise OptionError(f"low-frequency window {lo:g}:{hi:g} THz holds fewer than 3 points")
        a, c, rho = _fit(nu[sel], g[sel])
        if not np.isfinite(rho):
            raise OptionError(f"no positive ν² form fits the DOS in {lo:g}:{hi:g} THz")
        return LowFrequencyFit(float(a), hi, (lo, hi), float(c), rho, automatic=False), None
    limit = _search_limit(nu, g)
    clean = _first_clean_octave(nu, g, limit)
    if clean is not None:
        start, stop = clean[0], _widen(nu, g, clean[0], clean[1], limit)
        sel = _in(nu, start, stop)
        a, c, rho = _fit(nu[sel], g[sel])
        return LowFrequencyFit(a, float(stop), (float(start), float(stop)), c, rho), None
    best = _least_misfit_window(nu, g, limit)
    if best is None or best[2] > NOISY_TOLERANCE:
        return None, ("no ν²-like (acoustic) region found at low frequency; "
                      "low-frequency treatment is off and the T³ law is not enforced")
    start, stop, rho = best
    sel = _in(nu, start, stop)
    a, c, rho = _fit(nu[sel], g[sel])
    note = (f"low-frequency DOS is noisy or structured (ν² fit misfit {100 * rho:.1f} % rms over "
            f"{start:.3g}-{stop:.3g} THz); low-temperature values are uncertain")
    return LowFrequencyFit(a, float(stop), (float(start), float(stop)), c, rho), note


def apply_low_frequency(frequency_thz, arrays, cutoff_thz):
    """Cut tabulated arrays at the cut-off, interpolating a point there.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Ascending frequencies [THz].
    arrays : sequence of array_like, each shape (N,)
        DOS columns to cut [states / THz].
    cutoff_thz : float
        Cut-off [THz].

    Returns
    -------
    frequency : numpy.ndarray
        Frequencies >= cut-off, starting exactly at it [THz].
    cut : list of numpy.ndarray
        The arrays on that grid.

    Notes
    -----
    Linear interpolation at the cut-off, consistent with the
    piecewise-linear reading of a tabulated DOS.

    References
    ----------
    .. [1] W. H. Press et al., *Numerical Recipes*, 3rd ed. (CUP, 2007), §3.1.

    Examples
    --------
    >>> f, (g,) = apply_low_frequency([0.0, 1.0, 2.0], [[0.0, 1.0, 4.0]], 1.5)
    >>> f.tolist(), g.tolist()
    ([1.5, 2.0], [2.5, 4.0])
    """
    nu = np.asarray(frequency_thz, dtype=float)
    keep = nu > cutoff_thz
    grid = np.concatenate([[cutoff_thz], nu[keep]])
    cut = [np.concatenate([[np.interp(cutoff_thz, nu, col)], np.asarray(col, float)[keep]])
           for col in arrays]
    return grid, cut
