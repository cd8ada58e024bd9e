r"""The long-wave region of a mode list: sound velocities near Γ and the elastic continuum.

A q-point mesh samples the acoustic branches only at a few points near Γ,
so a plain sum over its modes misses the :math:`T^3` law.  With the wave
vectors and the cell volume, the acoustic modes of the innermost q-shell
(Γ itself on a Γ-centred mesh) are replaced by the elastic continuum of a
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

from ..spectrum import LowFrequencyFit

#: Wave vectors shorter than this are Γ [1/Å].
GAMMA_Q = 1e-8
#: Fit points: q-points out to this many times the shortest non-zero |q|.
FIT_RADIUS = 2.6
#: Fewest fit points per fitted coefficient.
POINTS_PER_COEFFICIENT = 2


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


def inverse_cube_fit(q_per_a, acoustic_thz, weights):
    r"""Direction mean of :math:`\sum_j c_j^{-3}` and the dispersion from acoustic modes near Γ.

    Parameters
    ----------
    q_per_a : numpy.ndarray, shape (P, 3)
        Non-zero wave vectors near Γ [1/Å].
    acoustic_thz : numpy.ndarray, shape (P, 3)
        The three lowest frequencies at each [THz], > 0.
    weights : numpy.ndarray, shape (P,)
        q-point weights (star multiplicities) [1].

    Returns
    -------
    dict
        ``inverse_cube_mean`` :math:`\langle\sum_j c_j^{-3}\rangle` [(Å·THz)⁻³],
        ``branch_shares`` (each branch's share of it), ``dispersion``
        :math:`\beta` in :math:`c(q) = c(0)(1-\beta q^2)` [Å²], ``points``.

    Notes
    -----
    :math:`c_j(\mathbf q) = 2\pi\nu_j/|\mathbf q|`; the weighted least-squares
    fit :math:`\sum_j c_j^{-3} = a_0 + \sum_k a_k Y_k(\hat q) + d_1q^2 + d_2q^4`
    with zero-mean even :math:`Y_k` (degree 2 and 4, as many as the points
    carry) gives the sphere mean :math:`a_0` at :math:`q \to 0`.

    References
    ----------
    .. [1] Ashcroft and Mermin (1976), ch. 23.

    Examples
    --------
    >>> q = np.array([[0.1, 0, 0], [0, 0.1, 0], [0, 0, 0.1], [0.2, 0, 0], [0, 0.2, 0], [0, 0, 0.2]])
    >>> nu = np.outer(np.linalg.norm(q, axis=1), [5.0, 5.0, 8.0]) / (2 * np.pi)
    >>> out = inverse_cube_fit(q, nu, np.ones(6))
    >>> round(out["inverse_cube_mean"] * 5 ** 3, 6)      # 2/5³ + 1/8³ in units of 5⁻³
    2.244141
    """
    q = np.linalg.norm(q_per_a, axis=1)
    n = q_per_a / q[:, None]
    c = 2 * np.pi * np.asarray(acoustic_thz, float) / q[:, None]
    per_branch = c ** -3.0
    s = per_branch.sum(axis=1)
    shells = np.unique(np.round(q / q.min(), 6)).size
    points = q.size
    for degree in (4, 2, 0):
        cols = _direction_basis(n, degree)
        extra = [q ** 2, q ** 4][: max(0, min(2, shells - 1))]
        if points >= POINTS_PER_COEFFICIENT * (len(cols) + len(extra)) or degree == 0:
            break
    design = np.column_stack(cols + extra)
    root = np.sqrt(np.asarray(weights, float))
    coef = np.linalg.lstsq(design * root[:, None], s * root, rcond=None)[0]
    mean = float(coef[0])
    d1 = float(coef[len(cols)]) if extra else 0.0
    shares = np.average(per_branch, axis=0, weights=weights)
    beta = d1 / (3.0 * mean) if mean > 0 else 0.0
    return {"inverse_cube_mean": mean, "branch_shares": shares / shares.sum(), "dispersion": beta,
            "points": int(points), "directions_degree": degree}


def elastic_continuum(inverse_cube_branches, cell_volume_a3, sphere_modes, dispersion=0.0):
    r"""The continuum of each acoustic branch inside a sphere holding ``sphere_modes`` modes per branch.

    Parameters
    ----------
    inverse_cube_branches : sequence of float
        :math:`\langle c_j^{-3}\rangle` of each branch [(Å·THz)⁻³].
    cell_volume_a3 : float
        Cell volume V [Å³].
    sphere_modes : float
        Modes per branch in the sphere (its share of the zone per cell) [1].
    dispersion : float
        :math:`\beta` of :math:`\nu = cq(1-\beta q^2)/2\pi` [Å²].

    Returns
    -------
    tuple of LowFrequencyFit
        One form :math:`A_j\nu^2(1+b_j\nu^2)` per branch, with
        :math:`A_j = 4\pi V\langle c_j^{-3}\rangle`,
        :math:`b_j = 5\beta(2\pi)^2\langle c_j^{-3}\rangle^{2/3}` and the cut-off where its
        integral reaches ``sphere_modes`` [per cell].

    Notes
    -----
    :math:`N_j(\nu) = V q^3/6\pi^2` with :math:`q(\nu) \approx (2\pi\nu/c)(1+\beta(2\pi\nu/c)^2)`
    gives :math:`g_j = 4\pi V\nu^2c^{-3}(1 + 5\beta(2\pi/c)^2\nu^2)` to first order in β.

    References
    ----------
    .. [1] Ashcroft and Mermin (1976), ch. 23.

    Examples
    --------
    >>> f = elastic_continuum([1e-3], 10.0, 0.01)[0]
    >>> round(f.analytic_moment(), 12)
    0.01
    """
    out = []
    for inv in inverse_cube_branches:
        a = 4 * np.pi * cell_volume_a3 * inv
        b = 5 * dispersion * (2 * np.pi) ** 2 * inv ** (2 / 3) if dispersion > 0 else 0.0
        top = (3 * sphere_modes / a) ** (1 / 3)
        for _ in range(50):                       # Newton on A(ν³/3 + bν⁵/5) = N
            value = a * (top ** 3 / 3 + b * top ** 5 / 5) - sphere_modes
            top -= value / (a * top * top * (1 + b * top * top))
        out.append(LowFrequencyFit(coefficient=a, cutoff_thz=float(top), window_thz=(0.0, float(top)),
                                   curvature=b, automatic=True))
    return tuple(out)


def replace_inner_shell(q_points, frequencies, weights, cell_volume_a3):
    r"""Which acoustic modes the continuum replaces, and the continuum per cell.

    Parameters
    ----------
    q_points : numpy.ndarray, shape (P, 3)
        Distinct wave vectors [1/Å].
    frequencies : numpy.ndarray, shape (P, m)
        Sorted frequencies at each q-point [THz] (m = 3 × atoms in the cell).
    weights : numpy.ndarray, shape (P,)
        q-point weights normalised to 1 over the zone [1].
    cell_volume_a3 : float
        Cell volume [Å³].

    Returns
    -------
    inner : numpy.ndarray of bool, shape (P,)
        q-points whose three acoustic modes are replaced.
    continuum : tuple of LowFrequencyFit
        Per cell (one mode per branch over the whole zone).
    fit : dict
        :func:`inverse_cube_fit` and ``shell_radius_per_A``; None when the
        shells near Γ carry no positive acoustic frequencies.

    Examples
    --------
    >>> k = np.arange(-3, 4)
    >>> q = 0.05 * np.array(np.meshgrid(k, k, k)).reshape(3, -1).T          # 7³ cubic mesh [1/Å]
    >>> nu = np.outer(np.linalg.norm(q, axis=1), [4.0, 4.0, 7.0]) / (2 * np.pi)
    >>> w = np.full(len(q), 1 / len(q))
    >>> inner, continuum, fit = replace_inner_shell(q, nu, w, (2 * np.pi / 0.35) ** 3)
    >>> int(inner.sum()), round(fit["inverse_cube_mean"] * 64, 6)       # Γ; 2/4³ + 1/7³ in 4⁻³
    (1, 2.186589)
    """
    q = np.linalg.norm(q_points, axis=1)
    moving = q > GAMMA_Q
    if not moving.any():
        return np.zeros(q.size, bool), (), None
    first = float(q[moving].min())
    inner = ~moving if (~moving).any() else q <= first * (1 + 1e-6)
    near = moving & ~inner & (q <= FIT_RADIUS * first) & np.all(frequencies[:, :3] > 0, axis=1)
    if near.sum() < 3:
        return np.zeros(q.size, bool), (), None
    fit = inverse_cube_fit(q_points[near], frequencies[near, :3], weights[near])
    if not fit["inverse_cube_mean"] > 0:
        return np.zeros(q.size, bool), (), None
    per_branch = fit["inverse_cube_mean"] * fit["branch_shares"]
    sphere = float(weights[inner].sum())
    continuum = elastic_continuum(per_branch, cell_volume_a3, sphere, max(fit["dispersion"], 0.0))
    fit = dict(fit, shell_radius_per_A=(6 * np.pi ** 2 * sphere / cell_volume_a3) ** (1 / 3))
    return inner, continuum, fit
