r"""The long-wave region of a mode list: sound velocities near Γ and the elastic continuum.

A q-point mesh samples the acoustic branches only at a few points near Γ,
so a plain sum over its modes misses the :math:`T^3` law.  With the wave
vectors and the cell volume:

1. the long-wave sound speeds :math:`c_0` along the directions of the
   q-points nearest Γ come from their acoustic modes, the dispersion removed
   by a Richardson step with the mode at :math:`k\mathbf q` (:func:`branch_velocities`);
2. an elastic tensor fitted to them gives the exact direction means
   :math:`\langle c_j^{-3}\rangle` (:func:`christoffel_means`);
3. each acoustic branch below :data:`BLEND` mesh spacings is the elastic
   continuum :math:`g_j = 4\pi V\nu^2\langle c_j^{-3}\rangle` with its
   dispersion (a sine law with the measured β, :func:`dispersion_nodes`),
   blended by an infinitely smooth step :math:`W_j(\nu)` into the acoustic
   mesh modes, each of which keeps the share :math:`1 - W_j`
   (:func:`long_wave_region`).

At low temperature only the continuum is excited and the table follows the
Debye law with the exact :math:`\langle\sum_j c_j^{-3}\rangle`; the mesh sum
of the smooth remainder converges fast.

References
----------
.. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Holt, Rinehart
   and Winston, 1976), ch. 22-23 (sound speeds of the long-wave dynamical
   matrix; the Debye :math:`T^3` law with the direction-averaged :math:`c^{-3}`).
.. [2] L. F. Richardson, "The deferred approach to the limit", Phil. Trans.
   R. Soc. A 226, 299-361 (1927).
"""

from __future__ import annotations

import numpy as np

from ..errors import ModeheatError
from .christoffel import christoffel_fit, christoffel_means, christoffel_speeds
from ..spectrum import LowFrequencyFit

#: Wave vectors shorter than this are Γ [1/Å].
GAMMA_Q = 1e-8
#: Velocity points: whole shells near Γ out to this many times the shortest non-zero |q| ...
FIT_RADIUS = 1.8
#: ... and at least this many points.
MIN_FIT_POINTS = 24
#: Fewest q-points with a partner at kq for the dispersion step.
MIN_PAIRS = 6
#: The tensor fit weighs a point by (q₁/q)^this: the residual of a Richardson step grows as q⁴.
RICHARDSON_POWER = 4
#: The continuum is the whole acoustic DOS below BLEND[0]·Δq and is blended into the mesh modes up to
#: BLEND[1]·Δq (Δq = (V_zone·w_min)^{1/3} the mesh spacing; per branch in frequency, ν = c_j q/2π).
BLEND = (0.5, 2.5)


