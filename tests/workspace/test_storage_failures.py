"""A full or read-only workspace file: the original SQLite error in one line, reads still working.

A tiny file system cannot be mounted in the tests, so the disk is made "full" with SQLite's
``PRAGMA max_page_count`` (the file may not grow past its present size; SQLite then reports
SQLITE_FULL exactly as on a full disk) and read-only with a ``mode=ro`` URI (what SQLite does
with a file it cannot open for writing).
"""

import os
import sqlite3

import pytest

from thermo.cli.main import main
from thermo.errors import WorkspaceError
from thermo.workspace import Workspace, schema

from .helpers import debye_text

REAL_CONNECT = sqlite3.connect


def _full_connections(monkeypatch):
    """Every new connection sees a file that may not grow (a full disk)."""
    def connect(*args, **kwargs):
        con = REAL_CONNECT(*args, **kwargs)
        pages = con.execute("PRAGMA page_count").fetchone()[0]
        con.execute(f"PRAGMA max_page_count = {max(pages, 1)}")
        return con
    monkeypatch.setattr(schema.sqlite3, "connect", connect)


def _read_only_connections(monkeypatch):
    """Every open for writing becomes a read-only open (a read-only file or file system)."""
    def connect(database, *args, uri=False, **kwargs):
        if not uri:
            database, uri = f"file:{os.path.abspath(database)}?mode=ro", True
        return REAL_CONNECT(database, *args, uri=uri, **kwargs)
    monkeypatch.setattr(schema.sqlite3, "connect", connect)


def _unwritable_opens(monkeypatch):
    """Opening for writing fails as on a full disk (no room for the write-ahead log); read-only opens work."""
    def connect(database, *args, uri=False, **kwargs):
        if not uri:
            raise sqlite3.OperationalError("database or disk is full")
        return REAL_CONNECT(database, *args, uri=uri, **kwargs)
    monkeypatch.setattr(schema.sqlite3, "connect", connect)


def _stored(tmp_path):
    w = tmp_path / "w.sqlite"
    space = Workspace(w).local()
    space.add(debye_text(tag="kept").encode(), "kept.dat")
    return w


def test_full_disk_reports_the_original_error_not_the_rollback(tmp_path):
    ws = Workspace(tmp_path / "w.sqlite")
    space = ws.local()
    space.add(debye_text(tag="a").encode(), "a.dat")
    with ws.db() as con:
        pages = con.execute("PRAGMA page_count").fetchone()[0]
        con.execute(f"PRAGMA max_page_count = {pages}")
    with pytest.raises(WorkspaceError) as err:
        space.add(os.urandom(300_000), "big.dat")
    message = str(err.value)
    assert message.startswith("disk is full: ") and "rollback" not in message and "\n" not in message
    assert [d.name for d in space.datasets()] == ["a.dat"]          # nothing half-written


def test_cli_on_a_full_disk_says_so_in_one_line_and_still_lists(tmp_path, monkeypatch, capsys):
    w = _stored(tmp_path)
    big = tmp_path / "big.dat"
    big.write_text(debye_text(points=4001, tag="big"))
    _full_connections(monkeypatch)
    code = main(["workspace", "add", str(big), "--workspace", str(w)])
    err = capsys.readouterr().err
    assert code == 2 and "disk is full: " in err and "internal error" not in err and "rollback" not in err
    assert err.count("\n") <= 2 and "Traceback" not in err
    assert main(["workspace", "list", "--workspace", str(w)]) == 0
    assert "kept.dat" in capsys.readouterr().out


def test_list_works_when_the_file_cannot_be_opened_for_writing(tmp_path, monkeypatch, capsys):
    w = _stored(tmp_path)
    _unwritable_opens(monkeypatch)
    assert main(["workspace", "list", "--workspace", str(w)]) == 0
    assert "kept.dat" in capsys.readouterr().out


def test_read_only_file_lists_and_refuses_writes_in_one_line(tmp_path, monkeypatch, capsys):
    w = _stored(tmp_path)
    other = tmp_path / "other.dat"
    other.write_text(debye_text(tag="other"))
    _read_only_connections(monkeypatch)
    assert main(["workspace", "list", "--workspace", str(w)]) == 0
    assert "kept.dat" in capsys.readouterr().out
    code = main(["workspace", "add", str(other), "--workspace", str(w)])
    err = capsys.readouterr().err
    assert code == 2 and "read-only" in err and "internal error" not in err
    monkeypatch.undo()
    assert [d.name for d in Workspace(w).local().datasets()] == ["kept.dat"]


@pytest.fixture
def server(tmp_path):
    from webapp.app import create_app
    app = create_app(workspace=tmp_path / "w.sqlite")          # the installed demo: a new space writes its files
    yield app.server
    create_app()


def _layout(client):
    response = client.get("/_dash-layout")
    assert response.status_code == 200, response.status_code
    return response.get_data(as_text=True)


@pytest.mark.parametrize("failure", [_full_connections, _read_only_connections, _unwritable_opens])
def test_pages_open_on_a_full_or_read_only_disk(server, tmp_path, monkeypatch, failure):
    from webapp import persistence
    w = tmp_path / "w.sqlite"
    Workspace(w).browser("returning")[0].add(debye_text(tag="theirs").encode(), "theirs.dat")
    returning = server.test_client()
    returning.set_cookie(persistence.COOKIE, "returning")
    failure(monkeypatch)
    assert "theirs.dat" in _layout(returning)                   # an existing space is read as before
    for path in ("/", "/workspace", "/thermodynamics"):
        assert returning.get(path).status_code == 200
    newcomer = server.test_client()                              # a new browser: the demo, kept in the tab
    assert newcomer.get("/").status_code == 200
    fresh = _layout(newcomer)
    assert "springium" in fresh and "cannot be used" in fresh and "Traceback" not in fresh
