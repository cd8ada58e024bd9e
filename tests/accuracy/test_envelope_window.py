"""The smearing part's envelope over T/ENVELOPE … T·ENVELOPE without a temperature × grid array (issue 26):
at 10⁶ temperatures the dense mask needed 931 GiB.  Checked against the plain per-window maximum (numpy)."""

from __future__ import annotations

import numpy as np

from thermo.accuracy.resolution import window_max


def test_window_max_equals_the_plain_maximum_of_each_window():
    rng = np.random.default_rng(26)
    for size in (1, 2, 3, 8, 9, 257, 4000):
        values = rng.normal(size=size)
        lo = rng.integers(0, size, 500)
        hi = np.array([rng.integers(a + 1, size + 1) for a in lo])
        plain = np.array([values[a:b].max() for a, b in zip(lo, hi)])
        assert np.array_equal(window_max(values, lo, hi), plain)


def test_envelope_of_a_million_temperatures_uses_linear_memory():
    # windows of a geometric grid as the error estimate builds them; a dense mask would need 10¹² booleans
    aux = np.geomspace(0.1, 1e6, 1_000_000)
    values = np.sin(np.log(aux) * 7.0)
    lo = np.searchsorted(aux, aux / 1.5, side="left")
    hi = np.searchsorted(aux, aux * 1.5, side="right")
    out = window_max(values, lo, hi)
    sample = np.arange(0, aux.size, 99_991)
    assert np.array_equal(out[sample], [values[lo[j]:hi[j]].max() for j in sample])
