r"""The lowest frequency a sampled DOS resolves: one rule for the error estimate and the elastic anchor.

A DOS from a q-point mesh, Gaussian-smeared (σ) or binned (Δ), says nothing
below a few smearing widths or bins, nor where its cumulative count
:math:`N(\nu)=\int_0^\nu g` does not yet follow a ν³ law (the first q-shells).
:func:`resolved_limit` starts at :math:`\max(\nu_0 + 2\sigma, 2h)` (the
lowest Gaussian feature's centre and width, or the bin/grid step h) and moves
up to the last frequency, up to where N holds :data:`FIT_SHARE` of the modes,
at which N leaves a band of :data:`LAW_BAND` around :math:`A\nu^3/3` — A
fitted to the count (the error estimate, :mod:`thermo.accuracy.resolution`) or
given by an elastic Debye temperature (:mod:`.anchor`).  A
cumulative count is far less sensitive to the comb of a mesh than :math:`g/\nu^2`.

References
----------
.. [1] N. W. Ashcroft and N. D. Mermin, *Solid State Physics* (Saunders, 1976),
   ch. 23 (the T³ law of the long-wave modes).
"""

from __future__ import annotations

import numpy as np

#: Share of the modes below the top of the ν³ fit window [1].
FIT_SHARE = 0.05
#: The data follow the ν³ law above ν_r within this factor.
LAW_BAND = 2.0


def gaussian_width(nu, g, law):
    """(σ, centre) of the lowest feature when it is a Gaussian (half-Gaussian at 0 or a rising tail), else (0, 0).

    A rising start that is no single Gaussian gives (-1, 0): σ then follows from g(0) = Aσ²/2 with
    ``law`` = A.  (Restricting the tail to where the data lie below the ν² law under-estimated σ on
    shifted 16³–24³ meshes, so the leading run is used as it is: it can only over-estimate σ.)
    """
    pos = np.flatnonzero(g > 0)
    if pos.size < 4:
        return 0.0, 0.0
    i0 = pos[0]
    # a maximum at the start: Γ's modes smeared into a half Gaussian
    if g[i0] > 0 and (i0 + 1 < g.size) and g[i0 + 1] < g[i0]:
        j = i0 + 1
        while j + 1 < g.size and 0 < g[j + 1] < g[j]:
            j += 1
        sel = np.arange(i0, j + 1)
        sel = sel[g[sel] > 1e-8 * g[i0]]
        if sel.size >= 3:
            slope = np.polyfit(nu[sel] ** 2, np.log(g[sel]), 1)[0]
            if slope < 0:
                return float(np.sqrt(-0.5 / slope)), 0.0
        return 0.0, 0.0
    # a rising start from a non-zero value at 0: the tail of the lowest smeared shell (quadratic ln g)
    if nu[0] > 1e-6 * (nu[-1] - nu[0]) or g[0] <= 0:
        return 0.0, 0.0
    best = None
    for k in range(5, min(g.size, 80) + 1):          # the longest leading run that is one Gaussian tail
        sel = np.arange(k)
        if np.any(g[sel] <= 0):
            break
        coef = np.polyfit(nu[sel], np.log(g[sel]), 2)
        rms = float(np.sqrt(np.mean((np.polyval(coef, nu[sel]) - np.log(g[sel])) ** 2)))
        if coef[0] >= 0 or rms > 0.02:
            break
        best = coef
    if best is not None:
        return float(np.sqrt(-0.5 / best[0])), max(float(-best[1] / (2 * best[0])), 0.0)
    return -1.0, 0.0          # smeared, width from g(0) = Aσ²/2 (see analyse_resolution)


def cumulative_count(nu, g, histogram):
    """N at the grid nodes (trapezoid) or at the bin tops (histogram), and those abscissae."""
    if histogram:
        h = nu[1] - nu[0]
        return np.concatenate([[0.0], nu + h / 2]), np.concatenate([[0.0], np.cumsum(g) * h])
    n = np.concatenate([[0.0], np.cumsum(0.5 * (g[1:] + g[:-1]) * np.diff(nu))])
    if nu[0] > 0:
        return np.concatenate([[0.0], nu]), np.concatenate([[0.0], n + g[0] * nu[0] / 3])
    return nu, n


