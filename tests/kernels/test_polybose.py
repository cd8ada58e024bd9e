"""Closed-form sums of polynomial spectra (thermo.kernels.polybose) against independent references.

References used here:
- the Planck kernels' definitions (Planck 1901) integrated against a Debye spectrum g = 9ν²/ν_D³
  (Debye 1912) by mpmath quadrature at 30 digits, independent of thermo.kernels;
- the Debye heat capacity C_v/(3R) = 0.9517321357 at θ_D/T = 1: R. Pässler, Adv. Condens. Matter
  Phys. 2017, 9321439, Table 7 (as quoted in the project's style notes; mpmath gives 0.95173213570328);
- the fitted form A ν² (1 + b ν² + c ν⁴) times the cubic step, by mpmath quadrature
  (tests/kernels/test_nu2_prepared.py's reference).
"""

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from thermo.kernels import nu2, polybose
from thermo.spectrum import LowFrequencyFit

from .test_nu2_prepared import KEYS, _mp_sums

H_OVER_K = sc.h * 1e12 / sc.k   # K per THz, CODATA via scipy.constants
CUTOFF = 8.0                    # THz: θ_D = 383.9 K


def _mp_debye(temperature, cutoff=CUTOFF):
    """Σ_c, Σ_u, Σ_ℓ of g = 9ν²/ν_D³ on [0, ν_D] by mpmath quadrature (kernels written out here)."""
    with mp.workdps(30):
        x_d = mp.mpf(H_OVER_K) * mp.mpf(cutoff) / mp.mpf(temperature)
        pre = 9 / x_d ** 3                          # ∫ 9ν²/ν_D³ K dν = 9/X_D³ ∫_0^{X_D} x² K dx
        kernels = {"heat_capacity": lambda x: x ** 4 * mp.exp(x) / mp.expm1(x) ** 2,
                   "thermal_energy": lambda x: x ** 3 / mp.expm1(x),
                   "log_partition": lambda x: -x ** 2 * mp.log1p(-mp.exp(-x))}
        return {key: float(pre * mp.quad(kernel, [0, min(x_d, 1), x_d])) for key, kernel in kernels.items()}


# X_D = hν_D/k_BT on both sides of the series splits (1.5: one series for all limits, 3: the
# e^{-X} series), deep in the T³ regime and far above θ_D
DEBYE_X = [1e-4, 0.05, 1.0, 1.49, 1.51, 2.2, 2.99, 3.01, 7.0, 40.0, 400.0]


@pytest.mark.parametrize("x_d", DEBYE_X)
def test_debye_spectrum_matches_mpmath_to_1e_12(x_d):
    t = H_OVER_K * CUTOFF / x_d
    fast = nu2.nu2_part_sums(9.0 / CUTOFF ** 3, CUTOFF, [t])
    ref = _mp_debye(t)
    for key in KEYS:
        assert fast[key][0] == pytest.approx(ref[key], rel=1e-12), key


def test_debye_heat_capacity_at_theta_matches_the_published_table():
    # Pässler 2017, Table 7: C_D(θ_D/T = 1) = 0.9517321357 (per 3R)
    t = H_OVER_K * CUTOFF
    cv = nu2.nu2_part_sums(9.0 / CUTOFF ** 3, CUTOFF, [t])["heat_capacity"][0] / 3.0
    assert cv == pytest.approx(0.9517321357, abs=1e-10)


def test_a_whole_temperature_grid_is_the_same_as_one_temperature_at_a_time():
    # grid evaluation (one series for the warm end, per-limit series for the rest) = single values
    fit = LowFrequencyFit(0.0416, 0.407, (0.4, 1.6), blend_top_thz=0.814)
    t = np.linspace(1.0, 1000.0, 1000)
    top_x = H_OVER_K * 0.814 / t
    whole = nu2.analytic_part_sums(fit, t)
    # the temperatures beside each split of the highest limit's X (1.5 and 3) and the ends
    picks = {0, 999, int(np.argmin(np.abs(top_x - 1.5))), int(np.argmin(np.abs(top_x - 3.0)))}
    picks |= {j + 1 for j in picks if j < 999}
    for j in sorted(picks):
        single = nu2.analytic_part_sums(fit, t[j:j + 1])
        for key in KEYS:
            assert single[key][0] == pytest.approx(whole[key][j], rel=1e-13), (key, t[j])


def test_tapered_fit_beside_the_splits_matches_mpmath_to_1e_12():
    fit = LowFrequencyFit(0.0416, 0.407, (0.4, 1.6), blend_top_thz=0.814)
    xs = [0.3, 1.49, 1.51, 2.99, 3.01, 5.9, 6.1, 30.0]       # X of the highest limit (2 × cut-off)
    temperatures = [H_OVER_K * 0.814 / x for x in xs]
    fast = nu2.analytic_part_sums(fit, temperatures)
    for j, t in enumerate(temperatures):
        ref = _mp_sums(fit, t)
        for key in KEYS:
            assert fast[key][j] == pytest.approx(ref[key], rel=1e-12), (key, t)


def test_products_in_chunks_equal_one_product():
    rng = np.random.default_rng(7)
    coefficients, powers = rng.normal(size=(3, 60)), rng.normal(size=(60, 5000))
    chunked = polybose._apply(coefficients, powers)           # 3·60·5000 > one chunk
    np.testing.assert_allclose(chunked, np.einsum("rk,km->rm", coefficients, powers), rtol=1e-12, atol=1e-12)


@pytest.mark.parametrize("count", [1, 2, 3, 7, 29, 52, 60])
def test_powers_in_blocks_equal_numpy_power(count):
    x = np.linspace(0.01, 1.5, 3000)                          # many values: the row-product path
    np.testing.assert_allclose(polybose._powers(x, count),
                               np.power(x[None, :], np.arange(count, dtype=float)[:, None]), rtol=1e-14)
