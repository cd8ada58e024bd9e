"""Sending results on (webapp/handoff.py): what the receiving page fits equals the command on the downloaded file.

The reference is ``modeheat polynomial FILE --cp-table`` run in-process on the file the sending page's
download writes; the coefficients must be the same numbers.
"""

from __future__ import annotations

import base64
import hashlib
import json

import dash
import numpy as np
import pytest

from thermo.cli.main import main
from webapp import handoff
from webapp.app import create_app
from webapp.demo import demo_workspace


@pytest.fixture(scope="module", autouse=True)
def _app():
    create_app()


def _item(name, content, page):
    text = content.decode("utf-8")
    return {"name": name, "from": page, "csv": text, "sha256": hashlib.sha256(content).hexdigest()}


def test_calorimetry_table_sent_to_polynomials_fits_as_the_command(tmp_path, capsys):
    from webapp.pages import calorimetry, polynomials
    ws = demo_workspace()
    name, content = calorimetry.calorimetry_download("csv", None, ws, "dos", ["electronic", "nernst-lindemann"],
                                                     "", "", 1, "header", "", None, None)
    sent = {"polynomials": _item(name, content, "Calorimetry")}
    assert handoff.received(sent, "polynomials")["name"] == name and handoff.received(sent, "phases") is None
    _, fit, entry = polynomials.fitted_table(handoff.received(sent, "polynomials"), "shomate", 200, 350, None, 0,
                                             "cr", "")
    assert entry["role"] == "heat-capacity table" and entry["sha256"] == hashlib.sha256(content).hexdigest()
    path = tmp_path / name
    path.write_bytes(content)
    assert main(["polynomial", str(path), "--cp-table", "--range", "200:350"]) == 0
    theirs = json.loads(capsys.readouterr().out)
    assert [r["coefficients"] for r in fit.to_dict()["ranges"]] == [r["coefficients"] for r in theirs["ranges"]]
    # the page's choice offers the sent table beside its own source and selects it
    options, value = handoff.offered(sent, "polynomials", [{"label": "own", "value": "dataset"}])
    assert value == "sent" and [o["value"] for o in options] == ["dataset", "sent"]
    options, value = handoff.offered({}, "polynomials", options)
    assert value == "dataset" and len(options) == 1


def _phases_page_and_command(sent, ws, tmp_path, capsys, table_name, content, t_min, t_max, dos_name):
    """The Phases page's comparison of the sent table with the active dataset, and the command's on the files."""
    from thermo.io.readback import read_exported_csv
    from webapp.demo import demo_file
    from webapp.pages import phases
    chosen, seen, low, high = phases.arrival(sent, None, ws, [], t_min, t_max)
    assert chosen[0] == "sent" and seen == sent["phases"]["sha256"]
    rows = phases.input_rows(chosen, ws, [], sent)
    made, _ = phases.download(1, rows, ws, "eV", low, high, 10, "0", "on", "csv", sent)
    ours, meta = read_exported_csv(base64.b64decode(made["content"]))
    (tmp_path / table_name).write_bytes(content)
    stem = rows[0]["phase"]
    assert main(["phases", f"{stem}={tmp_path / table_name}", f"{rows[1]['phase']}={demo_file(dos_name)}",
                 "--temperatures", f"{low:g}:{high:g}:10", "--format", "csv"]) == 0
    theirs, cli_meta = read_exported_csv(capsys.readouterr().out.encode())
    assert list(ours.columns) == list(theirs.columns) and len(ours) > 10
    assert ours.select_dtypes("number").equals(theirs.select_dtypes("number"))
    assert [i["sha256"] for i in meta["inputs"]] == [i["sha256"] for i in cli_meta["inputs"]]
    assert meta["inputs"][0]["sha256"] == hashlib.sha256(content).hexdigest()
    return ours, meta, (low, high)


