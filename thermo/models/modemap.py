"""Mode-resolved shares of C_v and S: which frequencies carry the heat.

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, New York, 1972), §4.
"""

from __future__ import annotations

import numpy as np

from ..columns import column_name, register_quantity
from ..errors import OptionError
from ..kernels.quadrature import mode_quadrature
from ..kernels.planck import entropy_kernel, heat_capacity_kernel, reduced_frequency
from ..tables import check_temperatures

#: Default number of frequency bins of the map.
DEFAULT_BINS = 200

register_quantity("frequency", "ν", "fixed", "THz", "THz", "frequency (centre of a bin)")
register_quantity("bin_low", "ν_low", "fixed", "THz", "THz", "lower edge of a frequency bin")
register_quantity("bin_high", "ν_high", "fixed", "THz", "THz", "upper edge of a frequency bin")
register_quantity("heat_capacity_v_share", "C_v share", "fixed", "1", "", "share of C_v carried by a frequency bin")
register_quantity("entropy_share", "S share", "fixed", "1", "", "share of S carried by a frequency bin")
#: Columns of :func:`share_table`, in order (quantity keys of the column schema).
SHARE_TABLE = ("temperature", "frequency", "bin_low", "bin_high", "heat_capacity_v_share", "entropy_share")


#: Node × temperature values evaluated at once: memory is bounded by blocks of about 16 MB.
_BLOCK = 1 << 21


def _binned(nodes, weights, index, t, bins):
    """(C_v, S) kernels weighted and summed per bin [(B, M) each], over blocks of nodes sorted by bin."""
    order = np.argsort(index, kind="stable")
    nodes, weights, index = nodes[order], weights[order], index[order]
    heat, entropy = np.zeros((bins, t.size)), np.zeros((bins, t.size))
    step = max(1, _BLOCK // max(t.size, 1))
    for lo in range(0, nodes.size, step):
        part = slice(lo, lo + step)
        idx = index[part]
        starts = np.flatnonzero(np.r_[True, idx[1:] != idx[:-1]])
        x = reduced_frequency(nodes[part], t)
        w = weights[part, None]
        heat[idx[starts]] += np.add.reduceat(w * heat_capacity_kernel(x), starts, axis=0)
        entropy[idx[starts]] += np.add.reduceat(w * entropy_kernel(x), starts, axis=0)
    return heat, entropy


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

    then summed over the nodes in each bin, a block of nodes at a time (memory
    bounded whatever the number of nodes).  Nodes at ν = 0 (whose entropy
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
    heat, entropy = _binned(nodes, weights, index, t, bins)
    heat_share = _share(heat, t > 0)
    return {"frequency_thz": 0.5 * (edges[1:] + edges[:-1]), "bin_edges_thz": edges, "temperature_K": t,
            "heat_capacity_share": heat_share, "entropy_share": _share(entropy, t > 0),
            "cumulative_heat_capacity_share": np.cumsum(heat_share, axis=0)}


def share_table(shares):
    """A :func:`mode_share_map` result as a long table: one row per temperature and frequency bin.

    Parameters
    ----------
    shares : dict
        The result of :func:`mode_share_map`.

    Returns
    -------
    pandas.DataFrame
        Columns of :data:`SHARE_TABLE` named by the column schema: temperature [K], bin centre,
        lower and upper bin edge [THz], share of C_v and of S in the bin [1]; rows by temperature,
        then frequency.

    Notes
    -----
    The shares of one temperature sum to 1 (see :func:`mode_share_map`).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 10.0, 1001)
    >>> t = share_table(mode_share_map(PhononDOS(nu, 0.3 * np.ones_like(nu), atoms=1), [100.0, 300.0], bins=4))
    >>> list(t.columns)[:3], len(t)
    (['temperature_K', 'frequency_THz', 'bin_low_THz'], 8)
    """
    import pandas as pd
    nu, edges = np.asarray(shares["frequency_thz"]), np.asarray(shares["bin_edges_thz"])
    t = np.asarray(shares["temperature_K"])
    values = {"temperature": np.repeat(t, nu.size), "frequency": np.tile(nu, t.size),
              "bin_low": np.tile(edges[:-1], t.size), "bin_high": np.tile(edges[1:], t.size),
              "heat_capacity_v_share": np.asarray(shares["heat_capacity_share"]).T.ravel(),
              "entropy_share": np.asarray(shares["entropy_share"]).T.ravel()}
    return pd.DataFrame({column_name(key): values[key] for key in SHARE_TABLE})
