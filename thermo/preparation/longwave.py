r"""The long-wave region of a mode list: sound velocities near Γ and the elastic continuum.

A q-point mesh samples the acoustic branches only at a few points near Γ,
so a plain sum over its modes misses the :math:`T^3` law.  With the wave
vectors and the cell volume, the acoustic modes near Γ are replaced by the
elastic continuum:
sphere of the same Brillouin-zone volume: three branches
:math:`g_j(\nu) = 4\pi V\nu^2/c_j^3\,(1 + b_j\nu^2)` whose velocities come
from the acoustic modes of the shells nearest Γ.  At low temperature only
the continuum is excited and the table follows the Debye law with the exact
:math:`\langle\sum_j c_j^{-3}\rangle`.

References
----------
.. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Holt, Rinehart
   and Winston, 1976), ch. 23 (the Debye :math:`T^3` law with the
   direction-averaged :math:`c^{-3}`).
"""

from __future__ import annotations

import numpy as np
from scipy import optimize

from ..errors import ModeheatError
from ..spectrum import LowFrequencyFit

#: Wave vectors shorter than this are Γ [1/Å].
GAMMA_Q = 1e-8
#: Velocity points: q-points out to this many times the shortest non-zero |q| (with a 2q partner).
FIT_RADIUS = 1.8
#: Fewest fit points per fitted coefficient.
POINTS_PER_COEFFICIENT = 2
#: The continuum is the whole acoustic DOS below BLEND[0]·q₁ and is blended into the mesh modes by
#: 2q₁ above that (q₁ the shortest non-zero |q|; per branch in frequency, ν = c_j q/2π).
BLEND = (0.5, 2.5)


def _direction_basis(n, degree):
    """Zero-mean even functions of the unit vector n (N, 3) up to ``degree`` (0, 2 or 4), and the constant."""
    x, y, z = n.T
    cols = [np.ones_like(x)]
    if degree >= 2:
        cols += [x * x - 1 / 3, y * y - 1 / 3, x * y, x * z, y * z]
    if degree >= 4:
        cols += [x ** 4 - 0.2, y ** 4 - 0.2, z ** 4 - 0.2, x * x * y * y - 1 / 15, x * x * z * z - 1 / 15,
                 x ** 3 * y, x ** 3 * z, y ** 3 * x, y ** 3 * z, z ** 3 * x, z ** 3 * y,
                 x * x * y * z, y * y * x * z, z * z * x * y]
    return cols


#: Voigt pairs of the 21 independent elastic constants.
_VOIGT = [(0, 0), (1, 1), (2, 2), (1, 2), (0, 2), (0, 1)]
#: Sphere rule for the direction means: Gauss–Legendre in cos θ × uniform φ.
_SPHERE = (24, 48)


def _tensor(params):
    """C_ijkl / ρ [(Å·THz)²] from the 21 Voigt numbers (upper triangle of the 6×6 matrix)."""
    voigt = np.zeros((6, 6))
    voigt[np.triu_indices(6)] = params
    voigt = voigt + np.triu(voigt, 1).T
    c = np.empty((3, 3, 3, 3))
    for a, (i, j) in enumerate(_VOIGT):
        for b, (k, m) in enumerate(_VOIGT):
            for ii, jj in {(i, j), (j, i)}:
                for kk, mm in {(k, m), (m, k)}:
                    c[ii, jj, kk, mm] = voigt[a, b]
    return c


def _speeds_squared(params, n):
    """Ascending eigenvalues of the Christoffel matrix Γ_ik = C_ijkl n_j n_l / ρ at unit vectors n (P, 3)."""
    gamma = np.einsum("ijkl,pj,pl->pik", _tensor(params), n, n)
    return np.linalg.eigvalsh(gamma)


def _sphere_rule():
    x, w = np.polynomial.legendre.leggauss(_SPHERE[0])
    phi = (np.arange(_SPHERE[1]) + 0.5) * 2 * np.pi / _SPHERE[1]
    ct, ph = np.meshgrid(x, phi, indexing="ij")
    st = np.sqrt(1 - ct ** 2)
    n = np.column_stack([(st * np.cos(ph)).ravel(), (st * np.sin(ph)).ravel(), ct.ravel()])
    weights = np.repeat(w / 2, _SPHERE[1]) / _SPHERE[1]
    return n, weights


