"""Bench P18 and ``make test-budget``: each page callback and CLI command at its documented maximum.

Each case runs in a fresh Python process (``python -m bench.limits CASE FOLDER``):
its inputs are prepared and the result caches emptied, the peak RSS mark is
reset (``/proc/self/clear_refs``), then the callback or command runs once and
the process prints ``{"case", "seconds", "peak_rss_mb"}`` — the peak resident
memory above the RSS at the start of the call [MB] and the wall time [s].
The maxima are those of ``docs/limits.md``: 20,000 temperatures per page
request (2,000 on the Quasi-harmonic page), a DOS of 1,000,000 rows within the 20 MB upload limit, a measured
C_p file of 20,000 points; the command line at 1,000,000 temperatures.
Inputs are invented (Debye ν² spectra, a smooth C_p curve).
"""

from __future__ import annotations

import base64
import json
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

#: The resource goal per case: peak RSS above start [MB] and time [s].
GOAL_RSS_MB, GOAL_SECONDS = 1000.0, 10.0
#: Page temperature grid at the budget (20,000 points: 0 to 1999.9 K every 0.1 K).
PAGE_T = (0.0, 1999.9, 0.1)
DOS_ROWS = 999_999          # data rows: with the header line, the 1,000,000-row limit
CP_ROWS = 20_000
ROOT = Path(__file__).resolve().parents[1]


def make_inputs(folder) -> dict:
    """Write the inputs at the limits into ``folder`` (once); their paths."""
    folder = Path(folder)
    paths = {"dos": folder / "dos_1e6.dat", "cp": folder / "cp_20k.csv", "edos": folder / "edos_big.dat"}
    if not paths["dos"].exists():
        nu = np.linspace(0.0, 6.25, DOS_ROWS)
        body = "\n".join(f"{a:.6f} {9 * a * a / 6.25 ** 3:.5g}" for a in nu)
        paths["dos"].write_text("# frequency (THz) dos\n" + body + "\n")
    if not paths["cp"].exists():
        t = np.linspace(2.0, 400.0, CP_ROWS)
        c = 3 * 8.314462618 * (t / 300.0) ** 3 * 77.93 / (1 + 77.93 * (t / 300.0) ** 3)   # smooth, T³ at low T
        lines = [f"{a:.6f},{b:.7g},{0.004 * b + 1e-6:.3g}" for a, b in zip(t, c)]
        paths["cp"].write_text("temperature_K,heat_capacity_J_per_mol_K,uncertainty_J_per_mol_K\n"
                               + "\n".join(lines) + "\n")
    if not paths["edos"].exists():
        e = np.linspace(-10.0, 5.0, 400_000)
        g = np.sqrt(np.clip(e + 10.0, 0, None)) * 0.1
        paths["edos"].write_text("# energy (eV) dos\n# fermi energy: 0.0 eV\n"
                                 + "\n".join(f"{a:.6f} {b:.5g}" for a, b in zip(e, g)) + "\n")
    return {k: str(v) for k, v in paths.items()}


def _url(path):
    return "data:application/octet-stream;base64," + base64.b64encode(Path(path).read_bytes()).decode("ascii")


def _workspace(paths):
    from webapp import intake, session
    ws, messages = intake.add_uploads(session.empty_workspace(), [_url(paths["dos"])], ["dos_1e6.dat"],
                                      intake.upload_limit())
    if not ws["datasets"]:
        raise RuntimeError(f"the DOS at the limit was refused: {messages}")
    return ws


