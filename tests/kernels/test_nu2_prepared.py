"""The analytic low-frequency part in closed form, prepared once per fit, against mpmath.

References used here:
- the kernels' definitions (Planck 1901; Einstein 1907) and the fitted form
  A ν² (1 + b ν² + c ν⁴) times the cubic step W = 1 - 3s² + 2s³, integrated by
  mpmath quadrature at 30 digits, independent of thermo.kernels;
- Bernoulli numbers from mpmath.bernoulli (exact rationals).
"""

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from thermo.kernels import nu2
from thermo.spectrum import LowFrequencyFit

H_OVER_K = sc.h * 1e12 / sc.k   # K per THz, CODATA via scipy.constants
KEYS = ("heat_capacity", "thermal_energy", "log_partition")

FITS = [
    LowFrequencyFit(0.0416, 0.407, (0.4, 1.6), blend_top_thz=0.814),                 # automatic: top = 2 cut
    LowFrequencyFit(9.0, 1.0, (1.0, 4.0), blend_top_thz=2.0, curvature=-0.1, quartic=0.01),
    LowFrequencyFit(0.3, 2.0, (2.0, 8.0), blend_top_thz=2.1, curvature=0.02),        # narrow: quadrature
    LowFrequencyFit(0.3, 2.0, (2.0, 8.0)),                                            # no taper
    LowFrequencyFit(5.0, 0.05, (0.05, 0.4), blend_top_thz=0.1, curvature=3.0, quartic=-2.0),
    LowFrequencyFit(0.2, 1.0, (1.0, 4.0), blend_top_thz=2.0, smooth_taper=True),        # not a cubic: quadrature
]


def _mp_sums(fit, temperature):
    with mp.workdps(30):
        beta = mp.mpf(H_OVER_K) / mp.mpf(temperature)
        a, b, c = (mp.mpf(v) for v in (fit.coefficient, fit.curvature, fit.quartic))
        cut = mp.mpf(fit.cutoff_thz)
        top = mp.mpf(fit.blend_top_thz if fit.blend_top_thz is not None else fit.cutoff_thz)

        def form(v):
            return a * v ** 2 * (1 + b * v ** 2 + c * v ** 4)

        def step(v):
            s = (v - cut) / (top - cut)
            if fit.smooth_taper:
                return 1 / (1 + mp.exp(1 / (1 - s) - 1 / s)) if 0 < s < 1 else (1 if s <= 0 else 0)
            return 1 - 3 * s ** 2 + 2 * s ** 3

        kernels = {"heat_capacity": lambda v: (beta * v) ** 2 * mp.exp(beta * v) / mp.expm1(beta * v) ** 2,
                   "thermal_energy": lambda v: beta * v / mp.expm1(beta * v),
                   "log_partition": lambda v: -mp.log1p(-mp.exp(-beta * v))}
        out = {}
        for key, kern in kernels.items():
            value = mp.quad(lambda v: form(v) * kern(v), [0, cut / 4, cut])
            if top > cut:
                value += mp.quad(lambda v: step(v) * form(v) * kern(v), [cut, top])
            out[key] = float(value)
        return out


@pytest.mark.parametrize("fit", FITS)
def test_analytic_part_matches_mpmath(fit):
    # temperatures on both sides of the series split (X = hν/kT = 3) for both limits
    temperatures = [0.05, 1.0, 7.0, 14.0, 20.0, 31.0, 33.0, 60.0, 300.0, 1e4]
    fast = nu2.analytic_part_sums(fit, temperatures)
    for j, t in enumerate(temperatures):
        ref = _mp_sums(fit, t)
        for key in KEYS:
            assert fast[key][j] == pytest.approx(ref[key], rel=1e-11), (key, t)


def test_bernoulli_coefficients_are_exact():
    beta = nu2._bernoulli_over_factorial(60)
    with mp.workdps(40):
        exact = [mp.bernoulli(k) / mp.factorial(k) for k in range(60)]
    exact[1] = -0.5                                     # x/(eˣ-1) convention, B₁ = -1/2
    for k in range(60):
        assert beta[k] == pytest.approx(float(exact[k]), rel=1e-15, abs=1e-300), k


def test_prepared_sums_are_kept_and_equal_a_fresh_preparation():
    fit = FITS[1]
    first = fit.prepared_sums()
    assert fit.prepared_sums() is first                 # prepared once, kept on the fit
    t = np.geomspace(0.5, 3000.0, 57)
    kept = nu2.analytic_part_sums(fit, t)
    fresh_sums, nodes, _modes = nu2.prepared_analytic_part(fit)
    fresh = fresh_sums.sums(t)
    assert nodes.size == 0
    for key in KEYS:
        np.testing.assert_array_equal(kept[key], fresh[key])
    # a rescaled fit is a new object with its own preparation: 2 × the sums
    double = nu2.analytic_part_sums(fit.scaled(2.0), t)
    for key in KEYS:
        np.testing.assert_allclose(double[key], 2.0 * kept[key], rtol=1e-14)


def test_one_temperature_and_a_grid_give_the_same_values():
    # the joint series (all limits below the split) and the per-limit path agree
    fit = FITS[0]
    t = np.linspace(1.0, 1000.0, 1000)
    whole = nu2.analytic_part_sums(fit, t)
    for j in (0, 5, 12, 40, 999):
        single = nu2.analytic_part_sums(fit, t[j:j + 1])
        for key in KEYS:
            assert single[key][0] == pytest.approx(whole[key][j], rel=1e-14)
