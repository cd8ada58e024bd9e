"""The shared synthetic spectra are checked against closed forms so that the other tests can trust them."""

from __future__ import annotations

import pytest

from tests.spectra import band_plus_peaks, debye_spectrum, peak_dos


def test_synthetic_spectra_carry_3n_modes():
    # ∫ 9n ν²/ν_D³ dν = 3n, and a normalised Gaussian carries its stated modes (closed forms).
    assert debye_spectrum(5.0, atoms=2).mode_count == pytest.approx(6.0, rel=1e-12)
    assert peak_dos(5.0).mode_count == pytest.approx(3.0, rel=1e-9)
    assert band_plus_peaks(3.0, [6.0, 9.0]).mode_count == pytest.approx(9.0, rel=1e-7)
