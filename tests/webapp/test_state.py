"""Workspace logic of the dashboard (no browser): uploads, options, demo, caches.

The DOS used here is invented test data (a Debye ν² spectrum); physical
reference values come from scipy.constants (CODATA) as noted.
"""

import base64

import numpy as np
import pytest
from scipy import constants as sc

from thermo import load_dos, tabulate
from thermo.errors import OptionError
from thermo.temperatures import temperature_range
from webapp import cache, demo, intake, reporting, session
from webapp.pages import thermodynamics

PLAIN = "# frequency (THz) dos\n" + "\n".join(f"{a} {9 * a * a / 125}" for a in np.linspace(0, 5, 101)) + "\n"
GARBAGE = "# frequency (THz) dos\n0 0\n1 0.1\n2 banana\n3 0.5\n"


def data_url(text, mime="text/plain"):
    raw = text.encode() if isinstance(text, str) else text
    return f"data:{mime};base64," + base64.b64encode(raw).decode()


def workspace_with_plain():
    ws, notes = intake.add_uploads(session.empty_workspace(), [data_url(PLAIN)], ["debye.dat"], 10 ** 6)
    assert notes == [("info", "loaded debye.dat")]
    return ws


def test_decode_upload_round_trip_and_refusal():
    assert intake.decode_upload(data_url("a b\n"), "x") == b"a b\n"
    with pytest.raises(intake.UploadRefused, match="base64"):
        intake.decode_upload("data:text/plain;base64,@@@", "x")
    with pytest.raises(intake.UploadRefused, match="data URL"):
        intake.decode_upload("not a data url", "x")


def test_upload_adds_active_dataset_that_loads_like_thermo():
    ws = workspace_with_plain()
    (d,) = ws["datasets"]
    assert ws["active"] == d["id"] and d["name"] == "debye.dat"
    ours = cache.load(d)
    direct = load_dos(PLAIN.encode(), name="debye.dat")
    np.testing.assert_array_equal(ours.dos, direct.dos)
    assert ours.atoms == 1


def test_garbage_upload_names_the_line_and_keeps_previous_dataset():
    ws = workspace_with_plain()
    new, notes = intake.add_uploads(ws, [data_url(GARBAGE)], ["bad.dat"], 10 ** 6)
    assert new["datasets"] == ws["datasets"] and new["active"] == ws["active"]
    (kind, text), = notes
    assert kind == "error" and "bad.dat" in text and "line 4" in text
    assert "\n" not in text and "Traceback" not in text


def test_binary_junk_and_oversize_uploads_are_refused_with_one_line():
    ws = workspace_with_plain()
    new, notes = intake.add_uploads(ws, [data_url(bytes(range(256)) * 4, "application/octet-stream"),
                                        data_url(PLAIN)], ["junk.bin", "big.dat"], 1000)
    assert [k for k, _ in notes] == ["error", "error"]
    assert "upload limit is 0.001 MB" in notes[1][1]
    assert new["active"] == ws["active"] and len(new["datasets"]) == 1


def test_several_files_at_once_and_unique_names():
    ws = workspace_with_plain()
    other = "# another run\n" + PLAIN            # other bytes under the same name
    new, notes = intake.add_uploads(ws, [data_url(other), data_url(GARBAGE), data_url("#3\n" + PLAIN)],
                                   ["debye.dat", "bad.dat", "debye.dat"], 10 ** 6)
    names = [d["name"] for d in new["datasets"]]
    assert names == ["debye.dat", "debye.dat (2)", "debye.dat (3)"]
    assert new["active"] == new["datasets"][-1]["id"]
    assert [k for k, _ in notes] == ["info", "error", "info"]


def test_identical_bytes_uploaded_again_select_the_existing_dataset():
    # issue 25 item 7: a re-upload of the same file became "debye.dat (2)", which the workspace
    # store (one dataset per bytes and settings) never kept, so it vanished after a reload
    ws = workspace_with_plain()
    ws = session.with_dataset(ws, session.new_dataset("other.dat", ("# x\n" + PLAIN).encode()))
    new, notes = intake.add_uploads(ws, [data_url(PLAIN)], ["copy of debye.dat"], 10 ** 6)
    assert [d["name"] for d in new["datasets"]] == ["debye.dat", "other.dat"]
    assert new["active"] == ws["datasets"][0]["id"]
    assert notes == [("info", "copy of debye.dat is already loaded as debye.dat; selected it")]


def test_bad_option_keeps_previous_options():
    ws = workspace_with_plain()
    d = ws["datasets"][0]
    new, error = intake.with_options(ws, d["id"], {"atoms": 0})
    assert error and "\n" not in error and new["datasets"][0]["options"] == d["options"]
    new, error = intake.with_options(ws, d["id"], {"formula": "Xq9"})
    assert error and "Xq9" in error and new["datasets"][0]["options"]["formula"] == ""
    new, error = intake.with_options(ws, d["id"], {"freq_unit": "meV"})
    assert error is None and new["datasets"][0]["options"]["freq_unit"] == "meV"
    # the unit change rescales the axis: 1 THz = h·1e12/e meV (CODATA via scipy.constants)
    f_thz = cache.load(ws["datasets"][0]).input_frequency_thz[-1]
    f_mev = cache.load(new["datasets"][0]).input_frequency_thz[-1]
    assert f_thz / f_mev == pytest.approx(sc.h * 1e12 / sc.e * 1e3, rel=1e-9)


