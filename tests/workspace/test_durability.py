"""A workspace survives SIGKILL during ``workspace add`` and two processes writing at once.

Checked against SQLite's own ``PRAGMA integrity_check`` and SHA-256 (FIPS 180-4)
recomputed here with :mod:`hashlib` from the bytes read back.
"""

import hashlib
import os
import random
import signal
import sqlite3
import subprocess
import sys
import time
from contextlib import closing

import pytest

from thermo.workspace import Workspace

from .helpers import ROOT, cli, popen, write_files

pytestmark = pytest.mark.skipif(not hasattr(signal, "SIGKILL"), reason="needs POSIX signals")


def _stored(path):
    """Datasets of the main space as {name: sha256}, after checking every one reads back complete."""
    with closing(sqlite3.connect(path)) as con:
        assert con.execute("PRAGMA integrity_check").fetchone()[0] == "ok"
        rows = con.execute("SELECT d.name, d.sha256, b.content, b.size FROM datasets d "
                           "JOIN blobs b ON b.sha256 = d.sha256 JOIN spaces s ON s.id = d.space_id "
                           "WHERE s.name = 'main'").fetchall()
        orphans = con.execute("SELECT COUNT(*) FROM datasets d LEFT JOIN blobs b ON b.sha256 = d.sha256 "
                              "WHERE b.sha256 IS NULL").fetchone()[0]
    assert orphans == 0
    for name, sha, content, size in rows:
        assert hashlib.sha256(content).hexdigest() == sha and len(content) == size, name
    names = [r[0] for r in rows]
    assert len(names) == len(set(names))
    return {r[0]: r[1] for r in rows}


def _rows(path):
    if not path.exists():
        return 0
    try:
        with closing(sqlite3.connect(path, timeout=5)) as con:
            return con.execute("SELECT COUNT(*) FROM datasets").fetchone()[0]
    except sqlite3.OperationalError:     # schema not created yet
        return 0


@pytest.mark.slow   # full size; make test runs it (-m 'not slow' for a quick local loop)
def test_sigkill_during_add_leaves_a_consistent_workspace(tmp_path):
    files = write_files(tmp_path / "in", 1000)    # about 0.35 s of adding on a fast machine: kills land mid-add
    expected = {p.name: hashlib.sha256(p.read_bytes()).hexdigest() for p in files}
    w = tmp_path / "w.sqlite"
    rng = random.Random(20261203)            # fixed seed: the kill moments are reproducible
    kills = 0
    for _ in range(6):
        proc = popen("workspace", "add", tmp_path / "in", "--unchecked", "--workspace", w, quiet=True)
        start = _rows(w)
        deadline = time.monotonic() + 30
        while _rows(w) == start and proc.poll() is None and time.monotonic() < deadline:
            time.sleep(0.005)
        time.sleep(rng.uniform(0.0, 0.1))
        if proc.poll() is None:
            proc.send_signal(signal.SIGKILL)
            kills += 1
        proc.wait(timeout=30)
        stored = _stored(w)
        assert set(stored) <= set(expected)
        assert all(expected[n] == s for n, s in stored.items())
        if len(stored) == len(expected):
            break
    assert kills >= 1, "the add finished before any kill; the test did not test anything"
    done = cli("workspace", "add", tmp_path / "in", "--unchecked", "--workspace", w)
    assert done.returncode == 0, done.stderr
    assert _stored(w) == expected
    assert Workspace(w).check() == []


_SERVER_LIKE = """
import sys
from thermo.workspace import Workspace
ws = Workspace(sys.argv[1])
space, _ = ws.browser("a-browser-key")
for i in range(int(sys.argv[2])):
    d, _ = space.add(f"# frequency (THz) dos\\n0 0\\n1 {i + 1}\\n2 {i + 3}\\n".encode(), f"upload{i}.dat")
    space.update(d.id, note=f"note {i}")
    space.datasets()
print("ok")
"""


def test_two_processes_write_at_once(tmp_path):
    files = write_files(tmp_path / "in", 250)
    w = tmp_path / "w.sqlite"
    Workspace(w)
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    server = subprocess.Popen([sys.executable, "-c", _SERVER_LIKE, str(w), "250"], stdout=subprocess.PIPE,
                              stderr=subprocess.PIPE, text=True, env=env)
    adder = popen("workspace", "add", tmp_path / "in", "--unchecked", "--workspace", w)
    s_out, s_err = server.communicate(timeout=300)
    a_out, a_err = adder.communicate(timeout=300)
    assert server.returncode == 0 and s_out.strip() == "ok", s_err
    assert adder.returncode == 0, a_err
    assert "locked" not in s_err + a_err
    assert len(_stored(w)) == len(files)
    space, new = Workspace(w).browser("a-browser-key")
    assert not new and len(space.datasets()) == 250 and space.get("upload249.dat").note == "note 249"
    assert Workspace(w).check() == []
