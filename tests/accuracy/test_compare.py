"""``modeheat compare`` and :func:`thermo.convergence.compare_runs` on the spring-model test crystal.

The reference values are the crystal's exact C_v and S (tests/crystal.py: q-sphere integral
near Γ plus a fine mesh; Debye T³ limit of Ashcroft & Mermin 1976, ch. 23); the relative
differences are checked against numbers computed here from the tables the runs give.
"""

import io
import json
import contextlib

import numpy as np
import pytest

from tests import crystal as C
from thermo import load_dos
from thermo.columns import column_name
from thermo.convergence import compare_runs
from thermo.tables import tabulate


@pytest.fixture(scope="module")
def runs(tmp_path_factory):
    d = tmp_path_factory.mktemp("runs")
    paths = []
    for n in (24, 8):
        p = d / f"bcc_{n}.dat"
        p.write_text(C.dos_text(*C.gaussian_dos(C.BCC, n, 0.12)))
        paths.append(p)
    return paths


def test_relative_differences_are_against_the_reference_run(runs):
    doses = [load_dos(p, atoms=1) for p in runs]
    t = [5.0, 20.0, 298.15]
    df = compare_runs(doses, t, reference=0, names=["fine", "coarse"])
    fine, coarse = (tabulate(d, t) for d in doses)
    s = column_name("entropy")
    got = df[df.run == "coarse"]["entropy_relative_difference"].to_numpy()
    assert got == pytest.approx((coarse[s] - fine[s]).to_numpy() / fine[s].to_numpy(), rel=1e-12)
    assert np.all(df[df.run == "fine"]["entropy_relative_difference"] == 0)
    assert list(df.reference) == [True] * 3 + [False] * 3
    # each run's own error estimate travels beside its difference, in the quantity's unit
    assert np.all(df[column_name("entropy_error")] > 0)


def test_cli_reference_option_and_json(runs):
    from thermo.cli.main import main
    out = io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(io.StringIO()):
        code = main(["compare", str(runs[1]), "--reference", str(runs[0]), "--atoms", "1", "--format", "json",
                     "--temperatures", "20"])
    assert code == 0
    text = out.getvalue()
    doc = json.loads(text)
    assert "bcc_24.dat" in text and "heat_capacity_v_relative_difference" in text
    assert doc is not None


def test_cli_needs_two_runs(runs, capsys):
    from thermo.cli.main import main
    assert main(["compare", str(runs[0]), "--atoms", "1"]) == 2
    assert "at least two runs" in capsys.readouterr().err
