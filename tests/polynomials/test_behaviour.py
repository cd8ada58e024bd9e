"""Behaviour of the fits that a database user relies on: resampling stability, range checks, reference state.

Spectra are synthetic (tests/spectra.py, invented).  Reference for the
resampling check: the same harmonic table recomputed on half the DOS grid
(`thermo.tables.estimated_relative_error` gives the size of that change).
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from tests.spectra import band_plus_peaks
from thermo.errors import OptionError
from thermo.polynomials import fit_polynomial, harmonic_source, heat_capacity_source
from thermo.tables import estimated_relative_error

T = np.array([300.0, 500.0, 800.0, 1200.0, 1500.0])


@pytest.mark.parametrize("form", ["shomate", "nasa7", "sgte"])
def test_a_resampled_dos_gives_the_same_polynomial(form):
    dos = band_plus_peaks(4.0, [9.0])
    keep = np.arange(0, dos.frequency_thz.size, 2)
    coarse = dataclasses.replace(dos, frequency_thz=dos.frequency_thz[keep], dos=dos.dos[keep])
    change = estimated_relative_error(dos, T)
    a = fit_polynomial(harmonic_source(dos, 298.15, 1500.0), form).properties(T)
    b = fit_polynomial(harmonic_source(coarse, 298.15, 1500.0), form).properties(T)
    for key in ("heat_capacity_p", "entropy"):
        # the fit moves no more than the table itself (plus a small margin), and the midpoint does not move
        assert np.max(np.abs(b[key] / a[key] - 1)) <= 3 * change + 1e-7


def test_evaluation_outside_the_range_is_refused_in_one_line():
    t = np.linspace(250.0, 1200.0, 60)
    fit = fit_polynomial(heat_capacity_source(t, 24.0 + 0.004 * t, entropy_298=40.0), "shomate", (298.15, 1000.0))
    with pytest.raises(OptionError, match="leave the fitted range 298.15–1000 K"):
        fit.evaluate([1200.0])
    assert fit.evaluate([1200.0], extrapolate=True).shape == (1, 6)


def test_range_above_298_anchors_at_its_first_point_and_says_so():
    t = np.linspace(250.0, 1600.0, 271)
    cp = 24.0 + 0.004 * t
    src = heat_capacity_source(t, cp, entropy_298=40.0)
    fit = fit_polynomial(src, "nasa7", (500.0, 1500.0), formation_enthalpy=-10.0)
    assert fit.reference_temperature_K == 500.0
    assert any("298.15 K is outside the range" in w for w in fit.warnings)
    # C_p is linear in T, so H and S at 298.15 K (extrapolated) are exact: H = ΔfH, S = 40
    p = fit.properties([298.15], extrapolate=True)
    assert float(p["enthalpy"][0]) == pytest.approx(-10.0e3, abs=0.05)
    assert float(p["entropy"][0]) == pytest.approx(40.0, abs=1e-3)


def test_calorimetry_like_table_with_entropy_column_is_used_as_given():
    # third-law S given beside C_p: the fit's S at 298.15 K is the table's
    t = np.linspace(200.0, 1000.0, 81)
    cp = 20.0 + 0.01 * t
    s = 30.0 + 20.0 * np.log(t / 298.15) + 0.01 * (t - 298.15)
    fit = fit_polynomial(heat_capacity_source(t, cp, entropy=s), "sgte", (298.15, 1000.0))
    # 298.15 K is not a table point: S there comes from a cubic spline of the column (1e-6)
    assert float(fit.properties([298.15])["entropy"][0]) == pytest.approx(30.0, abs=1e-6)
    assert fit.errors["entropy"]["max_relative"] < 1e-8


@pytest.mark.parametrize("kwargs, text", [
    (dict(form="virial"), "unknown polynomial form"),
    (dict(t_range=(1000.0, 500.0)), "0 < LO < HI"),
    (dict(form="nasa7", t_mid=100.0), "must lie inside"),
    (dict(t_range=(298.15, 299.0)), "at least 8 needed"),
])
def test_bad_settings_are_one_line_errors(kwargs, text):
    t = np.linspace(250.0, 1200.0, 60)
    src = heat_capacity_source(t, 24.0 + 0.004 * t, entropy_298=40.0)
    with pytest.raises(OptionError, match=text):
        fit_polynomial(src, **kwargs)
