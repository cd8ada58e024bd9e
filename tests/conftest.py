"""Shared fixtures of the test suite; the spectra themselves live in tests/spectra.py."""

from __future__ import annotations

import pytest

from tests.spectra import debye_table, dos_text


@pytest.fixture
def debye_text():
    def make(theta_k=400.0, atoms=1, points=2001):
        return dos_text(*debye_table(theta_k, atoms, points))
    return make
