r"""What a sampled DOS resolves, and the resolution and smearing parts of a table's error.

A DOS from a q-point mesh is a sum of modes at the mesh points, smeared
(Gaussian of width σ) or binned (histogram of width Δ).  It says nothing
about the modes below its lowest resolved frequency :math:`\nu_r` (the first
q-shell, a few smearing widths, a few bins), and above it the mesh's shells
and the smearing move modes by up to a shell spacing or a width.

Both errors are bounded through the cumulative count
:math:`N(\nu)=\int_0^\nu g`: for a kernel :math:`K` (per mode) and any two
spectra with the same mode count, integration by parts gives

.. math:: \Big|\int K\,dN_1 - \int K\,dN_2\Big| \le \int |K'(\nu)|\,|N_1-N_2|\,d\nu ,

so a bound :math:`D(\nu) \ge |N_{table}-N_{true}|` gives an error bound per
quantity and temperature:

* *resolution* (:math:`\nu<\nu_r`): the true count lies between 0 and
  :math:`U = \min(\gamma N_D, N_{table}(\nu_r) + |\Delta N_e(\nu_r)|)`, so
  :math:`D = \max(N_{table}, U - N_{table})`, with
  :math:`N_D = A\nu^3/3` the ν³ law fitted to the cumulative count above
  :math:`\nu_r` (far less sensitive to mesh combs than :math:`g/\nu^2`),
  :math:`\gamma` = :data:`MODEL_FACTOR` and :math:`\Delta N_e(\nu_r)` the count
  the extra smearing below moves across :math:`\nu_r` (the count up to
  :math:`\nu_r` is the data's within it); when the table follows a fitted ν²
  form there, :math:`D = |N_{table} - N_D| + 0.5 N_D` (:data:`LAW_UNCERTAINTY`);
* *smearing* (:math:`\nu\ge\nu_r`): twice the change of the table,
  :math:`2|\int K\,d(N_{data}-N_{data}*G_{\sigma_e})|`, when the data are
  smeared once more by :math:`\sigma_e=\sqrt2\,\max(\sigma,\Delta,h)`
  (none when no smearing or binning is seen; the grid step is then the
  numerical part's):
  to first order that change equals the error of the smearing the data
  carry (Richardson's argument applied to σ², [2]_); it also sees the comb
  of the shells.  For S the change is taken by parts,
  :math:`2|\int_{\nu_r} K_S'\,(N_{data}-N_{data}*G_{\sigma_e})\,d\nu|`: the
  kernel :math:`K_S = 1 - \ln x + \dots` grows like ln T at high T, and an
  error bound must not change when a constant is added to the kernel (the
  mode count is fixed) — the count moved across :math:`\nu_r` belongs to
  the resolution part.

References
----------
.. [1] N. W. Ashcroft and N. D. Mermin, *Solid State Physics* (Saunders, 1976),
   ch. 23 (the T³ law of the long-wave modes).
.. [2] L. F. Richardson, Phil. Trans. R. Soc. A 226, 299 (1927).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy import constants as sc

from ..kernels.planck import H_OVER_K_THZ
from ..preparation.histogram import is_histogram
from ..preparation.resolved import cumulative_count as _cumulative, law_coefficient as _law, resolved_limit

#: The ν³ law below the resolved limit is trusted to this factor (the true count may exceed the fit's).
MODEL_FACTOR = 2.0
#: Relative uncertainty of the ν³ law of the count below ν_r when the table itself follows a ν² law there
#: (on the test crystals the law's A was 0.85-1.23 times the exact long-wave one).
LAW_UNCERTAINTY = 0.5
#: Most points of the fine frequency grid of the bounds.
GRID_POINTS = 4000
#: Safety factor on the resolution bound (its ν³ law and count below ν_r are estimates).
RESOLUTION_SAFETY = 1.25
#: The smearing part is this many times the change of the table under the extra smearing (σ_e = √2 σ:
#: to first order the change equals the smearing error itself).
SMEARING_FACTOR = 2.0
#: The smearing part at T is the largest change over T/ENVELOPE … T·ENVELOPE (the signed change crosses zero).
ENVELOPE = 1.3
ENVELOPE_POINTS = 60
#: A mode list without a long-wave continuum: its comb of shells is judged as a smearing of this many
#: times its lowest mode (the first shell's spacing) [1].
LIST_WIDTH = 0.5
#: The table is not determined by the data below h·ν_r/(k_B · this) (as for a mode list).
RESOLVED_DIVISOR = 5.0
_J_PER_MOL_PER_THZ = sc.h * 1e12 * sc.N_A


@dataclass(frozen=True)
class Resolution:
    r"""What a sampled DOS resolves.

    Attributes
    ----------
    kind : {'histogram', 'gaussian', 'plain', 'modes'}
        Histogram of bin centres, Gaussian-smeared mesh DOS (smearing seen in
        its lowest feature), neither seen, or a mode list without a long-wave
        continuum (nothing resolved below its lowest mode; the comb of
        its first shells judged as a smearing :data:`LIST_WIDTH` times that mode wide).
    width_thz : float
        Bin width, smearing σ, or 0 [THz].
    step_thz : float
        Grid step of the data [THz].
    resolved_thz : float
        Lowest frequency the data resolve, ν_r [THz].
    coefficient : float
        A of the ν³ law N = Aν³/3 fitted to the cumulative count above ν_r [modes/THz³].
    undetermined_below_k : float
        Below this temperature the table is not determined by the data [K].
    lost_share : float
        Share of the modes a smeared DOS starting at 0 lost below 0,
        :math:`g(0)\,\sigma\sqrt{\pi/2}/N` (exact for Γ's half Gaussian, an upper
        bound for a tail centred above 0); the normalisation to 3n spreads it
        over all modes [1].
    """

    kind: str
    width_thz: float
    step_thz: float
    resolved_thz: float
    coefficient: float
    undetermined_below_k: float
    lost_share: float = 0.0

    def as_dict(self):
        """JSON-able record."""
        return {"kind": self.kind, "width_THz": self.width_thz, "step_THz": self.step_thz,
                "resolved_THz": self.resolved_thz, "cumulative_nu3_coefficient": self.coefficient,
                "undetermined_below_K": self.undetermined_below_k, "lost_share": self.lost_share}


def _data(dos):
    """(ν, g) of the positive-frequency data as read (scaled), or of the table."""
    if dos.input_frequency_thz is not None and dos.input_dos is not None:
        nu, g = np.asarray(dos.input_frequency_thz, float), np.asarray(dos.input_dos, float)
    else:
        nu, g = np.asarray(dos.frequency_thz, float), np.asarray(dos.dos, float)
    keep = nu >= 0
    return nu[keep], np.clip(g[keep], 0.0, None)


def analyse_resolution(dos):
    """The :class:`Resolution` of a prepared DOS (None for a mode list or an empty table).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 5.0, 501)
    >>> r = analyse_resolution(PhononDOS(nu, 9 * nu**2 / 125, atoms=1))
    >>> r.kind, r.resolved_thz <= 0.05
    ('plain', True)
    """
    if dos.modes is not None and not dos.source.get("histogram"):
        return None if dos.modes.continuum else _list_resolution(dos.modes)
    nu, g = _data(dos)
    if nu.size < 4 or not np.any(g > 0):
        return None
    histogram = bool(dos.source.get("histogram")) or is_histogram(nu)
    kind, width, step, resolved, a = resolved_limit(nu, g, histogram)
    total = _cumulative(nu, g, histogram)[1][-1]
    lost = float(g[0] * width * np.sqrt(np.pi / 2) / total) if kind == "gaussian" and nu[0] == 0 else 0.0
    return Resolution(kind, float(width), step, float(resolved), a, float(H_OVER_K_THZ * resolved / RESOLVED_DIVISOR),
                      lost)


def _list_resolution(modes):
    """A mode list without a long-wave continuum resolves nothing below its lowest mode: ν³ law of the count above."""
    x = np.concatenate([[0.0], modes.frequency_thz])
    n = np.concatenate([[0.0], np.cumsum(modes.weight)])
    if x.size < 4 or n[-1] <= 0:
        return None
    resolved = float(modes.resolved_thz or modes.frequency_thz[0])
    a = _law(x, n, resolved, float(n[-1]))
    step = resolved / 10.0
    return Resolution("modes", LIST_WIDTH * resolved, step, resolved, a,
                      float(H_OVER_K_THZ * resolved / RESOLVED_DIVISOR))


def resolution_note(resolution, temperatures):
    """The warning that the table is not determined by the data below some temperature, or None.

    Examples
    --------
    >>> r = Resolution("gaussian", 0.12, 0.03, 0.9, 0.05, 8.6)
    >>> resolution_note(r, [5.0, 300.0])[:59]
    'the data resolve frequencies down to 0.9 THz (Gaussian smea'
    >>> resolution_note(r, [10.0, 300.0]) is None
    True
    """
    t = np.asarray(temperatures, float)
    if resolution is None or not np.any((t > 0) & (t < resolution.undetermined_below_k)):
        return None
    what = {"gaussian": f"Gaussian smearing σ ≈ {resolution.width_thz:.3g} THz",
            "histogram": f"{resolution.width_thz:.3g} THz bins", "plain": "its lowest rows",
            "modes": "its lowest mode"}[resolution.kind]
    return (f"the data resolve frequencies down to {resolution.resolved_thz:.3g} THz ({what}, first q-shells); "
            f"below {resolution.undetermined_below_k:.3g} K the table is not determined by the data "
            "(see the resolution part of the error estimate)")


def _table_cumulative(dos, grid):
    """N of what the table integrates (modes; or ν² form, then the piecewise-linear table) at ``grid``."""
    if dos.modes is not None:
        steps = np.cumsum(dos.modes.weight)
        at = np.searchsorted(dos.modes.frequency_thz, grid, side="right")
        return np.where(at > 0, steps[np.maximum(at - 1, 0)], 0.0)
    nu, g = np.asarray(dos.frequency_thz, float), np.asarray(dos.dos, float)
    x, n = _cumulative(nu, g, False)
    out = np.interp(grid, x, n, right=n[-1])
    fit = dos.low_frequency
    if fit is not None and fit.cutoff_thz > 0:
        c = np.minimum(grid, fit.cutoff_thz)
        below = fit.coefficient * (c ** 3 / 3 + fit.curvature * c ** 5 / 5 + fit.quartic * c ** 7 / 7)
        out = np.where(grid >= fit.cutoff_thz, out + fit.analytic_moment() - _taper(fit), below)
    return out


def _taper(fit):
    return float(np.sum(fit.taper_nodes()[1]))


def _smoothed_count(nu, g, histogram, grid, sigma):
    """N of the data smeared once more by a Gaussian σ (modes folded back at 0), at ``grid``."""
    x, n = _cumulative(nu, g, histogram)
    h = min(sigma / 4.0, float(grid[1] - grid[0]))
    u = np.arange(-6 * sigma, grid[-1] + 6 * sigma + h, h)
    nn = np.interp(u, x, n, left=0.0, right=n[-1])
    k = np.arange(-int(np.ceil(6 * sigma / h)), int(np.ceil(6 * sigma / h)) + 1) * h
    w = np.exp(-0.5 * (k / sigma) ** 2)
    w /= w.sum()
    smooth = np.convolve(nn, w, mode="same")
    smooth = np.interp(grid, u, smooth) + np.interp(-grid, u, smooth)   # the part pushed below 0, folded back
    return smooth


def _kernels(grid, t):
    """Per-mode C_v, S [J/(mol K)], U, F [J/mol] at ``grid`` (rows) and ``t`` (columns)."""
    x = H_OVER_K_THZ * grid[:, None] / t[None, :]
    e = np.exp(-x)
    one = -np.expm1(-x)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        u = np.where(x < 700, x * e / one, 0.0)
        c = np.where(x < 700, u * x / one, 0.0)
        lg = np.log(one)
    zp = 0.5 * _J_PER_MOL_PER_THZ * grid[:, None]
    return (sc.R * c, sc.R * (u - lg), zp + sc.R * t[None, :] * u, zp + sc.R * t[None, :] * lg)


def _resolution_sums(nodes, d_res, t):
    """Σ_g d_g |K(ν_{g+1}) − K(ν_g)| of C_v, S, U, F at ``t``, shape (4, M), over the intervals with d_g ≠ 0 only."""
    out = np.zeros((4, t.size))
    idx = np.flatnonzero(d_res)
    if idx.size == 0:
        return out
    rows = np.unique(np.concatenate([idx, idx + 1]))
    lo, hi = np.searchsorted(rows, idx), np.searchsorted(rows, idx + 1)
    for start in range(0, t.size, 64):        # temperature blocks: memory stays small
        for i, k in enumerate(_kernels(nodes[rows], t[start:start + 64])):
            out[i, start:start + 64] = np.einsum("g,gm->m", d_res[idx], np.abs(k[hi] - k[lo]))
    return out


def _signed_sums(nodes, weights, t):
    """Σ w K of the three Planck kernels for weights of either sign: positive and negative parts apart, each by
    :func:`thermo.kernels.sums.grid_sums` (the log-grid correlation when it pays)."""
    from ..kernels.direct import SUM_KEYS
    from ..kernels.sums import grid_sums
    out = {key: np.zeros(t.size) for key in SUM_KEYS}
    for sign in (1.0, -1.0):
        part = np.where(sign * weights > 0, sign * weights, 0.0)
        if np.any(part > 0):
            sums = grid_sums(nodes, part, t)
            for key in SUM_KEYS:
                out[key] += sign * sums[key]
    return out


def _smearing_sums(nodes, d_sm, m_sm, t):
    r"""\|Σ_g d_g (K(ν_g) + K(ν_{g+1}))/2\| for C_v, U, F and \|Σ_g m_g (K_S(ν_{g+1}) − K_S(ν_g))\| at ``t``.

    Both are linear in the kernels: with node weights :math:`W_n = (d_{n-1} + d_n)/2` and
    :math:`V_n = m_{n-1} - m_n` they are mode sums, :math:`|R\Sigma_W c|`, :math:`|R\Sigma_V (u + \ell)|`,
    :math:`|Z + RT\Sigma_W u|` and :math:`|Z - RT\Sigma_W \ell|` with :math:`Z = \sum_n W_n N_A h
u_n/2`.
    """
    out = np.zeros((4, t.size))
    w = 0.5 * (np.append(0.0, d_sm) + np.append(d_sm, 0.0))
    v = np.append(0.0, m_sm) - np.append(m_sm, 0.0)
    if np.any(w != 0):
        sums = _signed_sums(nodes, w, t)
        z = float(np.sum(w * 0.5 * _J_PER_MOL_PER_THZ * nodes))
        out[0] = np.abs(sc.R * sums["heat_capacity"])
        out[2] = np.abs(z + sc.R * t * sums["thermal_energy"])
        out[3] = np.abs(z - sc.R * t * sums["log_partition"])
    if np.any(v != 0):
        sums = _signed_sums(nodes, v, t)
        out[1] = np.abs(sc.R * (sums["thermal_energy"] + sums["log_partition"]))
    return out


def resolution_parts(dos, temperatures, resolution=None, widen=False):
    r"""Resolution and smearing parts of the error of C_v, S, U, F at each temperature.

    Parameters
    ----------
    dos : PhononDOS
        Prepared DOS (its rows as read are used when kept).
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.
    resolution : Resolution, optional
        A ready :func:`analyse_resolution` of ``dos``.
    widen : bool
        Take each smearing window's largest value over one sample more at each end (``temperatures``
        a sub-grid of the table's, :mod:`thermo.accuracy.subgrid`: the window's ends lie between samples).

    Returns
    -------
    resolution, smearing : numpy.ndarray, shape (4, M)
        Bounds of the error of C_v, S [J/(mol·K)], U, F [J/mol] per mole of
        formula units (zeros for a mode list, at T = 0 the smearing part of
        the zero-point energy only).

    Notes
    -----
    :math:`\delta_Q = \sum_i |K_Q(\nu_{i+1})-K_Q(\nu_i)|\,D(\bar\nu_i)` on a
    fine grid (see the module notes for D).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 5.0, 501)
    >>> res, smear = resolution_parts(PhononDOS(nu, 9 * nu**2 / 125, atoms=1), [300.0])
    >>> bool(res[0, 0] < 1e-4 and smear[0, 0] < 1e-3)
    True
    """
    t = np.atleast_1d(np.asarray(temperatures, float)).ravel()
    zero = np.zeros((4, t.size))
    r = analyse_resolution(dos) if resolution is None else resolution
    if r is None:
        return zero, zero.copy()
    nu, g = _data(dos)
    histogram = r.kind == "histogram"
    sigma = np.sqrt(2.0) * max(r.width_thz, r.step_thz)
    top = float(nu[-1]) + (r.step_thz if histogram else 0.0) + 6.0 * sigma   # the extra smearing spills over the top
    h = min(r.step_thz / 2.0, r.resolved_thz / 20.0) if r.resolved_thz > 0 else r.step_thz / 2.0
    grid = np.arange(0.0, top + h, max(h, top / GRID_POINTS))
    mid = 0.5 * (grid[1:] + grid[:-1])
    scale = dos.mode_count / max(_cumulative(nu, g, histogram)[1][-1], 1e-300)
    table = _table_cumulative(dos, mid)
    below = mid < r.resolved_thz
    law = r.coefficient * scale * mid ** 3 / 3.0
    x, n = _cumulative(nu, g, histogram)
    moved = (np.interp(grid, x, n, right=n[-1]) - _smoothed_count(nu, g, histogram, grid, sigma)) * scale
    if dos.low_frequency is None:        # the table is the data there: the truth lies between 0 and a cap
        cap = float(np.interp(r.resolved_thz, mid, table)) + abs(float(np.interp(r.resolved_thz, grid, moved)))
        d_res = np.where(below, np.maximum(table, np.minimum(MODEL_FACTOR * law, cap) - table), 0.0)
    else:                                # the table follows a ν² law there: the law known within LAW_UNCERTAINTY
        d_res = np.where(below, np.abs(table - law) + LAW_UNCERTAINTY * law, 0.0)
    fit = dos.low_frequency
    own = r.resolved_thz if fit is None else max(r.resolved_thz, fit.blend_top_thz or fit.cutoff_thz)
    if r.kind == "plain":                                # no smearing seen: the grid is the numerical part's
        own = np.inf
    # modes the extra smearing moves, per interval, where the table uses the data (not the ν² form)
    d_sm = np.where(mid < own, 0.0, np.diff(moved))
    # S: the same change integrated by parts, without the count moved across ν_r times K_S(ν_r) (see notes)
    m_sm = np.where(mid < own, 0.0, 0.5 * (moved[1:] + moved[:-1]))
    hot = t > 0
    out_res, out_sm = zero, zero.copy()
    if hot.any():
        floor = np.maximum(grid, 0.5 * grid[1])
        th = t[hot]
        # the signed change crosses zero at some temperatures: its envelope over T/ENVELOPE..T·ENVELOPE is used
        aux = np.unique(np.concatenate([th, np.geomspace(th.min() / ENVELOPE, th.max() * ENVELOPE, ENVELOPE_POINTS)]))
        res_aux = _resolution_sums(floor, d_res, aux)
        sm_aux = _smearing_sums(floor, d_sm, m_sm, aux)
        res_hot = res_aux[:, np.searchsorted(aux, th)]
        lo = np.searchsorted(aux, th / ENVELOPE, side="left")
        hi = np.searchsorted(aux, th * ENVELOPE, side="right")
        if widen:
            lo, hi = np.maximum(lo - 1, 0), np.minimum(hi + 1, aux.size)
        out_res[:, hot] = RESOLUTION_SAFETY * res_hot
        for i in range(4):
            out_sm[i, hot] = SMEARING_FACTOR * np.maximum(window_max(sm_aux[i], lo, hi), 0.0)
    if histogram:
        # a bin's modes sit anywhere in it, and the zero-point energy is linear in ν, so a signed change
        # cancels: the count moved, unsigned, bounds it
        moved_abs = np.where(mid < own, 0.0, np.abs(0.5 * (moved[1:] + moved[:-1])))
        zero_point = SMEARING_FACTOR * 0.5 * _J_PER_MOL_PER_THZ * float(np.sum(moved_abs * np.diff(grid)))
        out_sm[2] += zero_point
        out_sm[3] += zero_point
    return out_res, out_sm


def window_max(values, lo, hi):
    """``max(values[lo[j]:hi[j]])`` for each j (every window non-empty), in O(A log A) time and O(A) memory.

    A sparse table of running maxima over 2^k neighbours, one level at a time: each window is covered by two
    blocks of the largest power of two that fits it.  No window × value array is formed.

    Examples
    --------
    >>> window_max(np.array([3.0, -1.0, 4.0, 1.0, 5.0]), np.array([0, 1, 3]), np.array([2, 4, 4]))
    array([3., 4., 1.])
    """
    values = np.asarray(values, dtype=float)
    lo, hi = np.asarray(lo, dtype=np.int64), np.asarray(hi, dtype=np.int64)
    level = np.floor(np.log2(np.maximum(hi - lo, 1))).astype(np.int64)
    out = np.empty(lo.shape)
    table, k = values, 0
    while True:
        pick = np.flatnonzero(level == k)
        if pick.size:
            out[pick] = np.maximum(table[lo[pick]], table[hi[pick] - (1 << k)])
        if not (level > k).any():
            return out
        table = np.maximum(table[:-(1 << k)], table[(1 << k):])
        k += 1
