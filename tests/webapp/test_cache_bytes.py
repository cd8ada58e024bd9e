"""The dashboard's result caches are bounded by bytes, not only by entry count.

Invented test data: Debye ν² spectra of many points (the size is what matters here).
"""

import numpy as np
import pytest

from webapp import cache, session


def _dataset(k, points=60_000):
    nu = np.linspace(0.0, 5.0 + k / 100, points)
    text = "# frequency (THz) dos\n" + "\n".join(f"{a:.9g} {9 * a * a / nu[-1] ** 3:.9g}" for a in nu) + "\n"
    return session.new_dataset(f"big{k}.dat", text.encode())


@pytest.fixture
def small_budget():
    for c in cache.CACHES:
        c.resize(8e6)            # 8 MB for all caches together
    yield 8e6
    for c in cache.CACHES:
        c.resize()


def test_twelve_large_uploads_stay_within_the_byte_budget(small_budget):
    doses = [cache.load(_dataset(k)) for k in range(12)]
    arrays = doses[-1].frequency_thz.nbytes + doses[-1].dos.nbytes + doses[-1].input_frequency_thz.nbytes
    assert cache.held_bytes(doses[-1]) >= arrays          # the measure sees the arrays
    assert 12 * arrays > small_budget                      # without a byte bound they would not fit
    assert cache.held_total() <= small_budget
    assert cache._DOS_CACHE.held <= 0.45 * small_budget
    assert len(cache._DOS_CACHE._data) >= 1               # still caching what fits


def test_entry_larger_than_the_budget_is_computed_but_not_kept(small_budget):
    for c in cache.CACHES:
        c.resize(1e4)
    dos = cache.load(_dataset(99, points=20_000))
    assert dos.atoms == 1 and cache._DOS_CACHE.held == 0