def _page(name, paths):
    """(setup result, the call) of one page case."""
    import webapp.app  # noqa: F401  (registers the pages)
    from webapp import intake, session
    from webapp.pages import (calorimetry, compare, displacements, electronic, export, models, modemap,
                              polynomials, quasiharmonic, spectrum, thermodynamics)
    t0, t1, dt = PAGE_T
    if name == "page_spectrum_upload":
        url = _url(paths["dos"])
        return lambda: intake.add_uploads(session.empty_workspace(), [url], ["dos_1e6.dat"], intake.upload_limit())
    if name in ("page_electronic", "page_electronic_over"):
        entry = {"name": "edos_big.dat", "contents": _url(paths["edos"]), "fields": {}}
        if name == "page_electronic":       # 400,000 points to 99 K: 1.8e6 points × temperatures, in budget
            return lambda: electronic.draw(entry, 0.0, 99.0, 1.0, None)
        return lambda: electronic.draw(entry, t0, t1, dt, None)       # 5.6e9: refused (work budget)
    if name == "page_quasiharmonic":
        record = quasiharmonic.demo_set()
        return lambda: quasiharmonic.draw(record, "manifest", [], None, 0.0, 1999.0, 1.0, 0.0, "vinet", "formula",
                                          "drop", "", 1.0, "on")     # 2,000 temperatures: its own budget
    ws = _workspace(paths)
    _empty_caches()
    if name == "page_spectrum":
        return lambda: spectrum.draw(ws)
    if name == "page_thermodynamics":
        return lambda: thermodynamics.draw(ws, t0, t1, dt, "formula", [])
    if name == "page_compare":
        # two runs at the row limit; the table field at the budget too (a forged 20,000-temperature list)
        two, _ = intake.add_uploads(ws, [_url(paths["dos"])], ["copy.dat"], intake.upload_limit())
        ids = [d["id"] for d in two["datasets"]]
        spec = f"{t0 + dt}:{t1}:{dt},{t1 + dt}"
        return lambda: compare.draw(two, ids, ids[0], "entropy", "relative", spec, t0, t1, dt, "formula")
    if name == "page_models":
        return lambda: models.draw(ws, None, None, [], t0, t1, dt, "formula", "heat_capacity_v")
    if name == "page_modemap":
        # the map at its 120 temperatures; the explorer's slider at 10³ K (its position is log10 T)
        return lambda: (modemap.draw_map(ws, "heat_capacity_share", 1.0, 2000.0), modemap.draw_explorer(ws, 3.0))
    if name == "page_displacements":
        # 200 temperatures: 932,139 frequencies × 200 within the pair budget (thermo.vibration.species.MAX_PAIRS)
        return lambda: displacements.draw(ws, 0.0, 1990.0, 10.0, "Ly=12.4", 2.5)
    if name == "page_polynomials":
        return lambda: polynomials.draw(ws, "shomate", 298.15, 1500.0, None, 0.0, "cr", "", "json")
    if name == "page_export":
        spec = f"{t0}:{t1}:{dt}"
        return lambda: (export.preview(ws, spec, "formula", ["entropy"]),
                        export.export_bytes(session.active(ws), spec, "formula",
                                            ["heat_capacity_v", "entropy", "internal_energy", "helmholtz_energy"],
                                            "csv"))
    if name == "page_calorimetry":
        entry = {"name": "cp_20k.csv", "contents": _url(paths["cp"])}
        return lambda: calorimetry.draw(entry, ws, "dos", [], "", "", 1, "header", "", None)
    raise KeyError(name)


def _cli(name, paths, folder):
    out = str(Path(folder) / f"{name}.out")
    args = {
        "cli_table": ["table", paths["dos"], "--temperatures", "0:99999.9:0.1", "--output", out + ".csv", "--force"],
        "cli_models": ["models", paths["dos"], "--temperatures", "0:99999.9:0.1", "--output", out + ".json",
                       "--force"],
        "cli_displacements": ["displacements", paths["dos"], "--temperatures", "0:1990:10", "--masses", "Ly=12.4",
                              "--output", out + ".csv", "--force"],         # within MAX_PAIRS, as the page
        "cli_calorimetry": ["calorimetry", paths["cp"], "--dos", paths["dos"], "--output", out + ".json", "--force"],
        "cli_quasiharmonic": ["quasiharmonic", str(ROOT / "sample_dos" / "volumes" / "springium_volumes.csv"),
                              "--temperatures", "0:1999.9:0.1", "--output", out + ".csv", "--force"],
        "cli_polynomial": ["polynomial", paths["dos"], "--output", out + ".json", "--force"],
    }[name]
    from thermo.cli.main import main
    return lambda: main(args)


