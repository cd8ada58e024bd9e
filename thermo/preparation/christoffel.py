r"""Sound speeds of a crystal's long-wave limit: the elastic tensor fitted to measured speeds (Christoffel).

In the long-wave limit :math:`\rho c^2` are the eigenvalues of the
Christoffel matrix :math:`\Gamma_{ik} = C_{ijkl}n_jn_l`.  Fitting the 21
constants :math:`C/\rho` to speeds along a few directions gives the speeds
along every direction, hence exact direction means such as
:math:`\langle c_j^{-3}\rangle` of the Debye :math:`T^3` law.

References
----------
.. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (1976), ch. 22-23.
.. [2] E. B. Christoffel, Ann. Mat. Pura Appl. 8, 193-243 (1877).
"""

from __future__ import annotations

import numpy as np
from scipy import optimize

from ..errors import ModeheatError

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


def christoffel_fit(directions, speeds, weights):
    r"""The elastic tensor :math:`C_{ijkl}/\rho` (21 Voigt numbers) whose Christoffel speeds fit ``speeds``.

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
    numpy.ndarray, shape (21,)
        Upper triangle of the 6×6 Voigt matrix of :math:`C/\rho` [(Å·THz)²].

    Raises
    ------
    ModeheatError
        When the least-squares fit does not converge.

    Notes
    -----
    In the long-wave limit :math:`\rho c^2` are the eigenvalues of the
    Christoffel matrix :math:`C_{ijkl}n_jn_l`; the fit minimises the weighted
    relative misfit of :math:`c^2`, starting from the isotropic tensor of the
    mean speeds.

    References
    ----------
    .. [1] Ashcroft and Mermin (1976), ch. 22.
    .. [2] E. B. Christoffel, Ann. Mat. Pura Appl. 8, 193-243 (1877).

    Examples
    --------
    >>> n = np.eye(3)
    >>> p = christoffel_fit(n, np.tile([5.0, 5.0, 8.0], (3, 1)), np.ones(3))
    >>> np.round(christoffel_speeds(p, np.array([[0.6, 0.8, 0.0]])), 6).tolist()      # isotropic
    [[5.0, 5.0, 8.0]]
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
    return result.x


def christoffel_speeds(params, directions):
    """Ascending sound speeds [Å·THz] of the fitted tensor along unit ``directions`` (P, 3)."""
    return np.sqrt(np.clip(_speeds_squared(params, directions), 0.0, None))


def christoffel_means(params):
    r""":math:`\langle c_j^{-3}\rangle` per branch [(Å·THz)⁻³] of a fitted tensor, over the sphere.

    Notes
    -----
    A 24 × 48-point product rule (Gauss–Legendre in cos θ, uniform in φ).

    Examples
    --------
    >>> p = christoffel_fit(np.eye(3), np.tile([5.0, 5.0, 8.0], (3, 1)), np.ones(3))
    >>> np.round(christoffel_means(p) * 5 ** 3, 6).tolist()
    [1.0, 1.0, 0.244141]
    """
    n, w = _sphere_rule()
    eig = np.clip(_speeds_squared(params, n), 1e-300, None)
    return w @ eig ** -1.5
