"""Every CLI output on ``sample_dos/`` equals the pinned reference (see reference_cases).

Text must be identical; numbers must agree to one unit in their eighth
significant digit.  That is the precision every export carries
(:data:`thermo.io.writers.DEFAULT_DIGITS` = 8): a value a hair from a rounding
boundary flips its last printed digit when the machine changes (the last binary
digits of a sum depend on the CPU's vector width and the BLAS build; a fitted θ
converges only to its solver tolerance and moved by 4e-9 relative between two
machines, flipping the last digit of 20 numbers of one table).  A unit in the
eighth digit is 1e-8 to 1e-7 relative: inside the solver tolerance of the
full-precision fitted values in the JSON reports, and far below any change of
behaviour, which must fail (see ``test_comparison_can_fail``).
"""

import math
import re

import pytest

from thermo.io.writers import DEFAULT_DIGITS

from .reference_cases import CASES, SAMPLES, reference_path, run_case

_NUMBER = re.compile(r"[-+]?(?:\d+\.\d*|\.\d+|\d+)(?:[eE][-+]?\d+)?")


def last_digit_unit(x: float, y: float) -> float:
    """One unit in the :data:`DEFAULT_DIGITS`-th significant digit of the larger magnitude."""
    top = max(abs(x), abs(y))
    return 0.0 if top == 0 else 10.0 ** (math.floor(math.log10(top)) - (DEFAULT_DIGITS - 1))


def assert_same_output(got: str, expected: str) -> None:
    assert _NUMBER.sub("#", got) == _NUMBER.sub("#", expected), "non-numeric text changed"
    tokens_a, tokens_b = _NUMBER.findall(got), _NUMBER.findall(expected)
    a, b = [float(x) for x in tokens_a], [float(x) for x in tokens_b]
    assert len(a) == len(b)
    for i, (x, y) in enumerate(zip(a, b)):
        if not (math.isfinite(x) and math.isfinite(y)):    # hex digits of a SHA-256 such as '8826e3787'
            assert tokens_a[i] == tokens_b[i], f"number {i}: {tokens_a[i]!r} != {tokens_b[i]!r}"
            continue
        assert abs(x - y) <= last_digit_unit(x, y) * (1 + 1e-6), f"number {i}: {x!r} != {y!r}"


def test_comparison_can_fail():
    # the case seen on another machine: the last of 8 digits flips -> same output
    assert_same_output("C 5.2782687", "C 5.2782688")
    assert_same_output("theta 412.34567891234567", "theta 412.34567892901234")   # 4e-11 relative
    assert_same_output("sha 8826e3787", "sha 8826e3787")             # hex digits read as an infinite number
    for got, expected in [("C 5.2782687", "C 5.2782690"),     # three units in the last digit
                          ("sha 8826e3787", "sha 8826e3788"),
                          ("C 1.000001", "C 1.0"), ("atoms 2", "atoms 3"), ("x 0", "x 1e-20"),
                          ("Cv 1.0", "S 1.0")]:
        with pytest.raises(AssertionError):
            assert_same_output(got, expected)


def test_every_sample_has_references():
    assert len(SAMPLES) >= 4
    for sample in SAMPLES:
        for case, _ in CASES:
            assert reference_path(sample, case).exists(), f"{sample.name} {case}: no reference output"


@pytest.mark.parametrize("case,args", CASES, ids=[c for c, _ in CASES])
@pytest.mark.parametrize("sample", SAMPLES, ids=[s.name for s in SAMPLES])
def test_cli_output_unchanged(sample, case, args):
    expected = reference_path(sample, case).read_text(encoding="utf-8")
    got = run_case(sample, args)
    assert got.startswith("exit 0\n")
    assert_same_output(got, expected)
