"""Every page request is held to the server's budgets (webapp.budget): over a limit is a one-line refusal.

Resource use at the documented maxima is measured by tests/budget/ (``make test-budget``);
these tests check that each limit is enforced.  Test files are invented (Debye ν² spectra).
"""

from __future__ import annotations

import base64
import json
import threading

import numpy as np
import pytest

from tests.spectra import debye_table, dos_text
from webapp import budget, intake, session
from webapp.app import create_app
from webapp.pages import calorimetry, compare, electronic, export, phases, quasiharmonic, thermodynamics

TEXT = dos_text(*debye_table(300.0, points=201))


def _url(raw: bytes):
    return "data:application/octet-stream;base64," + base64.b64encode(raw).decode()


@pytest.fixture(scope="module")
def client():
    return create_app().server.test_client()


@pytest.fixture
def ws():
    new, _ = intake.add_uploads(session.empty_workspace(), [_url(TEXT.encode())], ["d.dat"], 10 ** 6)
    return new


def test_default_page_budget_is_documented_value():
    assert budget.setting("MODEHEAT_MAX_TEMPERATURES") == 20_000
    with open("docs/limits.md", encoding="utf-8") as handle:
        text = handle.read()
    for name in ("MODEHEAT_MAX_TEMPERATURES", "MODEHEAT_MAX_QHA_TEMPERATURES", "MODEHEAT_MAX_INFLIGHT_MB", "MODEHEAT_MAX_JSON_DEPTH",
                 "MODEHEAT_MAX_JSON_CONTAINERS", "20,000"):
        assert name in text


def test_temperatures_over_the_page_budget_are_refused(ws):
    out = thermodynamics.draw(ws, 0, 20_001, 1, "formula", [])       # 20,002 temperatures
    assert "at most 20,000" in repr(out[-1])
    out = thermodynamics.draw(ws, 0, 19_999, 1, "formula", [])       # exactly 20,000: computed
    assert "at most" not in repr(out[-1])
    out = quasiharmonic.draw(quasiharmonic.demo_set(), "manifest", [], None, 0, 2000, 1, 0.0, "vinet", "formula",
                             "drop", "", 1.0, "on")                     # 2,001 (+298.15 K): over its own budget
    assert "at most 2,000" in repr(out[-1]) and "MODEHEAT_MAX_QHA_TEMPERATURES" in repr(out[-1])
    with pytest.raises(Exception, match="at most 20,000"):
        export.export_bytes(session.active(ws), "0:100000:1", "formula", ["entropy"], "csv")


def test_deep_json_body_refused_with_400_before_parsing(client):
    deep = b"[" * 100_000 + b"]" * 100_000
    r = client.post("/_dash-update-component", data=deep, content_type="application/json")
    assert r.status_code == 400
    assert r.get_data(as_text=True).count("\n") == 1 and "nested" in r.get_data(as_text=True)


def test_json_body_of_many_objects_refused_with_400(client):
    many = b"[" + b"{}," * 300_000 + b"{}]"
    r = client.post("/_dash-update-component", data=many, content_type="application/json")
    assert r.status_code == 400
    assert "objects and arrays" in r.get_data(as_text=True)


def test_ordinary_callback_body_passes_the_json_check(client):
    assert budget.json_shape(json.dumps({"output": "x.children", "inputs": [{"id": "a", "value": [1, {"b": []}]}]})
                             .encode()) == (6, 6)
    r = client.post("/_dash-update-component", json={"output": "nothing.children", "outputs": {}, "inputs": [],
                                                     "changedPropIds": []})
    assert r.status_code != 400 or "nested" not in r.get_data(as_text=True)


def test_decoded_bytes_in_flight_are_bounded_per_worker(ws):
    limit = budget.setting("MODEHEAT_MAX_INFLIGHT_BYTES")
    inside, release = threading.Event(), threading.Event()

    def hold():
        with budget.holding(limit - 10, "first"):
            inside.set()
            release.wait(30)
    worker = threading.Thread(target=hold)
    worker.start()
    try:
        inside.wait(30)
        new, messages = intake.add_uploads(ws, [_url(TEXT.replace("total", "total ").encode())], ["e.dat"], 10 ** 6)
        assert len(new["datasets"]) == 1
        assert "try again" in messages[0][1] and "at most" in messages[0][1]
    finally:
        release.set()
        worker.join()
    assert budget.inflight_bytes() == 0
    new, messages = intake.add_uploads(ws, [_url(TEXT.replace("total", "total ").encode())], ["e.dat"], 10 ** 6)
    assert len(new["datasets"]) == 2