def resolved_limit(nu, g, histogram, law=None, band=LAW_BAND):
    r"""(kind, width, step, ν_r, A) of a sampled DOS: what it resolves.

    Parameters
    ----------
    nu : numpy.ndarray, shape (N,)
        Ascending frequencies >= 0 [THz] (bin centres for a histogram).
    g : numpy.ndarray, shape (N,)
        DOS >= 0 [states/THz, any scale]; with ``law`` given, per formula unit.
    histogram : bool
        The rows are bins (N is Σ g·Δ).
    law : float, optional
        A of the ν³ law :math:`N = A\nu^3/3` to compare with [modes/THz³];
        default: fitted to the count (median of :math:`3N/\nu^3` over the window).
    band : float
        The count must stay within this factor of the law above ν_r.

    Returns
    -------
    kind : {'histogram', 'gaussian', 'plain'}
    width : float
        Bin width, smearing σ or 0 [THz].
    step : float
        Grid step [THz].
    resolved : float
        ν_r [THz].
    coefficient : float
        A of the law used [modes/THz³].

    Notes
    -----
    :math:`\nu_r = \max(\nu_s, \text{the point after the last}\ \nu \in [\nu_s, \nu_{top}]\ \text{with}\ N/(A\nu^3/3) \notin [1/b, b])`,
    :math:`\nu_s = \max(\nu_0 + 2\sigma, 2h)`, :math:`\nu_{top}` where N reaches
    :data:`FIT_SHARE` of the modes (at least :math:`2\nu_s`).

    Examples
    --------
    >>> nu = np.linspace(0.0, 5.0, 501)
    >>> kind, width, step, resolved, a = resolved_limit(nu, 9 * nu**2 / 125, False)
    >>> kind, round(resolved, 6), round(a * 125 / 9, 3)
    ('plain', 0.02, 1.0)
    """
    step = float(np.median(np.diff(nu)))
    kind, width, centre = "histogram", step, 0.0
    x, n = cumulative_count(nu, g, histogram)
    total = n[-1]
    if not histogram:
        a0 = law if law is not None else law_coefficient(x, n, max(2.0 * step, float(x[1])), total)
        width, centre = gaussian_width(nu, g, a0)
        kind = "gaussian" if width != 0 else "plain"
        if width < 0:             # a smeared ν² law has g(0) = Aσ²/2: σ from the ν³ law of the count
            width = float(np.sqrt(2.0 * g[0] / a0)) if a0 > 0 else step
    start = max(centre + 2.0 * width, 2.0 * step, float(x[1]))
    win = _window(x, n, start, total)
    a = law if law is not None else law_coefficient(x, n, start, total)
    resolved = start
    if a > 0:
        ratio = n[win] / (a * x[win] ** 3 / 3.0)
        bad = np.flatnonzero((ratio > band) | (ratio < 1.0 / band))
        if bad.size:          # the first point from which the count stays in the band
            above = x[win]
            resolved = max(resolved, float(above[min(bad[-1] + 1, above.size - 1)]))
    return kind, float(width), step, float(resolved), float(a)


def _window(x, n, start, total):
    """Grid points of the ν³ fit window: from ``start`` to where N reaches FIT_SHARE of the modes (at least 2 start)."""
    top = max(float(np.interp(FIT_SHARE * total, n, x)), 2.0 * start)
    win = (x >= start) & (x <= top)
    if win.sum() < 2:
        win = (x >= start) & (x <= x[min(np.searchsorted(x, start) + 2, x.size - 1)])
    return win


def law_coefficient(x, n, start, total):
    """A of N = Aν³/3 over the fit window (median of 3N/ν³: robust to the comb of the shells) [modes/THz³]."""
    win = _window(x, n, start, total)
    return float(np.median(3.0 * n[win] / x[win] ** 3)) if win.any() else 0.0
