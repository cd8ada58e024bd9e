r"""The heat capacity of one DOS at any temperature, its sums computed once on a log grid and interpolated.

A fit of the scaled-DOS lattice part evaluates :math:`C_v(T/s)` for every
measured point at every trial scale s.  Summing over a 10⁶-row DOS each time
cost minutes; here the sums are computed once per grid temperature
:math:`\tau_k = 10^{k/P}` (only the grid points a call needs, kept for the
next call) and :math:`\ln C` is interpolated in :math:`\ln\tau` with the
8-point Lagrange rule of :mod:`thermo.kernels.loggrid`, so a fit costs about
:data:`PER_DECADE` sums per decade of T/s it visits, whatever the number of
points.

References
----------
.. [1] J.-P. Berrut, L. N. Trefethen, "Barycentric Lagrange interpolation",
   SIAM Rev. 46, 501-517 (2004).
"""

from __future__ import annotations

import threading

import numpy as np

from ..kernels.loggrid import ORDER, lagrange_weights
from ..kernels.sums import thermal_sums

#: Grid temperatures per decade: a step of ln(10)/100 = 0.023 in ln T, where the 8-point rule's error
#: bound h⁸/8!·max|f⁽⁸⁾| is ~1e-17·max|f⁽⁸⁾| for f = ln C(ln T) (smooth: a sum of Planck kernels).
PER_DECADE = 100


class DosHeatCapacity:
    r"""Mode-weighted heat-capacity sum :math:`\sum_i w_i c(h\nu_i/k_BT)` [1] of a DOS, memoised on a log grid.

    Parameters
    ----------
    dos : PhononDOS
        The spectrum (frequencies as given; scale them by passing T/s).

    Notes
    -----
    :math:`\ln C(T) \approx \sum_{j=0}^{7} L_j(q - k_0)\,\ln C(\tau_{k_0+j})` with
    :math:`q = P\log_{10}T`, :math:`k_0 = \lfloor q\rfloor - 3`; where a grid value is 0
    (C underflows at the lowest T) the sums at T are computed directly.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> d = PhononDOS(np.linspace(0.0, 6.0, 301), 9 * np.linspace(0.0, 6.0, 301) ** 2 / 216, atoms=1)
    >>> t = np.array([3.0, 47.3, 300.0])
    >>> exact = thermal_sums(d, t)["heat_capacity"]
    >>> bool(np.max(np.abs(DosHeatCapacity(d)(t) / exact - 1)) < 1e-9)
    True
    """

    def __init__(self, dos):
        self.dos = dos
        self._values = {}
        self._lock = threading.Lock()

    def _grid(self, ks):
        """ln C at the grid indices ``ks`` (computed once each)."""
        with self._lock:
            missing = np.array(sorted({int(k) for k in ks} - self._values.keys()), dtype=np.int64)
        if missing.size:
            c = thermal_sums(self.dos, 10.0 ** (missing / PER_DECADE), keys=("heat_capacity",))["heat_capacity"]
            with np.errstate(divide="ignore"):
                logs = np.where(c > 0, np.log(np.where(c > 0, c, 1.0)), -np.inf)
            with self._lock:
                self._values.update(zip(missing.tolist(), logs.tolist()))
        with self._lock:
            return np.array([self._values[int(k)] for k in ks])

    def __call__(self, temperatures):
        """The sum at each T [K] (0 at T = 0), shape of ``temperatures``."""
        t = np.asarray(temperatures, dtype=float)
        flat = t.ravel()
        out = np.zeros(flat.size)
        hot = np.flatnonzero(flat > 0)
        if hot.size:
            q = PER_DECADE * np.log10(flat[hot])
            first = np.floor(q).astype(np.int64) - (ORDER // 2 - 1)
            index = first[:, None] + np.arange(ORDER)[None, :]
            used, inverse = np.unique(index, return_inverse=True)
            logs = self._grid(used)[inverse.reshape(index.shape)]
            finite = np.all(np.isfinite(logs), axis=1)
            weights = lagrange_weights(q - first)
            out[hot[finite]] = np.exp(np.sum(weights[finite] * logs[finite], axis=1))
            if not finite.all():      # C underflows near these T: the sums themselves
                out[hot[~finite]] = thermal_sums(self.dos, flat[hot[~finite]], keys=("heat_capacity",))[
                    "heat_capacity"]
        return out.reshape(t.shape)