def branch_velocities(q_per_a, acoustic_thz, weights, doubled_thz=None, step=2):
    r"""Direction means of :math:`c_j^{-3}` and of the dispersion, from acoustic modes near Γ.

    Parameters
    ----------
    q_per_a : numpy.ndarray, shape (P, 3)
        Non-zero wave vectors near Γ [1/Å].
    acoustic_thz : numpy.ndarray, shape (P, 3)
        The three lowest frequencies at each, ascending [THz], > 0.
    weights : numpy.ndarray, shape (P,)
        q-point weights (star multiplicities) [1].
    doubled_thz : numpy.ndarray, shape (P, 3), optional
        The same at :math:`k\mathbf q` (Richardson step for the dispersion;
        NaN rows where the mesh has no such point: their β is the mean of the others').
    step : int
        :math:`k` (2 on a Γ-centred mesh, 3 on a shifted one).

    Returns
    -------
    dict
        ``inverse_cube`` :math:`\langle c_j^{-3}\rangle` per branch [(Å·THz)⁻³];
        ``inverse_cube_mean`` :math:`\sum_j\langle c_j^{-3}\rangle`; ``points``;
        ``dispersion_corrected``; per point ``speeds`` :math:`c_0` [Å·THz],
        ``betas`` β [Å²] and ``weights``.

    Notes
    -----
    :math:`c_j(\mathbf q) = 2\pi\nu_j/|\mathbf q|`.  With the mode at
    :math:`k\mathbf q`, :math:`c = c_0(1-\beta q^2)` gives
    :math:`c_0 = (k^2c(q) - c(kq))/(k^2-1)` (Richardson's step).  An elastic
    tensor is fitted to these :math:`c_0` (:func:`christoffel_fit`, weights
    :math:`\propto q^{-4}`, the order of the step's residual); its speeds
    give every point's :math:`\beta = (1 - c(q)/c_0(\hat q))/q^2` and the
    direction means (:func:`christoffel_means`).  With fewer than
    :data:`MIN_PAIRS` partners the tensor is fitted to the raw speeds and β = 0.

    References
    ----------
    .. [1] Ashcroft and Mermin (1976), ch. 23.
    .. [2] L. F. Richardson, Phil. Trans. R. Soc. A 226, 299-361 (1927).

    Examples
    --------
    >>> q = np.array([[0.1, 0, 0], [0, 0.1, 0], [0, 0, 0.1], [0.1, 0.1, 0], [0, 0.1, 0.1], [0.1, 0, 0.1]])
    >>> nu = np.outer(np.linalg.norm(q, axis=1), [5.0, 5.0, 8.0]) / (2 * np.pi)
    >>> out = branch_velocities(q, nu, np.ones(6))
    >>> round(out["inverse_cube_mean"] * 5 ** 3, 6)      # 2/5³ + 1/8³ in units of 5⁻³
    2.244141
    """
    q = np.linalg.norm(q_per_a, axis=1)
    n = q_per_a / q[:, None]
    c = 2 * np.pi * np.asarray(acoustic_thz, float) / q[:, None]
    weights = np.asarray(weights, float)
    paired = np.zeros(q.size, bool) if doubled_thz is None else np.all(np.isfinite(doubled_thz), axis=1)
    corrected = paired.sum() >= MIN_PAIRS
    fit_speeds, fit_weights = c, weights * (q.min() / q) ** RICHARDSON_POWER
    if corrected:              # the tensor from the Richardson-corrected points, β of every point from it
        c2 = 2 * np.pi * np.asarray(doubled_thz, float)[paired] / (step * q[paired, None])
        fit_speeds = (step ** 2 * c[paired] - c2) / (step ** 2 - 1)
        fit_weights = fit_weights[paired]
    params = christoffel_fit(n[paired] if corrected else n, fit_speeds, fit_weights)
    c0 = christoffel_speeds(params, n)
    beta = (1 - c / c0) / q[:, None] ** 2 if corrected else np.zeros_like(c)
    inverse = christoffel_means(params)
    return {"inverse_cube": inverse, "inverse_cube_mean": float(inverse.sum()), "points": int(q.size),
            "dispersion_corrected": bool(corrected), "speeds": c0, "betas": beta, "weights": weights}


def blended_continuum(velocities, cell_volume_a3, spacing_per_a, blend=None):
    r"""The elastic continuum of each acoustic branch, blended out between ``blend`` × Δq.

    Parameters
    ----------
    velocities : dict
        :func:`branch_velocities`.
    cell_volume_a3 : float
        Cell volume V [Å³].
    spacing_per_a : float
        Mesh spacing Δq [1/Å].
    blend : (float, float), optional
        Start and end of the blend in units of Δq (default :data:`BLEND`).

    Returns
    -------
    tuple of LowFrequencyFit
        Per branch :math:`A_j\nu^2`, :math:`A_j = 4\pi V\langle c_j^{-3}\rangle`
        [modes / THz³ per cell, one mode per branch over the zone], cut-off
        :math:`c_jq_a/2\pi` and blend top :math:`c_jq_b/2\pi` with
        :math:`c_j = \langle c_j^{-3}\rangle^{-1/3}`.

    Notes
    -----
    :math:`N_j(\nu) = V q^3/6\pi^2` per branch and cell gives
    :math:`g_j = 4\pi V\nu^2/c_j^3` for :math:`\nu = c_jq/2\pi`.

    References
    ----------
    .. [1] Ashcroft and Mermin (1976), ch. 23.

    Examples
    --------
    >>> v = {"inverse_cube": np.array([1e-3])}
    >>> f = blended_continuum(v, 10.0, 0.1, (1.0, 1.0))[0]          # a sharp sphere of radius q₁
    >>> round(f.analytic_moment() / (10.0 * 0.1 ** 3 / (6 * np.pi ** 2)), 12)
    1.0
    """
    out = []
    blend = BLEND if blend is None else blend
    for inv in velocities["inverse_cube"]:
        speed = float(inv) ** (-1 / 3)
        low, high = (speed * f * spacing_per_a / (2 * np.pi) for f in blend)
        out.append(LowFrequencyFit(coefficient=float(4 * np.pi * cell_volume_a3 * inv), cutoff_thz=low,
                                   window_thz=(low, high), blend_top_thz=high, smooth_taper=True))
    return tuple(out)


#: The elastic law of a list without wave vectors holds below ANCHOR_BLEND[0]·ν_Δ and is blended out by
#: ANCHOR_BLEND[1]·ν_Δ, ν_Δ the frequency of the Debye-averaged branch one mesh spacing from Γ.
ANCHOR_BLEND = (0.25, 2.0)


