"""Workspace figure P10: opening a 200-dataset workspace and drawing Compare with 10 of them; adding 1,000 files.

``p10_open_compare_s`` is measured in this process on the server's path: open
the workspace file, read one browser space of 200 stored spring-crystal
variants into the page's workspace dict (what a page load sends: names, hashes,
settings; the bytes stay on the server), then run the Compare page's drawing
callback for 10 of them (their bytes read from the store) (heat capacity, 0-1000 K every
5 K) with empty result caches.  Browser rendering is not included.
``p10_add_1000_s`` is the wall time of ``python -m thermo workspace add`` of
1,000 files into a new workspace, each file loaded (checked) before it is stored.
"""

from __future__ import annotations

import json
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from . import cases
from .figures import write_batch_inputs

POINTS = 2000


def _clear_result_caches():
    from webapp import cache
    for memo in (cache._DOS_CACHE, cache._TABLE_CACHE, cache._HEADER_CACHE, cache._DERIVED_CACHE):
        memo._data.clear()


def p10_open_compare(datasets=200, chosen=10, repeat=5):
    """Median seconds: open a workspace of ``datasets`` and draw Compare with ``chosen`` of them."""
    from thermo.workspace import Workspace
    from webapp import persistence
    from webapp.app import create_app
    from webapp.pages import compare
    times = []
    with tempfile.TemporaryDirectory(prefix="modeheat-bench-") as tmp:
        path = Path(tmp) / "w.sqlite"
        space, _ = Workspace(path).browser("bench-browser")
        for i in range(datasets):
            nu, g = cases.spring_crystal(POINTS, acoustic_cutoff_thz=5.0 + 2.0 * i / datasets)
            space.add(cases.as_text(nu, g).encode(), f"crystal_{i:03d}.dat", {"atoms": 2})
        server = create_app(workspace=path).server
        for run in range(repeat + 1):
            _clear_result_caches()
            # as in a request of that browser: its cookie picks the space the bytes are read from
            with server.test_request_context("/", headers={"Cookie": f"{persistence.COOKIE}=bench-browser"}):
                start = time.perf_counter()
                ws = persistence.browser_workspace(persistence.current_space(server))
                ids = [d["id"] for d in ws["datasets"][run:run + chosen]]
                over, diff, _table = compare.comparison(ws, ids, ids[0], "heat_capacity_v",
                                                        [5.0 * k for k in range(201)], "atom")
                elapsed = time.perf_counter() - start
                page_bytes = len(json.dumps(ws))
            if len(ws["datasets"]) != datasets or len(over.data) != chosen or len(diff.data) != chosen - 1:
                raise RuntimeError("the Compare figures do not hold the chosen datasets")
            if run:                           # the first run warms imports up
                times.append(elapsed)
    create_app()
    return {"p10_open_compare_s": statistics.median(times),
            "p10_open_compare_case": f"{datasets} stored {POINTS}-point datasets, Compare of {chosen} "
                                     f"(C_v, 201 temperatures), server side, median of {repeat} cold-cache runs",
            "contrast": {"p10_open_compare_times_s": times, "p10_workspace_json_bytes_sent_to_page": page_bytes}}


def p10_add(files=1000, repeat=1):
    """Wall time [s] of ``workspace add`` of ``files`` files (checked) into a new workspace."""
    repo = Path(__file__).resolve().parents[1]
    times = []
    with tempfile.TemporaryDirectory(prefix="modeheat-bench-") as tmp:
        folder = Path(tmp) / "in"
        folder.mkdir()
        write_batch_inputs(folder, files, POINTS)
        for run in range(repeat):
            target = Path(tmp) / f"w{run}.sqlite"
            start = time.perf_counter()
            proc = subprocess.run([sys.executable, "-m", "thermo", "workspace", "add", str(folder),
                                   "--workspace", str(target)], cwd=repo, capture_output=True, text=True,
                                  env={**os.environ, "PYTHONPATH": str(repo)})
            times.append(time.perf_counter() - start)
            if proc.returncode != 0 or f"added {files}," not in proc.stderr:
                raise RuntimeError(f"workspace add failed: {proc.stderr.strip()[-200:]}")
    return {"p10_add_1000_s": statistics.median(times),
            "p10_add_case": f"{files} files of {POINTS} points, each loaded then stored, one process",
            "contrast": {"p10_add_times_s": times}}


def p10(quick=False):
    """Both P10 figures."""
    first = p10_open_compare(repeat=3 if quick else 5)
    second = p10_add(files=200 if quick else 1000)
    return {**first, **second, "contrast": {**first.pop("contrast"), **second.pop("contrast")}}