def test_quasiharmonic_table_sent_to_phases_compares_as_the_command(tmp_path, capsys):
    from webapp.pages import quasiharmonic as qh
    ws = demo_workspace()
    name, content = qh.table_download("csv", qh.demo_set(), "manifest", [], None, 0, 1000, 10, 0,
                                      "birch-murnaghan", "formula", "drop", "", 1, "on")
    sent = {"phases": _item(name, content, "Quasi-harmonic")}
    active = next(d for d in ws["datasets"] if d["id"] == ws["active"])["name"]
    _, meta, span = _phases_page_and_command(sent, ws, tmp_path, capsys, name, content, 0, 1000, active)
    assert span == (0.0, 1000.0) and meta["inputs"][0]["role"].endswith("quasi-harmonic table")


def test_calorimetry_table_sent_to_phases_keeps_inside_its_rows(tmp_path, capsys):
    from webapp.pages import calorimetry
    ws = demo_workspace()
    name, content = calorimetry.calorimetry_download("csv", None, ws, "dos", ["electronic", "nernst-lindemann"],
                                                     "", "", 1, "header", "", None, None)
    sent = {"phases": _item(name, content, "Calorimetry")}
    active = next(d for d in ws["datasets"] if d["id"] == ws["active"])["name"]
    _, meta, (low, high) = _phases_page_and_command(sent, ws, tmp_path, capsys, name, content, 0, 1000, active)
    assert 0 < low < 10 and 300 <= high < 1000          # the measured range, not the page's 0–1000 K
    assert any("H°(0)" in w for w in meta["warnings"])


def test_thermodynamics_table_sent_to_compare_is_a_run_as_the_command_adds_it(tmp_path, capsys):
    from thermo.io.readback import read_exported_csv
    from webapp.demo import demo_file
    from webapp.pages import compare, thermodynamics
    ws = demo_workspace()
    fcc = next(d for d in ws["datasets"] if d["name"] == "springium_fcc.dat")
    ws = {**ws, "active": fcc["id"]}
    name, content = thermodynamics.table_download("csv", ws, 0, 1000, 10, "formula")
    sent = {"compare": _item(name, content, "Thermodynamics")}
    options, value = handoff.offered(sent, "compare", [{"label": "runs only", "value": "none"}])
    assert value == "sent"
    made = compare.comparison_download("csv", ws, [fcc["id"]], fcc["id"], "5,20,298.15", "atom", value, sent)
    ours, meta = read_exported_csv(made[1])
    (tmp_path / name).write_bytes(content)
    assert main(["compare", str(demo_file("springium_fcc.dat")), "--table", str(tmp_path / name), "--per", "atom",
                 "--temperatures", "5,20,298.15"]) == 0
    theirs, cli_meta = read_exported_csv(capsys.readouterr().out.encode())
    assert list(ours["run"]) == ["springium_fcc.dat"] * 3 + [name] * 3 and list(ours.columns) == list(theirs.columns)
    assert ours.select_dtypes("number").equals(theirs.select_dtypes("number"))
    assert [i["sha256"] for i in meta["inputs"]] == [i["sha256"] for i in cli_meta["inputs"]]
    # the table is the dataset's own harmonic table: at its rows (20, 298.15 K interpolated within its error)
    table = ours[ours["run"] == name]
    from thermo.columns import column_name, error_key
    from thermo.convergence import difference_key
    rel = table[column_name(difference_key("entropy"))].to_numpy()
    err = table[column_name(error_key("entropy"), "atom")].to_numpy() / table[column_name("entropy", "atom")].to_numpy()
    assert abs(rel[1]) < 1e-6 and np.all(np.abs(rel) <= err + 1e-7)


def test_nothing_is_sent_until_the_button_is_clicked():
    """Opening a page by its address fired the send callbacks with ``n_clicks=0`` (Dash inserts the page's
    layout, so ``prevent_initial_call`` did not hold): the table went to every target page and the Phases page
    swapped the user's phases for it. A send needs a click."""
    built = []
    send = handoff.register_send("tsend", "phases", (), lambda: built.append(1) or ("t.csv", b"a,b\n1,2\n"), "Test")
    for clicks in (None, 0):
        out = send(clicks, {"compare": {"csv": "x"}})
        assert out[0] is dash.no_update and built == [], clicks
    stored, note = send(1, None)
    assert stored["phases"]["name"] == "t.csv" and built == [1]