def anchored_continuum(coefficient, q_points, atoms):
    r"""An elastic Debye law :math:`A\nu^2` blended into a mode list that has no wave vectors.

    Parameters
    ----------
    coefficient : float
        :math:`A = 9n/\nu_D^3`, :math:`\nu_D = k_B\theta/h` [modes / THz³ per formula unit].
    q_points : float
        Number of q-points of the mesh, :math:`N_q` [1].
    atoms : int
        Atoms per formula unit n (one formula unit per cell is assumed).

    Returns
    -------
    LowFrequencyFit
        The law alone below :data:`ANCHOR_BLEND`\ [0]·ν_Δ, blended out by
        :data:`ANCHOR_BLEND`\ [1]·ν_Δ with an infinitely smooth step.

    Notes
    -----
    A mesh spacing :math:`\Delta q = (V_{zone}/N_q)^{1/3}` on the Debye branch
    :math:`\nu = \bar cq/2\pi` with :math:`\nu_D = \bar c(3n/4\pi V)^{1/3}` is
    :math:`\nu_\Delta = \nu_D(4\pi/3nN_q)^{1/3}`.

    References
    ----------
    .. [1] Ashcroft and Mermin (1976), ch. 23.

    Examples
    --------
    >>> f = anchored_continuum(9.0, 4 * np.pi / 3, 1)                 # ν_D = 1 THz, ν_Δ = 1 THz
    >>> round(f.cutoff_thz, 12), round(f.blend_top_thz, 12)
    (0.25, 2.0)
    """
    spacing = (9.0 * atoms / coefficient) ** (1 / 3) * (4 * np.pi / (3 * atoms * q_points)) ** (1 / 3)
    low, high = (f * spacing for f in ANCHOR_BLEND)
    return LowFrequencyFit(coefficient=float(coefficient), cutoff_thz=low, window_thz=(low, high),
                           automatic=False, blend_top_thz=high, smooth_taper=True)


#: Gauss–Legendre points of each of the two segments of a dispersion correction.
DISPERSION_NODES = 24


def dispersion_nodes(velocities, fits, cell_volume_a3):
    r"""Nodes and weights of :math:`\int (g_j - A_j\nu^2)W_j\,d\nu`: the dispersion of each continuum branch.

    Parameters
    ----------
    velocities : dict
        :func:`branch_velocities` (``speeds``, ``betas``, ``weights`` of its points).
    fits : tuple of LowFrequencyFit
        :func:`blended_continuum`.
    cell_volume_a3 : float
        Cell volume [Å³].

    Returns
    -------
    nodes, modes : numpy.ndarray
        Frequencies [THz] and mode weights [1 per cell] (either sign).

    Notes
    -----
    Along each direction :math:`\nu = (c_0q_s/2\pi)\sin(q/q_s)` with
    :math:`q_s = (6\beta)^{-1/2}` (the sine law with the measured
    :math:`c_0` and :math:`\beta`), so with :math:`u = 2\pi\nu/c_0q_s`,
    :math:`g_j = 4\pi V\nu^2\langle c_0^{-3}R(u)\rangle`,
    :math:`R = (\arcsin u/u)^2/\sqrt{1-u^2}`; the ratio
    :math:`\langle c_0^{-3}R\rangle/\langle c_0^{-3}\rangle` is the
    weighted mean over the points, the scale :math:`A_j` is the fitted one.

    Examples
    --------
    >>> v = {"inverse_cube": np.array([1e-3]), "speeds": np.array([[10.0]]),
    ...      "betas": np.array([[0.0]]), "weights": np.array([1.0])}
    >>> nodes, modes = dispersion_nodes(v, blended_continuum(v, 10.0, 0.1), 10.0)
    >>> float(np.abs(modes).max())                     # no dispersion: nothing to add
    0.0
    """
    x, w = np.polynomial.legendre.leggauss(DISPERSION_NODES)
    nodes, modes = [], []
    for j, fit in enumerate(fits):
        c0, beta = velocities["speeds"][:, j], velocities["betas"][:, j]
        weight = velocities["weights"] * c0 ** -3.0
        qs = np.where(beta > 0, 1 / np.sqrt(np.where(beta > 0, 6 * beta, 1.0)), np.inf)
        for low, high in ((0.0, fit.cutoff_thz), (fit.cutoff_thz, fit.blend_top_thz)):
            nu = low + 0.5 * (high - low) * (x + 1)
            u = np.clip(2 * np.pi * nu[:, None] / (c0 * qs)[None, :], 1e-12, 0.99)
            ratio = (np.arcsin(u) / u) ** 2 / np.sqrt(1 - u * u)
            excess = fit.form(nu) * ((ratio @ weight) / weight.sum() - 1.0) * fit.taper(nu)
            nodes.append(nu)
            modes.append(0.5 * (high - low) * w * excess)
    return np.concatenate(nodes), np.concatenate(modes)


