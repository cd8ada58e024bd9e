"""Uncertainties of S° and H°−H°(0) that cover the truth (issue 24, issue 25 item 3).

References used here:

* NIST-JANAF Thermochemical Tables (M. W. Chase, J. Phys. Chem. Ref. Data,
  Monograph 9, 1998), crystal phases, via the ``janaf`` package;
* a Debye + Einstein solid (P. Debye, Ann. Phys. 344, 789 (1912); A. Einstein,
  Ann. Phys. 327, 180 (1907)) whose C_v, S and H are integrated by ``mpmath``,
  independent of the project's kernels.
"""

import functools

import mpmath
import numpy as np
import pytest
from scipy import constants as sc

from thermo.calorimetry import HeatCapacityModel, MeasuredHeatCapacity
from thermo.calorimetry.entropy import third_law_from_data
from thermo.calorimetry.report import analyse

from .test_external import GAMMA_FROM_MEMORY

janaf = pytest.importorskip("janaf")

ATOMS = {"Al": 1, "Cu": 1, "ClNa": 2, "MgO": 2}


def _janaf(formula):
    # NIST-JANAF (Chase 1998), crystal phase; NaCl is listed under the formula ClNa.
    df = janaf.search(formula=f"^{formula}$", phase="^cr$").df
    t = df["T(K)"].to_numpy()
    return {"T": t, "Cp": df["Cp"].to_numpy(), "S298": float(df["S"].to_numpy()[t == 298.15][0]),
            # H°(298.15) − H°(0) [kJ/mol]: JANAF lists −[H°(0) − H°(298.15)] in its 0 K row.
            "H298": -float(df["H-H(Tr)"].to_numpy()[t == 0][0])}


@functools.lru_cache(maxsize=None)
def _janaf_report(formula):
    table = _janaf(formula)
    keep = (table["T"] >= 100) & (table["T"] <= 700)
    data = MeasuredHeatCapacity(table["T"][keep], table["Cp"][keep], None, "J/(mol K)", formula)
    metal = formula in GAMMA_FROM_MEMORY
    fixed = {"gamma": GAMMA_FROM_MEMORY[formula]} if metal else {}
    report, _fit, _third = analyse(data, HeatCapacityModel(atoms=ATOMS[formula], electronic=metal), fixed)
    return report, table


@pytest.mark.parametrize("formula", ["Al", "Cu", "ClNa", "MgO"])
@pytest.mark.parametrize("route", ["model", "data"])
def test_janaf_crystals_from_100_K_within_two_uncertainties(formula, route):
    # Issue 24: C_p rows 100-700 K of NIST-JANAF (Chase 1998), γ of the metals held at the handbook
    # values (from memory, see test_external).  Both routes: |S° − JANAF| <= 2u and
    # |H°(298.15) − H°(0) − JANAF| <= 2u (on main the data route missed by 11, 55, 145 u).
    report, table = _janaf_report(formula)
    suffix = "_from_data" if route == "data" else ""
    s = report[f"entropy_298_15{suffix}_J_per_mol_K"]
    h = report[f"enthalpy_298_15_minus_0{suffix}_kJ_per_mol"]
    assert abs(s["value"] - table["S298"]) <= 2 * s["uncertainty"], (s, table["S298"])
    assert abs(h["value"] - table["H298"]) <= 2 * h["uncertainty"], (h, table["H298"])
    # large (the data start at θ_D/3-θ_D/8, and both routes continue them below 100 K), but bounded
    assert s["uncertainty"] < 0.15 * table["S298"]


def test_janaf_copper_data_route_states_the_extrapolated_share():
    # Issue 25 item 3: Cu from 100 K (above θ_D/10 ≈ 32 K): 28.38 ± 0.16 on main against 33.16 in the
    # table.  Now the part below 100 K carries the spread of its forms, the share is stated and the
    # warning names the first point.
    report, table = _janaf_report("Cu")
    below = report["below_first_point"]
    s100 = 10.034                       # NIST-JANAF Cu(cr) S°(100 K) [J/(mol K)]
    assert abs(below["entropy_J_per_mol_K"]["value"] - s100) <= 2 * below["entropy_J_per_mol_K"]["uncertainty"]
    assert below["share_of_entropy_298_15"] == pytest.approx(s100 / table["S298"], abs=0.1)
    assert any("weakly determined" in n and "(100 K)" in n and "% of S°(298.15 K)" in n for n in report["notes"])
    forms = below["forms"]
    assert {"debye T³", "debye", "model"} <= set(forms)


# --- a Debye + Einstein solid: truth by mpmath --------------------------------------------------------

