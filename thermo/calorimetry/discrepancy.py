r"""Is the model able to describe the data?  Structure of the fit residuals and a model-discrepancy term.

A fit's parameter covariance says how well the data fix the parameters *of
this model*; it says nothing about whether the model can describe the data.
When the residuals are structured — long runs of one sign (runs test), or a
scatter beyond the stated uncertainties (Birge ratio) — the model misses the
data by a smooth curve, and every quantity integrated from the model
(S°, H° − H°(0)) carries that miss.  This module measures it:

* noise level of the relative residuals: the stated uncertainties σ/C when
  given, else the point-to-point scatter about the straight line through
  each point's neighbours (a second difference, generalised von Neumann
  estimator), which a smooth misfit hardly changes:
  :math:`\hat\sigma^2 = \overline{e_j^2/(1+a_j^2+b_j^2)}`,
  :math:`e_j = r_j - a_jr_{j-1} - b_jr_{j+1}` with the linear-interpolation
  weights a_j, b_j;
* structure: the Wald–Wolfowitz runs test on the signs of the residuals
  (too few runs, one-sided p < 0.05); with σ given, a χ² beyond its 99th
  percentile (Birge ratio :math:`R_B = \sqrt{\chi^2_\nu}` well above 1);
  without σ, a mean square residual beyond :math:`(1 + 3\sqrt{2/M})` times
  the point-to-point noise (three standard deviations of the ratio for
  pure noise);
* discrepancy :math:`\delta = \sqrt{\max(0, \overline{r^2} - \hat\sigma^2)}`
  (relative), used when the residuals are structured; the model route then
  adds :math:`\delta\,S` and :math:`\delta\,(H-H_0)` to its uncertainty
  (the miss treated as one relative offset of C_p over [0, T], which may
  over-state but never hides it).

References
----------
.. [1] A. Wald, J. Wolfowitz, "On a test whether two samples are from the
   same population", Ann. Math. Statist. 11, 147-162 (1940) (runs test).
.. [2] J. von Neumann, R. H. Kent, H. R. Bellinson, B. I. Hart, "The mean
   square successive difference", Ann. Math. Statist. 12, 153-162 (1941).
.. [3] R. T. Birge, "The calculation of errors by the method of least
   squares", Phys. Rev. 40, 207-227 (1932).
.. [4] M. C. Kennedy, A. O'Hagan, "Bayesian calibration of computer models",
   J. R. Statist. Soc. B 63, 425-464 (2001) (model discrepancy).
"""

from __future__ import annotations

import numpy as np
from scipy import stats

#: One-sided p-value below which the residual signs have too few runs.
RUNS_P = 0.05
#: χ² upper-tail probability below which the scatter exceeds the stated σ.
CHI2_P = 0.01
#: Fewest residuals for which the runs test is made.
MIN_POINTS = 8


def runs_test(residuals):
    r"""Wald–Wolfowitz runs test on the signs of ``residuals``.

    Parameters
    ----------
    residuals : array_like
        Residuals in the order of the fitted temperatures [any unit].

    Returns
    -------
    dict
        ``runs`` observed, ``expected`` (μ), ``z`` = (runs − μ)/σ and the
        one-sided ``p`` of so few runs; zeros are left out.

    Notes
    -----
    With n₊ positive and n₋ negative signs, n = n₊ + n₋:
    :math:`\mu = 2n_+n_-/n + 1`,
    :math:`\sigma^2 = (\mu-1)(\mu-2)/(n-1)`, p = Φ(z).

    References
    ----------
    .. [1] A. Wald, J. Wolfowitz, Ann. Math. Statist. 11, 147 (1940).

    Examples
    --------
    >>> r = runs_test([1, 2, 3, 4, 5, -1, -2, -3, -4, -5])
    >>> r["runs"], round(r["expected"], 6), r["p"] < 0.01
    (2, 6.0, True)
    """
    r = np.asarray(residuals, dtype=float)
    signs = np.sign(r[r != 0])
    n_plus, n_minus = int(np.sum(signs > 0)), int(np.sum(signs < 0))
    n = n_plus + n_minus
    runs = int(1 + np.count_nonzero(np.diff(signs))) if n else 0
    if n_plus == 0 or n_minus == 0:
        return {"runs": runs, "expected": float(runs), "z": float("-inf") if n >= MIN_POINTS else 0.0,
                "p": 0.0 if n >= MIN_POINTS else 1.0}
    mu = 2.0 * n_plus * n_minus / n + 1.0
    var = (mu - 1.0) * (mu - 2.0) / (n - 1.0)
    z = (runs - mu) / np.sqrt(var) if var > 0 else 0.0
    return {"runs": runs, "expected": float(mu), "z": float(z), "p": float(stats.norm.cdf(z))}


