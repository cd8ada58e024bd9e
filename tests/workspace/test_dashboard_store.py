"""The dashboard's server-side workspace: cookie, per-browser isolation, sync of edits, the panel's edits."""

import json
import re

import pytest

from thermo.workspace import Workspace
from webapp import persistence, session
from webapp.app import create_app
from webapp.pages import workspace as panel

from .helpers import debye_text


@pytest.fixture
def server(tmp_path):
    app = create_app(workspace=tmp_path / "w.sqlite", demo_dir=tmp_path / "no-demo")
    yield app.server
    create_app()                       # back to the browser-only default for other tests


def _layout_workspace(client):
    layout = client.get("/_dash-layout").get_json()
    text = json.dumps(layout)
    found = re.search(r'"id": "mh-workspace", "data": (\{.*?"stored": true\})', text)
    return json.loads(found.group(1))


def test_cookie_is_httponly_unguessable_and_stable(server):
    client = server.test_client()
    first = client.get("/")
    cookie = first.headers.get("Set-Cookie")
    assert cookie.startswith(f"{persistence.COOKIE}=") and "HttpOnly" in cookie and "SameSite=Lax" in cookie
    key = cookie.split(";")[0].split("=", 1)[1]
    assert len(key) >= 43                       # secrets.token_urlsafe(32): 32 random bytes, base64url
    assert "Set-Cookie" not in client.get("/").headers      # sent back by the browser: not set again


def test_each_browser_sees_only_its_own_datasets(server, tmp_path):
    one, two = server.test_client(), server.test_client()
    one.get("/"), two.get("/")
    ws_one = _layout_workspace(one)
    assert ws_one["datasets"] == []             # no demo folder in this test
    key_one = one.get_cookie(persistence.COOKIE).value
    Workspace(tmp_path / "w.sqlite").browser(key_one)[0].add(debye_text(tag=1).encode(), "private.dat")
    assert [d["name"] for d in _layout_workspace(one)["datasets"]] == ["private.dat"]
    assert _layout_workspace(two)["datasets"] == []


def test_sync_adds_updates_and_deletes_softly(server, tmp_path):
    with server.test_request_context("/", headers={"Cookie": f"{persistence.COOKIE}=k1"}):
        space = persistence.current_space(server)
        loaded = persistence.loaded_stamp()
        ws = session.with_dataset(session.empty_workspace(), session.new_dataset("a.dat", debye_text(tag=2).encode()))
        ws = session.with_dataset(ws, session.new_dataset("b.dat", debye_text(tag=3).encode()))
        assert persistence.sync(space, ws, loaded) == 2
        later = persistence.loaded_stamp()
        a_id, b_id = (d["id"] for d in ws["datasets"])
        ws = panel.edited(ws, a_id, "mesh 8", "convergence: mesh", "first try")
        ws, trash = panel.deleted(ws, b_id, [])
        space.add(debye_text(tag=4).encode(), "from-the-cli.dat")   # added after the page loaded
        assert persistence.sync(space, ws, later) == 2
        stored = {d.name: d for d in space.datasets()}
        assert set(stored) == {"mesh 8", "from-the-cli.dat"}
        assert (stored["mesh 8"].group, stored["mesh 8"].note) == ("convergence: mesh", "first try")
        # undo: restored in the store, back in the page, and the next sync changes nothing
        space.restore(b_id)
        ws, trash, back = panel.undone(ws, trash)
        assert back == "b.dat" and trash == []
        assert persistence.sync(space, ws, later) == 0
        again = persistence.browser_workspace(space)
        assert {d["name"] for d in again["datasets"]} == {"mesh 8", "b.dat", "from-the-cli.dat"}
        assert session.content_bytes(session.find(again, b_id)) == debye_text(tag=3).encode()


def test_a_dataset_deleted_in_another_tab_is_not_brought_back(server):
    with server.test_request_context("/", headers={"Cookie": f"{persistence.COOKIE}=k2"}):
        space = persistence.current_space(server)
        stale = session.with_dataset(session.empty_workspace(), session.new_dataset("x.dat", b"# f (THz) g\n0 0\n"))
        persistence.sync(space, stale, persistence.loaded_stamp())
        space.remove(stale["datasets"][0]["id"], soft=True)
        assert persistence.sync(space, stale, persistence.loaded_stamp()) == 0
        assert space.datasets() == []


def test_panel_refuses_a_taken_name():
    ws = session.with_dataset(session.empty_workspace(), session.new_dataset("a", b"1"))
    ws = session.with_dataset(ws, session.new_dataset("b", b"2"))
    with pytest.raises(Exception, match="exists already"):
        panel.edited(ws, ws["datasets"][1]["id"], "a", "", "")


def test_browser_only_mode_keeps_session_storage_path():
    ws = session.with_dataset(session.empty_workspace(), session.new_dataset("a", b"1"))
    kept, left = session.persistable(ws, 3_000_000)
    assert kept["datasets"] and left == []
    stamp, left = session.persistable(session.revised(ws), None)
    assert set(stamp) == {"rev", "stored"} and left == []


def test_named_workspace_switch_sets_the_cookie(server, tmp_path):
    lab = Workspace(tmp_path / "w.sqlite").create_named("lab")
    with server.test_request_context("/", headers={"Cookie": f"{persistence.COOKIE}=own-key"}):
        assert persistence.open_named(server, "wrong") is None
        assert persistence.open_named(server, lab.key) == lab
        response = server.process_response(server.response_class("x"))
        assert f"{persistence.COOKIE}={lab.key}" in response.headers["Set-Cookie"]
    with server.test_request_context("/", headers={"Cookie": f"{persistence.COOKIE}={lab.key}"}):
        assert persistence.current_space(server) == lab
        persistence.own_space(server)
        response = server.process_response(server.response_class("x"))
        fresh = response.headers["Set-Cookie"].split(";")[0].split("=", 1)[1]
    assert fresh not in (lab.key, "own-key") and len(fresh) >= 43
    # a browser space's key does not open it as a named workspace
    Workspace(tmp_path / "w.sqlite").browser("someone-else")
    with server.test_request_context("/"):
        assert persistence.open_named(server, "someone-else") is None


def test_every_new_browser_gets_the_demo_once(tmp_path):
    app = create_app(workspace=tmp_path / "d.sqlite")          # default demo folder sample_dos/
    try:
        one, two = app.server.test_client(), app.server.test_client()
        one.get("/"), two.get("/")
        names_one = [d["name"] for d in _layout_workspace(one)["datasets"]]
        names_two = [d["name"] for d in _layout_workspace(two)["datasets"]]
        assert "springium_fcc.dat" in names_one and names_one == names_two
        assert [d["name"] for d in _layout_workspace(one)["datasets"]] == names_one     # not seeded twice
        assert all(d["invented"] for d in _layout_workspace(two)["datasets"])
    finally:
        create_app()
