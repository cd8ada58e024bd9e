"""Crossing search: two crossings hidden inside one grid step, and the root of an exact function.

Truths are closed forms (the roots of the functions written here); Brent's method's guarantee is from
R. P. Brent, Algorithms for Minimization without Derivatives (1973), ch. 4.
"""

from __future__ import annotations

import numpy as np
import pytest

from thermo.phases.crossings import brackets, hermite_root, refine


def test_two_crossings_inside_one_step_are_found():
    # ΔG = 0.01 cos(2π T / 400) + 0.0095 dips below zero for 2·(400/2π)·acos(0.95) ≈ 40 K around T = 200 K:
    # rows every 150 K are all positive, the two roots lie between 150 and 300 K
    def dg(t):
        return 0.01 * np.cos(2 * np.pi * t / 400.0) + 0.0095

    def ds(t):          # −d ΔG/dT
        return 0.01 * 2 * np.pi / 400.0 * np.sin(2 * np.pi * t / 400.0)
    t = np.arange(0.0, 451.0, 150.0)
    assert np.all(dg(t) > 0)
    found = brackets(t, dg(t), ds(t), lambda x: float(dg(x)))
    roots = sorted(refine(a, b, lambda x: float(dg(x)))[0] for a, b, hidden in found)
    half = 400.0 / (2 * np.pi) * np.arccos(0.95)
    assert [h for _, _, h in found] == [True, True]
    np.testing.assert_allclose(roots, [200.0 - half, 200.0 + half], atol=1e-8)


def test_a_step_clear_of_zero_costs_no_exact_evaluation():
    t = np.linspace(0.0, 1000.0, 101)
    calls = []
    out = brackets(t, 1.0 + 1e-6 * (t - 500.0) ** 2, -2e-6 * (t - 500.0), lambda x: calls.append(x) or 1.0)
    assert out == [] and calls == []


def test_hermite_root_and_brent_agree_with_the_closed_form():
    # ΔG = (T − 333.3)·(1 + T/1000)·1e-4 on a 10 K grid: the cubic through values and slopes is within h⁴
    root_true = 333.3
    t = np.arange(0.0, 1001.0, 10.0)
    dg = (t - root_true) * (1 + t / 1000.0) * 1e-4
    ds = -((1 + t / 1000.0) + (t - root_true) / 1000.0) * 1e-4
    [(low, high, hidden)] = brackets(t, dg, ds, None)
    root, ok = hermite_root(t, dg, ds, low, high)
    assert ok and not hidden and root == pytest.approx(root_true, abs=1e-6)
    exact, converged, width = refine(low, high, lambda x: (x - root_true) * (1 + x / 1000.0) * 1e-4)
    assert converged and width == 10.0 and exact == pytest.approx(root_true, abs=1e-8)
