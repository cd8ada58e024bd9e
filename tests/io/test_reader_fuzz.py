"""Property-based fuzzing of read_table + check_spectrum with hypothesis.

Property: for any input, the pair either returns objects or raises
DosInputError whose message is one line; no other exception escapes.
"""

from __future__ import annotations

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from thermo.errors import DosInputError
from thermo.io.readers import RawTable, read_table
from thermo.preparation.validation import CleanSpectrum, check_spectrum

FUZZ = settings(max_examples=300, deadline=None,
                suppress_health_check=[HealthCheck.too_slow])

TOKENS = st.sampled_from(
    list("0123456789") + [" ", "\t", ",", ";", "-", "+", "e", "E", ".", "nan", "inf",
                          "\n", "\r\n", "#", "%", "!", "\ufeff", "d", "1e999", "abc"])


def _check(source):
    try:
        raw = read_table(source, name="fuzz")
        assert isinstance(raw, RawTable)
        assert raw.data.ndim == 2 and raw.data.shape[1] >= 2
        assert np.all(np.isfinite(raw.data))
        assert len(raw.line_numbers) == raw.data.shape[0]
        spec = check_spectrum(raw)
        assert isinstance(spec, CleanSpectrum)
        assert np.all(spec.frequency[1:] > spec.frequency[:-1]) and np.all(spec.total >= 0)
    except DosInputError as exc:
        assert "\n" not in str(exc) and "\r" not in str(exc)
        assert str(exc).startswith("fuzz")


@FUZZ
@given(st.binary(max_size=400))
def test_any_bytes(content):
    _check(content)


@FUZZ
@given(st.binary(max_size=200))
def test_any_bytes_behind_zip_signature(content):
    _check(b"PK\x03\x04" + content)


@FUZZ
@given(st.lists(TOKENS, max_size=200).map("".join))
def test_number_like_text(text):
    _check(text.encode("utf-8"))
    _check(text + "\n")


@FUZZ
@given(st.lists(st.lists(st.floats(allow_nan=False, allow_infinity=False, width=64),
                         min_size=2, max_size=4), min_size=1, max_size=30),
       st.sampled_from([" ", "\t", ",", ";"]))
def test_numeric_tables_read_back_exactly(rows, sep):
    width = len(rows[0])
    rows = [r[:width] + [0.0] * (width - len(r)) for r in rows]
    text = "".join(sep.join(repr(v) for v in r) + "\n" for r in rows)
    raw = read_table(text)
    np.testing.assert_array_equal(raw.data, np.array(rows))
    _check(text)


@FUZZ
@given(st.lists(st.tuples(st.floats(1e-6, 1e3), st.floats(-1e3, 1e3)),
                min_size=10, max_size=40),
       st.floats(0.0, 0.1))
def test_sorted_tables_with_negative_values(steps, noise):
    nu = [float(v) for v in np.cumsum([s for s, _ in steps])]
    g = np.array([float(v) for _, v in steps])
    text = "".join(f"{a!r}\t{b!r}\n" for a, b in zip(nu, g.tolist()))
    try:
        spec = check_spectrum(read_table(text, name="fuzz"), negative_noise=noise)
    except DosInputError as exc:
        assert "\n" not in str(exc)
        # an error here must be about a negative value beyond the noise level
        assert "negative DOS value" in str(exc) or "zero everywhere" in str(exc)
        assert g.min() < -noise * max(g.max(), 0.0) or g.max() <= 0
        return
    assert np.all(spec.total >= 0)
    clipped = int(np.sum(g < 0))
    clip_notes = [w for w in spec.warnings if w.startswith("clipped")]   # other notes (holes) may appear too
    assert (clipped == 0) == (clip_notes == [])