PAGE_CASES = ("page_spectrum_upload", "page_spectrum", "page_thermodynamics", "page_compare", "page_models",
              "page_modemap", "page_displacements", "page_polynomials", "page_export", "page_calorimetry",
              "page_electronic", "page_electronic_over", "page_quasiharmonic")
CLI_CASES = ("cli_table", "cli_models", "cli_displacements", "cli_calorimetry", "cli_quasiharmonic", "cli_polynomial")
CASES = PAGE_CASES + CLI_CASES
#: Cases past a work budget: the answer is a one-line refusal naming the budget ("at most …"), not a result.
REFUSED = ("page_electronic_over",)


def _empty_caches():
    from webapp import cache
    for c in cache.CACHES:
        with c._lock:
            c._data.clear()
            c.held = 0


def _rss_kb(field="VmRSS"):
    for line in Path("/proc/self/status").read_text().splitlines():
        if line.startswith(field + ":"):
            return int(line.split()[1])
    return 0


def _child(name, folder):
    paths = make_inputs(folder)
    call = _page(name, paths) if name.startswith("page_") else _cli(name, paths, folder)
    import gc
    gc.collect()
    try:
        Path("/proc/self/clear_refs").write_text("5")     # reset the peak-RSS mark (Linux)
    except OSError:
        pass
    start = _rss_kb()
    t = time.perf_counter()
    result = call()
    seconds = time.perf_counter() - t
    peak = _rss_kb("VmHWM")
    failed = _failure(result)
    print(json.dumps({"case": name, "seconds": seconds, "peak_rss_mb": (peak - start) / 1e3, "failed": failed}))


def _failure(result):
    """An error message a page showed (or a CLI exit code), '' when the call did its work."""
    if isinstance(result, int):
        return "" if result == 0 else f"exit {result}"
    text = repr(result)
    for marker in ("mh-msg-error", "'error'", "unexpected error"):
        if marker in text:
            i = text.index(marker)
            return text[max(0, i - 300):i + 50]          # the message comes before its class name
    return ""


def run_case(name, folder=None, timeout=600):
    """Run one case in a fresh process; ``{"case", "seconds", "peak_rss_mb", "failed"}``."""
    folder = folder or os.path.join(tempfile.gettempdir(), "modeheat-limits")
    os.makedirs(folder, exist_ok=True)
    make_inputs(folder)
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    proc = subprocess.run([sys.executable, "-m", "bench.limits", name, folder], cwd=ROOT, env=env,
                          capture_output=True, text=True, timeout=timeout)
    lines = [ln for ln in proc.stdout.splitlines() if ln.startswith("{")]
    if proc.returncode != 0 or not lines:
        raise RuntimeError(f"{name}: exit {proc.returncode}: {proc.stderr.strip().splitlines()[-1:] }")
    return json.loads(lines[-1])


def p18(cases=CASES):
    """Bench figure P18: the worst case (largest peak RSS, longest time) over the cases, and each case."""
    rows = [run_case(c) for c in cases]
    return {"p18_worst_peak_rss_mb": max(r["peak_rss_mb"] for r in rows),
            "p18_worst_seconds": max(r["seconds"] for r in rows),
            "p18_cases": {r["case"]: {"seconds": round(r["seconds"], 3), "peak_rss_mb": round(r["peak_rss_mb"], 1),
                                      "failed": r["failed"]} for r in rows}}


if __name__ == "__main__":
    _child(sys.argv[1], sys.argv[2])
