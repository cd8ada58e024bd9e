"""Log-grid correlation sums against the direct pair sums and against mpmath.

References used here:
- the kernels' definitions (Planck 1901; Einstein 1907) evaluated with
  mpmath at 30 significant digits, independent of thermo.kernels.planck;
- J(X) = ∫_0^X x³/(eˣ−1) dx by mpmath quadrature (Abramowitz & Stegun 27.1);
- exactness of p-point Lagrange interpolation for polynomials of degree
  < p (a mathematical fact).
"""

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from thermo.kernels import cold, loggrid, nu2
from thermo.kernels.direct import direct_grid_sums

H_OVER_K = sc.h * 1e12 / sc.k   # K per THz, CODATA via scipy.constants
KEYS = ("heat_capacity", "thermal_energy", "log_partition")


def _mp_sums(nodes, weights, temperatures):
    """Σ w K(hν/kT) with mpmath kernels (30 digits), as floats."""
    mp.mp.dps = 30
    out = {k: [] for k in KEYS}
    for t in temperatures:
        acc = {k: mp.mpf(0) for k in KEYS}
        for nu, w in zip(nodes, weights):
            x = mp.mpf(H_OVER_K) * mp.mpf(nu) / mp.mpf(t)
            em1 = mp.expm1(x)
            acc["heat_capacity"] += w * x ** 2 * mp.exp(x) / em1 ** 2
            acc["thermal_energy"] += w * x / em1
            acc["log_partition"] += -w * mp.log1p(-mp.exp(-x))
        for k in KEYS:
            out[k].append(float(acc[k]))
    return {k: np.array(v) for k, v in out.items()}


def _worst(a, b):
    return max(float(np.max(np.abs(a[k] / b[k] - 1))) for k in KEYS)


def _debye_with_edge(n=4000, top=15.0):
    nu = np.linspace(0.0, 1.3 * top, n)
    g = np.where(nu <= top, 9 * nu ** 2 / top ** 3, 0.0) + 2 * np.exp(-((nu - 1.1 * top) / 0.5) ** 2)
    return nu, g * np.gradient(nu)


def _gapped(n=3000):
    # spectrum starting at a cut-off, as the table part after the ν² treatment
    nu = np.linspace(2.0, 18.0, n)
    return nu, (1 + np.sin(nu)) ** 2 * np.gradient(nu)


def _uneven(n=2500):
    nu = np.sort(np.concatenate([[0.0], np.geomspace(1e-3, 25.0, n - 1)]))
    return nu, np.exp(-((nu - 8) / 4) ** 2) * np.gradient(nu)


SHAPES = {"debye_edge": _debye_with_edge, "gapped": _gapped, "uneven_zero_node": _uneven}
GRIDS = {"linear_1_1000": np.linspace(1.0, 1000.0, 1000),
         "linear_step10": np.linspace(1.0, 1001.0, 101),
         "log_0.1_3000": np.geomspace(0.1, 3000.0, 400),
         "shuffled": np.random.default_rng(1).permutation(np.linspace(2.0, 700.0, 300))}


@pytest.mark.parametrize("shape", SHAPES)
@pytest.mark.parametrize("grid", GRIDS)
def test_matches_direct_pair_sums(shape, grid):
    nu, w = SHAPES[shape]()
    t = GRIDS[grid]
    assert loggrid.suitable(nu, w, t)
    assert _worst(loggrid.loggrid_sums(nu, w, t), direct_grid_sums(nu, w, t)) < 1e-7


def test_matches_mpmath_on_small_case():
    rng = np.random.default_rng(7)
    nu = np.sort(rng.uniform(0.3, 12.0, 40))
    w = rng.uniform(0.0, 1.0, 40)
    t = np.geomspace(2.0, 1500.0, 25)
    assert _worst(loggrid.loggrid_sums(nu, w, t), _mp_sums(nu, w, t)) < 1e-9


def test_cold_temperatures_match_mpmath():
    # every term exponentially small: the cold path must keep relative accuracy
    nu = np.linspace(3.0, 6.0, 31)
    w = np.full(31, 0.1)
    t = np.linspace(1.0, 40.0, 40)
    fast = loggrid.loggrid_sums(nu, w, t)
    ref = _mp_sums(nu, w, t)
    assert ref["heat_capacity"][0] < 1e-50 and ref["heat_capacity"][2] < 1e-15   # really frozen
    assert _worst(fast, ref) < 1e-9
    frozen = slice(0, 3)
    assert _worst({k: v[frozen] for k, v in fast.items()}, {k: v[frozen] for k, v in ref.items()}) < 1e-12


def test_zero_node_uses_the_direct_half_interval_mean():
    nu = np.linspace(0.0, 10.0, 2001)
    w = np.full(nu.size, 0.001)
    t = np.linspace(1.0, 900.0, 200)
    assert _worst(loggrid.loggrid_sums(nu, w, t), direct_grid_sums(nu, w, t)) < 1e-7


def test_frozen_sums_match_mpmath():
    nu = np.array([0.05, 0.7, 3.0, 11.0])
    w = np.array([0.5, 1.0, 2.0, 0.25])
    t = np.array([0.5, 3.0, 40.0, 900.0])
    assert _worst(loggrid.frozen_sums(nu, w, t), _mp_sums(nu, w, t)) < 1e-13


