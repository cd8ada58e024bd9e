r"""Quadrature of a tabulated DOS: trapezoid mode weights with sharp band edges.

A DOS is the analytic form :math:`A\nu^2` below the low-frequency cut-off
plus a piecewise-linear table above it.  The functions here turn the table
into mode weights (one number of modes per grid node) and the whole DOS into
nodes and weights of one discrete sum.

References
----------
.. [1] P. Debye, "Zur Theorie der spezifischen Wärmen", Ann. Phys. 344,
   789-839 (1912) (sharp cut-off spectrum).
.. [2] M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*
   (NBS, 1964), 25.4.29 (Gauss–Legendre quadrature).
"""

from __future__ import annotations

import numpy as np

#: 64-point Gauss–Legendre nodes and weights on [0, 1] (for the ν² part).
_GL_NODES, _GL_WEIGHTS = np.polynomial.legendre.leggauss(64)
_GL_NODES = 0.5 * (_GL_NODES + 1.0)
_GL_WEIGHTS = 0.5 * _GL_WEIGHTS


#: A sample at least this share of the maximum next to an exact zero marks a
#: sharp band edge (see :func:`band_edge_segments`).
EDGE_SHARE = 0.25


def band_edge_segments(frequency_thz, dos):
    """Segments read as empty because the DOS has a sharp edge there.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Ascending grid [THz].
    dos : array_like, shape (N,)
        DOS samples [states / THz].

    Returns
    -------
    numpy.ndarray of bool, shape (N-1,)
        True for a segment between an exact zero and a sample of at least
        25 % of the maximum and at least half its other, non-zero neighbour
        (the edge of an extended band, as in a Debye spectrum or a
        histogram).  Isolated spikes and smooth rises keep their segments.

    Notes
    -----
    A linear ramp across such a segment would add half a grid step of modes
    (1.5 Δν/ν_D of the total for a Debye spectrum sampled on its cut-off);
    reading the band as ending at its last non-zero sample avoids that.

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912) (sharp cut-off spectrum).

    Examples
    --------
    >>> band_edge_segments([0, 1, 2, 3, 4], [0.0, 1.0, 4.0, 0.0, 0.0]).tolist()
    [False, False, True, False]
    >>> band_edge_segments([0, 1, 2, 3, 4], [0.0, 0.0, 3.0, 3.0, 0.0]).tolist()
    [False, True, False, True]
    """
    g = np.asarray(dos, dtype=float)
    edge = np.zeros(max(g.size - 1, 0), dtype=bool)
    if g.size < 3 or not np.any(g > 0):
        return edge
    big = g >= EDGE_SHARE * g.max()
    mid = g[1:-1]
    falling = big[1:-1] & (mid >= 0.5 * g[:-2]) & (g[:-2] > 0) & (g[2:] == 0)   # segment i+1 -> i+2
    rising = (g[:-2] == 0) & big[1:-1] & (mid >= 0.5 * g[2:]) & (g[2:] > 0)     # segment i -> i+1
    edge[1:] |= falling
    edge[:-1] |= rising
    return edge


def trapezoid_weights(frequency_thz, dos=None):
    r"""Trapezoid-rule weights of a non-uniform grid.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Ascending grid [THz].
    dos : array_like, shape (N,), optional
        When given, segments at sharp band edges of this DOS
        (:func:`band_edge_segments`) get no weight.

    Returns
    -------
    numpy.ndarray, shape (N,)
        Weights [THz] such that ``sum(w * f)`` is the trapezoid integral.

    Notes
    -----
    :math:`w_i = (\nu_{i+1} - \nu_{i-1})/2`, with half intervals at the ends.

    References
    ----------
    .. [1] W. H. Press, S. A. Teukolsky, W. T. Vetterling, B. P. Flannery,
       *Numerical Recipes*, 3rd ed. (Cambridge University Press, 2007), §4.1.

    Examples
    --------
    >>> trapezoid_weights([0.0, 1.0, 3.0]).tolist()
    [0.5, 1.5, 1.0]
    """
    nu = np.asarray(frequency_thz, dtype=float)
    w = np.zeros_like(nu)
    if nu.size > 1:
        d = 0.5 * np.diff(nu)
        if dos is not None:
            d = np.where(band_edge_segments(nu, dos), 0.0, d)
        w[:-1] += d
        w[1:] += d
    return w


def mode_weights(frequency_thz, dos):
    """Modes carried by each sample of a tabulated DOS.

    Parameters
    ----------
    frequency_thz : array_like, shape (N,)
        Ascending grid [THz].
    dos : array_like, shape (N,)
        DOS [states / THz].

    Returns
    -------
    numpy.ndarray, shape (N,)
        :math:`g_i w_i` [modes]; the sum is the integral of the DOS.

    Examples
    --------
    >>> float(mode_weights([0.0, 1.0, 2.0], [1.0, 2.0, 2.0]).sum())
    3.5
    """
    return np.asarray(dos, dtype=float) * trapezoid_weights(frequency_thz, dos)


def mode_quadrature(dos):
    r"""Nodes and mode weights representing the whole DOS as a discrete sum.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.

    Returns
    -------
    nodes : numpy.ndarray
        Frequencies [THz]: Gauss–Legendre nodes on the ν² part, then the
        tabulated grid.
    weights : numpy.ndarray
        Modes carried by each node [1]; they add up to ``dos.mode_count``.

    Notes
    -----
    :math:`\int g(\nu) f(\nu)\,d\nu \approx \sum_k w_k f(\nu_k)`, exact
    for the ν² part when :math:`f` is a polynomial of degree below 126.

    References
    ----------
    .. [1] M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*
       (NBS, 1964), 25.4.29.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> d = PhononDOS(np.array([0.0, 1.0]), np.array([0.0, 6.0]), atoms=1)
    >>> nodes, w = mode_quadrature(d)
    >>> float(w.sum())
    3.0
    """
    weights = mode_weights(dos.frequency_thz, dos.dos)
    nodes = np.asarray(dos.frequency_thz, float)
    fit = dos.low_frequency
    if fit is None or fit.cutoff_thz <= 0:
        return nodes, weights
    gl_nodes = fit.cutoff_thz * _GL_NODES
    gl_weights = fit.cutoff_thz * _GL_WEIGHTS * fit.coefficient * gl_nodes ** 2 * (1.0 + gl_nodes ** 2 * (fit.curvature + fit.quartic * gl_nodes ** 2))
    taper_nodes, taper_modes = fit.taper_nodes()
    return np.concatenate([gl_nodes, taper_nodes, nodes]), np.concatenate([gl_weights, taper_modes, weights])
