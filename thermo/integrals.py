"""Integrals of a phonon DOS against the Planck kernels.

The DOS is the analytic Debye form :math:`A\\nu^2` below the low-frequency
cut-off plus a piecewise-linear table above it.  The table part is summed
with trapezoid weights (every pair ν × T, or the log-grid correlation of
:mod:`thermo.fastsum`); the :math:`A\\nu^2` part is integrated in reduced
variables, so the :math:`T^3` law holds however coarse the table is.

All sums are per formula unit and dimensionless (number of modes × kernel).
"""

from __future__ import annotations

import numpy as np
from scipy import special

from .planck import (H_OVER_K_THZ, heat_capacity_kernel, log_partition_kernel,
                     thermal_energy_kernel)

#: Keys of the dictionaries returned by the sum functions.
SUM_KEYS = ("heat_capacity", "thermal_energy", "log_partition")

_GL_NODES, _GL_WEIGHTS = np.polynomial.legendre.leggauss(64)
_GL_NODES = 0.5 * (_GL_NODES + 1.0)
_GL_WEIGHTS = 0.5 * _GL_WEIGHTS
#: Beyond this reduced cut-off the ν² integrals equal their limits to 1e-20.
_X_INFINITE = 60.0
_PI4 = np.pi ** 4
#: ∫_0^∞ x² K(x) dx for K = c, u, ℓ: 4π⁴/15, π⁴/15, π⁴/45 (Debye integrals).
_NU2_LIMITS = {"heat_capacity": 4 * _PI4 / 15, "thermal_energy": _PI4 / 15,
               "log_partition": _PI4 / 45}
#: Kernel function of each sum key.
KERNELS = {"heat_capacity": heat_capacity_kernel,
            "thermal_energy": thermal_energy_kernel,
            "log_partition": log_partition_kernel}


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
    """Trapezoid-rule weights of a non-uniform grid.

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
    :math:`w_i = (\\nu_{i+1} - \\nu_{i-1})/2`, with half intervals at the ends.

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


def _zero_node_log_partition(first_step_thz, temperatures):
    """Mean of ℓ(x) over the half interval [0, ν₁/2] next to a ν = 0 node.

    Uses :math:`\\int_0^X \\ell(t)\\,dt = \\pi^2/6 - \\mathrm{Li}_2(e^{-X})`.
    """
    with np.errstate(divide="ignore"):
        big_x = H_OVER_K_THZ * 0.5 * first_step_thz / temperatures
    li2 = special.spence(-np.expm1(-big_x))
    return (np.pi ** 2 / 6.0 - li2) / big_x


def direct_grid_sums(nodes_thz, weights, temperatures):
    """Sums :math:`\\sum_i w_i K(h\\nu_i/k_BT_j)` over every pair ν × T.

    Parameters
    ----------
    nodes_thz : array_like, shape (N,)
        Frequencies [THz], >= 0.
    weights : array_like, shape (N,)
        Number of modes carried by each node [1].
    temperatures : array_like, shape (M,)
        Temperatures [K], > 0.

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        ``heat_capacity`` (Σ w c), ``thermal_energy`` (Σ w u) and
        ``log_partition`` (Σ w ℓ) [1].

    Notes
    -----
    With :math:`x = h\\nu/(k_BT)`:
    :math:`c = x^2e^x/(e^x-1)^2`, :math:`u = x/(e^x-1)`,
    :math:`\\ell = -\\ln(1-e^{-x})`.  A node at :math:`\\nu = 0` carries the
    mean of ℓ over its half interval (ℓ diverges logarithmically there).

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.

    Examples
    --------
    >>> s = direct_grid_sums([1.0], [3.0], [1e6])
    >>> round(float(s["heat_capacity"][0]), 6)
    3.0
    """
    nu = np.asarray(nodes_thz, dtype=float)
    w = np.asarray(weights, dtype=float)
    t = np.asarray(temperatures, dtype=float)
    keep = w != 0.0
    nu, w = nu[keep], w[keep]
    zero = nu == 0.0
    x = H_OVER_K_THZ * nu[~zero, None] / t[None, :]
    wp = w[~zero]
    out = {key: wp @ KERNELS[key](x) for key in SUM_KEYS}
    if zero.any():
        w0 = float(w[zero].sum())
        out["heat_capacity"] = out["heat_capacity"] + w0
        out["thermal_energy"] = out["thermal_energy"] + w0
        step = float(nu[~zero].min()) if (~zero).any() else 1.0
        out["log_partition"] = out["log_partition"] + w0 * _zero_node_log_partition(step, t)
    return out


def nu2_part_sums(coefficient, cutoff_thz, temperatures):
    """Sums of the analytic part :math:`A\\nu^2` on :math:`[0, \\nu_c]`.

    Parameters
    ----------
    coefficient : float
        :math:`A` [modes / THz³].
    cutoff_thz : float
        :math:`\\nu_c` [THz].
    temperatures : array_like, shape (M,)
        Temperatures [K], > 0.

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        Same keys as :func:`direct_grid_sums` [1].

    Notes
    -----
    .. math:: \\int_0^{\\nu_c} A\\nu^2 K\\!\\left(\\frac{h\\nu}{k_BT}\\right)d\\nu
              = A\\left(\\frac{k_BT}{h}\\right)^3 \\int_0^{x_c} x^2 K(x)\\,dx

    evaluated by 64-point Gauss–Legendre quadrature for c and u (ℓ by parts,
    :math:`\\int_0^{X} x^2\\ell = X^3\\ell(X)/3 + \\int_0^X x^2u/3`) for
    :math:`x_c \\le 60` and by the complete Debye integrals
    :math:`4\\pi^4/15`, :math:`\\pi^4/15`, :math:`\\pi^4/45` above.

    References
    ----------
    .. [1] P. Debye, "Zur Theorie der spezifischen Wärmen", Ann. Phys. 344,
       789-839 (1912).
    .. [2] M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*
       (NBS, 1964), 27.1 (Debye functions) and 25.4.29 (Gauss–Legendre).

    Examples
    --------
    >>> s = nu2_part_sums(9.0, 1.0, [0.01])   # deep T^3 regime, 3 modes
    >>> from math import pi
    >>> x_d = H_OVER_K_THZ / 0.01
    >>> round(float(s["heat_capacity"][0]) / (12 * pi**4 / 5 / x_d**3), 9)
    1.0
    """
    t = np.asarray(temperatures, dtype=float)
    zeros = {key: np.zeros_like(t) for key in SUM_KEYS}
    if coefficient == 0.0 or cutoff_thz <= 0.0:
        return zeros
    scale = coefficient * (t / H_OVER_K_THZ) ** 3
    xc = H_OVER_K_THZ * cutoff_thz / t
    finite = xc <= _X_INFINITE
    span = np.minimum(xc, _X_INFINITE)[:, None]
    x = span * _GL_NODES[None, :]
    integral = {key: span[:, 0] * ((x * x * KERNELS[key](x)) @ _GL_WEIGHTS)
                for key in ("heat_capacity", "thermal_energy")}
    # ℓ has a log singularity at 0: integrate by parts, ℓ' = -u/x.
    integral["log_partition"] = (span[:, 0] ** 3 * log_partition_kernel(span[:, 0])
                                 + integral["thermal_energy"]) / 3.0
    return {key: scale * np.where(finite, integral[key], _NU2_LIMITS[key])
            for key in SUM_KEYS}


def mode_quadrature(dos):
    """Nodes and mode weights representing the whole DOS as a discrete sum.

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
    :math:`\\int g(\\nu) f(\\nu)\\,d\\nu \\approx \\sum_k w_k f(\\nu_k)`, exact
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
    gl_weights = fit.cutoff_thz * _GL_WEIGHTS * fit.coefficient * gl_nodes ** 2
    return np.concatenate([gl_nodes, nodes]), np.concatenate([gl_weights, weights])


