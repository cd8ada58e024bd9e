"""Property-based fuzzing of the whole pipeline: load_dos then tabulate.

Any table of numbers gives either a DOS whose table is finite, or our own
error type with a one-line message — never another exception, never a
RuntimeWarning (the suite turns those into errors).
"""

from __future__ import annotations

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from thermo import ModeheatError, load_dos, tabulate

finite = st.floats(min_value=-1e3, max_value=1e3, allow_nan=False, allow_infinity=False)


@st.composite
def spectra(draw):
    n = draw(st.integers(min_value=9, max_value=60))
    steps = draw(st.lists(st.floats(min_value=1e-4, max_value=2.0), min_size=n, max_size=n))
    start = draw(st.floats(min_value=-3.0, max_value=1.0))
    nu = start + np.cumsum(steps)
    dos = np.array(draw(st.lists(st.one_of(st.just(0.0), st.floats(min_value=0.0, max_value=50.0)),
                                 min_size=n, max_size=n)))
    if draw(st.integers(min_value=0, max_value=9)) == 0:   # now and then one arbitrary value
        dos[draw(st.integers(min_value=0, max_value=n - 1))] = draw(finite)
    partial = draw(st.booleans())
    cols = [nu, dos] + ([np.abs(dos) / 2] if partial else [])
    return "\n".join(" ".join(repr(float(v)) for v in row) for row in np.column_stack(cols)) + "\n"


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(text=spectra(), atoms=st.one_of(st.none(), st.integers(min_value=1, max_value=4)),
       negative=st.sampled_from(["drop", "keep-count", "refuse"]),
       low=st.sampled_from(["auto", "off"]))
def test_pipeline_returns_finite_table_or_one_line_error(text, atoms, negative, low):
    try:
        dos = load_dos(text, freq_unit="THz", atoms=atoms, negative=negative, low_frequency=low)
    except ModeheatError as exc:
        assert "\n" not in str(exc) and str(exc)
        return
    table = tabulate(dos, [0.0, 0.5, 10.0, 300.0, 5000.0])
    assert np.all(np.isfinite(table.to_numpy()))
    assert dos.mode_count > 0
    assert 0.0 <= dos.source["negative_mode_fraction"] <= 1.0
