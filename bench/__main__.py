"""``python -m bench [--json] [--quick] [--only p1,p3,...]``: measure the figures.

Prints one JSON object (``--json``) or a readable list: the figures
``p1_ratio_to_exp`` … ``p17_modelist_table_ms``, the scaling table (rows ×
temperatures) with its exponents, contrast figures, the goals and the machine.
A figure that cannot be measured here is ``null`` with a reason.
"""

from __future__ import annotations

import argparse
import json
import os
import sys

from .descriptions import WHAT

# Goals of issue 30 where it set them (p1, p2, p7, p9's 41-point run, p14-p16), p17 of issue 23; the scaling
# exponents are reported.
GOALS = {
    "p1_ratio_to_exp": ("<=", 0.10), "p1_agreement": ("<=", 1e-6), "p2_speedup_vs_loop": (">=", 50.0),
    "p2_speedup_vs_quad": ("report", None), "p3_max_rel_error": ("<=", 1e-4),
    "p4_low_t_rel_error": ("<=", 0.05), "p5_upload_to_plot_s": ("<=", 1.0),
    "p6_callback_median_s": ("<=", 0.15), "p7_batch_1000_s": ("<=", 8.0),
    "p8_quasiharmonic_s": ("<=", 0.5),
    "p11_first_page_s": ("<=", 1.0), "p11_navigation_s": ("<=", 0.3),
    "p9_calorimetry_fit_s": ("<=", 0.3), "p9_run_41_points_s": ("<=", 0.3), "p9_rows_6000_s": ("<=", 10.0),
    "p9_rows_6000_peak_mb": ("<=", 1000.0),
    "p10_open_compare_s": ("<=", 1.0), "p10_add_1000_s": ("<=", 10.0),
    "p12_parse_1e6_lines_s": ("<=", 2.0), "p13_p95_ms": ("<=", 300.0),
    "p14_provenance_ratio": ("<=", 2.0), "p15_load_1e6_rows_s": ("<=", 0.5),
    "p15_table_1e6_rows_1e4_T_s": ("<=", 0.3), "p16_table_1e3_rows_1e4_T_s": ("<=", 0.02),
    "p17_modelist_table_ms": ("<=", 50.0), "p19_phases_s": ("<=", 1.0),
    "p18_worst_peak_rss_mb": ("<=", 1000.0), "p18_worst_seconds": ("<=", 10.0),
    "scaling_exponent_rows": ("report", None), "scaling_exponent_temperatures": ("report", None),
    "scaling_exponent_load_rows": ("report", None),
}


def _guarded(name, fn, keys):
    try:
        return fn()
    except Exception as exc:  # noqa: BLE001 - one failing figure must not hide the others
        reason = " ".join(f"{type(exc).__name__}: {exc}".split())[:300]
        return {**{k: None for k in keys}, f"{name}_note": f"not measured: {reason}"}