def grid_sums(nodes_thz, weights, temperatures, method="auto"):
    """Dispatch the table-part sums to the direct or the fast evaluation.

    Parameters
    ----------
    nodes_thz, weights : array_like, shape (N,)
        Frequencies [THz] and mode weights [1].
    temperatures : array_like, shape (M,)
        Temperatures [K], > 0.
    method : {'auto', 'direct', 'fast'}
        ``direct`` sums every pair; ``fast`` uses the log-grid correlation
        of :mod:`thermo.fastsum`; ``auto`` picks ``fast`` where it is
        accurate and cheaper.

    Returns
    -------
    dict of str to numpy.ndarray
        As :func:`direct_grid_sums`.

    Examples
    --------
    >>> s = grid_sums([1.0], [3.0], [1e6], method="direct")
    >>> round(float(s["heat_capacity"][0]), 6)
    3.0
    """
    if method not in ("auto", "direct", "fast"):
        from .errors import OptionError
        raise OptionError(f"unknown method {method!r}; choose auto, direct or fast")
    if method != "direct":
        try:
            from . import fastsum
        except ImportError:
            fastsum = None
        if fastsum is not None and (method == "fast" or fastsum.suitable(nodes_thz, weights, temperatures)):
            return fastsum.grid_sums(nodes_thz, weights, temperatures)
    return direct_grid_sums(nodes_thz, weights, temperatures)


def thermal_sums(dos, temperatures, method="auto"):
    """Mode-weighted kernel sums of a whole DOS at each temperature.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0 (T = 0 gives exact zeros).
    method : {'auto', 'direct', 'fast'}
        Evaluation of the tabulated part (see :func:`grid_sums`).

    Returns
    -------
    dict
        ``heat_capacity``, ``thermal_energy``, ``log_partition`` and
        ``entropy`` (= thermal_energy + log_partition), arrays (M,) [1];
        ``zero_point_thz``, :math:`\\sum \\text{modes}\\cdot\\nu/2` [THz].

    Notes
    -----
    .. math:: \\Sigma_K(T) = \\int_0^{\\nu_c} A\\nu^2 K\\,d\\nu
              + \\sum_i w_i g_i K\\!\\left(\\frac{h\\nu_i}{k_BT}\\right)

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> d = PhononDOS(np.array([0.0, 1.0]), np.array([0.0, 6.0]), atoms=1)
    >>> round(float(thermal_sums(d, [1e7])["heat_capacity"][0]), 6)
    3.0
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float))
    hot = t > 0
    out = {key: np.zeros_like(t) for key in SUM_KEYS}
    if hot.any():
        parts = [grid_sums(dos.frequency_thz, mode_weights(dos.frequency_thz, dos.dos), t[hot], method)]
        if dos.low_frequency is not None:
            nu2 = nu2_part_sums
            if method != "direct":   # closed form (Debye integrals), equal to 1e-12, ~15x faster
                from .fastsum import debye_part_sums as nu2
            parts.append(nu2(dos.low_frequency.coefficient, dos.low_frequency.cutoff_thz, t[hot]))
        for key in SUM_KEYS:
            out[key][hot] = sum(p[key] for p in parts)
    out["entropy"] = out["thermal_energy"] + out["log_partition"]
    zp = float(np.sum(mode_weights(dos.frequency_thz, dos.dos) * dos.frequency_thz)) / 2
    if dos.low_frequency is not None:
        zp += dos.low_frequency.coefficient * dos.low_frequency.cutoff_thz ** 4 / 8
    out["zero_point_thz"] = zp
    return out
