r"""The elastic anchor of a tabulated DOS: a Debye law from an elastic θ below the data's resolved limit.

``--low-frequency elastic:THETA_K`` replaces the DOS below the lowest
frequency the data resolve by :math:`A\nu^2`, :math:`A = 9n/\nu_D^3`,
:math:`\nu_D = k_B\theta/h`, and blends it into the data above (the same
smooth step as the automatic ν² treatment, :class:`~thermo.spectrum.LowFrequencyFit`).

The data's own resolved limit is the one rule of :func:`.resolved.resolved_limit`
(the error estimate's, compared here with the elastic law): two smearing
widths or bins up, and past the last frequency at which the cumulative count
:math:`N(\nu)=\int_0^\nu g` leaves a factor :data:`~.resolved.LAW_BAND` of
the law's :math:`A\nu^3/3`.  From there the law holds up to the first ν from
which the count stays within :data:`AGREEMENT` of it up to 2ν (at most where
the law holds :data:`LAW_SHARE` of the modes): a noisy start is not blended in.

References
----------
.. [1] N. W. Ashcroft and N. D. Mermin, *Solid State Physics* (1976), ch. 23.
"""

from __future__ import annotations

import numpy as np

from ..kernels.planck import H_OVER_K_THZ
from ..spectrum import LowFrequencyFit
from .resolved import cumulative_count, resolved_limit

#: Above the resolved limit, the law holds until the data's count follows it within this factor up to 2ν.
AGREEMENT = 1.2
#: Share of the 3n modes below the top of the range looked at.
LAW_SHARE = 0.02


def elastic_anchor(frequency_thz, dos, theta_k, atoms, total_modes, histogram=False):
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
    histogram : bool
        The rows are bins (bin centres, counted as Σ g·Δ).

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
    >>> round(fit.coefficient * 125 / 9, 4), round(fit.cutoff_thz, 6)
    (1.0, 0.03)
    """
    nu, g = np.asarray(frequency_thz, float), np.asarray(dos, float)
    law = 9.0 * atoms / (theta_k / H_OVER_K_THZ) ** 3
    x, count = cumulative_count(nu, g, histogram)
    scale = total_modes / float(count[-1])
    count = count * scale
    resolved = resolved_limit(nu, g * scale, histogram, law=law)[3]      # what the data resolve
    top = (3.0 * LAW_SHARE * total_modes / law) ** (1 / 3)
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = count / (law * x ** 3 / 3.0)
    inside = (ratio <= AGREEMENT) & (ratio >= 1 / AGREEMENT)
    for i in np.flatnonzero((x >= resolved) & (x < top)):   # the first ν from which the count follows the law up to 2ν
        if inside[(x >= x[i]) & (x <= min(2 * x[i], top))].all():
            resolved = float(x[i])
            break
    else:
        resolved = max(resolved, min(top, float(x[-1])))
    fit = LowFrequencyFit(coefficient=law, cutoff_thz=resolved, window_thz=(resolved, 2 * resolved),
                          automatic=False, blend_top_thz=2 * resolved)
    note = (f"long-wave limit anchored by the elastic Debye temperature {theta_k:g} K below the resolved "
            f"limit {resolved:.4g} THz (the data follow its law within ×{AGREEMENT:g} above it), blended into "
            f"the data up to {2 * resolved:.4g} THz")
    return fit, note
