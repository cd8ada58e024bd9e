"""The library figures p1-p4 and the batch figure p7."""

from __future__ import annotations

import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np
from scipy import constants as sc

from . import baselines, cases
from .timing import median_ratio, median_seconds

H_OVER_K_THZ = sc.h * 1e12 / sc.k
P1_POINTS, P1_TEMPERATURES = 5000, np.linspace(1.0, 1000.0, 1000)
COLUMNS = ("heat_capacity", "entropy", "internal_energy", "helmholtz_energy")


def _load(text, **options):
    from thermo import load_dos
    return load_dos(text, **options)


def p1_p2(repeat=15, quad_temperatures=25):
    """Fast ``tabulate`` against one np.exp pass, the direct path and the usual loops."""
    from thermo import tabulate
    nu, g = cases.spring_crystal(P1_POINTS)
    dos = _load(cases.as_text(nu, g))
    t = P1_TEMPERATURES
    grid = np.ones((P1_POINTS, t.size))
    ratio, tab_s, exp_s = median_ratio(lambda: tabulate(dos, t), lambda: np.exp(grid), repeat)
    # the first table of a DOS also prepares what the sums keep on it (weights, deposit, transform)
    from .scaling import fresh
    first_ratio, first_s, _ = median_ratio(lambda: tabulate(fresh(dos), t), lambda: np.exp(grid), max(3, repeat // 2))
    # the same prepared DOS over a different range each time (a range's kernel transform is kept on the DOS)
    ranges = iter(np.outer(1.0 + 0.01 * (np.arange(64) % 16), t))
    other_ratio, other_s, _ = median_ratio(lambda: tabulate(dos, next(ranges)), lambda: np.exp(grid),
                                           max(3, repeat // 2))
    fast = tabulate(dos, t).to_numpy(float)[:, 1:]
    direct = tabulate(dos, t, method="direct").to_numpy(float)[:, 1:]
    agreement = float(np.max(np.abs(fast / direct - 1)))
    # contrast: no ν² treatment (the table reaches ν = 0) on a logarithmic grid 0.1-3000 K
    bare = _load(cases.as_text(nu, g), low_frequency="off")
    bare_ratio, bare_s, _ = median_ratio(lambda: tabulate(bare, t), lambda: np.exp(grid), max(3, repeat // 2))
    t_log = np.geomspace(0.1, 3000.0, 800)
    bare_agreement = float(np.max(np.abs(tabulate(bare, t_log).to_numpy(float)[:, 1:]
                                         / tabulate(bare, t_log, method="direct").to_numpy(float)[:, 1:] - 1)))
    loop_ratio, loop_s, _ = median_ratio(lambda: baselines.loop_table(nu, g, t), lambda: tabulate(dos, t),
                                         max(3, repeat // 3))
    subset = t[np.linspace(0, t.size - 1, quad_temperatures).astype(int)]
    start = time.perf_counter()
    baselines.quad_table(nu, g, subset)
    quad_s = (time.perf_counter() - start) * t.size / subset.size
    return {
        "p1_ratio_to_exp": ratio,
        "p1_agreement": agreement,
        "p2_speedup_vs_loop": loop_ratio,
        "p2_speedup_vs_quad": quad_s / tab_s,
        "contrast": {
            "p1_case": f"spring crystal, {P1_POINTS} points, 1-1000 K in 1000 steps, all four quantities; the "
                       f"DOS prepared by its first table (see p1_ratio_to_exp_first_table_of_the_dos)",
            "tabulate_s": tab_s, "one_exp_pass_s": exp_s,
            "p1_ratio_to_exp_first_table_of_the_dos": first_ratio, "tabulate_first_table_s": first_s,
            "p1_ratio_to_exp_new_range_each_table": other_ratio, "tabulate_new_range_each_table_s": other_s,
            "p1_ratio_to_exp_without_low_frequency_treatment": bare_ratio, "tabulate_without_treatment_s": bare_s,
            "p1_agreement_without_low_frequency_treatment_log_T_0.1_3000K": bare_agreement,
            "tabulate_direct_s": median_seconds(lambda: tabulate(dos, t, method="direct"), 3),
            "numpy_loop_s": loop_s,
            "quad_loop_s_extrapolated": quad_s,
            "quad_note": f"quad timed on {quad_temperatures} of the {t.size} temperatures, scaled",
        },
    }


def _debye_reference(temperatures, theta):
    """C_v, S, U, F of a one-atom Debye solid by mpmath quadrature [J/mol/K, J/mol]."""
    import mpmath as mp
    mp.mp.dps = 25
    r = sc.R
    rows = []
    for t in temperatures:
        xd = mp.mpf(theta) / mp.mpf(t)
        pre = 9 * (mp.mpf(t) / mp.mpf(theta)) ** 3
        cv = pre * mp.quad(lambda x: x ** 4 * mp.exp(x) / mp.expm1(x) ** 2, [0, xd])
        en = pre * mp.quad(lambda x: x ** 3 / mp.expm1(x), [0, xd])
        lg = pre * mp.quad(lambda x: -x ** 2 * mp.log1p(-mp.exp(-x)), [0, xd])
        zpe = mp.mpf(9) / 8 * r * theta
        rows.append([float(r * cv), float(r * (en + lg)), float(zpe + r * t * en), float(zpe - r * t * lg)])
    return np.array(rows)


def _relative(values, reference):
    """Largest relative difference per column; F is divided by max(|F|, 1e-3 max|F|)."""
    floor = 1e-3 * np.max(np.abs(reference), axis=0)
    return float(np.max(np.abs(values - reference) / np.maximum(np.abs(reference), floor)))


def p3(points=2000, cutoff_thz=8.0, count=40):
    """Debye solid through the whole pipeline vs mpmath, θ_D/50 ≤ T ≤ 3θ_D."""
    from thermo import tabulate
    theta = H_OVER_K_THZ * cutoff_thz
    t = np.geomspace(theta / 50, 3 * theta, count)
    dos = _load(cases.as_text(*cases.debye_solid(points, cutoff_thz)))
    table = tabulate(dos, t).to_numpy(float)[:, 1:] * np.array([1, 1, 1e3, 1e3])
    return {"p3_max_rel_error": _relative(table, _debye_reference(t, theta)),
            "p3_case": f"Debye solid, θ_D = {theta:.1f} K, {points} points, {count} temperatures"}


def p4(points=2000, cutoff_thz=8.0, sigma_thz=0.1, count=20):
    """C_v of a smeared Debye DOS vs the T³ law at θ_D/400 … θ_D/80, with and without treatment."""
    from thermo import tabulate
    theta = H_OVER_K_THZ * cutoff_thz
    t = np.geomspace(theta / 400, theta / 80, count)
    law = 12 * np.pi ** 4 / 5 * sc.R * (t / theta) ** 3
    text = cases.as_text(*cases.smeared_debye(points, cutoff_thz, sigma_thz))
    out = {}
    for key, low in (("p4_low_t_rel_error", "auto"), ("p4_without_treatment_rel_error", "off"),
                     ("p4_window_above_3_sigma_rel_error", "0.3:1.2")):
        cv = tabulate(_load(text, atoms=1, low_frequency=low), t)["heat_capacity_v_J_per_mol_K"].to_numpy()
        out[key] = float(np.max(np.abs(cv / law - 1)))
    out["p4_case"] = (f"Debye DOS θ_D = {theta:.1f} K smeared by a {sigma_thz} THz Gaussian, {points} points, "
                      f"{count} temperatures {t[0]:.2f}-{t[-1]:.2f} K")
    return out


def write_batch_inputs(folder, files=1000, points=2000):
    """Spring-crystal variants (acoustic cut-off 5-7 THz), one file each."""
    for i in range(files):
        nu, g = cases.spring_crystal(points, acoustic_cutoff_thz=5.0 + 2.0 * i / max(files - 1, 1))
        (Path(folder) / f"crystal_{i:04d}.dat").write_text(cases.as_text(nu, g))


def p7(files=1000, points=2000, workers=2, repeat=1):
    """Wall time of ``python -m thermo batch`` over ``files`` files (median of runs) [s]."""
    repo = Path(__file__).resolve().parents[1]
    times = []
    with tempfile.TemporaryDirectory(prefix="modeheat-bench-") as tmp:
        write_batch_inputs(tmp, files, points)
        for run in range(repeat):
            out = Path(tmp) / f"out{run}"
            start = time.perf_counter()
            proc = subprocess.run([sys.executable, "-m", "thermo", "batch", tmp, "--output", str(out),
                                   "--temperatures", "0:1000:10", "--workers", str(workers)],
                                  cwd=repo, capture_output=True, text=True,
                                  env={**os.environ, "PYTHONPATH": str(repo)})
            times.append(time.perf_counter() - start)
            if proc.returncode != 0:
                return {"p7_batch_1000_s": None,
                        "p7_note": f"batch exited with {proc.returncode}: {proc.stderr.strip()[-300:]}"}
    return {"p7_batch_1000_s": float(np.median(times)),
            "p7_case": f"{files} files x {points} points, 101 temperatures, {workers} workers, "
                       f"median of {repeat} run(s), wall time including start-up"}