def test_rename_remove_activate():
    ws = workspace_with_plain()
    ws, _ = intake.add_uploads(ws, [data_url("# second\n" + PLAIN)], ["second.dat"], 10 ** 6)
    first, second = (d["id"] for d in ws["datasets"])
    assert session.renamed(ws, first, "  my   run ")["datasets"][0]["name"] == "my run"
    assert session.renamed(ws, first, "   ") is ws
    assert session.activated(ws, first)["active"] == first
    assert session.activated(ws, "nope") is ws
    left = session.removed(ws, second)
    assert [d["id"] for d in left["datasets"]] == [first] and left["active"] == first
    assert session.removed(left, first) == {"datasets": [], "active": None}


def test_demo_workspace_missing_dir_is_empty(tmp_path):
    assert demo.demo_workspace(tmp_path / "absent") == session.empty_workspace()


def test_demo_workspace_skips_broken_files(tmp_path):
    (tmp_path / "good.dat").write_text(PLAIN)
    (tmp_path / "broken.dat").write_text(GARBAGE)
    (tmp_path / "notes.md").write_text("not a DOS")
    ws = demo.demo_workspace(tmp_path)
    assert [d["name"] for d in ws["datasets"]] == ["good.dat"]
    assert ws["active"] == ws["datasets"][0]["id"]


def test_shipped_demo_files_all_load():
    ws = demo.demo_workspace()
    files = [p.name for p in demo.DEMO_DIR.iterdir() if p.suffix in demo.DEMO_SUFFIXES]
    assert files, "sample_dos/ has no demo files"
    assert sorted(d["name"] for d in ws["datasets"]) == sorted(files)


def test_table_cache_matches_tabulate_and_dulong_petit():
    ws = workspace_with_plain()
    d = ws["datasets"][0]
    t = np.array([0.0, 100.0, 5000.0])
    df = cache.table(d, t, "formula")
    ref = tabulate(load_dos(PLAIN.encode(), name="debye.dat"), t)
    np.testing.assert_array_equal(df.to_numpy(), ref.to_numpy())
    # classical limit 3nR with R from CODATA (scipy.constants); n = 1 atom
    assert thermodynamics.dulong_petit(d, "formula") == pytest.approx(3 * sc.R)
    assert thermodynamics.dulong_petit(d, "atom") == 3.0
    assert df.iloc[-1, 1] == pytest.approx(3 * sc.R, rel=1e-3)


def test_temperature_range_errors_are_one_line():
    assert temperature_range(0, 10, 5).tolist() == [0.0, 5.0, 10.0]
    with pytest.raises(OptionError) as info:
        temperature_range(10, 0, 5)
    assert "\n" not in reporting.one_line(info.value)
    with pytest.raises(OptionError, match="lowest temperature is missing or not a number"):
        temperature_range("ten", 0, 5)
    with pytest.raises(OptionError, match="highest temperature -5 K is below 0 K"):
        temperature_range(0, -5, 5)
    with pytest.raises(OptionError, match="highest temperature 5 K is below the lowest 10 K; swap"):
        temperature_range(10, 5, 5)
    with pytest.raises(OptionError, match="step must be > 0 K"):
        temperature_range(0, 5, 0)


def test_reported_callback_turns_any_error_into_the_fallback():
    @reporting.reported(lambda message: ("fallback", message))
    def broken(x):
        return 1 / x
    assert broken(2) == 0.5
    assert broken(0) == ("fallback", "unexpected error: ZeroDivisionError: division by zero")


def test_one_line_for_unexpected_errors():
    text = reporting.one_line(KeyError("x\ny"))
    assert text.startswith("unexpected error: KeyError") and "\n" not in text


def test_xlsx_upload_is_kept_as_base64_and_loads_like_the_text():
    import io

    import openpyxl
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.append(["frequency (THz)", "dos"])
    for a in np.linspace(0, 5, 101):
        sheet.append([float(a), float(9 * a * a / 125)])
    out = io.BytesIO()
    book.save(out)
    ws, notes = intake.add_uploads(session.empty_workspace(), [data_url(out.getvalue(), "application/vnd.ms-excel")],
                                  ["debye.xlsx"], 10 ** 6)
    assert notes == [("info", "loaded debye.xlsx")]
    d = ws["datasets"][0]
    assert d["encoding"] == "base64" and session.content_bytes(d) == out.getvalue()
    np.testing.assert_allclose(cache.load(d).dos, load_dos(PLAIN.encode()).dos, rtol=1e-12)


def test_persistable_leaves_out_the_largest_datasets():
    ws = workspace_with_plain()
    long_text = "# frequency (THz) dos\n" + "\n".join(f"{a} {9 * a * a / 125}" for a in np.linspace(0, 5, 4001))
    ws, notes = intake.add_uploads(ws, [data_url(long_text)], ["long.dat"], 10 ** 7)
    assert notes == [("info", "loaded long.dat")]
    assert session.persistable(ws) == (ws, [])
    small = len(ws["datasets"][0]["content"])
    kept, left_out = session.persistable(ws, limit=small + 2000)
    assert left_out == ["long.dat"] and [d["name"] for d in kept["datasets"]] == ["debye.dat"]
    assert kept["active"] == kept["datasets"][0]["id"]
    assert len(ws["datasets"]) == 2   # the input is not modified