def measure(only=None, quick=False):
    """All requested figures in one dict."""
    load_before = os.getloadavg() if hasattr(os, "getloadavg") else None   # other jobs' load (1, 5, 15 min)
    from . import (calorimetry, dashboard, figures, limits, load, modelist, pageload, phases, quasiharmonic, scaling,
                   workspace)
    from .timing import machine
    plan = [
        ("p1", lambda: figures.p1_p2(repeat=7 if quick else 15, quad_temperatures=5 if quick else 25),
         ("p1_ratio_to_exp", "p1_agreement", "p2_speedup_vs_loop", "p2_speedup_vs_quad")),
        ("p3", figures.p3, ("p3_max_rel_error",)),
        ("p4", figures.p4, ("p4_low_t_rel_error",)),
        ("p5", dashboard.p5, ("p5_upload_to_plot_s",)),
        ("p6", dashboard.p6, ("p6_callback_median_s",)),
        ("p7", lambda: figures.p7(files=200 if quick else 1000, repeat=1 if quick else 3),
         ("p7_batch_1000_s",)),
        ("p8", lambda: quasiharmonic.p8(repeat=3 if quick else 7), ("p8_quasiharmonic_s",)),
        ("p11", lambda: pageload.p11(repeat=3 if quick else 5), ("p11_first_page_s", "p11_navigation_s")),
        ("p9", lambda: calorimetry.p9(repeat=3 if quick else 7),
         ("p9_calorimetry_fit_s", "p9_run_41_points_s", "p9_rows_6000_s", "p9_rows_6000_peak_mb")),
        ("p10", lambda: workspace.p10(quick), ("p10_open_compare_s", "p10_add_1000_s")),
        ("p12", lambda: load.p12(repeat=1 if quick else 3), ("p12_parse_1e6_lines_s",)),
        ("p13", lambda: load.p13(rounds=3 if quick else 10), ("p13_p95_ms",)),
        ("p14", lambda: scaling.p14(repeat=3 if quick else 9), ("p14_provenance_ratio",)),
        ("p15", lambda: scaling.p15_p16(repeat=1 if quick else 3),
         ("p15_load_1e6_rows_s", "p15_table_1e6_rows_1e4_T_s", "p16_table_1e3_rows_1e4_T_s")),
        ("p17", lambda: modelist.p17(repeat=3 if quick else 7), ("p17_modelist_table_ms",)),
        ("p19", lambda: phases.p19(repeat=1 if quick else 3), ("p19_phases_s",)),
        ("p18", lambda: limits.p18(limits.PAGE_CASES if quick else limits.CASES),
         ("p18_worst_peak_rss_mb", "p18_worst_seconds", "p18_cases")),
        ("scaling", lambda: scaling.scaling(quick),
         ("scaling_exponent_rows", "scaling_exponent_temperatures", "scaling_exponent_load_rows")),
    ]
    result = {}
    contrast = {}
    for name, fn, keys in plan:
        if only and name not in only and not (name == "p1" and "p2" in only) \
                and not (name == "p15" and "p16" in only):
            continue
        got = _guarded(name, fn, keys)
        contrast.update(got.pop("contrast", {}))
        result.update(got)
    result["contrast"] = contrast
    result["goals"] = {k: f"{op} {v}" if v is not None else op for k, (op, v) in GOALS.items()}
    result["met"] = {k: _met(result.get(k), *GOALS[k]) for k in GOALS if k in result}
    result["quick"] = quick
    result["machine"] = {**machine(), "load_average_before_run": load_before}
    return result


def _met(value, op, goal):
    if value is None or goal is None:
        return None
    return value <= goal if op == "<=" else value >= goal


def main(argv=None):
    p = argparse.ArgumentParser(prog="python -m bench", description=__doc__.splitlines()[0])
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.add_argument("--quick", action="store_true", help="fewer repeats and 200 batch files (a smoke run)")
    p.add_argument("--only", help="comma list of figures to measure, e.g. p1,p3")
    args = p.parse_args(argv)
    only = set(args.only.split(",")) if args.only else None
    result = measure(only, args.quick)
    if args.json:
        print(json.dumps(result, indent=2))
        return 0
    for key in GOALS:
        if key in result:
            goal = result["goals"][key]
            value = result[key]
            shown = "null" if value is None else f"{value:.4g}"
            mark = {True: "met", False: "NOT met", None: ""}[result["met"].get(key)]
            print(f"{key:24s} {shown:>12s}   goal {goal:10s} {mark:8s} {WHAT.get(key, '')}")
    for key, value in result.items():
        if key.endswith(("_note", "_case")):
            print(f"  {key}: {value}")
    if "scaling_table" in result:
        print(result["scaling_table"])
    print(json.dumps({"contrast": result["contrast"], "machine": result["machine"]}, indent=2))
    return 0


if __name__ == "__main__":
    sys.exit(main())
