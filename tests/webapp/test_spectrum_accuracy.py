"""The Spectrum page's error-breakdown lines (thin display over thermo.accuracy)."""

from __future__ import annotations

import numpy as np

from tests.spectra import dos_text
from thermo import load_dos
from webapp.pages.spectrum import ACCURACY_TEMPERATURES, accuracy_items


def _lines(dos):
    return [(kind, text) for kind, text in accuracy_items(dos) if text.startswith("error estimate")]


def test_clean_debye_dos_shows_both_parts_without_flags():
    # Exact Debye DOS (Debye 1912) on a fine grid: both parts far below 1 %.
    nu = np.linspace(0.0, 8.0, 4001)
    lines = _lines(load_dos(dos_text(nu, 9 * nu ** 2 / 512), atoms=1))
    assert len(lines) == 2 * len(ACCURACY_TEMPERATURES)
    assert all("numerical" in t and "low-frequency" in t for _, t in lines)
    assert all(kind == "info" for kind, _ in lines)


def test_noisy_low_frequency_dos_flags_the_low_temperature_rows():
    # 10 % noise on the DOS: the spread of plausible windows exceeds 1 % at 5 K.
    rng = np.random.default_rng(3)
    nu = np.arange(0.0, 8.0001, 0.02)
    g = 9 * nu ** 2 / 512 * (1 + 0.1 * rng.standard_normal(nu.size))
    lines = _lines(load_dos(dos_text(nu, np.clip(g, 0, None)), atoms=1))
    flagged = [t for kind, t in lines if kind == "warn"]
    assert any("(5 K)" in t for t in flagged)
    assert not any("(298.15 K)" in t for t in flagged)