def christoffel_means(directions, speeds, weights):
    r"""Direction mean of :math:`c_j^{-3}` per branch from an elastic tensor fitted to sound speeds.

    Parameters
    ----------
    directions : numpy.ndarray, shape (P, 3)
        Unit vectors [1].
    speeds : numpy.ndarray, shape (P, 3)
        Ascending long-wave speeds along each [Å·THz = 100 m/s].
    weights : numpy.ndarray, shape (P,)
        Weights of the points [1].

    Returns
    -------
    numpy.ndarray, shape (3,)
        :math:`\langle c_j^{-3}\rangle` [(Å·THz)⁻³].

    Raises
    ------
    ModeheatError
        When the fit does not converge.

    Notes
    -----
    In the long-wave limit :math:`\rho c^2` are the eigenvalues of the
    Christoffel matrix :math:`C_{ijkl}n_jn_l` (21 constants :math:`C/\rho`
    fitted by least squares to :math:`c^2`); the means come from a
    24 × 48-point product rule on the sphere.

    References
    ----------
    .. [1] Ashcroft and Mermin (1976), ch. 22-23.
    .. [2] E. B. Christoffel, Ann. Mat. Pura Appl. 8, 193-243 (1877).

    Examples
    --------
    >>> n = np.eye(3)[[0, 1, 2, 0, 1, 0]] + np.eye(3)[[0, 1, 2, 1, 2, 2]] * [[0], [0], [0], [1], [1], [1]]
    >>> n = n / np.linalg.norm(n, axis=1)[:, None]
    >>> out = christoffel_means(n, np.tile([5.0, 5.0, 8.0], (6, 1)), np.ones(6))   # isotropic
    >>> np.round(out * 5 ** 3, 6).tolist()
    [1.0, 1.0, 0.244141]
    """
    target = np.asarray(speeds, float) ** 2
    weights = np.asarray(weights, float)
    root = np.sqrt(weights / weights.mean())[:, None]
    lam, mu = target[:, 2].mean() - 2 * target[:, :2].mean(), target[:, :2].mean()
    start = np.zeros((6, 6))
    start[:3, :3] = lam
    start[np.arange(3), np.arange(3)] = lam + 2 * mu
    start[np.arange(3, 6), np.arange(3, 6)] = mu
    result = optimize.least_squares(lambda p: (root * (_speeds_squared(p, directions) / target - 1)).ravel(),
                                    start[np.triu_indices(6)], method="trf", x_scale="jac")
    if not result.success:
        raise ModeheatError(f"the elastic-tensor fit to the sound speeds near Γ did not converge ({result.message})")
    n, w = _sphere_rule()
    eig = np.clip(_speeds_squared(result.x, n), 1e-300, None)
    return w @ eig ** -1.5


