"""Resource checks (marker ``budget``, ``make test-budget``; ``make test`` skips them): each page callback and
CLI command at its documented maximum (docs/limits.md) stays within 1 GB of peak RSS above its start and 10 s.

Each case runs in a fresh process (bench/limits.py, the same code as bench figure P18).
"""

from __future__ import annotations

import pytest

from bench.limits import CASES, GOAL_RSS_MB, GOAL_SECONDS, REFUSED, run_case

pytestmark = pytest.mark.budget


@pytest.fixture(scope="module")
def folder(tmp_path_factory):
    return str(tmp_path_factory.mktemp("limits"))


@pytest.mark.parametrize("case", CASES)
def test_case_within_memory_and_time_at_its_maximum(case, folder):
    r = run_case(case, folder)
    print(r)
    if case in REFUSED:
        assert "at most" in r["failed"]             # refused with the budget named, before computing
    else:
        assert r["failed"] == ""
    assert r["peak_rss_mb"] <= GOAL_RSS_MB
    assert r["seconds"] <= GOAL_SECONDS
