"""Mode sums of a whole DOS: the table part (direct or log-grid) plus the ν² part.

The only entry point the tables and models need: :func:`thermal_sums` for a
:class:`~thermo.spectrum.PhononDOS`, :func:`grid_sums` for nodes and weights.

References
----------
.. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc

from ..errors import OptionError
from . import loggrid
from .direct import SUM_KEYS, direct_grid_sums
from .nu2 import analytic_part_sums, nu2_part_sums
from .quadrature import mode_weights

#: Zero-point energy [J/mol] per THz of Σ modes·ν/2.
ZPE_J_PER_MOL_PER_THZ = sc.N_A * sc.h * 1e12


def molar_values(sums, t):
    r"""C_v, S [J/(mol·K)] and U, F [J/mol] per mole of formula units from the sums.

    Notes
    -----
    :math:`C_v = R\Sigma_c`, :math:`S = R\Sigma_s`,
    :math:`U = E_0 + RT\Sigma_u`, :math:`F = E_0 - RT\Sigma_\ell`.

    Examples
    --------
    >>> s = {"heat_capacity": np.array([1.0]), "entropy": np.array([0.0]),
    ...      "thermal_energy": np.array([0.0]), "log_partition": np.array([0.0]), "zero_point_thz": 0.0}
    >>> round(float(molar_values(s, np.array([1.0]))[0][0]), 6)
    8.314463
    """
    zpe = sums["zero_point_thz"] * ZPE_J_PER_MOL_PER_THZ
    r = sc.R
    return (r * sums["heat_capacity"], r * sums["entropy"],
            zpe + r * t * sums["thermal_energy"], zpe - r * t * sums["log_partition"])


def grid_sums(nodes_thz, weights, temperatures, method="auto", keys=SUM_KEYS, prepared=None):
    """Dispatch the table-part sums to the direct or the fast evaluation.

    Parameters
    ----------
    nodes_thz, weights : array_like, shape (N,)
        Frequencies [THz] and mode weights [1].
    temperatures : array_like, shape (M,)
        Temperatures [K], > 0.
    method : {'auto', 'direct', 'fast'}
        ``direct`` sums every pair; ``fast`` uses the log-grid correlation
        of :mod:`thermo.kernels.loggrid`; ``auto`` picks ``fast`` where it is
        accurate and cheaper.
    keys : sequence of str
        Sums wanted (the direct path computes only these; the fast path all).
    prepared : thermo.kernels.loggrid.LogGrid, optional
        The same nodes and weights prepared for the fast path (kept by the caller).

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
        raise OptionError(f"unknown method {method!r}; choose auto, direct or fast")
    m, n = np.size(temperatures), np.size(nodes_thz)
    if method == "fast" or (method == "auto" and (m >= loggrid.MIN_TEMPERATURES or (m >= 2 and n >= loggrid.MANY_NODES))
                            and n * m >= loggrid.MIN_PAIRS):
        grid = loggrid.LogGrid(nodes_thz, weights) if prepared is None else prepared
        if method == "fast" or grid.suitable(temperatures):
            return grid.sums(temperatures)
    return direct_grid_sums(nodes_thz, weights, temperatures, keys)


