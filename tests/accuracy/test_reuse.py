"""The error breakdown kept on a DOS equals a fresh computation, and is computed once.

The breakdown's own correctness is tested with its formulas (tests/preparation);
here only the reuse: same numbers as :func:`error_breakdown` called afresh, no
recomputation for the same DOS and temperatures, a new one for new temperatures.
"""

import numpy as np
import pandas as pd

from thermo import load_dos
from thermo.accuracy import breakdown as breakdown_module
from thermo.accuracy import reuse
from thermo.accuracy.breakdown import breakdown_summary, error_breakdown, estimated_relative_error
from thermo.accuracy.rows import harmonic_row_errors
from thermo.tables import provenance


def _dos():
    nu = np.linspace(0.0, 6.0, 301)
    g = 0.04 * (nu ** 2 + 0.01) * np.exp(-(nu / 5.0) ** 4)       # smeared ν², invented
    return load_dos("# THz\n" + "\n".join(f"{a:.6f} {b:.9g}" for a, b in zip(nu, g)), atoms=1)


def _counting(monkeypatch):
    calls = []
    original = breakdown_module.error_breakdown

    def counted(dos, temperatures):
        calls.append(np.asarray(temperatures).size)
        return original(dos, temperatures)
    monkeypatch.setattr(reuse, "error_breakdown", counted)
    return calls


def test_kept_breakdown_equals_a_fresh_one_and_is_computed_once(monkeypatch):
    dos = _dos()
    t = np.array([0.0, 2.0, 10.0, 50.0, 300.0])
    calls = _counting(monkeypatch)
    first = reuse.table_breakdown(dos, t)
    again = reuse.table_breakdown(dos, list(t))
    assert calls == [t.size]                                  # the second call reused it
    fresh = error_breakdown(_dos(), t)                        # another object, computed afresh
    pd.testing.assert_frame_equal(first, fresh, check_exact=True)
    pd.testing.assert_frame_equal(again, fresh, check_exact=True)
    first.iloc[:, 1] = -1.0                                   # a caller's change does not reach the kept one
    pd.testing.assert_frame_equal(reuse.table_breakdown(dos, t), fresh, check_exact=True)
    reuse.table_breakdown(dos, t[:3])                         # other temperatures: computed for them
    assert calls == [t.size, 3]


def test_provenance_and_row_errors_reuse_the_same_breakdown(monkeypatch):
    dos = _dos()
    t = np.linspace(1.0, 400.0, 9)
    calls = _counting(monkeypatch)
    record = provenance(dos, t)
    rows = harmonic_row_errors(dos, t)
    record_again = provenance(dos, t, per="atom")
    assert calls == [t.size]
    fresh = error_breakdown(_dos(), t)
    assert record["error_breakdown"] == breakdown_summary(fresh)
    assert record_again["error_breakdown"] == breakdown_summary(fresh)
    assert record["estimated_relative_error"] == estimated_relative_error(_dos(), t)
    for key in ("heat_capacity_v", "entropy"):
        expected = sum(fresh[breakdown_module.error_column(key, p)].to_numpy() for p in breakdown_module.PARTS)
        np.testing.assert_array_equal(rows[key], expected)


def test_old_grids_are_dropped_beyond_the_kept_count(monkeypatch):
    dos = _dos()
    calls = _counting(monkeypatch)
    for k in range(reuse.KEEP + 1):
        reuse.table_breakdown(dos, [100.0 + k])
    reuse.table_breakdown(dos, [100.0 + reuse.KEEP])          # newest: kept
    assert len(calls) == reuse.KEEP + 1
    reuse.table_breakdown(dos, [100.0])                       # oldest: dropped, computed again
    assert len(calls) == reuse.KEEP + 2


def test_kept_temperatures_are_bounded(monkeypatch):
    dos = _dos()
    calls = _counting(monkeypatch)
    monkeypatch.setattr(reuse, "KEEP_TEMPERATURES", 5)
    big = np.linspace(10.0, 300.0, 6)                          # over the bound: computed, not kept
    pd.testing.assert_frame_equal(reuse.table_breakdown(dos, big), error_breakdown(_dos(), big), check_exact=True)
    reuse.table_breakdown(dos, big)
    assert len(calls) == 2
    reuse.table_breakdown(dos, [10.0, 20.0, 30.0])
    reuse.table_breakdown(dos, [40.0, 50.0, 60.0])            # 6 > 5 kept: the first grid goes
    reuse.table_breakdown(dos, [40.0, 50.0, 60.0])
    assert len(calls) == 4
    reuse.table_breakdown(dos, [10.0, 20.0, 30.0])
    assert len(calls) == 5


def test_provenance_from_the_kept_digest_equals_one_from_a_fresh_breakdown():
    t = np.linspace(5.0, 800.0, 60)
    fresh = provenance(_dos(), t, breakdown=error_breakdown(_dos(), t))
    dos = _dos()
    first, again = provenance(dos, t), provenance(dos, t)
    for record in (first, again):
        assert record["estimated_relative_error"] == fresh["estimated_relative_error"]
        assert record["error_breakdown"] == fresh["error_breakdown"]
        assert record["warnings"] == fresh["warnings"]
    first["error_breakdown"]["heat_capacity_v"].clear()        # a caller's change stays its own
    assert provenance(dos, t)["error_breakdown"] == fresh["error_breakdown"]


def test_table_with_errors_computes_one_breakdown_at_many_temperatures(monkeypatch, tmp_path):
    # 40,001 temperatures: more than the DOS keeps (reuse.KEEP_TEMPERATURES), so only passing the one
    # breakdown to the error columns and the provenance avoids a second computation (issue 30)
    from thermo.cli.main import main
    path = tmp_path / "dos.dat"
    nu = np.linspace(0.0, 6.0, 301)
    path.write_text("# THz\n" + "\n".join(f"{a:.6f} {0.04 * a * a:.9g}" for a in nu))
    calls = _counting(monkeypatch)
    out = tmp_path / "t.csv"
    assert main(["table", str(path), "--atoms", "1", "--temperatures", "0:4000:0.1", "--errors",
                 "--output", str(out)]) == 0
    assert calls == [40_001]
    assert "entropy_error_J_per_mol_K" in out.read_text().split("\n# ")[-1]
