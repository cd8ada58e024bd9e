r"""The elastic anchor of a tabulated DOS: a Debye law from an elastic θ below the data's resolved limit.

``--low-frequency elastic:THETA_K`` replaces the DOS below the lowest
frequency the data resolve by :math:`A\nu^2`, :math:`A = 9n/\nu_D^3`,
:math:`\nu_D = k_B\theta/h`, and blends it into the data above (the same
smooth step as the automatic ν² treatment, :class:`~thermo.spectrum.LowFrequencyFit`).

The resolved limit :math:`\nu_r` used here is stated simply: from three grid
steps and three smearing widths up (σ from :math:`g(0) = A\sigma^2/2`, the
value of a Gaussian-smeared ν² law at 0), the lowest frequency ν from which the data's cumulative count
:math:`N(\nu)=\int_0^\nu g` stays within a factor :data:`LAW_BAND` of the
law's :math:`A\nu^3/3` up to 2ν, at most the frequency below which the law
holds :data:`LAW_SHARE` of the modes (a cumulative count is far less
sensitive to the comb of a mesh than :math:`g/\nu^2`).

References
----------
.. [1] N. W. Ashcroft and N. D. Mermin, *Solid State Physics* (1976), ch. 23.
"""

from __future__ import annotations

import numpy as np

from ..kernels.planck import H_OVER_K_THZ
from ..kernels.quadrature import mode_weights
from ..spectrum import LowFrequencyFit

#: The data count within this factor of the law above the resolved limit.
LAW_BAND = 1.2
#: Share of the 3n modes below the top of the range looked at.
LAW_SHARE = 0.02
#: Grid steps below which nothing is resolved.
MIN_STEPS = 3
#: Smearing widths below which nothing is resolved (σ from g(0) = Aσ²/2 of a smeared ν² law).
SMEARING_WIDTHS = 3.0


def elastic_anchor(frequency_thz, dos, theta_k, atoms, total_modes):
    r"""The law of an elastic Debye temperature, cut at the data's resolved limit.

    Parameters
    ----------
    frequency_thz : numpy.ndarray, shape (N,)
        Ascending frequencies >= 0 [THz].
    dos : numpy.ndarray, shape (N,)
        DOS [states / THz, any scale].
    theta_k : float
        Elastic Debye temperature θ [K].
    atoms : int
        Atoms per formula unit n.
    total_modes : float
        Modes the DOS stands for (3n, or fewer under drop-unscaled).

    Returns
    -------
    fit : LowFrequencyFit
        :math:`A\nu^2` per formula unit (absolute, not to be rescaled),
        cut-off :math:`\nu_r`, blend top :math:`2\nu_r`.
    note : str
        What was done.

    Notes
    -----
    :math:`A = 9n(h/k_B\theta)^3`; the data are compared after scaling to
    ``total_modes``.

    Examples
    --------
    >>> nu = np.linspace(0.0, 5.0, 501)
    >>> fit, note = elastic_anchor(nu, 9 * nu ** 2 / 125, 5.0 * 47.992430, 1, 3.0)
    >>> round(fit.coefficient * 125 / 9, 4), fit.cutoff_thz
    (1.0, 0.03)
    """
    nu, g = np.asarray(frequency_thz, float), np.asarray(dos, float)
    law = 9.0 * atoms / (theta_k / H_OVER_K_THZ) ** 3
    count = np.concatenate([[0.0], np.cumsum(0.5 * (g[1:] + g[:-1]) * np.diff(nu))])
    count = count * total_modes / float(mode_weights(nu, g).sum())
    expected = law * nu ** 3 / 3.0
    top = (3.0 * LAW_SHARE * total_modes / law) ** (1 / 3)
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = count / expected
    inside = (ratio <= LAW_BAND) & (ratio >= 1 / LAW_BAND)
    norm = total_modes / float(mode_weights(nu, g).sum())
    width = np.sqrt(2.0 * max(float(g[0]) * norm, 0.0) / law)        # a smeared law has g(0) = Aσ²/2
    start = int(np.searchsorted(nu, max(float(nu[min(MIN_STEPS, nu.size - 1)]), SMEARING_WIDTHS * width)))
    start = min(start, nu.size - 1)
    resolved = float(nu[start])
    for i in range(start, nu.size):       # the first ν from which the count follows the law up to 2ν
        span = (nu >= nu[i]) & (nu <= min(2 * nu[i], top))
        if nu[i] >= top or inside[span].all():
            resolved = float(min(nu[i], top))
            break
    fit = LowFrequencyFit(coefficient=law, cutoff_thz=resolved, window_thz=(resolved, 2 * resolved),
                          automatic=False, blend_top_thz=2 * resolved)
    note = (f"long-wave limit anchored by the elastic Debye temperature {theta_k:g} K below the resolved "
            f"limit {resolved:.4g} THz (the data follow its law within ×{LAW_BAND:g} above it), blended into "
            f"the data up to {2 * resolved:.4g} THz")
    return fit, note
