"""Hardening figures: p12 (reading a 10⁶-line DOS, accepted or refused) and p13 (20 clients).

p12 times :func:`thermo.io.readers.read_table` on three invented 10⁶-line files:
plain, with Fortran ``d`` exponents, and with one bad cell in the last line
(refused); the figure is the slowest of the three [s].

p13 serves the dashboard with gunicorn as documented in README ("Serving
several users"): ``gunicorn --workers 2 --threads 8 webapp.app:server`` on a
2-core machine, and runs 20 client threads (plain ``requests``), each
repeating a page load (``GET /`` and ``/_dash-layout``) and the Thermodynamics
table callback (``POST /_dash-update-component`` with the demo workspace and
a temperature range of its own, so both cache hits and recomputations occur).
One warm-up round is not counted.  Figures: requests per second, p50 and p95
latency [ms] of each kind, errors.  The clients run on the same machine and
take CPU from the server; on a shared machine the load of other processes
adds to the latencies (the machine's load average is printed with it).
"""

from __future__ import annotations

import os
import socket
import subprocess
import sys
import threading
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
CLIENTS = 20


def _text_1e6(kind):
    nu = np.linspace(0.0, 20.0, 1_000_000)
    body = "\n".join(f"{a:.9g} {9 * a * a / 8000:.9g}" for a in nu)
    if kind == "d":
        body = body.replace("e-", "d-")
    if kind == "bad":
        body = body[:-1] + "x"
    return "# frequency (THz) dos\n" + body + "\n"


def p12(repeat=3):
    """Slowest of plain / d-exponent / bad-last-cell 10⁶-line reads [s] (best of ``repeat``)."""
    from thermo.errors import DosInputError
    from thermo.io.readers import read_table

    times = {}
    for kind in ("plain", "d", "bad"):
        text = _text_1e6(kind)
        best = float("inf")
        for _ in range(repeat):
            start = time.perf_counter()
            try:
                read_table(text)
                outcome = "accepted"
            except DosInputError:
                outcome = "refused"
            best = min(best, time.perf_counter() - start)
        if outcome != ("refused" if kind == "bad" else "accepted"):
            raise AssertionError(f"the {kind} file was {outcome}")
        times[kind] = best
    return {"p12_parse_1e6_lines_s": round(max(times.values()), 3),
            "contrast": {f"p12_{k}_s": round(v, 3) for k, v in times.items()}}


def _free_port():
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def _gunicorn(port, workers=2, threads=8):
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    cmd = [sys.executable, "-m", "gunicorn", "--workers", str(workers), "--threads", str(threads),
           "--bind", f"127.0.0.1:{port}", "--log-level", "warning", "webapp.app:server"]
    return subprocess.Popen(cmd, cwd=ROOT, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)


def _find(node, wanted):
    if isinstance(node, dict):
        if node.get("props", {}).get("id") == wanted:
            return node["props"]
        return next((r for v in node.values() if (r := _find(v, wanted)) is not None), None)
    if isinstance(node, list):
        return next((r for v in node if (r := _find(v, wanted)) is not None), None)
    return None


def _table_payload(session, base, tmax):
    deps = session.get(base + "/_dash-dependencies", timeout=30).json()
    cb = next(c for c in deps if "th-table.children" in c["output"])
    workspace = _find(session.get(base + "/_dash-layout", timeout=30).json(), "mh-workspace")["data"]
    values = {"mh-workspace": workspace, "th-tmin": 10, "th-tmax": tmax, "th-step": 10,
              "th-per": "formula", "th-logt": []}
    outputs = [{"id": part.split(".")[0], "property": part.split(".", 1)[1]}
               for part in cb["output"].strip(".").split("...")]
    inputs = [{"id": i["id"], "property": i["property"], "value": values[i["id"]]} for i in cb["inputs"]]
    return {"output": cb["output"], "outputs": outputs, "inputs": inputs, "state": [],
            "changedPropIds": ["th-tmax.value"]}


def p13(clients=CLIENTS, rounds=10, workers=2, threads=8):
    """Requests/s and p50/p95 [ms] of page loads and table callbacks at ``clients`` clients."""
    import requests

    load_before = " ".join(f"{v:.1f}" for v in os.getloadavg())
    port = _free_port()
    base = f"http://127.0.0.1:{port}"
    proc = _gunicorn(port, workers, threads)
    try:
        for _ in range(300):
            try:
                if requests.get(base + "/", timeout=5).status_code == 200:
                    break
            except requests.RequestException:
                time.sleep(0.1)
        else:
            raise RuntimeError("gunicorn did not start")
        latencies = {"page": [], "table": []}
        errors = []
        lock = threading.Lock()

        def client(k):
            s = requests.Session()
            try:
                payload = _table_payload(s, base, 1000 + 10 * (k % 5))   # 5 distinct ranges: hits and misses
            except Exception as exc:  # noqa: BLE001 - counted, the other clients go on
                with lock:
                    errors.append(f"setup: {type(exc).__name__}: {exc}")
                return
            for r in range(rounds + 1):          # round 0 warms the workers' caches: not counted
                for kind in ("page", "table"):
                    start = time.perf_counter()
                    try:
                        if kind == "page":
                            ok = s.get(base + "/", timeout=60).ok and s.get(base + "/_dash-layout", timeout=60).ok
                        else:
                            ok = s.post(base + "/_dash-update-component", json=payload, timeout=60).ok
                    except requests.RequestException as exc:
                        ok = False
                        errors.append(str(exc))
                    with lock:
                        if r:
                            latencies[kind].append(time.perf_counter() - start)
                        if not ok:
                            errors.append(kind)

        pool = [threading.Thread(target=client, args=(k,)) for k in range(clients)]
        start = time.perf_counter()
        for t in pool:
            t.start()
        for t in pool:
            t.join()
        wall = time.perf_counter() - start
    finally:
        proc.terminate()
        proc.wait(timeout=20)

    def q(values, p):
        return round(1000 * float(np.percentile(values, p)), 1)
    every = latencies["page"] + latencies["table"]
    return {"p13_p95_ms": q(every, 95),
            "contrast": {"p13_requests_per_s": round(len(every) / wall, 1), "p13_errors": len(errors), "p13_first_error": errors[0][:200] if errors else None,
                         "p13_page_p50_ms": q(latencies["page"], 50), "p13_page_p95_ms": q(latencies["page"], 95),
                         "p13_table_p50_ms": q(latencies["table"], 50),
                         "p13_table_p95_ms": q(latencies["table"], 95),
                         "p13_setup": f"gunicorn --workers {workers} --threads {threads}, {clients} clients x "
                                      f"{rounds} rounds, cores: {os.cpu_count()}, load average before: {load_before}"}}


if __name__ == "__main__":
    print(p12(repeat=1))
    print(p13(rounds=int(sys.argv[1]) if len(sys.argv) > 1 else 5))
