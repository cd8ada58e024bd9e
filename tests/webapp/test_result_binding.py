"""Results are bound to bytes the server holds: forged callback payloads against a real server process.

The server is ``python -m webapp`` with a workspace file in a child process;
two browsers are two cookie jars.  Every payload is built from the server's
own dependency list (``/_dash-dependencies``), as a browser or a script
posting to ``/_dash-update-component`` would.  The expected numbers are
computed in this process by :func:`thermo.load_dos` and :func:`thermo.tabulate`
from the same bytes (test files: invented Debye ν² spectra, tests/spectra.py).
"""

from __future__ import annotations

import hashlib
import json
import os
import re
import subprocess
import sys
import time
import uuid
from pathlib import Path

import pytest
import requests

from tests.spectra import debye_table, dos_text
from thermo import load_dos, tabulate
from thermo.columns import find
from tests.ports import worker_port
from webapp import session as ws_session

PORT = worker_port(8086)   # one port per xdist worker (tests/ports.py)
BASE = f"http://127.0.0.1:{PORT}"
ROOT = Path(__file__).resolve().parents[2]
TEXT_A = dos_text(*debye_table(300.0, points=801))
TEXT_B = dos_text(*debye_table(120.0, points=801))      # a lower θ: a much larger S(298.15 K)


@pytest.fixture(scope="module")
def server(tmp_path_factory):
    path = tmp_path_factory.mktemp("ws") / "w.sqlite"
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    proc = subprocess.Popen([sys.executable, "-m", "webapp", "--port", str(PORT), "--workspace", str(path)],
                            cwd=ROOT, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    try:
        for _ in range(300):
            try:
                if requests.get(BASE + "/", timeout=1).status_code == 200:
                    break
            except requests.ConnectionError:
                time.sleep(0.1)
        else:
            raise AssertionError("the dashboard did not start")
        yield proc
    finally:
        proc.terminate()
        proc.wait(timeout=10)


def _callback(output_part):
    deps = requests.get(BASE + "/_dash-dependencies", timeout=10).json()
    return next(c for c in deps if output_part in c["output"])


def _payload(cb, known):
    """A callback request from the server's dependency entry ``cb`` with the values ``known[(id, prop)]``."""
    outputs = [{"id": part.split(".")[0], "property": part.split(".", 1)[1]}
               for part in cb["output"].strip(".").split("...")]

    def values(items):
        return [{"id": i["id"], "property": i["property"], "value": known.get((i["id"], i["property"]))}
                for i in items]
    return {"output": cb["output"], "outputs": outputs, "inputs": values(cb["inputs"]),
            "state": values(cb.get("state", [])), "changedPropIds": [f"{i['id']}.{i['property']}"
                                                                     for i in cb["inputs"][:1]]}


def _browser():
    b = requests.Session()
    assert b.get(BASE + "/", timeout=30).status_code == 200
    assert "mh_space" in b.cookies
    return b


def _workspace_of(browser):
    """The ``mh-workspace`` store the server puts in this browser's page shell."""
    layout = browser.get(BASE + "/_dash-layout", timeout=30).json()

    def walk(node):
        if isinstance(node, dict):
            if node.get("props", {}).get("id") == "mh-workspace":
                return node["props"]["data"]
            return next((r for r in map(walk, node.values()) if r is not None), None)
        if isinstance(node, list):
            return next((r for r in map(walk, node) if r is not None), None)
        return None
    return walk(layout)


def _keep(browser, text, name):
    """Add a file to this browser's stored space through the shell's saving callback; its stored entry."""
    dataset = ws_session.new_dataset(name, text.encode())
    before = _workspace_of(browser)
    ws = {**before, "datasets": before["datasets"] + [dataset], "rev": uuid.uuid4().hex}
    cb = _callback("mh-synced.data")
    r = browser.post(BASE + "/_dash-update-component", timeout=30, json=_payload(
        cb, {("mh-workspace", "data"): ws, ("mh-space", "data"): {"stored": True, "loaded": "1970-01-01"}}))
    assert r.status_code == 200, r.text[:300]
    return next(d for d in _workspace_of(browser)["datasets"] if d["id"] == dataset["id"])


def _thermodynamics(browser, dataset):
    """Post the Thermodynamics page's callback for ``dataset``; (S(298.15 K) shown or None, the response text)."""
    cb = _callback("th-keys.children")
    known = {("mh-workspace", "data"): {"datasets": [dataset], "active": dataset["id"]},
             ("th-tmin", "value"): 0, ("th-tmax", "value"): 600, ("th-step", "value"): 10,
             ("th-per", "value"): "formula", ("th-logt", "value"): []}
    r = browser.post(BASE + "/_dash-update-component", json=_payload(cb, known), timeout=60)
    assert r.status_code == 200, r.text[:300]
    text = json.dumps(r.json()["response"])
    match = re.search(r"S at 298\.15 K\S*\s*\S*?\"[^0-9-]*([-0-9.e+]+) J", text)
    return (float(match.group(1)) if match else None), text


def _expected_entropy(text, name):
    table = tabulate(load_dos(text.encode(), name=name), [298.15])
    return float(f"{table[find(table, 'entropy')].iloc[0]:.5g}")


def test_another_space_s_dataset_is_refused_before_any_cache_lookup(server):
    a, b = _browser(), _browser()
    own = _keep(a, TEXT_A, "a_private.dat")
    assert own["encoding"] == "stored" and own["sha256"] == hashlib.sha256(TEXT_A.encode()).hexdigest()
    shown_a, _ = _thermodynamics(a, own)             # the owner's result is now in the server's caches
    assert shown_a == _expected_entropy(TEXT_A, "a_private.dat")
    stolen, text = _thermodynamics(b, dict(own))      # the same reference, sha256, name and options from b
    assert stolen is None
    assert "not in this browser's workspace" in text
    assert str(shown_a) not in text


def test_own_bytes_under_another_hash_cannot_poison_what_the_owner_sees(server):
    a, b = _browser(), _browser()
    own = _keep(a, TEXT_A.replace("total", "total "), "a_second.dat")     # other bytes: a cold cache entry
    forged = {**own, "encoding": "text", "content": TEXT_B}                 # b's bytes under a's sha256
    shown_b, _ = _thermodynamics(b, forged)
    assert shown_b == _expected_entropy(TEXT_B, "a_second.dat")             # b sees its own bytes' numbers
    shown_a, _ = _thermodynamics(a, own)
    assert shown_a == _expected_entropy(TEXT_A, "a_second.dat")
    assert shown_a != shown_b


def test_demo_numbers_unchanged_for_everyone(server):
    from webapp.demo import demo_workspace

    attacker, visitor = _browser(), _browser()
    demo = {d["name"]: d for d in demo_workspace()["datasets"]}
    stored = {d["name"]: d for d in _workspace_of(visitor)["datasets"]}
    for name, d in list(demo.items())[:2]:
        expected = _expected_entropy(ws_session.content_bytes(d).decode("utf-8"), name) \
            if d["encoding"] == "text" else None
        for _ in range(3):     # the same demo reference posted with other bytes, repeatedly
            _thermodynamics(attacker, {**stored[name], "encoding": "text", "content": TEXT_B})
        shown, _ = _thermodynamics(visitor, stored[name])
        if expected is not None:
            assert shown == expected
        assert shown != _expected_entropy(TEXT_B, name)
