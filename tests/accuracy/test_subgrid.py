"""The breakdown over many temperatures (parts on a sub-grid in ln T, thermo/accuracy/subgrid.py) never
reports less than the breakdown evaluated at every temperature: per row and part, in the summary's
maxima and in the table's largest relative error.

Cases: the spring-model test crystals of tests/crystal.py (an 8³ Gaussian-smeared coarse mesh, a 12³
histogram, a 16³ mode list) and a clean Debye ν² spectrum (Debye, Ann. Phys. 39, 789 (1912): g ∝ ν² up to
the cut-off), with and without T = 0 rows.  Reference: the same breakdown with the sub-grid switched off.
"""

import numpy as np
import pytest

from tests import crystal as C
from thermo import load_dos
from thermo.accuracy import subgrid
from thermo.accuracy.breakdown import PARTS, QUANTITIES, breakdown_summary, error_breakdown, error_column, \
    estimated_relative_error

#: 40,000 temperatures 0.5 … 2000 K, a grid starting at 0 K, and one to 10⁵ K (where C_v's numerical part
#: is the rounding noise of two tables).
GRIDS = {"0.5-2000K": np.linspace(0.5, 2000.0, 40_000), "0-1500K": np.arange(0.0, 1500.0, 0.05),
         "0.5-1e5K": np.linspace(0.5, 1e5, 40_000)}


def _clean():
    nu = np.linspace(0.0, 6.0, 601)
    return load_dos("# THz\n" + "\n".join(f"{a} {9 * a * a / 216}" for a in nu), atoms=1)


def _case(name):
    if name == "coarse-8-gaussian":
        return load_dos(C.dos_text(*C.gaussian_dos(C.BCC, 8, 0.12)), atoms=1)
    if name == "histogram-12":
        return load_dos(C.dos_text(*C.histogram_dos(C.FCC, 12, 0.05, gamma=True), unit="meV"), atoms=1)
    if name == "mode-list-16":
        return load_dos(C.mode_list_text(C.BCC, 16), atoms=1)
    return _clean()


CASES = ("coarse-8-gaussian", "histogram-12", "mode-list-16", "clean-debye")


@pytest.mark.parametrize("grid", sorted(GRIDS))
@pytest.mark.parametrize("case", CASES)
def test_sub_grid_breakdown_never_below_the_full_one(case, grid, monkeypatch):
    t = GRIDS[grid]
    assert subgrid.sub_grid(t) is not None and subgrid.sub_grid(t).size < t.size / 2
    fast = error_breakdown(_case(case), t)
    monkeypatch.setattr(subgrid, "EXACT_TEMPERATURES", 10 ** 9)
    assert subgrid.sub_grid(t) is None
    full = error_breakdown(_case(case), t)
    assert list(fast.columns) == list(full.columns)
    for key in QUANTITIES:
        for part in PARTS:
            a, b = fast[error_column(key, part)].to_numpy(), full[error_column(key, part)].to_numpy()
            assert np.all(a >= b), (key, part, float(np.max(b - a)), float(t[np.argmax(b - a)]))
            # and not much more where the full grid samples at least as densely as the sub-grid (below, its
            # own steps sample a window's largest value more coarsely than the sub-grid's 0.1 %; near the top
            # the windows reach past the grid, where both sample at the same 60 points)
            dense = (np.gradient(t) / np.maximum(t, 1e-300) <= subgrid.STEP) & (t <= t.max() / 1.5)
            rel_a, rel_b = (fast[error_column(key, part, True)].to_numpy()[dense],
                            full[error_column(key, part, True)].to_numpy()[dense])
            worst = np.argmax(rel_a - 1.05 * rel_b)
            assert np.all(rel_a <= 1.05 * rel_b + 1e-6), (key, part, float(rel_a[worst]), float(rel_b[worst]),
                                                          float(t[dense][worst]))
    assert estimated_relative_error(None, t, fast) >= estimated_relative_error(None, t, full)
    s_fast, s_full = breakdown_summary(fast), breakdown_summary(full)
    for key in QUANTITIES:
        for part in s_full[key]:
            assert s_fast[key][part]["max_relative"] >= s_full[key][part]["max_relative"]
            assert s_fast[key][part]["max_absolute"] >= s_full[key][part]["max_absolute"]
    assert set(s_full["error_flagged_temperatures_K"]) <= set(s_fast["error_flagged_temperatures_K"])
    assert set(s_full["flagged_temperatures_K"]) <= set(s_fast["flagged_temperatures_K"])


def test_values_are_those_of_every_temperature():
    t = GRIDS["0.5-2000K"]
    dos = _clean()
    b = error_breakdown(dos, t)
    from thermo.tables import tabulate
    table = tabulate(dos, t)
    assert np.array_equal(b["entropy_J_per_mol_K"].to_numpy(), table["entropy_J_per_mol_K"].to_numpy())


def test_small_grids_are_evaluated_at_every_temperature():
    assert subgrid.sub_grid(np.linspace(1.0, 1000.0, 20_000)) is None       # the pages' budget
    assert subgrid.sub_grid(np.geomspace(1.0, 1e5, 22_000)) is None         # not fewer nodes than half
