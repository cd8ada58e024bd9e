r"""Cubic splines through the sampled volumes, one per temperature, as linear weights.

A cubic spline through fixed knots is linear in the values it passes
through, so the spline of an identity matrix gives the *weights* with which
each sampled value enters the curve (and its derivatives) at any point.  The
same weights evaluate all temperatures at once and carry per-volume errors
into the result (:mod:`thermo.quasiharmonic.uncertainty`).

Two uses:

- :class:`LogSpline` carries S(V) and C_v(V) between the volumes as
  :math:`\ln y` against :math:`\ln V` (a power law — S and C_v of a Debye
  solid at low T, :math:`\propto V^{3\gamma}` — is a straight line there);
- the ``spline`` equation of state (:class:`thermo.quasiharmonic.eos.EosFit`)
  is F against the Birch–Murnaghan strain variable :math:`x = (V_{ref}/V)^{2/3}`.

Not-a-knot end conditions; beyond the knots the end cubics continue
(extrapolation, flagged by the caller).

References
----------
.. [1] C. de Boor, *A Practical Guide to Splines*, revised ed. (Springer,
   2001), ch. IV (cubic spline interpolation, not-a-knot condition).
"""

from __future__ import annotations

import numpy as np
from scipy.interpolate import CubicSpline


class CardinalSpline:
    """The not-a-knot cubic spline through K knots, as weights on the K values.

    Parameters
    ----------
    knots : array_like, shape (K,)
        Strictly monotonic abscissae (K >= 4).

    Examples
    --------
    >>> s = CardinalSpline([0.0, 1.0, 2.0, 3.0, 4.0])
    >>> y = np.array([0.0, 1.0, 8.0, 27.0, 64.0])[:, None]      # x³ is reproduced exactly
    >>> float(s.evaluate(y, np.array([1.5]))[0]), float(s.evaluate(y, np.array([1.5]), 1)[0])
    (3.375, 6.75)
    """

    def __init__(self, knots):
        x = np.asarray(knots, dtype=float)
        order = np.argsort(x)
        self.knots = x
        self._basis = CubicSpline(x[order], np.eye(x.size)[order], axis=0)

    def weights(self, points, order=0):
        """Weights (points.shape + (K,)) of the K knot values in the ``order``-th derivative at ``points``."""
        return self._basis(np.asarray(points, dtype=float), order)

    def evaluate(self, values, points, order=0):
        """The ``order``-th derivative of the spline of each column of ``values`` (K, M) at its own points.

        ``points`` has shape (M,) or (M, L); the result has the shape of ``points``.
        """
        w = self.weights(points, order)
        y = np.asarray(values, dtype=float)
        if w.ndim == 2:
            return np.einsum("mk,km->m", w, y)
        return np.einsum("mlk,km->ml", w, y)


class LogSpline:
    r"""y(V) > 0 carried between volumes as a spline of :math:`\ln y` in :math:`\ln V`, per temperature.

    Columns with a non-positive value (T = 0, where S = C_v = 0) are splined
    in y itself.

    Parameters
    ----------
    volumes : array_like, shape (K,)
        Sampled volumes [Å³].
    values : array_like, shape (K, M)
        y at each volume and temperature.

    Notes
    -----
    With :math:`L(\ln V)` the spline of :math:`\ln y`:
    :math:`y = e^{L}`, :math:`dy/dV = y\,L'/V`.

    Examples
    --------
    >>> v = np.linspace(18.0, 22.0, 7)
    >>> s = LogSpline(v, (v ** 4.8)[:, None])
    >>> round(float(s.derivative(np.array([20.5]))[0] / (4.8 * 20.5 ** 3.8)), 12)
    1.0
    """

    def __init__(self, volumes, values):
        self.volumes = np.asarray(volumes, dtype=float)
        self.values = np.asarray(values, dtype=float)
        self.positive = np.all(self.values > 0, axis=0)
        self.spline = CardinalSpline(np.log(self.volumes))
        with np.errstate(divide="ignore", invalid="ignore"):
            self._logs = np.where(self.positive, np.log(np.where(self.values > 0, self.values, 1.0)), 0.0)
        self._linear = CardinalSpline(self.volumes)

    def value(self, volume):
        """y at ``volume`` (M,)."""
        v = np.asarray(volume, dtype=float)
        log = np.exp(self.spline.evaluate(self._logs, np.log(v)))
        return np.where(self.positive, log, self._linear.evaluate(self.values, v))

    def derivative(self, volume):
        """dy/dV at ``volume`` (M,) [unit of y per Å³]."""
        v = np.asarray(volume, dtype=float)
        slope = self.spline.evaluate(self._logs, np.log(v), 1)
        return np.where(self.positive, self.value(v) * slope / v, self._linear.evaluate(self.values, v, 1))

    def second_derivative(self, volume):
        r"""d²y/dV² at ``volume`` (M,): :math:`y(L'^2 + L'' - L')/V^2` for the log form."""
        v = np.asarray(volume, dtype=float)
        d1 = self.spline.evaluate(self._logs, np.log(v), 1)
        d2 = self.spline.evaluate(self._logs, np.log(v), 2)
        log = self.value(v) * (d1 * d1 + d2 - d1) / (v * v)
        return np.where(self.positive, log, self._linear.evaluate(self.values, v, 2))

    def sensitivities(self, volume):
        r"""d y(V)/d y_k and d y'(V)/d y_k at ``volume`` (M,), each (M, K).

        Notes
        -----
        For the log form :math:`\partial y/\partial y_k = y\,w_k/y_k` and
        :math:`\partial y'/\partial y_k = (y'\,w_k + y\,w'_k/V)/y_k`, with
        :math:`w, w'` the spline weights of value and slope.
        """
        v = np.asarray(volume, dtype=float)
        w0 = self.spline.weights(np.log(v))
        w1 = self.spline.weights(np.log(v), 1)
        y, dy = self.value(v)[:, None], self.derivative(v)[:, None]
        with np.errstate(divide="ignore", invalid="ignore"):
            inverse = np.where(self.positive[:, None], 1.0 / np.where(self.values.T > 0, self.values.T, 1.0), 0.0)
        d0 = np.where(self.positive[:, None], y * w0 * inverse, self._linear.weights(v))
        d1 = np.where(self.positive[:, None], (dy * w0 + y * w1 / v[:, None]) * inverse, self._linear.weights(v, 1))
        return d0, d1
