"""Every CLI output on ``sample_dos/`` equals the pinned reference (see reference_cases).

Text must be identical; numbers must agree to 1e-8 relative.  Exact byte
equality of 17-digit floats does not survive a change of machine: the last
binary digits of a sum depend on the CPU's vector width and the BLAS build, and
fitted model parameters (root finding, least squares) converge only to their
solver tolerance, where such differences show at ~1e-10.  Numbers are compared
as numbers, everything else character by character.
"""

import re

import pytest

from .reference_cases import CASES, SAMPLES, reference_path, run_case

_NUMBER = re.compile(r"[-+]?(?:\d+\.\d*|\.\d+|\d+)(?:[eE][-+]?\d+)?")
RTOL = 1e-8


def assert_same_output(got: str, expected: str) -> None:
    assert _NUMBER.sub("#", got) == _NUMBER.sub("#", expected), "non-numeric text changed"
    a = [float(x) for x in _NUMBER.findall(got)]
    b = [float(x) for x in _NUMBER.findall(expected)]
    assert len(a) == len(b)
    for i, (x, y) in enumerate(zip(a, b)):
        assert abs(x - y) <= RTOL * max(abs(x), abs(y)) + 1e-300, f"number {i}: {x!r} != {y!r}"


def test_comparison_can_fail():
    with pytest.raises(AssertionError):
        assert_same_output("C 1.0000001", "C 1.0")
    with pytest.raises(AssertionError):
        assert_same_output("Cv 1.0", "S 1.0")
    assert_same_output("C 1.00000000000000001", "C 1.0")


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
