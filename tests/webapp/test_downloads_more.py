"""Downloads of the Electronic and Mode map pages (webapp/exports.py), without a browser.

Electronic: equal to ``modeheat electronic`` run in-process on the same file.  Mode map: each
temperature's shares sum to 1 (every mode counted once), the input's SHA-256 is the file's
(``hashlib``), and the rows are the map's (temperatures × bins).
"""

from __future__ import annotations

import hashlib

import numpy as np
import pytest

from thermo.cli.main import main
from thermo.columns import find
from thermo.io.readback import read_exported_csv
from webapp import session
from webapp.app import create_app
from webapp.demo import demo_file, demo_workspace


@pytest.fixture(scope="module", autouse=True)
def _app():
    create_app()


def test_electronic_download_equals_the_command(capsys):
    from webapp.pages import electronic
    name, content = electronic.table_download("csv", None, 0, 600, 20)
    assert name == "springium_edos-electronic.csv"
    assert main(["electronic", str(demo_file("electronic", "springium_edos.dat")), "--temperatures", "0:600:20"]) == 0
    ours, meta = read_exported_csv(content)
    theirs, cli_meta = read_exported_csv(capsys.readouterr().out.encode())
    assert list(ours.columns) == list(theirs.columns) and len(ours) == 31
    np.testing.assert_array_equal(ours.to_numpy(), theirs.to_numpy())
    assert [i["sha256"] for i in meta["inputs"]] == [i["sha256"] for i in cli_meta["inputs"]]


def test_mode_map_download_is_the_map_with_its_provenance():
    from webapp.pages import modemap
    ws = demo_workspace()
    fcc = next(d for d in ws["datasets"] if d["name"] == "springium_fcc.dat")
    ws = {**ws, "active": fcc["id"]}
    name, content = modemap.map_download("csv", ws, 2, 1000)
    table, meta = read_exported_csv(content)
    assert name == "springium_fcc-mode-shares.csv"
    assert len(table) == modemap.MAP_TEMPERATURES * modemap.BINS
    sums = table.groupby(find(table, "temperature"))[[find(table, "heat_capacity_v_share"),
                                                      find(table, "entropy_share")]].sum()
    np.testing.assert_allclose(sums.to_numpy(), 1.0, rtol=1e-6)
    assert meta["inputs"][0]["sha256"] == hashlib.sha256(demo_file("springium_fcc.dat").read_bytes()).hexdigest()
    assert modemap.map_download("csv", session.empty_workspace(), 2, 1000) is None
