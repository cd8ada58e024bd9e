"""Mode-resolved shares of C_v and S: which frequencies carry the heat.

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, New York, 1972), §4.
"""

from __future__ import annotations

import numpy as np

from ..errors import OptionError
from ..kernels.quadrature import mode_quadrature
from ..kernels.planck import entropy_kernel, heat_capacity_kernel, reduced_frequency
from ..tables import check_temperatures

#: Default number of frequency bins of the map.
DEFAULT_BINS = 200


def _binned(values, index, bins):
    out = np.zeros((bins, values.shape[1]))
    np.add.at(out, index, values)
    return out


def _share(binned, hot):
    total = binned.sum(axis=0, keepdims=True)
    defined = (total > 0) & hot[None, :]
    return np.where(defined, binned / np.where(defined, total, 1.0), np.nan)


def mode_share_map(dos, temperatures, bins=DEFAULT_BINS):
    r"""Share of C_v and of S carried by each frequency bin at each temperature.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.
    bins : int
        Number of equal frequency bins from 0 to the highest mode (1 ... 2000).

    Returns
    -------
    dict
        ``frequency_thz`` (bin centres, (B,)) [THz], ``bin_edges_thz`` ((B+1,))
        [THz], ``temperature_K`` ((M,)) [K], ``heat_capacity_share`` and
        ``entropy_share`` ((B, M), columns sum to 1) [1],
        ``cumulative_heat_capacity_share`` ((B, M)): share of C_v from modes
        below each bin's upper edge [1].  At T = 0 shares are ``nan``.

    Notes
    -----
    Every node pair is evaluated directly, with the quadrature of
    :func:`thermo.kernels.quadrature.mode_quadrature` (weights :math:`w_i`):

    .. math:: s^{C}_{ij} = \frac{w_i c(x_{ij})}{\sum_i w_i c(x_{ij})},\qquad
              s^{S}_{ij} = \frac{w_i s(x_{ij})}{\sum_i w_i s(x_{ij})},\qquad
              x_{ij} = \frac{h\nu_i}{k_BT_j},

    then summed over the nodes in each bin.  Nodes at ν = 0 (whose entropy
    kernel diverges) are left out.

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 10.0, 1001)
    >>> d = PhononDOS(nu, 0.3 * np.ones_like(nu), atoms=1)
    >>> m = mode_share_map(d, [1e6], bins=10)
    >>> m["heat_capacity_share"][1:4, 0].round(3).tolist()   # classical: shares = mode fractions
    [0.1, 0.1, 0.1]
    """
    bins = int(bins)
    if not 1 <= bins <= 2000:
        raise OptionError(f"number of frequency bins must be 1 ... 2000, got {bins}")
    t = check_temperatures(temperatures)
    nodes, weights = mode_quadrature(dos)
    keep = (weights > 0) & (nodes > 0)
    nodes, weights = nodes[keep], weights[keep]
    edges = np.linspace(0.0, float(nodes.max()), bins + 1)
    index = np.clip(np.searchsorted(edges, nodes, side="right") - 1, 0, bins - 1)
    x = reduced_frequency(nodes, t)
    heat = _binned(weights[:, None] * heat_capacity_kernel(x), index, bins)
    entropy = _binned(weights[:, None] * entropy_kernel(x), index, bins)
    heat_share = _share(heat, t > 0)
    return {"frequency_thz": 0.5 * (edges[1:] + edges[:-1]), "bin_edges_thz": edges, "temperature_K": t,
            "heat_capacity_share": heat_share, "entropy_share": _share(entropy, t > 0),
            "cumulative_heat_capacity_share": np.cumsum(heat_share, axis=0)}