def test_upload_limits_come_from_the_server_not_the_browser(monkeypatch):
    limit = intake.upload_limit()
    big = b"0" * (limit + 10)
    # the Electronic page once took the limit from the browser's config store
    out = electronic.draw({"name": "e.dat", "contents": _url(big), "fields": {}}, 0, 100, 10,
                          {"max_upload_bytes": 10 ** 12})
    assert "upload limit" in repr(out)
    with pytest.raises(intake.UploadRefused, match="upload limit"):
        quasiharmonic.set_from_uploads(["m.csv"], [_url(b"volume_A3,energy_eV,dos_file\n" + big)])
    with pytest.raises(intake.UploadRefused, match="upload limit"):
        quasiharmonic.set_files({"manifest": {"name": "m.csv", "content": base64.b64encode(big).decode()},
                                 "files": []})


def _two_runs(ws):
    new, _ = intake.add_uploads(ws, [_url(TEXT.replace("total", "total ").encode())], ["e.dat"], 10 ** 6)
    return new, [d["id"] for d in new["datasets"]]


def test_compare_table_temperatures_are_held_to_the_page_budget(ws):
    two, ids = _two_runs(ws)
    # a forged table field of 20,001 temperatures (one over the budget): refused before anything is computed
    out = compare.draw(two, ids, ids[0], "entropy", "relative", "1:20001:1", 25, 500, 25, "formula")
    assert "at most 20,000" in repr(out[-1]) and "MODEHEAT_MAX_TEMPERATURES" in repr(out[-1])
    with pytest.raises(Exception, match="at most 20,000"):
        compare.comparison_download("csv", two, ids, ids[0], "1:20001:1", "formula")
    out = compare.draw(two, ids, ids[0], "entropy", "relative", "1:201:1", 25, 500, 25, "formula")
    assert "at most 200 temperatures" in repr(out[-1])                  # the on-screen table: 200 rows a run
    _, content = compare.comparison_download("csv", two, ids, ids[0], "1:201:1", "formula")
    assert content.decode().count("\n") > 2 * 201                      # the download carries them all
    out = compare.draw(two, ids, ids[0], "entropy", "relative", "5,298.15", 25, 500, 25, "formula")
    assert "at most" not in repr(out[-1]) and "298.15" in repr(out[2])


def test_phases_temperatures_are_held_to_the_page_budgets(ws):
    rows = phases.input_rows(phases.DEFAULT_CHOICE, session.empty_workspace(), [])
    # the demo phases are quasi-harmonic: the Quasi-harmonic page's budget of 2,000 temperatures holds
    out = phases.draw(rows, "eV", 0, 2000, 1, "0, 1, 2", "on", session.empty_workspace())
    assert "at most 2,000" in repr(out[-1]) and "MODEHEAT_MAX_QHA_TEMPERATURES" in repr(out[-1])
    # workspace datasets are harmonic phases: the page budget of 20,000 holds
    two, ids = _two_runs(ws)
    harmonic = phases.input_rows([f"ds:{i}" for i in ids], two, [])
    out = phases.draw(harmonic, "eV", 0, 20_001, 1, "0", "off", two)   # 20,002 temperatures
    assert "at most 20,000" in repr(out[-1]) and "MODEHEAT_MAX_TEMPERATURES" in repr(out[-1])
    out = phases.draw(harmonic, "eV", 10, 500, 10, "0", "off", two)
    assert "at most" not in repr(out[-1]) and len(out[0].data) >= 1


def test_calorimetry_download_ignores_the_browsers_upload_limit():
    from webapp.demo import demo_workspace, electronic_demo_entry
    ws = demo_workspace()
    args = ("csv", None, ws, "dos", ["electronic"], "", "", 1, "header", "", electronic_demo_entry())
    name, content = calorimetry.calorimetry_download(*args, {"max_upload_bytes": 1})   # a forged browser config
    assert content == calorimetry.calorimetry_download(*args, None)[1]
    big = {"name": "e.dat", "contents": _url(b"0" * (intake.upload_limit() + 10)), "fields": {}}
    with pytest.raises(intake.UploadRefused, match="upload limit"):
        calorimetry.calorimetry_download(*args[:-1], big, {"max_upload_bytes": 10 ** 12})


def test_electronic_page_refuses_work_over_its_budget():
    from thermo.electronic.segments import window_work
    from webapp.demo import electronic_demo_entry
    entry = electronic_demo_entry()
    edos = intake.electronic_dos(entry)
    # 20,000 temperatures to 2,000 K of the demo E-DOS: every point × every temperature, refused before computing
    assert window_work(edos.energies_ev, np.arange(0.0, 2000.0, 0.1)) > budget.setting("MODEHEAT_MAX_ELECTRONIC_WORK")
    out = electronic.draw(entry, 0, 1999.9, 0.1, None)
    assert "at most 5,000,000" in repr(out[-1]) and "MODEHEAT_MAX_ELECTRONIC_WORK" in repr(out[-1])
    with pytest.raises(Exception, match="at most 5,000,000"):
        electronic.table_download("csv", entry, 0, 1999.9, 0.1)
    out = electronic.draw(entry, 0, 1000, 5, None)                    # the page's usual range: computed
    assert "at most" not in repr(out[-1]) and len(out[1].data) == 1
