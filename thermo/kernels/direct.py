"""Direct mode sums: every pair of frequency node × temperature.

All sums are per formula unit and dimensionless (number of modes × kernel).

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.
"""

from __future__ import annotations

import numpy as np
from scipy import special

from .planck import H_OVER_K_THZ, heat_capacity_kernel, log_partition_kernel, thermal_energy_kernel

#: Keys of the dictionaries returned by the sum functions.
SUM_KEYS = ("heat_capacity", "thermal_energy", "log_partition")


#: Kernel function of each sum key.
KERNELS = {"heat_capacity": heat_capacity_kernel,
            "thermal_energy": thermal_energy_kernel,
            "log_partition": log_partition_kernel}


def _zero_node_log_partition(first_step_thz, temperatures):
    r"""Mean of ℓ(x) over the half interval [0, ν₁/2] next to a ν = 0 node.

    Uses :math:`\int_0^X \ell(t)\,dt = \pi^2/6 - \mathrm{Li}_2(e^{-X})`.
    """
    with np.errstate(divide="ignore"):
        big_x = H_OVER_K_THZ * 0.5 * first_step_thz / temperatures
    li2 = special.spence(-np.expm1(-big_x))
    return (np.pi ** 2 / 6.0 - li2) / big_x


def direct_grid_sums(nodes_thz, weights, temperatures, keys=SUM_KEYS):
    r"""Sums :math:`\sum_i w_i K(h\nu_i/k_BT_j)` over every pair ν × T.

    Parameters
    ----------
    nodes_thz : array_like, shape (N,)
        Frequencies [THz], >= 0.
    weights : array_like, shape (N,)
        Number of modes carried by each node [1].
    temperatures : array_like, shape (M,)
        Temperatures [K], > 0.
    keys : sequence of str
        The sums wanted (a subset of :data:`SUM_KEYS`; the others are not computed).

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        ``heat_capacity`` (Σ w c), ``thermal_energy`` (Σ w u) and
        ``log_partition`` (Σ w ℓ) [1], those of ``keys``.

    Notes
    -----
    With :math:`x = h\nu/(k_BT)`:
    :math:`c = x^2e^x/(e^x-1)^2`, :math:`u = x/(e^x-1)`,
    :math:`\ell = -\ln(1-e^{-x})`.  A node at :math:`\nu = 0` carries the
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
    # einsum, not wp @ K: a threaded BLAS matrix-vector product stalled for milliseconds on a busy machine
    out = {key: np.einsum("n,nm->m", wp, KERNELS[key](x)) for key in keys}
    if zero.any():
        w0 = float(w[zero].sum())
        for key in {"heat_capacity", "thermal_energy"}.intersection(keys):
            out[key] = out[key] + w0
        if "log_partition" in out:
            step = float(nu[~zero].min()) if (~zero).any() else 1.0
            out["log_partition"] = out["log_partition"] + w0 * _zero_node_log_partition(step, t)
    return out
