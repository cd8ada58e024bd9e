r"""Imaginary (negative-frequency) modes of a phonon DOS.

Codes that compute phonons report an imaginary frequency :math:`i|\nu|` as
a negative one.  Such modes have no harmonic thermodynamics: they are either
numerical noise (tiny fractions near Γ) or a sign of dynamical instability.
"""

from __future__ import annotations

import numpy as np

from ..errors import OptionError
from ..kernels.quadrature import trapezoid_weights

#: Policies for negative-frequency weight.
POLICIES = ("drop", "drop-unscaled", "refuse")
#: Former spellings still accepted (one release), mapped to the current name.
POLICY_ALIASES = {"keep-count": "drop-unscaled"}
#: Above this share of modes the lattice is called dynamically unstable.
UNSTABLE_SHARE = 0.01


def check_policy(policy: str) -> str:
    """Validate an imaginary-mode policy name.

    Parameters
    ----------
    policy : str
        ``drop``, ``drop-unscaled`` or ``refuse`` (case-insensitive); the
        former spelling ``keep-count`` is read as ``drop-unscaled``.

    Returns
    -------
    str
        The canonical policy name.

    Raises
    ------
    OptionError
        For any other name.

    Examples
    --------
    >>> check_policy("Keep-Count")
    'drop-unscaled'
    """
    name = str(policy).strip().lower().replace("_", "-")
    name = POLICY_ALIASES.get(name, name)
    if name not in POLICIES:
        raise OptionError(f"unknown imaginary-mode policy {policy!r}; choose one of {', '.join(POLICIES)}")
    return name


def split_at_zero(frequency, columns):
    """Split a piecewise-linear DOS into its ν < 0 and ν >= 0 parts.

    Parameters
    ----------
    frequency : array_like, shape (N,)
        Ascending frequencies [any unit].
    columns : sequence of array_like, each shape (N,)
        DOS columns [states / unit].

    Returns
    -------
    negative_integral : numpy.ndarray, shape (len(columns),)
        Modes at ν < 0 for each column [1].
    frequency_positive : numpy.ndarray
        Frequencies >= 0, starting at 0 when the grid crosses zero.
    columns_positive : list of numpy.ndarray
        The columns on that grid (linearly interpolated at ν = 0).

    Notes
    -----
    Trapezoid integrals of the piecewise-linear DOS on each side of 0, with
    sharp band edges read as steps (:func:`thermo.kernels.quadrature.band_edge_segments`).

    References
    ----------
    .. [1] W. H. Press et al., *Numerical Recipes*, 3rd ed. (CUP, 2007), §4.1.

    Examples
    --------
    >>> neg, f, (g,) = split_at_zero([-1.0, 1.0, 2.0], [[2.0, 2.0, 0.0]])
    >>> float(neg[0]), f.tolist(), g.tolist()
    (2.0, [0.0, 1.0, 2.0], [2.0, 2.0, 0.0])
    """
    nu = np.asarray(frequency, dtype=float)
    cols = [np.asarray(c, dtype=float) for c in columns]
    if nu[0] >= 0:
        return np.zeros(len(cols)), nu, cols
    below = nu < 0
    nu_neg = np.concatenate([nu[below], [0.0]])
    zero_vals = [np.interp(0.0, nu, c) for c in cols]
    total_neg = np.concatenate([cols[0][below], [zero_vals[0]]])
    trapezoid = trapezoid_weights(nu_neg, total_neg)
    negative = np.array([float(np.dot(np.concatenate([c[below], [z]]), trapezoid))
                         for c, z in zip(cols, zero_vals)])
    keep = nu > 0
    nu_pos = np.concatenate([[0.0], nu[keep]])
    pos = [np.concatenate([[z], c[keep]]) for c, z in zip(cols, zero_vals)]
    return negative, nu_pos, pos


def imaginary_warnings(share: float, policy: str) -> list:
    """One-line cautions for a given share of imaginary modes.

    Parameters
    ----------
    share : float
        Fraction of modes at negative frequency [1].
    policy : str
        The policy applied.

    Returns
    -------
    list of str
        Empty when the share is zero.

    Examples
    --------
    >>> len(imaginary_warnings(0.05, "drop"))
    2
    """
    if share <= 0:
        return []
    what = {"drop": "left out and the real modes renormalised to 3n",
            "drop-unscaled": "left out without renormalising (the real modes carry fewer than 3n)",
            "refuse": "refused"}[policy]
    out = [f"{100 * share:.3g} % of modes are imaginary (negative frequencies); they are {what}"]
    if share > UNSTABLE_SHARE:
        out.append("CAUTION: more than 1 % imaginary modes means the structure is dynamically "
                   "unstable at this geometry; harmonic results are not meaningful")
    return out