def test_suitable_refuses_what_it_cannot_do():
    nu, w = _gapped()
    t = np.linspace(1.0, 1000.0, 1000)
    assert loggrid.suitable(nu, w, t)
    assert not loggrid.suitable(nu, w, t[:5])                       # too few temperatures
    assert not loggrid.suitable(nu, w, np.append(t, 0.0))           # T = 0
    assert not loggrid.suitable(nu, w, np.append(t, np.nan))
    assert not loggrid.suitable(np.append(nu, -1.0), np.append(w, 1.0), t)
    assert not loggrid.suitable(nu, np.zeros_like(w), t)


def test_lagrange_weights_are_exact_for_degree_seven():
    offsets = np.array([3.0, 3.25, 3.5, 3.999])
    lw = loggrid.lagrange_weights(offsets)
    stencil = np.arange(loggrid.ORDER, dtype=float)
    for degree in range(loggrid.ORDER):
        assert np.allclose(lw @ stencil ** degree, offsets ** degree, rtol=1e-12, atol=1e-12)


def test_debye_integral_matches_mpmath():
    mp.mp.dps = 30
    xs = [1e-5, 0.3, 0.9999, 1.0, 1.9999, 2.5, 7.0, 30.0, 80.0]
    for x in xs:
        ref = mp.quad(lambda s: s ** 3 / mp.expm1(s), [0, x])
        assert abs(float(nu2.debye_integral(x)) / float(ref) - 1) < 1e-14
    assert float(nu2.debye_integral(1e300)) == pytest.approx(np.pi ** 4 / 15, rel=1e-15)


def test_nu2_part_sums_match_mpmath():
    mp.mp.dps = 30
    a, cut = 0.3, 2.0
    t = np.array([0.5, 4.0, 30.0, 300.0, 5000.0])
    fast = nu2.nu2_part_sums(a, cut, t)
    for j, temp in enumerate(t):
        beta = mp.mpf(H_OVER_K) / mp.mpf(temp)
        kern = {"heat_capacity": lambda v: (beta * v) ** 2 * mp.exp(beta * v) / mp.expm1(beta * v) ** 2,
                "thermal_energy": lambda v: beta * v / mp.expm1(beta * v),
                "log_partition": lambda v: -mp.log1p(-mp.exp(-beta * v))}
        for key in KEYS:
            ref = mp.quad(lambda v: a * v ** 2 * kern[key](v), [0, cut / 4, cut])
            assert abs(fast[key][j] / float(ref) - 1) < 1e-12, (key, temp)


def test_cold_sums_in_small_passes_give_the_same(monkeypatch):
    nu = np.linspace(3.0, 6.0, 301)
    w = np.full(nu.size, 0.01)
    t = np.linspace(1.0, 60.0, 120)
    whole = loggrid.loggrid_sums(nu, w, t)
    monkeypatch.setattr(cold, "_PAIRS_PER_PASS", 500)      # many passes of a few temperatures
    assert _worst(loggrid.loggrid_sums(nu, w, t), whole) < 1e-13
    assert _worst(whole, direct_grid_sums(nu, w, t)) < 1e-7


def test_spectrum_mostly_frozen_over_the_whole_range():
    # most modes far above every temperature: the sums are tiny against Σw, and the
    # FFT's rounding (relative to Σw) must not leak into them
    # (judging against the largest sum on the grid instead gave 6e-5 here)
    rng = np.random.default_rng(4)
    nu = np.sort(rng.uniform(0.2, 1700.0, 1800))
    w = rng.uniform(0.0, 1.0, nu.size) ** 3
    t = np.linspace(0.5, 4.0, 1100)
    assert _worst(loggrid.loggrid_sums(nu, w, t), direct_grid_sums(nu, w, t)) < 1e-9


def test_a_subset_of_sums_is_the_same_numbers():
    # Reference: the full direct pair sums (every kernel); a subset skips kernels, never changes one.
    from thermo.kernels.direct import direct_grid_sums
    from thermo.kernels.sums import thermal_sums
    from thermo.spectrum import PhononDOS
    nu = np.linspace(0.0, 6.0, 301)                       # starts at ν = 0: the zero node's terms too
    g = 9 * nu ** 2 / 6.0 ** 3 + 0.01
    t = np.array([3.0, 298.15, 2000.0])
    w = np.gradient(nu) * g
    full = direct_grid_sums(nu, w, t)
    part = direct_grid_sums(nu, w, t, keys=("thermal_energy", "log_partition"))
    assert set(part) == {"thermal_energy", "log_partition"}
    for key in part:
        np.testing.assert_array_equal(part[key], full[key])
    dos = PhononDOS(nu, g, atoms=1)
    s = thermal_sums(dos, t, keys=("thermal_energy", "log_partition"))
    np.testing.assert_array_equal(s["entropy"], thermal_sums(dos, t)["entropy"])
    assert "heat_capacity" not in s


def test_relevant_prefix_shortcut_equals_the_full_bound():
    # the bounds formed only up to x* (largest weight vs the first node) pick the same prefix as all bounds
    from thermo.kernels.cold import _relevant_nodes
    rng = np.random.default_rng(3)
    for _ in range(300):
        n = int(rng.integers(2, 3000))
        nu = np.sort(rng.uniform(0, 1, n) ** rng.uniform(0.3, 3)) * 10 ** rng.uniform(-2, 2) + 1e-6
        w = np.exp(rng.normal(0, rng.uniform(0, 15), n)) * rng.choice([1, -1], n)
        log_w = np.log(np.abs(w))
        for t in 10 ** rng.uniform(-2, 3, 3):
            assert _relevant_nodes(nu, w, t, log_w, float(log_w.max())) == _relevant_nodes(nu, w, t, log_w)
