"""Every CLI output on ``sample_dos/`` equals the pinned reference (see reference_cases)."""

import pytest

from .reference_cases import CASES, SAMPLES, reference_path, run_case


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
    assert got == expected