def point_to_point_noise(temperatures, residuals):
    r"""rms noise of ``residuals`` about the line through each point's two neighbours.

    Parameters
    ----------
    temperatures : array_like, shape (M,)
        Increasing abscissae [K].
    residuals : array_like, shape (M,)

    Returns
    -------
    float
        :math:`\sqrt{\overline{e_j^2/(1+a_j^2+b_j^2)}}` over the inner points
        (see the module notes); the rms of ``residuals`` when M < 3.

    References
    ----------
    .. [1] J. von Neumann et al., Ann. Math. Statist. 12, 153 (1941).

    Examples
    --------
    >>> t = np.linspace(0.0, 1.0, 201)
    >>> point_to_point_noise(t, 0.01 * np.cos(3 * t)) < 1e-5      # a smooth miss: almost no noise
    True
    >>> noise = 0.003 * np.random.default_rng(1).standard_normal(201)
    >>> bool(abs(point_to_point_noise(t, noise) / 0.003 - 1) < 0.15)
    True
    """
    t = np.asarray(temperatures, dtype=float)
    r = np.asarray(residuals, dtype=float)
    if r.size < 3:
        return float(np.sqrt(np.mean(r * r))) if r.size else 0.0
    left, right = t[1:-1] - t[:-2], t[2:] - t[1:-1]
    a, b = right / (left + right), left / (left + right)
    e = r[1:-1] - a * r[:-2] - b * r[2:]
    return float(np.sqrt(np.mean(e * e / (1.0 + a * a + b * b))))


def residual_structure(relative_residuals, relative_sigma=None, free_parameters=0, temperatures=None):
    r"""Noise level, structure tests and the relative model discrepancy of a fit.

    Parameters
    ----------
    relative_residuals : array_like, shape (M,)
        (model − measured)/measured, in order of temperature [1].
    relative_sigma : array_like, optional
        Stated standard uncertainties over the measured values [1].
    free_parameters : int
        Number of fitted parameters (for χ²_ν).
    temperatures : array_like, optional
        The temperatures of the residuals [K] (for the point-to-point noise;
        default evenly spaced).

    Returns
    -------
    dict
        ``noise`` (relative rms noise), ``noise_from`` (``'stated
        uncertainties'`` or ``'point-to-point scatter'``), ``rms``,
        ``noise_ratio`` (mean square residual over noise², without σ),
        ``runs`` (:func:`runs_test`), ``birge_ratio`` and ``chi2_p`` (with σ),
        ``structured`` (bool), ``reasons`` (list of str) and
        ``discrepancy`` δ (relative, 0 when not structured).

    Notes
    -----
    :math:`\delta = \sqrt{\max(0, \overline{r^2} - \hat\sigma^2)}` when the
    runs test, the χ² test (with σ) or the noise ratio (without σ) finds
    structure; else 0.

    References
    ----------
    .. [1] J. von Neumann et al., Ann. Math. Statist. 12, 153 (1941).
    .. [2] R. T. Birge, Phys. Rev. 40, 207 (1932).

    Examples
    --------
    >>> t = np.linspace(0.0, 1.0, 40)
    >>> s = residual_structure(0.01 * np.cos(3 * t))      # a smooth miss of about 0.7 %
    >>> s["structured"], round(s["discrepancy"], 3)
    (True, 0.007)
    """
    r = np.asarray(relative_residuals, dtype=float)
    m = r.size
    rms = float(np.sqrt(np.mean(r * r))) if m else 0.0
    out = {"rms": rms, "runs": runs_test(r), "birge_ratio": None, "chi2_p": None, "noise_ratio": None,
           "reasons": []}
    dof = m - int(free_parameters)
    if relative_sigma is not None:
        rel = np.asarray(relative_sigma, dtype=float)
        noise = float(np.sqrt(np.mean(rel * rel)))
        out["noise_from"] = "stated uncertainties"
        if dof > 0:
            chi2 = float(np.sum((r / rel) ** 2))
            out["birge_ratio"] = float(np.sqrt(chi2 / dof))
            out["chi2_p"] = float(stats.chi2.sf(chi2, dof))
            if out["chi2_p"] < CHI2_P:
                out["reasons"].append(f"Birge ratio {out['birge_ratio']:.3g} (χ² p = {out['chi2_p']:.2g})")
    else:
        noise = point_to_point_noise(np.arange(m) if temperatures is None else temperatures, r)
        out["noise_from"] = "point-to-point scatter"
        if m >= MIN_POINTS:
            ratio = rms * rms / max(noise * noise, 1e-300)
            out["noise_ratio"] = float(min(ratio, 1e300))
            if ratio > 1.0 + 3.0 * np.sqrt(2.0 / m):
                out["reasons"].append(f"residuals {min(ratio, 1e9) ** 0.5:.3g}× their point-to-point scatter")
    runs = out["runs"]
    if m >= MIN_POINTS and runs["p"] < RUNS_P:
        out["reasons"].append(f"{runs['runs']} runs of one sign where {runs['expected']:.3g} are expected "
                              f"(runs test p = {runs['p']:.2g})")
    out["noise"] = noise
    out["structured"] = bool(out["reasons"])
    out["discrepancy"] = float(np.sqrt(max(0.0, rms * rms - noise * noise))) if out["structured"] else 0.0
    return out