R = sc.R
#: (θ_D of the 3 acoustic modes, θ_E of the 3 optical modes) [K], two atoms per formula unit: a stiff and
#: a soft compound and one whose optical branch lies below the acoustic Debye temperature (invented).
SOLIDS = ((300.0, 400.0), (200.0, 150.0), (400.0, 700.0))
FIRST_POINTS = (10.0, 30.0, 50.0, 100.0)
GRID = np.arange(10.0, 321.0, 5.0)
SEEDS = 100
NOISE = 0.003          # relative standard uncertainty of each point, stated in the file


def _debye_mp(theta, t, kind):
    y = mpmath.mpf(theta) / t
    if kind == "cv":
        return 9 * R / y ** 3 * mpmath.quad(lambda x: x ** 4 * mpmath.exp(x) / mpmath.expm1(x) ** 2, [0, y])
    d3 = 3 / y ** 3 * mpmath.quad(lambda x: x ** 3 / mpmath.expm1(x), [0, y])
    if kind == "s":
        return 3 * R * (mpmath.mpf(4) / 3 * d3 - mpmath.log(-mpmath.expm1(-y)))
    return 3 * R * t * d3                                      # thermal energy H − H(0)


def _einstein_mp(theta, t, kind):
    x = mpmath.mpf(theta) / t
    n = 1 / mpmath.expm1(x)
    return 3 * R * {"cv": x * x * mpmath.exp(x) * n * n, "s": x * n - mpmath.log(-mpmath.expm1(-x)),
                    "h": t * x * n}[kind]


@functools.lru_cache(maxsize=None)
def _solid(theta_d, theta_e):
    """C_v on the grid, S(298.15 K) and H(298.15 K) − H(0) of the solid, by mpmath (20 digits)."""
    with mpmath.workdps(20):
        cv = np.array([float(_debye_mp(theta_d, t, "cv") + _einstein_mp(theta_e, t, "cv")) for t in GRID])
        s = float(_debye_mp(theta_d, 298.15, "s") + _einstein_mp(theta_e, 298.15, "s"))
        h = float(_debye_mp(theta_d, 298.15, "h") + _einstein_mp(theta_e, 298.15, "h"))
    return cv, s, h


def test_mpmath_solid_is_self_consistent():
    # The reference checked against itself: dS/dT = C/T and dH/dT = C (thermodynamic identities) at 150 K.
    with mpmath.workdps(20):
        for kind, factor in (("s", 1 / mpmath.mpf(150)), ("h", 1)):
            for part in (_debye_mp, _einstein_mp):
                slope = mpmath.diff(lambda t: part(300.0, t, kind), 150)
                assert float(slope) == pytest.approx(float(part(300.0, 150, "cv") * factor), rel=1e-10)


@pytest.mark.slow   # full size; make test runs it (-m 'not slow' for a quick local loop)
def test_data_route_coverage_over_seeds_and_first_points():
    # Issue 24 / 25 item 3: S° and H° − H°(0) from data whose first point is at 10, 30, 50 or 100 K,
    # 100 noise seeds (each seed one of three invented solids, 0.3 % stated noise, every 5 K to 320 K):
    # the share of cases within 1u and within 2u of the mpmath truth.
    inside = {"entropy": [], "enthalpy": []}
    per_first = {t1: [] for t1 in FIRST_POINTS}
    for seed in range(SEEDS):
        theta_d, theta_e = SOLIDS[seed % len(SOLIDS)]
        cv, s_true, h_true = _solid(theta_d, theta_e)
        noisy = cv + np.random.default_rng(seed).normal(0.0, NOISE * cv)
        for t1 in FIRST_POINTS:
            keep = GRID >= t1
            r = third_law_from_data(GRID[keep], noisy[keep], [298.15], NOISE * cv[keep], atoms=2)
            for key, truth in (("entropy", s_true), ("enthalpy", h_true)):
                z = abs(r[key][0] - truth) / r[f"{key}_uncertainty"][0]
                inside[key].append(z)
                if key == "entropy":
                    per_first[t1].append(z)
    for key, z in inside.items():
        z = np.asarray(z)
        within1, within2 = np.mean(z <= 1.0), np.mean(z <= 2.0)
        print(f"{key}: within 1u {within1:.3f}, within 2u {within2:.3f} of {z.size}")
        assert 0.60 <= within1 <= 0.80, key
        assert 0.92 <= within2 <= 0.99, key
    for t1, z in per_first.items():          # no first point may be covered badly on its own
        assert np.mean(np.asarray(z) <= 2.0) >= 0.85, t1