def branch_velocities(q_per_a, acoustic_thz, weights, doubled_thz=None):
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
        The same at :math:`2\mathbf q` (Richardson step for the dispersion).

    Returns
    -------
    dict
        ``inverse_cube`` :math:`\langle c_j^{-3}\rangle` per branch [(Å·THz)⁻³];
        ``curvature`` :math:`b_j` of :math:`g_j \propto \nu^2(1+b_j\nu^2)` [1/THz²];
        ``inverse_cube_mean`` :math:`\sum_j\langle c_j^{-3}\rangle`; ``points``;
        ``directions_degree``; ``dispersion_corrected``.

    Notes
    -----
    :math:`c_j(\mathbf q) = 2\pi\nu_j/|\mathbf q|`.  With the mode at
    :math:`2\mathbf q`, :math:`c = c_0(1-\beta q^2)` gives
    :math:`c_0 = (4c(q) - c(2q))/3` and :math:`\beta = (1 - c(q)/c_0)/q^2`;
    then :math:`g_j = 4\pi V\nu^2\langle c_0^{-3}(1 + 3\beta(2\pi\nu/c_0)^2)\rangle`.
    Each direction mean is the constant of a weighted least-squares fit of
    zero-mean even functions of :math:`\hat q` (degree 4, 2 or 0, as many as
    the points carry) — its sphere mean.

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
    beta = np.zeros_like(c)
    if doubled_thz is not None:
        c2 = 2 * np.pi * np.asarray(doubled_thz, float) / (2 * q[:, None])
        c0 = (4 * c - c2) / 3
        beta = (1 - c / c0) / (q[:, None] ** 2)
        c = c0
    for degree in (4, 2, 0):
        cols = _direction_basis(n, degree)
        if q.size >= POINTS_PER_COEFFICIENT * len(cols) or degree == 0:
            break
    design = np.column_stack(cols)
    root = np.sqrt(np.asarray(weights, float))
    slope = np.linalg.lstsq(design * root[:, None], 3 * beta * (2 * np.pi) ** 2 * c ** -5.0 * root[:, None],
                            rcond=None)[0][0]
    inverse = christoffel_means(n, c, weights)
    curvature = np.where(inverse > 0, slope / np.where(inverse > 0, inverse, 1.0), 0.0)
    return {"inverse_cube": inverse, "curvature": curvature,
            "inverse_cube_mean": float(inverse.sum()), "points": int(q.size), "directions_degree": degree,
            "dispersion_corrected": doubled_thz is not None}


def blended_continuum(velocities, cell_volume_a3, first_shell_per_a, blend=BLEND):
    r"""The elastic continuum of each acoustic branch, blended out between ``blend`` × q₁.

    Parameters
    ----------
    velocities : dict
        :func:`branch_velocities`.
    cell_volume_a3 : float
        Cell volume V [Å³].
    first_shell_per_a : float
        Shortest non-zero |q| of the mesh, q₁ [1/Å].
    blend : (float, float)
        Start and end of the blend in units of q₁.

    Returns
    -------
    tuple of LowFrequencyFit
        Per branch :math:`A_j\nu^2(1+b_j\nu^2)`, :math:`A_j = 4\pi V\langle c_j^{-3}\rangle`
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
    >>> v = {"inverse_cube": np.array([1e-3]), "curvature": np.array([0.0])}
    >>> f = blended_continuum(v, 10.0, 0.1, (1.0, 1.0))[0]          # a sharp sphere of radius q₁
    >>> round(f.analytic_moment() / (10.0 * 0.1 ** 3 / (6 * np.pi ** 2)), 12)
    1.0
    """
    out = []
    for inv, b in zip(velocities["inverse_cube"], velocities["curvature"]):
        speed = float(inv) ** (-1 / 3)
        low, high = (speed * f * first_shell_per_a / (2 * np.pi) for f in blend)
        out.append(LowFrequencyFit(coefficient=float(4 * np.pi * cell_volume_a3 * inv), cutoff_thz=low,
                                   window_thz=(low, high), curvature=float(b), blend_top_thz=high))
    return tuple(out)


def long_wave_region(q_points, frequencies, weights, cell_volume_a3):
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
    near = moving & (q <= FIT_RADIUS * first) & np.all(frequencies[:, :3] > 0, axis=1)
    lookup = {tuple(k): i for i, k in enumerate(np.round(q_points / first, 4))}
    partner = np.array([lookup.get(tuple(k), -1) for k in np.round(2 * q_points[near] / first, 4)], int)
    if near.sum() < 3:
        return kept, (), None
    doubled = None
    if partner.size and np.all(partner >= 0) and np.all(frequencies[partner, :3] > 0):
        doubled = frequencies[partner, :3]
    info = branch_velocities(q_points[near], frequencies[near, :3], weights[near], doubled)
    if not np.all(info["inverse_cube"] > 0):
        return kept, (), None
    continuum = blended_continuum(info, cell_volume_a3, first)
    for j, fit in enumerate(continuum):
        kept[:, j] = 1.0 - fit.taper(frequencies[:, j])
    kept[~moving] = 0.0
    return kept, continuum, dict(info, shell_radius_per_A=first)
