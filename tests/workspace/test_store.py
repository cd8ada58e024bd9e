"""The workspace store: schema and migrations, content addressing, spaces, soft delete, sets."""

import hashlib
import sqlite3
from contextlib import closing

import pytest

from thermo.errors import WorkspaceError
from thermo.workspace import Workspace, default_path
from thermo.workspace.schema import MIGRATIONS, SCHEMA_VERSION, connect, migrate, version

from .helpers import debye_text


@pytest.fixture
def ws(tmp_path):
    return Workspace(tmp_path / "w.sqlite")


def test_new_file_is_wal_at_current_version(ws):
    with closing(ws.connect()) as con:
        assert con.execute("PRAGMA journal_mode").fetchone()[0] == "wal"
        assert version(con) == SCHEMA_VERSION
        assert con.execute("PRAGMA integrity_check").fetchone()[0] == "ok"


def test_migration_from_version_1_keeps_datasets(tmp_path):
    path = tmp_path / "old.sqlite"
    with closing(connect(path)) as con:
        assert migrate(con, target=1) == 1
        con.execute("INSERT INTO spaces (name, key, kind, created_utc) VALUES ('main', 'k', 'local', 'x')")
        raw = debye_text().encode()
        sha = hashlib.sha256(raw).hexdigest()
        con.execute("INSERT INTO blobs VALUES (?, ?, ?)", (sha, len(raw), raw))
        con.execute("INSERT INTO datasets (id, space_id, name, sha256, settings, added_utc) "
                    "VALUES ('d1', 1, 'old.dat', ?, '{}', 'x')", (sha,))
        assert not con.execute("SELECT 1 FROM sqlite_master WHERE name = 'sets'").fetchone()
    space = Workspace(path).local()
    with closing(space.workspace.connect()) as con:
        assert version(con) == SCHEMA_VERSION == max(MIGRATIONS)
        assert con.execute("SELECT 1 FROM sqlite_master WHERE name = 'sets'").fetchone()
    assert [d.name for d in space.datasets()] == ["old.dat"]
    assert space.content(space.get("d1")) == raw


def test_newer_schema_refused(tmp_path):
    path = tmp_path / "new.sqlite"
    Workspace(path)
    with closing(sqlite3.connect(path)) as con:
        con.execute("INSERT INTO schema_version VALUES (99, 'x')")
        con.commit()
    with closing(connect(path)) as con, pytest.raises(WorkspaceError, match="newer"):
        migrate(con, str(path))


def test_same_bytes_stored_once(ws):
    space = ws.local()
    raw = debye_text(tag=1).encode()
    a, new_a = space.add(raw, "a.dat")
    b, new_b = space.add(raw, "other-name.dat")
    c, new_c = space.add(raw, "a.dat", settings={"atoms": 1})
    assert (new_a, new_b, new_c) == (True, False, True)
    assert b.id == a.id and c.id != a.id and c.name == "a.dat (2)"
    # FIPS 180-4: the address is the SHA-256 of the bytes, computed here independently with hashlib
    assert a.sha256 == hashlib.sha256(raw).hexdigest()
    with closing(ws.connect()) as con:
        assert con.execute("SELECT COUNT(*) FROM blobs").fetchone()[0] == 1
    assert ws.check() == []


def test_spaces_are_isolated(ws):
    one, new1 = ws.browser("key-one")
    two, new2 = ws.browser("key-two")
    assert new1 and new2 and ws.browser("key-one") == (one, False)
    one.add(debye_text(tag=2).encode(), "mine.dat")
    assert [d.name for d in one.datasets()] == ["mine.dat"]
    assert two.datasets() == [] and ws.local().datasets() == []
    assert two.find("mine.dat") is None
    assert [s.name for s in ws.spaces()] == ["main"]       # browser spaces are not listed
    with pytest.raises(WorkspaceError, match="missing"):     # another space cannot read the bytes by hash
        two.content(one.datasets()[0].sha256)
    taken = one.datasets()[0].id
    # another space's id is neither refused nor reused: the error would tell that the id exists elsewhere
    other, added = two.add(debye_text(tag=9).encode(), "other.dat", dataset_id=taken)
    assert added and other.id != taken and two.find(taken) is None
    assert [d.name for d in one.datasets()] == ["mine.dat"] and one.datasets()[0].id == taken


def test_named_space_opened_by_key(ws):
    lab = ws.create_named("convergence study")
    assert len(lab.key) >= 40 and ws.by_key(lab.key) == lab and lab.name.startswith("convergence study [")
    # the same name again is a new space: creating tells nothing about the spaces in the file
    again = ws.create_named("convergence study")
    assert again.key != lab.key and again.name != lab.name and ws.by_key(lab.key) == lab
    assert ws.by_key("not-a-key") is None
    # a name typed in the dashboard never becomes the command line's space
    assert ws.create_named("main").name != "main" and ws.local("main").kind == "local"


