"""The measured-C_p reader and the third-law integrals under seeded fuzzing (issue 26).

A generator of our own (3,000 inputs: random bytes, other encodings, NaN/inf/1e308/1e-320, huge integers,
ragged rows, units far out, broken .xlsx, values near and far from physical) feeds
:func:`thermo.calorimetry.read_heat_capacity`; every accepted file goes through the data route
(:func:`third_law_from_data`) and every tenth also through the fit and both routes (:func:`analyse`).
The outcome is our own one-line error (``ModeheatError``) or finite, non-negative S° and H° − H°(0);
no warning of numpy or any other library.
"""

from __future__ import annotations

import random
import time
import warnings

import pytest

import numpy as np
from scipy import constants as sc

from thermo.calorimetry import HeatCapacityModel, read_heat_capacity
from thermo.calorimetry.entropy import STANDARD_K, third_law_from_data
from thermo.calorimetry.report import analyse
from thermo.errors import ModeheatError, ModeheatWarning

from ..preparation.test_hardening_fuzz import EXTREMES, _xlsx

SEED = 20261204
N_GENERATED = 3000
HEADERS = ["T (K),Cp (J/(mol K))", "# T[K]  C[mJ/(mol K)]", "T Cp u", "temperature_K;heat_capacity_J_per_g_K",
           "T (°C),Cp", "T,Cp (kJ/(mol K))", "", "=cmd|' /C calc'!A0,Cp", "# T [K] C [cal/(mol K)] u"]


def _text(rng):
    """One measured-C_p-like text, near-valid or broken."""
    n = rng.randint(2, 60)
    mild = rng.random() < 0.35
    t = np.cumsum([rng.uniform(0.05, 30.0) for _ in range(n)]) + rng.choice([0.0, 1.0, 50.0, -5.0])
    theta = rng.uniform(50.0, 1500.0)
    cp = 3 * sc.R * (t / theta) ** 3 / (1 + np.abs(t / theta) ** 3 * 26.0)   # a smooth Debye-like rise
    scale = 1.0 if mild else 10.0 ** rng.choice([0, 0, 3, -3, 9, 100, 300, -300])
    with np.errstate(all="ignore"):
        rows = [[repr(float(a)), repr(float(b * scale))] for a, b in zip(t, cp)]
    if rng.random() < 0.4:
        for row, b in zip(rows, cp):
            row.append(repr(float(b * rng.choice([1e-3, 1e-2, 0.0, -1e-3, 1e3]))))
    for _ in range(0 if mild else rng.choice([0, 1, 2, 5])):
        row = rng.randrange(n)
        rows[row][rng.randrange(len(rows[row]))] = rng.choice(EXTREMES)
    if rng.random() < 0.1:
        rows[rng.randrange(n)].append("1.0")
    sep = rng.choice([" ", "\t", ",", ";"])
    head = rng.choice(HEADERS[:3] if mild else HEADERS)
    return head + "\n" + "\n".join(sep.join(r) for r in rows) + rng.choice(["\n", "", "\r\n", "\n\n\x00"])


def _source(rng):
    kind = rng.randrange(10)
    if kind == 0:
        return bytes(rng.randrange(256) for _ in range(rng.randrange(1, 200)))
    text = _text(rng)
    if kind == 1:
        return text.encode(rng.choice(["utf-16", "latin-1"]), "replace")
    if kind == 2:
        return _xlsx(rng, text)
    return text if kind < 6 else text.encode("utf-8", "replace")


def _check(source, options, index, counts):
    """None when the input ends in our one-line error or in finite S, H >= 0; else the failure."""
    try:
        measured = read_heat_capacity(source, name="fuzz.csv", **options)
        t, c, sigma = measured.temperature_K, measured.heat_capacity_J_per_mol_K, measured.uncertainty_J_per_mol_K
        atoms = None if index % 5 else 1 + index % 3
        targets = np.append(t, STANDARD_K) if t[0] <= STANDARD_K <= t[-1] else t
        r = third_law_from_data(t, c, targets, sigma, atoms=atoms)
        values = np.concatenate([r["entropy"], r["enthalpy"]])
        counts["accepted"] += 1
        if not (np.all(np.isfinite(values)) and np.all(values >= 0)):
            return f"S or H negative or not finite: {values.min()}"
        if index % 10 == 0:
            report, _, _ = analyse(measured, HeatCapacityModel(atoms=atoms or 1))
            counts["analysed"] += 1
            for key in ("entropy_298_15_J_per_mol_K", "entropy_298_15_from_data_J_per_mol_K"):
                v = report[key]["value"]
                if v is not None and not (np.isfinite(v) and v >= 0):
                    return f"{key} = {v}"
    except ModeheatError as exc:
        return None if str(exc) and "\n" not in str(exc) else f"error message not one line: {exc!r}"
    return None


@pytest.mark.slow   # full size; make test runs it (-m 'not slow' for a quick local loop)
def test_seeded_generator_3000_inputs():
    rng = random.Random(SEED)
    counts = {"accepted": 0, "analysed": 0}
    failures, slowest = [], (0.0, None)
    for k in range(N_GENERATED):
        start = time.perf_counter()
        source = _source(rng)
        if isinstance(source, str) and "\n" not in source:
            source += "\n"
        options = {"cp_unit": rng.choice([None] * 6 + ["mJ/(mol K)", "cal/(mol K)", "J/(g K)", "BTU"]),
                   "formula": rng.choice([None, None, "Cu", "NaCl", "Xx9"])}
        try:
            with warnings.catch_warnings():
                warnings.simplefilter("error")
                warnings.simplefilter("ignore", ModeheatWarning)
                problem = _check(source, options, k, counts)
        except Exception as exc:   # noqa: BLE001 - any other type is the failure this test looks for
            problem = f"{type(exc).__name__}: {exc}"
        if problem:
            failures.append((k, problem))
        slowest = max(slowest, (time.perf_counter() - start, k))
    print(f"slowest measured file: input {slowest[1]}, {slowest[0]:.2f} s (recorded, not asserted)")
    assert not failures, f"{len(failures)} of {N_GENERATED} inputs failed, first: {failures[:3]}"
    assert counts["accepted"] >= 300 and counts["analysed"] >= 30     # the accept path is fuzzed too
