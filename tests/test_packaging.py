"""The wheel is complete: built from this tree, installed in a fresh venv, it tabulates its own demo
and the dashboard starts with the demo datasets loaded (no file of the source tree is used).

The fresh venv gets the wheel only (``--no-deps``); its dependencies (numpy, dash, ...) are those
of the test environment, made visible by a ``.pth`` file, so the check runs offline and in about
half a minute. ``.pth`` lines add plain paths (the test environment's editable install of this
tree is not activated), and every check asserts that ``thermo`` and ``sample_dos`` come from the
fresh venv. Marked ``package`` (``-m "not package"`` leaves it out of a quick run); ``make test``
runs it.
"""

from __future__ import annotations

import io
import subprocess
import sys
import sysconfig
import zipfile
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import thermo
from thermo import load_dos, tabulate

ROOT = Path(__file__).resolve().parents[1]
pytestmark = pytest.mark.package


def _run(args, cwd, **kw):
    done = subprocess.run(args, cwd=cwd, capture_output=True, text=True, timeout=600, **kw)
    assert done.returncode == 0, f"{args[:4]} exited {done.returncode}:\n{done.stdout[-2000:]}\n{done.stderr[-2000:]}"
    return done.stdout


@pytest.fixture(scope="module")
def installed(tmp_path_factory):
    """(python, modeheat script, wheel) of a fresh venv holding only the wheel built from ROOT."""
    work = tmp_path_factory.mktemp("wheel")
    # the build backend of the test environment (setuptools>=77 from requirements-test.txt), offline
    _run([sys.executable, "-m", "pip", "wheel", "--no-deps", "--no-build-isolation", "--quiet",
          "--wheel-dir", str(work / "dist"), str(ROOT)], cwd=work)
    wheel = next((work / "dist").glob("modeheat-*.whl"))
    venv = work / "venv"
    _run([sys.executable, "-m", "venv", "--without-pip", str(venv)], cwd=work)
    python = venv / "bin" / "python"
    _run([sys.executable, "-m", "pip", "--python", str(python), "install", "--no-deps", "--no-index",
          "--quiet", str(wheel)], cwd=work)
    site = Path(_run([str(python), "-c", "import sysconfig; print(sysconfig.get_paths()['purelib'])"], cwd=work).strip())
    (site / "zz_test_dependencies.pth").write_text(sysconfig.get_paths()["purelib"] + "\n")
    return python, venv / "bin" / "modeheat", wheel, work


def test_wheel_holds_the_demo_and_the_license(installed):
    names = zipfile.ZipFile(installed[2]).namelist()
    for expected in ("sample_dos/springium_fcc.dat", "sample_dos/volumes/springium_volumes.csv",
                     "thermo/__init__.py", "webapp/app.py"):
        assert expected in names, f"{expected} missing from {installed[2].name}"
    assert any(n.endswith("licenses/LICENSE") or n.endswith("/LICENSE") for n in names)
    assert f"modeheat-{thermo.__version__}-" in installed[2].name


def test_installed_command_tabulates_the_packaged_demo(installed):
    python, script, _, work = installed
    demo = _run([str(python), "-c", "import thermo, sample_dos; from importlib.resources import files; "
                 "print(thermo.__file__); print(files('sample_dos') / 'springium_fcc.dat')"], cwd=work).split()
    assert all(str(work / "venv") in p for p in demo), demo          # not the source tree
    out = _run([str(script), "table", demo[1], "--temperatures", "100:300:100"], cwd=work)
    got = pd.read_csv(io.StringIO(out), comment="#")
    # the same table as the library of this tree computes from the repository's copy of the file
    expected = tabulate(load_dos(ROOT / "sample_dos" / "springium_fcc.dat"), [100.0, 200.0, 300.0])
    assert list(got.columns) == list(expected.columns)
    np.testing.assert_allclose(got.to_numpy(), expected.to_numpy(), rtol=1e-7)   # 8 printed digits


def test_installed_dashboard_starts_with_the_demo(installed):
    python, _, _, work = installed
    code = ("import webapp, webapp.demo as d; from webapp.app import create_app; create_app(); "
            "ws = d.demo_workspace(); print(webapp.__file__); "
            "print(sorted(x['name'] for x in ws['datasets']))")
    out = _run([str(python), "-c", code], cwd=work).splitlines()
    assert str(work / "venv") in out[0]
    assert "springium_fcc.dat" in out[1] and "lightheavy_rocksalt.tsv" in out[1], out[1]