def test_rename_annotate_soft_delete_and_undo(ws):
    space = ws.local()
    d, _ = space.add(debye_text(tag=3).encode(), "mesh8.dat")
    space.add(debye_text(tag=4).encode(), "mesh12.dat")
    d2 = space.update(d.id, name="mesh 8x8x8", group="convergence:  mesh", note="smearing 0.1")
    assert (d2.name, d2.group, d2.note) == ("mesh 8x8x8", "convergence: mesh", "smearing 0.1")
    with pytest.raises(WorkspaceError, match="exists"):
        space.update(d.id, name="mesh12.dat")
    space.remove(d.id, soft=True)
    assert [x.name for x in space.datasets()] == ["mesh12.dat"]
    space.add(debye_text(tag=5).encode(), "mesh 8x8x8")     # the name is free while deleted
    back = space.restore(d.id)
    assert back.name == "mesh 8x8x8 (2)" and back.note == "smearing 0.1"
    with pytest.raises(WorkspaceError, match="nothing to undo"):
        space.restore(d.id)


def test_hard_remove_drops_unused_bytes(ws):
    space = ws.local()
    d, _ = space.add(b"# frequency (THz) dos\n0 0\n1 3\n", "x.dat")
    space.remove("x.dat")
    with closing(ws.connect()) as con:
        assert con.execute("SELECT COUNT(*) FROM blobs").fetchone()[0] == 0
    with pytest.raises(WorkspaceError, match="no dataset 'x.dat'"):
        space.get("x.dat")


def test_damaged_bytes_detected(ws):
    space = ws.local()
    d, _ = space.add(debye_text(tag=6).encode(), "y.dat")
    with closing(ws.connect()) as con:
        con.execute("UPDATE blobs SET content = ? WHERE sha256 = ?", (b"tampered", d.sha256))
    assert any("does not hash" in p for p in ws.check())
    with pytest.raises(WorkspaceError, match="damaged"):
        space.content(d)


def test_settings_and_volume_set(ws):
    space = ws.local()
    ids = [space.add(debye_text(tag=f"v{i}").encode(), f"V{i}.dat")[0].id for i in range(3)]
    space.save_set("volumes", "volume", [(i, 10.0 + k) for k, i in enumerate(ids)], note="Å^3 per cell")
    space.remove(ids[1], soft=True)
    assert space.sets() == {"volumes": {"kind": "volume", "note": "Å^3 per cell",
                                        "members": [(ids[0], 10.0), (ids[2], 12.0)]}}
    space.set_setting("temperatures", {"start": 0, "stop": 1000})
    assert space.setting("temperatures") == {"start": 0, "stop": 1000} and space.setting("nope", 3) == 3
    with pytest.raises(WorkspaceError, match="unknown dataset setting"):
        space.add(b"z", "z", settings={"colour": "red"})


def test_default_location_follows_xdg(tmp_path):
    # XDG Base Directory Specification 0.8: $XDG_DATA_HOME, default $HOME/.local/share; relative values ignored
    assert default_path({"XDG_DATA_HOME": str(tmp_path)}) == tmp_path / "modeheat" / "workspace.sqlite"
    home = default_path({"XDG_DATA_HOME": "relative/dir"})
    assert home.parts[-4:] == (".local", "share", "modeheat", "workspace.sqlite")
    assert default_path({"MODEHEAT_WORKSPACE": str(tmp_path / "x.sqlite")}) == tmp_path / "x.sqlite"


def test_file_sets_are_kept_with_their_bytes_and_found_again(ws):
    # issue 25 item 7: volume sets (a manifest and its DOS files) and measured sets are kept
    from thermo.workspace.sets import file_set, file_sets, remove_file_set, save_file_set, set_contents
    space = ws.local()
    manifest = b"volume_A3,energy_eV,dos_file\n10,0,a.dat\n"
    files = [("manifest", "m.csv", manifest), ("dos", "a.dat", debye_text(tag="a").encode())]
    kept, new = save_file_set(space, "m.csv", "volume", files, {"negative": "drop"})
    assert new and kept.kind == "volume" and [f.name for f in kept.files] == ["m.csv", "a.dat"]
    # FIPS 180-4 SHA-256 of each file, computed here
    assert [f.sha256 for f in kept.files] == [hashlib.sha256(b).hexdigest() for _, _, b in files]
    again, new = save_file_set(space, "copy of m.csv", "volume", files)
    assert not new and again.name == "m.csv"                 # identical bytes: the set already kept
    other, new = save_file_set(space, "m.csv", "volume", files[:1])
    assert new and other.name == "m.csv (2)"
    measured, _ = save_file_set(space, "cp.csv", "measured", [("measured", "cp.csv", b"T Cp\n1 2\n")])
    assert [s.name for s in file_sets(space, "volume")] == ["m.csv", "m.csv (2)"]
    assert [s.name for s in file_sets(space)] == ["m.csv", "m.csv (2)", "cp.csv"]
    assert set_contents(space, "m.csv") == files and file_set(space, "m.csv").settings == {"negative": "drop"}
    # another space never reads them
    assert file_sets(ws.local("other")) == []
    with pytest.raises(WorkspaceError, match="no set"):
        set_contents(ws.local("other"), "m.csv")
    # bytes go with the last user: a dataset may share them
    d, _ = space.add(files[1][2], "a.dat")
    remove_file_set(space, "m.csv")
    assert space.content(d) == files[1][2]
    remove_file_set(space, "m.csv (2)")
    with closing(ws.connect()) as con:
        assert con.execute("SELECT COUNT(*) FROM blobs WHERE sha256 = ?",
                           (hashlib.sha256(manifest).hexdigest(),)).fetchone()[0] == 0
    space.remove(d.id)                                       # a blob still in a set stays
    assert set_contents(space, "cp.csv") == [("measured", "cp.csv", b"T Cp\n1 2\n")]
    assert ws.check() == []
