"""Callbacks of the Quasi-harmonic page called directly (no browser).

The demo volume set is invented; references are the library and the
command line on the same files.
"""

from __future__ import annotations

import base64

import numpy as np
import pytest

from tests.quasiharmonic import debye_solid as ds
from tests.quasiharmonic.test_volume_set import write_set
from thermo.cli.main import main
from thermo.errors import DosInputError
from thermo.io.readback import read_exported_csv
from thermo.quasiharmonic import quasiharmonic_table
from webapp import intake, session
from webapp.pages import quasiharmonic as qh

SETTINGS = dict(t_min=0, t_max=600, step=50, pressure=0, eos="birch-murnaghan", per="formula", negative="drop",
                formula=None, tolerance=1, errors="on")
#: The page's grid for 0-600 K every 50 K: 298.15 K is put in its place (issue 29).
GRID = np.union1d(np.arange(0.0, 601.0, 50.0), [298.15])


def draw(record, source="manifest", rows=None, workspace=None, **change):
    s = {**SETTINGS, **change}
    return qh.draw(record, source, rows or [], workspace, s["t_min"], s["t_max"], s["step"], s["pressure"],
                   s["eos"], s["per"], s["negative"], s["formula"], s["tolerance"], s["errors"])


def as_urls(paths):
    return [p.name for p in paths], ["data:text/plain;base64," + base64.b64encode(p.read_bytes()).decode()
                                     for p in paths]


def test_demo_figures_follow_the_library():
    out = draw(qh.demo_set())
    expected = quasiharmonic_table(str(qh.DEMO_MANIFEST), GRID, errors=True)
    np.testing.assert_allclose(np.asarray(out[1].data[0].y, float), expected.volume_A3, rtol=1e-12)
    assert out[0].layout.xaxis.title.text.startswith("volume V")
    assert len(out) == len(qh._GRAPHS) + 2
    # the band under V(T) is V ± its estimated error, row by row (upper edge forward, lower edge back)
    band = out[1].data[1]
    n = GRID.size
    np.testing.assert_allclose(np.asarray(band.y[:n], float), expected.volume_A3 + expected.volume_error_A3, rtol=1e-12)
    np.testing.assert_allclose(np.asarray(band.y[n:], float)[::-1], expected.volume_A3 - expected.volume_error_A3,
                               rtol=1e-12)
    keys = str(out[-2])
    assert "V at 298.15 K" in keys and "±" in keys
    off = draw(qh.demo_set(), errors="off")
    assert len(off[1].data) == 1 and "±" not in str(off[-2])


def test_upload_needs_a_manifest_and_five_volumes(tmp_path):
    names, urls = as_urls(sorted(write_set(tmp_path, volumes=ds.VOLUMES[:4]).parent.glob("d*.dat")))
    with pytest.raises(DosInputError, match="no manifest"):
        qh.set_from_uploads(names, urls)
    names, urls = as_urls([tmp_path / "set.csv", *sorted(tmp_path.glob("d*.dat"))])
    record = qh.set_from_uploads(names, urls)
    messages = draw(record)[-1]
    assert "at least 5" in messages[0].children


def test_loaded_datasets_with_typed_volumes(tmp_path):
    manifest = write_set(tmp_path)
    ws = session.empty_workspace()
    for i in range(len(ds.VOLUMES)):
        path = tmp_path / f"d{i}.dat"
        ws, _ = intake.add_uploads(ws, ["data:text/plain;base64," + base64.b64encode(path.read_bytes()).decode()],
                                   [path.name], 10 ** 6)
    rows, style = qh.dataset_rows("datasets", ws, [])
    assert style == {} and len(rows) == len(ds.VOLUMES)
    for row, v in zip(rows, ds.VOLUMES):
        row.update(volume_A3=float(v), energy_eV=float(ds.static_energy(v)))
    out = draw(None, "datasets", rows, ws)
    expected = quasiharmonic_table(str(manifest), GRID)
    np.testing.assert_allclose(np.asarray(out[1].data[0].y, float), expected.volume_A3, rtol=1e-10)


def test_download_equals_command_line(tmp_path, capsys):
    record = qh.demo_set()
    name, content = qh.table_download("csv", record, "manifest", [], None, 0, 600, 50, 1.5, "vinet", "atom", "drop",
                                      None, 0.5, "on")
    page_table, page_info = read_exported_csv(content)
    assert main(["quasiharmonic", str(qh.DEMO_MANIFEST), "--temperatures", "0:600:50,298.15", "--pressure", "1.5",
                 "--eos", "vinet", "--per", "atom", "--imaginary-tolerance", "0.005", "--errors"]) == 0
    cli_table, cli_info = read_exported_csv(capsys.readouterr().out.encode())
    assert name == "springium_volumes-quasiharmonic-atom.csv"
    assert list(page_table.columns) == list(cli_table.columns)
    np.testing.assert_allclose(page_table.to_numpy(float), cli_table.to_numpy(float), rtol=1e-12)
    assert {k: v for k, v in page_info.items() if k != "created_utc"} == \
        {k: v for k, v in cli_info.items() if k != "created_utc"}


def test_imaginary_tolerance_field(tmp_path):
    manifest = write_set(tmp_path, negative_at=10)      # 5 % imaginary modes at the largest volume
    names, urls = as_urls([manifest, *sorted(tmp_path.glob("d*.dat"))])
    record = qh.set_from_uploads(names, urls)
    listed = [m.children for m in draw(record, tolerance=1)[-1]]
    assert any("d10.dat" in t and "imaginary" in t and "tolerance 1 %" in t for t in listed)
    quiet = [m.children for m in draw(record, tolerance=10)[-1]]
    assert not any("tolerance" in t for t in quiet)
    assert "between 0 and 100" in draw(qh.demo_set(), tolerance=150)[-1][0].children


def test_a_kept_volume_set_reads_back_as_the_record_it_came_from():
    # the files kept in the workspace (manifest first, then the DOS files) give the same record back
    record = qh.demo_set()
    files = qh.set_files(record)
    assert files[0][0] == "manifest" and [r for r, _, _ in files[1:]] == ["dos"] * len(record["files"])
    assert qh.record_of(files) == record
