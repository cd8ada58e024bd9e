"""``batch`` on any executor: the same files whichever pool runs them, a Dask cluster included.

The reference is the in-process run (``workers=1``), itself checked against the single-file
``table`` path in ``test_batch.py``; here every other executor must write byte-identical tables
(apart from the creation time in the provenance) and the same index.
"""

import csv
import sys
from concurrent.futures import Executor, Future, ThreadPoolExecutor
from pathlib import Path

import numpy as np
import pytest

from thermo.batch import INDEX_NAME, BatchOptions, run_batch
from thermo.cli.main import main
from thermo.errors import OptionError
from thermo.parallel import run_jobs, scheduler_executor

TEMPS = (0.0, 20.0, 300.0)


def _debye_text(cutoff_thz, points=200):
    # invented Debye-like spectrum, one atom (3 modes), demo data
    nu = np.linspace(0.0, cutoff_thz, points)
    return "# frequency (THz) dos\n" + "\n".join(f"{a:.8g} {9 * a * a / cutoff_thz ** 3:.8g}" for a in nu) + "\n"


@pytest.fixture
def inputs(tmp_path):
    src = tmp_path / "in"
    src.mkdir()
    for k, cutoff in enumerate((5.0, 6.0, 7.0, 8.0, 9.0)):
        (src / f"s{k}.dat").write_text(_debye_text(cutoff))
    (src / "s2_bad.dat").write_text("# frequency (THz) dos\n0 0\n1 x\n")
    return src


def _outputs(folder):
    """Every written file's lines, without the creation time of the provenance."""
    return {p.name: [line for line in p.read_text().splitlines() if not line.startswith("# created_utc")]
            for p in sorted(Path(folder).iterdir())}


def _index(folder):
    with open(Path(folder) / INDEX_NAME, newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


def _cluster(distributed):
    """A small Dask cluster in this process (threads), on the loopback interface over TCP."""
    return distributed.LocalCluster(n_workers=1, threads_per_worker=2, processes=False, dashboard_address=None,
                                    host="127.0.0.1", protocol="tcp://", scheduler_port=0)


def test_any_executor_writes_the_same_files(inputs, tmp_path):
    distributed = pytest.importorskip("distributed")
    options = BatchOptions(temperatures=TEMPS, digits=8)
    reference = tmp_path / "reference"
    run_batch([inputs], reference, options, workers=1, progress=False)
    expected = _outputs(reference)
    assert len(expected) == 5 + 1 and [r["status"] for r in _index(reference)].count("failed") == 1

    runs = {"process pool": dict(workers=2)}
    with ThreadPoolExecutor(3) as pool:
        runs["thread pool"] = dict(executor=pool)
        for name, how in runs.items():
            out = tmp_path / name.replace(" ", "_")
            run_batch([inputs], out, options, progress=False, **how)
            assert _outputs(out) == expected, name
    with _cluster(distributed) as cluster, distributed.Client(cluster) as client:
        out = tmp_path / "dask"
        run_batch([inputs], out, options, workers=2, progress=False, executor=client.get_executor())
        assert _outputs(out) == expected


def test_cli_runs_on_a_dask_scheduler(inputs, tmp_path, capsys):
    distributed = pytest.importorskip("distributed")
    with _cluster(distributed) as cluster:
        out = tmp_path / "out"
        code = main(["batch", str(inputs), "--output", str(out), "--temperatures", "0,20,300",
                     "--scheduler", cluster.scheduler_address])
    assert code == 1                                   # the bad file failed, the others did not
    rows = _index(out)
    assert [r["status"] for r in rows] == ["ok", "ok", "ok", "failed", "ok", "ok"]
    assert "s2_bad.dat" in capsys.readouterr().err


class _LosingExecutor(Executor):
    """Runs chunks in this thread, but every second chunk's worker is 'lost'."""

    def __init__(self):
        self.calls = 0

    def submit(self, fn, *args, **kwargs):
        self.calls += 1
        future = Future()
        if self.calls % 2 == 0:
            future.set_exception(RuntimeError("worker tcp://10.0.0.9 died"))
        else:
            future.set_result(fn(*args, **kwargs))
        return future


def test_a_lost_worker_fails_its_files_only(inputs, tmp_path):
    rows = run_batch([inputs], tmp_path / "out", BatchOptions(temperatures=TEMPS), workers=8,
                     progress=False, executor=_LosingExecutor())
    lost = [r for r in rows if "worker stopped" in r["error"]]
    assert 0 < len(lost) < len(rows)
    for row in rows:
        if row in lost:
            assert row["status"] == "failed" and "worker tcp://10.0.0.9 died" in row["error"]
        else:
            assert row["status"] == ("failed" if "bad" in row["input"] else "ok")


def test_jobs_keep_their_order_on_a_pool():
    with ThreadPoolExecutor(4) as pool:
        assert run_jobs(divmod, [(k, 7) for k in range(100)], executor=pool, workers=4) == \
            [divmod(k, 7) for k in range(100)]


def test_missing_dask_is_one_line(monkeypatch):
    monkeypatch.setitem(sys.modules, "distributed", None)     # as if not installed
    with pytest.raises(OptionError, match=r"needs the 'distributed' package.*modeheat\[cluster\]"):
        with scheduler_executor("tcp://127.0.0.1:8786"):
            pass


def test_unreachable_scheduler_is_one_line():
    pytest.importorskip("distributed")
    with pytest.raises(OptionError, match="cannot connect to the Dask scheduler at 'tcp://127.0.0.1:9'") as info:
        with scheduler_executor("tcp://127.0.0.1:9", timeout=0.5):
            pass
    assert "\n" not in str(info.value)