def thermal_sums(dos, temperatures, method="auto", keys=SUM_KEYS):
    r"""Mode-weighted kernel sums of a whole DOS at each temperature.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0 (T = 0 gives exact zeros).
    method : {'auto', 'direct', 'fast'}
        Evaluation of the tabulated part (see :func:`grid_sums`).
    keys : sequence of str
        Sums wanted, a subset of ``heat_capacity``, ``thermal_energy``,
        ``log_partition`` (default all; a check that needs S alone skips C_v).

    Returns
    -------
    dict
        ``heat_capacity``, ``thermal_energy``, ``log_partition`` (those of
        ``keys``) and ``entropy`` (= thermal_energy + log_partition, when
        both are), arrays (M,) [1]; ``zero_point_thz``,
        :math:`\sum \text{modes}\cdot\nu/2` [THz].

    Notes
    -----
    .. math:: \Sigma_K(T) = \int_0^{\nu_c} A\nu^2 K\,d\nu
              + \sum_i w_i g_i K\!\left(\frac{h\nu_i}{k_BT}\right)

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
    if dos.modes is not None:
        return mode_list_sums(dos.modes, t, method, keys)
    hot = t > 0
    weights, grid, zero_point = _prepared(dos)
    if t.ndim == 1 and hot.all():
        parts = [grid_sums(dos.frequency_thz, weights, t, method, keys, grid)]
        if dos.low_frequency is not None:
            parts.append(analytic_part_sums(dos.low_frequency, t))
        out = {key: parts[0][key] + parts[1][key] if len(parts) > 1 else parts[0][key] for key in keys}
    else:
        out = {key: np.zeros_like(t) for key in keys}
        if hot.any():
            parts = [grid_sums(dos.frequency_thz, weights, t[hot], method, keys, grid)]
            if dos.low_frequency is not None:
                parts.append(analytic_part_sums(dos.low_frequency, t[hot]))
            for key in keys:
                out[key][hot] = sum(p[key] for p in parts)
    if "thermal_energy" in out and "log_partition" in out:
        out["entropy"] = out["thermal_energy"] + out["log_partition"]
    out["zero_point_thz"] = zero_point
    return out


def _prepared(dos):
    """The DOS's mode weights, their :class:`~thermo.kernels.loggrid.LogGrid` and Σ modes·ν/2 [THz], computed on
    first use and kept on the DOS beside its frozen fields (a prepared spectrum does not change)."""
    held = getattr(dos, "__dict__", None)
    kept = None if held is None else held.get("_prepared_grid")
    if kept is None or kept[0] is not dos.frequency_thz or kept[1] is not dos.dos or kept[2] is not dos.low_frequency:
        weights = mode_weights(dos.frequency_thz, dos.dos)
        zero_point = float(np.sum(weights * dos.frequency_thz)) / 2
        if dos.low_frequency is not None:
            zero_point += dos.low_frequency.analytic_moment(1) / 2
        kept = (dos.frequency_thz, dos.dos, dos.low_frequency, weights,
                loggrid.LogGrid(dos.frequency_thz, weights), zero_point)
        if held is not None:
            held["_prepared_grid"] = kept
    return kept[3:]


def mode_list_sums(modes, temperatures, method="auto", keys=SUM_KEYS, weights=None, continuum_share=1.0):
    r"""Sums of a :class:`~thermo.spectrum.ModeList`: every mode, plus its elastic continuum.

    Parameters
    ----------
    modes : ModeList
        Modes [THz] with their weights [modes per formula unit].
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.
    method : {'auto', 'direct', 'fast'}
        Evaluation of the mode sums (see :func:`grid_sums`).
    keys : sequence of str
        Sums wanted.
    weights : array_like, optional
        Other weights of the modes (a species' share of each) [1]; default ``modes.weight``.
    continuum_share : float
        Share of the continuum counted with them [1].

    Returns
    -------
    dict
        As :func:`thermal_sums`.

    Notes
    -----
    .. math:: \Sigma_K(T) = \sum_i w_i K\!\left(\frac{h\nu_i}{k_BT}\right)
              + \sum_j \int_0^{\nu_{c,j}} A_j\nu^2(1+b_j\nu^2) K\,d\nu

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.

    Examples
    --------
    >>> from thermo.spectrum import ModeList
    >>> m = ModeList(np.array([2.0]), np.array([3.0]))
    >>> round(float(mode_list_sums(m, [1e7])["heat_capacity"][0]), 6)
    3.0
    """
    t = np.atleast_1d(np.asarray(temperatures, dtype=float))
    hot = t > 0
    out = {key: np.zeros_like(t) for key in keys}
    if hot.any():        # the modes, the continuum's taper and dispersion nodes in one pass; its ν² core closed
        share = continuum_share
        tapers = [fit.taper_nodes() for fit in modes.continuum]
        nodes = np.concatenate([modes.frequency_thz, modes.extra[0]] + [n for n, _ in tapers])
        counts = np.concatenate([modes.weight if weights is None else np.asarray(weights, float),
                                 share * modes.extra[1]] + [share * w for _, w in tapers])
        order = np.argsort(nodes, kind="stable")
        parts = [grid_sums(nodes[order], counts[order], t[hot], method, keys)]
        parts += [nu2_part_sums(share * f.coefficient, f.cutoff_thz, t[hot], f.curvature, f.quartic)
                  for f in modes.continuum]
        for key in keys:
            out[key][hot] = sum(p[key] for p in parts)
    if "thermal_energy" in out and "log_partition" in out:
        out["entropy"] = out["thermal_energy"] + out["log_partition"]
    mesh = modes.weight if weights is None else np.asarray(weights, float)
    out["zero_point_thz"] = float(np.sum(mesh * modes.frequency_thz) + continuum_share * (
        np.sum(modes.extra[1] * modes.extra[0]) + sum(f.analytic_moment(1) for f in modes.continuum))) / 2
    return out
