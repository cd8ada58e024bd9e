"""Fuzzing the whole path file -> load_dos -> tabulate with malformed and extreme inputs.

A seeded generator of our own (12,000 inputs: random bytes, other encodings,
NaN/inf/1e308/1e-320, huge integers, ragged rows, formula-like strings, units
and scale factors far out, broken and oversize .xlsx) plus hypothesis.  For
every input the result is either our own one-line error (``ModeheatError``)
or a DOS whose table is finite and physical:

* C_v <= 3nR — common practice (Dulong–Petit limit of a harmonic lattice),
  with R from scipy.constants (CODATA);
* at most :data:`thermo.preparation.atoms.MAX_ATOMS` atoms per formula unit;
* no warning of numpy or any other library (the test turns warnings into errors).
"""

from __future__ import annotations

import io
import random
import warnings
import zipfile

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from scipy import constants as sc

from thermo import load_dos, tabulate
from thermo.columns import column_name
from thermo.errors import ModeheatError, ModeheatWarning
from thermo.preparation.atoms import MAX_ATOMS

SEED = 20261203
N_GENERATED = 12_000
TEMPERATURES = [0.0, 1.0, 10.0, 300.0, 3000.0]
UNITS = ["THz", "cm-1", "meV", "rad/s", "K"]
EXTREMES = ["nan", "inf", "-inf", "1e308", "-1e308", "1.7976931348623157e308", "1e-320", "4.9e-324", "1e-300",
            "1" * 400, "-" + "9" * 330, "0", "-0", "1d300", "1D-320", "=1+1", "+2", "@SUM(A1)", "-3", "\t4",
            "1,5", "0x10", "", "\"1\"", "1e", ".", "1e99999"]
C_V = column_name("heat_capacity_v")


def _spectrum(rng, n):
    nu = np.cumsum([rng.uniform(1e-3, 1.0) for _ in range(n)]) + rng.choice([0.0, -0.5, 1.0])
    g = nu.clip(0) ** 2 * rng.uniform(0.01, 2.0)
    return nu, g


def _text(rng):
    """One malformed or extreme DOS text of our own making."""
    n = rng.randint(8, 80)
    mild = rng.random() < 0.4            # near-valid files, so the accept path is fuzzed too
    nu, g = _spectrum(rng, n)
    if mild and g.any():                  # normalised to 3n modes, as a real file would be
        g = g * 3 * rng.randint(1, 5) / np.trapezoid(g, nu)
    scale_nu = 1.0 if mild else 10.0 ** rng.choice([0, 0, 0, 3, 6, 12, 100, 200, 300, -3, -12, -100, -300])
    scale_g = 10.0 ** rng.choice([0, 0, 0, 0, 5, -30]) if mild else \
        10.0 ** rng.choice([0, 0, 0, 5, 30, 100, 300, 307, -30, -100, -300, -318])
    with np.errstate(all="ignore"):
        rows = [[repr(float(a * scale_nu)), repr(float(b * scale_g))] for a, b in zip(nu, g)]
    for _ in range(0 if mild else rng.choice([0, 0, 1, 2, 5])):      # extreme or malformed cells
        row = rng.randrange(n)
        rows[row][rng.randrange(2)] = rng.choice(EXTREMES)
    if rng.random() < 0.1:                              # ragged rows
        rows[rng.randrange(n)].append(rng.choice(EXTREMES + ["1.0"]))
    if rng.random() < 0.15:                             # a partial column
        for row in rows:
            row.append(rng.choice([row[1], "0", "1e308", "-1"]))
    sep = rng.choice([" ", "\t", ",", ";", "  "])
    head = "# frequency (THz) dos" if mild else rng.choice(["# frequency (THz) dos", "# nu (cm-1)", "=HYPERLINK(\"x\")\t+dos", "freq,total,@x",
                       "# frequency (meV)", "", "% rad/s", "frequency total"])
    text = head + "\n" + "\n".join(sep.join(r) for r in rows) + rng.choice(["\n", "", "\r\n", "\n"] * 3 + ["\n\n\x00"])
    return text


def _bytes(rng):
    kind = rng.randrange(8)
    if kind == 0:
        return bytes(rng.randrange(256) for _ in range(rng.randrange(1, 300)))
    text = _text(rng)
    if kind == 1:
        return text.encode(rng.choice(["utf-16", "utf-32", "latin-1", "cp1252"]), "replace")
    if kind == 2:
        return b"PK\x03\x04" + bytes(rng.randrange(256) for _ in range(rng.randrange(200)))
    if kind == 3:
        return _xlsx(rng, text)
    return text.encode("utf-8", "replace")


def _xlsx(rng, text):
    """A real workbook of the text's cells, then perhaps truncated or flipped."""
    import openpyxl
    from openpyxl.cell.cell import ILLEGAL_CHARACTERS_RE

    book = openpyxl.Workbook()
    sheet = book.active
    for line in ILLEGAL_CHARACTERS_RE.sub("", text).splitlines():
        cells = line.replace(",", " ").replace(";", " ").split()
        sheet.append([float(c) if _floaty(c) else c for c in cells])
    buf = io.BytesIO()
    book.save(buf)
    raw = bytearray(buf.getvalue())
    damage = rng.randrange(4)
    if damage == 1:
        raw = raw[: rng.randrange(len(raw))]
    elif damage == 2:
        for _ in range(5):
            raw[rng.randrange(len(raw))] ^= 0xFF
    return bytes(raw)