def long_wave_region(q_points, frequencies, weights, cell_volume_a3, blend=None, corrected=True):
    r"""The continuum near Γ and the share of each acoustic mesh mode left beside it.

    Parameters
    ----------
    q_points : numpy.ndarray, shape (P, 3)
        Distinct wave vectors [1/Å].
    frequencies : numpy.ndarray, shape (P, m)
        Ascending frequencies at each q-point [THz] (m = 3 × atoms in the cell).
    weights : numpy.ndarray, shape (P,)
        q-point weights normalised to 1 over the zone [1].
    cell_volume_a3 : float
        Cell volume [Å³].
    blend : (float, float), optional
        Start and end of the blend in mesh spacings (default :data:`BLEND`).
    corrected : bool
        Remove the dispersion by the Richardson step (default); False fits
        the raw speeds (an alternative treatment for the error estimate).

    Returns
    -------
    kept : numpy.ndarray, shape (P, 3)
        Share :math:`1 - W_j(\nu)` of each acoustic mode kept in the sums [1].
    continuum : tuple of LowFrequencyFit
        Per cell (:func:`blended_continuum`).
    info : dict or None
        :func:`branch_velocities` and ``shell_radius_per_A``; None (and
        nothing replaced) when the shells near Γ give no velocities.

    Notes
    -----
    The acoustic DOS is :math:`\sum_j W_jg_j + \sum_{\mathbf q}w_{\mathbf q}(1-W_j)\delta(\nu-\nu_j)`:
    the mesh sum of the smooth remainder converges fast while the continuum
    carries the :math:`T^3` law exactly.

    References
    ----------
    .. [1] Ashcroft and Mermin (1976), ch. 23.

    Examples
    --------
    >>> k = np.arange(-3, 4)
    >>> q = 0.05 * np.array(np.meshgrid(k, k, k)).reshape(3, -1).T          # 7³ cubic mesh [1/Å]
    >>> nu = np.outer(np.linalg.norm(q, axis=1), [4.0, 4.0, 7.0]) / (2 * np.pi)
    >>> w = np.full(len(q), 1 / len(q))
    >>> kept, continuum, info = long_wave_region(q, nu, w, (2 * np.pi / 0.35) ** 3)
    >>> float(kept[np.all(q == 0, axis=1)].max()), round(info["inverse_cube_mean"] * 64, 6)
    (0.0, 2.186589)
    """
    q = np.linalg.norm(q_points, axis=1)
    kept = np.ones((q.size, 3))
    moving = q > GAMMA_Q
    if not moving.any():
        return kept, (), None
    first = float(q[moving].min())
    usable = moving & np.all(frequencies[:, :3] > 0, axis=1)
    radii = np.sort(q[usable])
    if radii.size < 3:
        return kept, (), None
    reach = radii[min(MIN_FIT_POINTS, radii.size) - 1] * (1 + 1e-6)      # whole shells up to MIN_FIT_POINTS
    near = usable & (q <= max(reach, FIT_RADIUS * first))
    lookup = {tuple(k): i for i, k in enumerate(np.round(q_points / first, 4))}
    doubled, step, best = None, 2, -1
    for k in (2, 3):          # Γ-centred meshes hold 2q, shifted (Monkhorst–Pack) ones 3q
        partner = np.array([lookup.get(tuple(x), -1) for x in np.round(k * q_points[near] / first, 4)], int)
        have = partner >= 0
        have[have] = np.all(frequencies[partner[have], :3] > 0, axis=1)
        if have.sum() > best:
            best, step, pairs = int(have.sum()), k, (partner, have)
    partner, have = pairs
    doubled = np.full((partner.size, 3), np.nan)
    doubled[have] = frequencies[partner[have], :3]
    if not corrected:
        doubled = None
    try:
        info = branch_velocities(q_points[near], frequencies[near, :3], weights[near], doubled, step)
    except ModeheatError:
        return kept, (), None
    if not np.all(info["inverse_cube"] > 0):
        return kept, (), None
    spacing = (8 * np.pi ** 3 / cell_volume_a3 * float(weights.min())) ** (1 / 3)
    continuum = blended_continuum(info, cell_volume_a3, spacing, blend)
    for j, fit in enumerate(continuum):
        kept[:, j] = 1.0 - fit.taper(frequencies[:, j])
    kept[~moving] = 0.0
    nodes = dispersion_nodes(info, continuum, cell_volume_a3)
    return kept, continuum, dict(info, shell_radius_per_A=first, mesh_spacing_per_A=spacing, dispersion_nodes=nodes,
                                 richardson_step=step)
