"""``modeheat workspace``: exports never write through planted links, references are not patterns,
names cannot drive the terminal (issue 26, item 5; each test fails on the code before the fix)."""

import os

from thermo.cli.main import main
from thermo.workspace import Workspace

from .helpers import debye_text


def _workspace(tmp_path, *names):
    w = tmp_path / "w.sqlite"
    space = Workspace(w).local()
    for i, name in enumerate(names):
        space.add(debye_text(tag=f"n{i}").encode(), name)
    return w, space


def test_export_never_writes_through_a_planted_part_link(tmp_path, capsys):
    w, space = _workspace(tmp_path, "kept.dat")
    out_dir = tmp_path / "out"
    out_dir.mkdir()
    victim = tmp_path / "victim.txt"
    victim.write_bytes(b"precious")
    (out_dir / "back.dat.part").symlink_to(victim)            # planted where the old code wrote first
    assert main(["workspace", "export", "kept.dat", "--output", str(out_dir / "back.dat"),
                 "--workspace", str(w)]) == 0
    assert victim.read_bytes() == b"precious"
    assert (out_dir / "back.dat").read_bytes() == space.content(space.get("kept.dat"))
    assert sorted(os.listdir(out_dir)) == ["back.dat", "back.dat.part"]     # only the planted link beside it


def test_export_leaves_no_partial_file_when_the_rename_fails(tmp_path, monkeypatch, capsys):
    w, _ = _workspace(tmp_path, "kept.dat")
    out_dir = tmp_path / "out"
    out_dir.mkdir()

    def refuse(*_args):
        raise PermissionError(13, "Permission denied")
    monkeypatch.setattr(os, "replace", refuse)
    assert main(["workspace", "export", "kept.dat", "--output", str(out_dir / "back.dat"),
                 "--workspace", str(w)]) == 2
    err = capsys.readouterr().err
    assert "Permission denied" in err and "internal error" not in err
    assert os.listdir(out_dir) == []


def test_like_wildcards_in_a_reference_match_nothing(tmp_path, capsys):
    w, space = _workspace(tmp_path, "only.dat")
    for ref in ("%%%%%%%%", "________", "%%%%", "%"):
        assert main(["workspace", "remove", ref, "--workspace", str(w)]) == 2
        assert "no dataset" in capsys.readouterr().err
    assert [d.name for d in space.datasets()] == ["only.dat"]
    sha = space.get("only.dat").sha256
    assert main(["workspace", "remove", sha[:10].upper(), "--workspace", str(w)]) == 0   # a real prefix still works
    assert space.datasets() == []


def test_escape_sequences_in_names_do_not_reach_the_terminal(tmp_path, capsys):
    name = "evil\x1b[2J\x1b]0;owned\x07\u202egnp.exe\x9b31m"
    w, _ = _workspace(tmp_path, name)
    assert main(["workspace", "list", "--workspace", str(w)]) == 0
    out = capsys.readouterr()
    shown = out.out + out.err
    for raw in ("\x1b", "\x07", "\u202e", "\x9b"):
        assert raw not in shown
    assert "evil\\x1b[2J" in out.out and "\\u202e" in out.out
    assert main(["workspace", "remove", name, "--workspace", str(w)]) == 0
    assert "\x1b" not in capsys.readouterr().err
