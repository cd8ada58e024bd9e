"""Deleted datasets really leave the file; idle browser spaces expire (issue 26, item 4)."""

import os
from datetime import datetime, timedelta, timezone

import pytest

from thermo.cli.main import main
from thermo.workspace import Workspace, upkeep
from webapp import persistence
from webapp.app import create_app
from webapp.pages import workspace as panel

from .helpers import debye_text

SECRET = b"CONFIDENTIAL-7f3a9c-do-not-keep"


def _secret_file(tag="s"):
    return debye_text(tag=tag).encode() + b"# " + SECRET + b"\n"


def _on_disk(path) -> bytes:
    return b"".join(open(p, "rb").read() for p in (str(path), f"{path}-wal") if os.path.exists(p))


def _backdate(path, days):
    stamp = (datetime.now(timezone.utc) - timedelta(days=days)).strftime("%Y-%m-%dT%H:%M:%S.%fZ")
    ws = Workspace(path)
    with ws.db() as con:
        con.execute("UPDATE spaces SET created_utc = ? WHERE kind = 'browser'", (stamp,))


def test_a_soft_deleted_dataset_stays_in_the_file_until_purged(tmp_path, capsys):
    w = tmp_path / "w.sqlite"
    space = Workspace(w).local()
    d, _ = space.add(_secret_file(), "secret.dat")
    space.add(debye_text(tag="other").encode(), "other.dat")
    space.remove(d.id, soft=True)
    assert SECRET in _on_disk(w)                          # the contrast: "deleted" is only a mark
    assert main(["workspace", "purge", "--workspace", str(w)]) == 0
    assert "purged 1 deleted dataset(s)" in capsys.readouterr().err
    assert SECRET not in _on_disk(w)
    assert [x.name for x in Workspace(w).local().datasets()] == ["other.dat"]
    assert Workspace(w).check() == []


def test_a_removed_dataset_leaves_no_bytes_after_purge(tmp_path):
    w = tmp_path / "w.sqlite"
    ws = Workspace(w)
    space = ws.local()
    for i in range(5):                                    # pages around the secret stay in use
        space.add(debye_text(tag=f"keep{i}").encode(), f"keep{i}.dat")
    d, _ = space.add(_secret_file("hard"), "secret.dat")
    space.remove(d.id)
    upkeep.purge(ws)
    assert SECRET not in _on_disk(w)
    assert len(space.datasets()) == 5


def test_idle_browser_spaces_expire_after_the_retention(tmp_path, monkeypatch):
    w = tmp_path / "w.sqlite"
    ws = Workspace(w)
    idle, _ = ws.browser("idle-key")
    idle.add(debye_text(tag="demo").encode(), "demo.dat", invented=True)
    owner, _ = ws.browser("owner-key")
    owner.add(debye_text(tag="mine").encode(), "mine.dat")
    named = ws.create_named("lab")
    _backdate(w, 31)
    fresh, _ = ws.browser("fresh-key")                    # younger than the retention: kept
    monkeypatch.setenv(upkeep.RETENTION_ENV, "30")
    assert upkeep.expire_idle_spaces(ws) == 1
    assert ws.by_key("idle-key") is None
    assert ws.by_key("owner-key") is not None and ws.by_key(named.key) is not None
    assert ws.by_key(fresh.key) is not None
    monkeypatch.setenv(upkeep.RETENTION_ENV, "0")          # 0 keeps them for ever
    _backdate(w, 400)
    assert upkeep.expire_idle_spaces(ws) == 0


@pytest.mark.parametrize("text", ["-1", "abc", "nan", "inf"])
def test_a_bad_retention_is_a_one_line_error(text):
    with pytest.raises(Exception, match=upkeep.RETENTION_ENV):
        upkeep.retention_days({upkeep.RETENTION_ENV: text})


@pytest.fixture
def server(tmp_path):
    app = create_app(workspace=tmp_path / "w.sqlite", demo_dir=tmp_path / "no-demo")
    yield app.server
    create_app()


def _browser_spaces(path):
    with Workspace(path).db() as con:
        return con.execute("SELECT count(*) FROM spaces WHERE kind = 'browser'").fetchone()[0]


def test_cookieless_requests_create_no_space(server, tmp_path):
    w = tmp_path / "w.sqlite"
    for _ in range(20):                                   # 20 visitors that never send the cookie back
        r = server.test_client().get("/_dash-layout")
        assert r.status_code == 200 and "kept in this tab only" in r.get_data(as_text=True)
    assert _browser_spaces(w) == 0
    browser = server.test_client()                        # a browser keeps the cookie of its first page
    browser.get("/")
    assert browser.get("/_dash-layout").status_code == 200 and _browser_spaces(w) == 1


def test_idle_spaces_are_swept_when_new_browsers_arrive(server, tmp_path, monkeypatch):
    w = tmp_path / "w.sqlite"
    monkeypatch.setattr(upkeep, "_SWEPT", {})
    for _ in range(5):
        browser = server.test_client()
        browser.get("/")
        browser.get("/_dash-layout")
    assert _browser_spaces(w) == 5
    _backdate(w, upkeep.DEFAULT_RETENTION_DAYS + 1)
    monkeypatch.setattr(upkeep, "_SWEPT", {})             # an hour later: the next new space sweeps
    late = server.test_client()
    late.get("/")
    late.get("/_dash-layout")
    assert _browser_spaces(w) == 1


def test_the_page_action_removes_deleted_bytes_from_the_file(server, tmp_path):
    w = tmp_path / "w.sqlite"
    with server.test_request_context("/", headers={"Cookie": f"{persistence.COOKIE}=purger"}):
        space = persistence.current_space(server)
        d, _ = space.add(_secret_file("page"), "secret.dat")
        space.add(debye_text(tag="stays").encode(), "stays.dat")
        space.remove(d.id, soft=True)                     # the page's Delete
        assert SECRET in _on_disk(w)
        message, trash = panel.purge(1, {"stored": True})
        assert "removed 1 deleted dataset(s)" in str(message) and trash == []
    assert SECRET not in _on_disk(w)
    assert [x.name for x in Workspace(w).browser("purger")[0].datasets()] == ["stays.dat"]


def test_a_bad_retention_stops_the_server_start(tmp_path, monkeypatch):
    monkeypatch.setenv(upkeep.RETENTION_ENV, "soon")
    try:
        with pytest.raises(ValueError, match=upkeep.RETENTION_ENV):
            create_app(workspace=tmp_path / "w.sqlite")
    finally:
        monkeypatch.delenv(upkeep.RETENTION_ENV)
        create_app()
