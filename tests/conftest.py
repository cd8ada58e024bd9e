"""Shared fixtures of the test suite; the spectra themselves live in tests/spectra.py."""

from __future__ import annotations

import pytest
from hypothesis import settings

from tests.spectra import debye_table, dos_text

# Property tests draw the same examples on every machine (CI must not pass or fail by luck);
# the seeded generators in the fuzz tests are fixed as well.
settings.register_profile("modeheat", derandomize=True, database=None)
settings.load_profile("modeheat")


@pytest.fixture
def debye_text():
    def make(theta_k=400.0, atoms=1, points=2001):
        return dos_text(*debye_table(theta_k, atoms, points))
    return make


@pytest.fixture(autouse=True)
def _mpmath_precision_is_restored():
    """A test that sets mpmath's working precision does so for itself only.

    ``mp.mp.dps`` is process-wide: a reference helper that lowers it would otherwise
    change the precision of every later test's reference (seen as an order-dependent failure).
    """
    import mpmath

    saved = mpmath.mp.dps
    yield
    mpmath.mp.dps = saved


def pytest_collection_modifyitems(config, items):
    """Long runs (marker ``slow``) first: on several workers (``make test``: ``-n 2 --dist worksteal``)
    a long test started last would leave the other worker idle at the end."""
    items.sort(key=lambda item: item.get_closest_marker("slow") is None)