def _floaty(cell):
    try:
        float(cell)
        return True
    except ValueError:
        return False


def _options(rng):
    return {"freq_unit": rng.choice(UNITS + [None] * 5),
            "atoms": rng.choice([None, None, None, 1, 2, 3, 10 ** 30, 0, -1, MAX_ATOMS + 1]),
            "negative": rng.choice(["drop", "keep-count", "refuse"]),
            "low_frequency": rng.choice(["auto"] * 8 + ["off"] * 3 + ["0:inf", "0:1e300", "0.1:2", "nan:1", (0.0, 0.5)])}


TABLES = [-1]   # index of the last input that gave a table (for counting)


def check_one(source, options, index=0):
    """``None`` when the input ends in our error or a physical table; else a description of the failure."""
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("error")
            warnings.simplefilter("ignore", ModeheatWarning)   # our own one-line warnings are fine
            try:
                dos = load_dos(source, name="fuzz.dat", **options)
            except ModeheatError as exc:
                text = str(exc)
                return None if text and "\n" not in text else f"error message not one line: {text!r}"
            table = tabulate(dos, TEMPERATURES)
    except ModeheatError as exc:
        return None if "\n" not in str(exc) else f"error message not one line: {exc!s}"
    except Exception as exc:   # noqa: BLE001 - any other type is the failure this test looks for
        return f"{type(exc).__name__}: {exc}"
    TABLES.append(index)
    values = table.to_numpy(dtype=float)
    if not np.isfinite(values).all():
        return "non-finite value in the table"
    if not 1 <= dos.atoms <= MAX_ATOMS:
        return f"atom count {dos.atoms}"
    limit = 3 * dos.atoms * sc.R
    if (table[C_V].to_numpy() > limit * (1 + 1e-9)).any() or (table[C_V].to_numpy() < -1e-9).any():
        return f"C_v outside 0..3nR: {table[C_V].max()} > {limit}"
    return None


@pytest.mark.slow   # full size; make test runs it (-m 'not slow' for a quick local loop)
def test_seeded_generator_12000_inputs():
    rng = random.Random(SEED)
    failures, accepted = [], 0
    for k in range(N_GENERATED):
        source = _bytes(rng) if rng.random() < 0.5 else _text(rng)
        if isinstance(source, str) and "\n" not in source and "\r" not in source:
            source += "\n"       # text input must be text, not a path
        options = _options(rng)
        problem = check_one(source, options, k)
        if problem:
            failures.append((k, problem, options))
        accepted += problem is None and TABLES[-1] == k
    assert not failures, f"{len(failures)} of {N_GENERATED} inputs failed, first: {failures[:3]}"
    assert accepted >= 500     # the accept path is exercised too, not only refusals


cells = st.one_of(st.floats(allow_nan=True, allow_infinity=True), st.sampled_from(EXTREMES),
                  st.integers(min_value=-10 ** 400, max_value=10 ** 400).map(str))


@settings(max_examples=400, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(rows=st.lists(st.lists(cells, min_size=1, max_size=4), min_size=1, max_size=30),
       unit=st.sampled_from(UNITS), atoms=st.one_of(st.none(), st.integers(-2, 20_000)))
def test_hypothesis_tables_of_extreme_cells(rows, unit, atoms):
    text = "\n".join(" ".join(str(c) for c in row) for row in rows) + "\n"
    assert check_one(text, {"freq_unit": unit, "atoms": atoms}) is None


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(scale_nu=st.floats(1e-310, 1e308), scale_g=st.floats(1e-320, 1e308), unit=st.sampled_from(UNITS),
       atoms=st.one_of(st.none(), st.integers(1, 4)))
def test_hypothesis_scaled_debye_spectra(scale_nu, scale_g, unit, atoms):
    nu = np.linspace(0.0, 5.0, 60)
    with np.errstate(all="ignore"):
        g = 9 * nu ** 2 / 125 * scale_g
        f = nu * scale_nu
    text = "\n".join(f"{float(a)!r} {float(b)!r}" for a, b in zip(f, g)) + "\n"
    assert check_one(text, {"freq_unit": unit, "atoms": atoms}) is None


@pytest.mark.parametrize("cell", EXTREMES)
def test_each_extreme_cell_is_refused_or_harmless(cell):
    nu = np.linspace(0.0, 5.0, 40)
    rows = [f"{float(a)!r} {9 * a * a / 125!r}" for a in nu]
    rows[7] = f"{float(nu[7])!r} {cell}"
    assert check_one("# frequency (THz) dos\n" + "\n".join(rows) + "\n", {}) is None


@settings(max_examples=300, deadline=None)
@given(temps=st.lists(st.floats(allow_nan=True, allow_infinity=True), min_size=1, max_size=6))
def test_hypothesis_any_temperatures(temps):
    nu = np.linspace(0.0, 1000.0, 60)            # the highest accepted frequency: the hardest case
    text = "# frequency (THz) dos\n" + "\n".join(f"{float(a)!r} {float(9 * a * a / 1e9)!r}" for a in nu) + "\n"
    dos = load_dos(text)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        try:
            table = tabulate(dos, temps)
        except ModeheatError as exc:
            assert "\n" not in str(exc)
            return
    assert np.isfinite(table.to_numpy(dtype=float)).all()
    assert (table[C_V].to_numpy() <= 3 * dos.atoms * sc.R * (1 + 1e-9)).all()
