"""Callback logic of each dashboard page, called directly (no browser).

Demo data is invented; reference values: CODATA constants via
scipy.constants, and the thermo command line's own output for exports.
"""

import base64
import io
import json

import numpy as np
import openpyxl
import pytest
from scipy import constants as sc

from tests.clirun import run_main
from thermo import load_dos, tabulate
from thermo.columns import column_name, label
from webapp import cache, intake, session
from webapp.demo import demo_workspace
from webapp.app import create_app
from webapp.pages import PAGES, compare, export, home, modemap, models, spectrum, thermodynamics

ALL = ["heat_capacity_v", "entropy", "internal_energy", "helmholtz_energy"]
S_MOL = column_name("entropy", "formula")
PLAIN = "# frequency (THz) dos\n" + "\n".join(f"{a} {9 * a * a / 125}" for a in np.linspace(0, 5, 101)) + "\n"
GARBAGE = "# frequency (THz) dos\n0 0\n1 0.1\n2 banana\n"


def url(text):
    return "data:text/plain;base64," + base64.b64encode(text.encode()).decode()


@pytest.fixture
def ws():
    new, _ = intake.add_uploads(session.empty_workspace(), [url(PLAIN)], ["debye.dat"], 10 ** 6)
    return new


@pytest.fixture(scope="module")
def demo():
    return demo_workspace()


def controls(ws, **change):
    values = spectrum.control_values(ws)
    values.update(change)
    return values


def test_every_page_lays_out_with_demo_and_with_nothing(demo):
    for module in PAGES:
        assert module.layout() is not None
    paths = [m.PATH for m in PAGES]
    assert len(set(paths)) == len(paths) and "/" in paths


def test_server_serves_layout_with_demo_datasets():
    client = create_app().server.test_client()
    assert client.get("/thermodynamics").status_code == 200
    layout = json.loads(client.get("/_dash-layout").data)
    text = json.dumps(layout)
    assert "mh-workspace" in text and "springium_fcc.dat" in text


def test_spectrum_garbage_upload_keeps_active_dataset(ws):
    upload = {"files": [{"name": "bad.dat", "contents": url(GARBAGE)}], "refused": [], "max_bytes": 10 ** 6}
    new, notes = spectrum.apply_edit(ws, "mh-upload-checked", controls(ws), upload)
    assert new["active"] == ws["active"] and len(new["datasets"]) == 1
    assert notes[0][0] == "error" and "line 4" in notes[0][1]


def test_spectrum_refused_by_size_is_reported(ws):
    upload = {"files": [], "refused": ["huge.dat: the file is 25.0 MB; the upload limit is 20 MB"]}
    new, notes = spectrum.apply_edit(ws, "mh-upload-checked", controls(ws), upload)
    assert new["datasets"] == ws["datasets"] and notes == [("error", upload["refused"][0])]


def test_spectrum_unit_change_and_bad_window(ws):
    new, notes = spectrum.apply_edit(ws, "sp-unit", controls(ws, **{"sp-unit": "cm-1"}))
    assert notes == [] and session.active(new)["options"]["freq_unit"] == "cm-1"
    # 1 cm-1 = c·100 Hz (CODATA via scipy.constants): the top frequency 5 cm-1 in THz
    top = cache.load(session.active(new)).input_frequency_thz[-1]
    assert top == pytest.approx(5 * sc.c * 100 / 1e12, rel=1e-9)
    bad, notes = spectrum.apply_edit(ws, "sp-low-hi", controls(ws, **{"sp-lowmode": "manual", "sp-low-lo": 2,
                                                                     "sp-low-hi": 1}))
    assert bad is ws and notes[0][0] == "error" and "window" in notes[0][1]
    bad, notes = spectrum.apply_edit(ws, "sp-atoms", controls(ws, **{"sp-atoms": 1.5}))
    assert bad is ws and "whole number" in notes[0][1]


def test_spectrum_manual_window_round_trips_to_controls(ws):
    new, notes = spectrum.apply_edit(ws, "sp-low-hi", controls(ws, **{"sp-lowmode": "manual", "sp-low-lo": 0.2,
                                                                     "sp-low-hi": 1.0}))
    assert notes == []
    shown = spectrum.control_values(new)
    assert (shown["sp-lowmode"], shown["sp-low-lo"], shown["sp-low-hi"]) == ("manual", 0.2, 1.0)
    assert cache.load(session.active(new)).low_frequency.window_thz == pytest.approx((0.2, 1.0), abs=0.06)


def test_spectrum_rename_remove(ws):
    new, _ = spectrum.apply_edit(ws, "sp-rename-btn", controls(ws), rename_text="cell 4x4x4")
    assert session.active(new)["name"] == "cell 4x4x4"
    gone, notes = spectrum.apply_edit(new, "sp-remove-btn", controls(new))
    assert gone["datasets"] == [] and notes[0][0] == "info"
    assert spectrum.apply_edit(gone, "sp-unit", controls(gone)) == (gone, [])


def test_spectrum_draw_shows_imaginary_share_of_unstable_demo(demo):
    soft = next(d for d in demo["datasets"] if "soft" in d["name"])
    dos_fig, red_fig, warnings, _ = spectrum.draw(session.activated(demo, soft["id"]))
    assert "THz" in dos_fig.layout.xaxis.title.text and "states/THz" in dos_fig.layout.yaxis.title.text
    share = cache.load(soft).source["negative_mode_fraction"]
    assert share > 0
    assert any(f"{100 * share:.3g} %" in w.children for w in warnings)
    assert any(t.name.startswith("partial") for t in dos_fig.data)


def test_thermodynamics_units_follow_the_basis(ws):
    cv_f = thermodynamics.draw(ws, 0, 500, 50, "formula", [])[0]
    cv_a = thermodynamics.draw(ws, 0, 500, 50, "atom", [])[0]
    y_f, y_a = np.asarray(cv_f.data[0].y), np.asarray(cv_a.data[0].y)
    # per atom in k_B: divide molar values by n·R (n = 1 here; R from scipy.constants)
    np.testing.assert_allclose(y_a, y_f / sc.R, rtol=1e-12)
    assert "k_B/atom" in cv_a.layout.yaxis.title.text and "J/(mol·K)" in cv_f.layout.yaxis.title.text


def test_thermodynamics_bad_settings_give_message_not_exception(ws):
    out = thermodynamics.draw(ws, 100, 0, 5, "formula", ["log"])
    assert "temperature" in out[-1][0].children
    out = thermodynamics.draw(ws, 0, 100, 5, "gram", [])   # no formula set
    assert "formula" in out[-1][0].children
    assert thermodynamics.draw(None, 0, 100, 5, "formula", [])[-1] == []


def cli_csv(path, spec, per):
    run = run_main("table", path, "--temperatures", spec, "--per", per, "--format", "csv")
    assert run.returncode == 0, run.stderr
    return run.stdout


def without_timestamp(text):
    return [ln for ln in text.splitlines() if not ln.startswith("# created_utc:")]


@pytest.mark.parametrize("per", ["formula", "atom"])
def test_export_csv_equals_command_line_output(tmp_path, ws, per):
    path = tmp_path / "debye.dat"
    path.write_text(PLAIN)
    name, content = export.export_bytes(session.active(ws), "0:600:20", per, ALL, "csv")
    assert name == f"debye-{per}.csv"
    assert without_timestamp(content.decode()) == without_timestamp(cli_csv(path, "0:600:20", per))


def test_export_xlsx_and_json_hold_the_tabulated_values(ws):
    t = np.arange(0.0, 301.0, 50.0)
    ref = tabulate(load_dos(PLAIN.encode(), name="debye.dat"), t, per="formula")
    _, js = export.export_bytes(session.active(ws), "0:300:50", "formula", ["heat_capacity_v", "helmholtz_energy"], "json")
    obj = json.loads(js)
    assert obj["columns"] == [ref.columns[0], ref.columns[1], ref.columns[4]]
    # 8 significant digits (the default of exports): within half a unit of the 8th digit
    np.testing.assert_allclose(np.array(obj["data"]), ref[[column_name(k) for k in ("temperature", "heat_capacity_v", "helmholtz_energy")]].to_numpy(), rtol=5e-8, atol=0)
    assert obj["provenance"]["significant_digits"] == 8
    assert [i["name"] for i in obj["provenance"]["inputs"]] == ["debye.dat"]
    _, xl = export.export_bytes(session.active(ws), "0:300:50", "formula", ALL, "xlsx")
    sheet = openpyxl.load_workbook(io.BytesIO(xl))["table"]
    rows = list(sheet.values)
    assert list(rows[0]) == list(ref.columns)
    np.testing.assert_allclose(np.array(rows[1:], dtype=float), ref.to_numpy(), rtol=5e-8, atol=0)


def test_export_preview_and_errors(ws):
    text, fig, msgs = export.preview(ws, "0:100:10", "formula", ["entropy", "helmholtz_energy"])
    assert text.startswith("# tool: modeheat") and msgs == []
    assert fig.layout.yaxis.title.text == "S [J/(mol·K)]" and len(fig.data[0].x) == 11
    text, _, msgs = export.preview(ws, "ten to twenty", "formula", ["heat_capacity_v"])
    assert text == "" and "temperatures" in msgs[0].children
    assert export.image_format("svg", {"image_format": "png"}) == {"image_format": "svg"}


def _grouped(demo, names, group):
    ws = demo
    for d in demo["datasets"]:
        if d["name"] in names:
            ws = session.replaced(ws, {**session.find(ws, d["id"]), "group": group})
    return ws


def test_compare_selects_by_group_all_none_and_never_all_at_first(demo):
    ids = {d["name"]: d["id"] for d in demo["datasets"]}
    assert len(ids) > 2
    # first visit without groups: the active dataset alone (not every dataset)
    assert compare.selection(demo, None, None, None) == [session.active(demo)["id"]]
    ws = _grouped(demo, ("springium_fcc.dat", "springium_md.csv"), "springium runs")
    assert compare.groups(ws) == ["springium runs"]
    by_group = compare.selection(ws, "cmp-group", [], "springium runs")
    assert sorted(by_group) == sorted([ids["springium_fcc.dat"], ids["springium_md.csv"]])
    assert compare.selection(ws, "cmp-all", by_group, None) == [d["id"] for d in ws["datasets"]]
    assert compare.selection(ws, "cmp-none", by_group, None) == []
    assert compare.selection(ws, None, [], None) == []            # "none" stays none when the workspace changes


def test_compare_relative_differences_with_each_runs_error(demo):
    fcc = next(d for d in demo["datasets"] if d["name"] == "springium_fcc.dat")
    md = next(d for d in demo["datasets"] if d["name"] == "springium_md.csv")
    over, diff, table, msgs = compare.draw(demo, [fcc["id"], md["id"]], fcc["id"], "entropy", "relative",
                                           "5,20,298.15", 25, 500, 25, "formula")
    assert msgs == []
    t = np.arange(25.0, 501.0, 25.0)
    s_fcc, s_md = cache.table(fcc, t, "formula")[S_MOL].to_numpy(), cache.table(md, t, "formula")[S_MOL].to_numpy()
    line = next(tr for tr in diff.data if tr.name == "springium_md.csv")
    np.testing.assert_allclose(np.asarray(line.y), 100 * (s_md - s_fcc) / np.abs(s_fcc), rtol=1e-12, atol=1e-12)
    assert "[%]" in diff.layout.yaxis.title.text and len(over.data) == 2
    text = str(table)
    assert "S ± error [J/(mol·K)]" in text and "ΔS/S [%]" in text
    at = cache.table(md, [298.15], "formula")[S_MOL].iloc[0], cache.table(fcc, [298.15], "formula")[S_MOL].iloc[0]
    assert f"{100 * (at[0] - at[1]) / abs(at[1]):+.3g}" in text
    _, absolute, table_abs, _ = compare.draw(demo, [fcc["id"], md["id"]], fcc["id"], "entropy", "absolute",
                                             "298.15", 25, 500, 25, "formula")
    line = next(tr for tr in absolute.data if tr.name == "springium_md.csv")
    np.testing.assert_allclose(np.asarray(line.y), s_md - s_fcc, rtol=1e-12, atol=1e-12)
    assert "[J/(mol·K)]" in absolute.layout.yaxis.title.text and f"{at[0] - at[1]:+.4g}" in str(table_abs)
    _, alone, _, one = compare.draw(demo, [fcc["id"]], fcc["id"], "entropy", "relative", "298.15", 25, 500, 25,
                                    "formula")
    assert "at least two runs" in one[0].children and len(alone.data) == 1     # its own error band only


def test_compare_download_equals_compare_command(demo, tmp_path, capsys):
    from thermo.cli.main import main
    from thermo.io.readback import read_exported_csv
    from webapp.demo import demo_file
    fcc = next(d for d in demo["datasets"] if d["name"] == "springium_fcc.dat")
    md = next(d for d in demo["datasets"] if d["name"] == "springium_md.csv")
    name, content = compare.comparison_download("csv", demo, [fcc["id"], md["id"]], md["id"], "5,20,298.15", "atom")
    assert name == "springium_md-comparison.csv"
    assert main(["compare", str(demo_file("springium_fcc.dat")), str(demo_file("springium_md.csv")),
                 "--reference", str(demo_file("springium_md.csv")), "--temperatures", "5,20,298.15",
                 "--per", "atom"]) == 0
    ours, meta = read_exported_csv(content)
    theirs, cli_meta = read_exported_csv(capsys.readouterr().out.encode())
    assert list(ours.columns) == list(theirs.columns) and len(ours) == 6
    np.testing.assert_array_equal(ours.select_dtypes("number").to_numpy(), theirs.select_dtypes("number").to_numpy())
    assert meta["comparison"]["reference"] == cli_meta["comparison"]["reference"] == "springium_md.csv"
    assert [i["sha256"] for i in meta["inputs"]] == [i["sha256"] for i in cli_meta["inputs"]]


def test_models_and_mode_map_draw_with_demo(demo):
    options = models.choices(demo, None, None)
    assert options[1] and options[3]
    figs = models.draw(demo, options[1], options[3], 1, 0, 400, 10, "formula", "heat_capacity_v")
    # only the dataset's own warnings, each once (no error)
    shown = [m.children for m in figs[-1]]
    expected = [f"{session.active(demo)['name']}: {w}" for w in cache.load(session.active(demo)).warnings]
    assert shown == expected and all(m.className.endswith("warn") for m in figs[-1]) and len(figs[0].data) >= 3
    heat, msgs = modemap.draw_map(demo, "heat_capacity_share", 10, 400)
    assert msgs == []
    share = np.asarray(heat.data[0].customdata)
    np.testing.assert_allclose(share.sum(axis=0), 100.0, rtol=1e-6)   # each column is a whole (100 %)
    # the colour is per temperature: every column reaches the top of the scale, the bar says so
    colour = np.asarray(heat.data[0].z)
    np.testing.assert_allclose(colour.max(axis=0), 100.0, rtol=1e-12)
    assert "relative to the largest bin at that T" in heat.data[0].colorbar.title.text
    # over the page's default range, on the share itself the hottest column would use a small part of the
    # scale (the issue: "everything above ~50 K looks blank"); per temperature it reaches the top
    wide, _ = modemap.draw_map(demo, "heat_capacity_share", 2, 1000)
    wide_share = np.asarray(wide.data[0].customdata)
    assert wide_share[:, -1].max() < 0.2 * wide_share.max() and np.asarray(wide.data[0].z)[:, -1].max() == 100.0
    logged, _ = modemap.draw_map(demo, "heat_capacity_share", 10, 400, "log")
    np.testing.assert_allclose(np.asarray(logged.data[0].z), np.log10(np.maximum(share, 1e-4)), rtol=1e-12)
    assert logged.data[0].colorbar.title.text.startswith("C_v: log₁₀")
    cum, planck, text = modemap.draw_explorer(demo, np.log10(300.0))
    assert text == "T = 300 K" and np.asarray(cum.data[0].y)[-1] == pytest.approx(100.0, rel=1e-6)


def test_mode_map_bad_range_is_a_message(demo):
    fig, msgs = modemap.draw_map(demo, "entropy_share", 400, 10)
    assert "T from < T to" in msgs[0].children
    fig, msgs = modemap.draw_map(demo, "entropy_share", None, 10)
    assert "two numbers" in msgs[0].children


def test_home_summary_for_demo_and_empty(demo):
    children, fig = home.summary(demo)
    assert len(fig.data) >= 1
    note, _ = home.summary(session.empty_workspace())
    assert "No dataset" in str(note)


def test_unit_choice_shows_the_unit_the_file_states(ws):
    d = session.active(ws)
    assert spectrum.unit_options(d)[0]["label"] == "as stated in file (THz)"
    chosen, _ = intake.with_options(ws, d["id"], {"freq_unit": "cm-1"})
    assert spectrum.unit_options(session.active(chosen))[0]["label"] == "as stated in file (THz)"
    assert [o["value"] for o in spectrum.unit_options(d)[1:]] == ["THz", "cm-1", "meV", "eV", "Hz", "rad/s",
                                                                     "rad/ps", "K"]


@pytest.mark.parametrize("per", ["formula", "atom", "gram"])
def test_models_page_works_in_every_basis(demo, per):
    d = session.active(demo)
    ws, error = intake.with_options(demo, d["id"], {"formula": "LiCs"})   # 2 atoms, like the demo crystal
    assert error is None
    opts = models.choices(ws, None, None)
    values, residual, lowt, thetad, msgs = models.draw(ws, opts[1], opts[3], 1, 0, 600, 20, per, "heat_capacity_v")
    assert all(m.className.endswith("warn") for m in msgs) and len(values.data) == 4
    expected = cache.table(session.active(ws), np.arange(0.0, 601.0, 20.0), per)[column_name("heat_capacity_v", per)]
    np.testing.assert_array_equal(np.asarray(values.data[0].y), expected.to_numpy())
    # the axis names the schema's quantity and unit (thermo.columns)
    assert values.layout.yaxis.title.text == label(column_name("heat_capacity_v", per))


def test_calorimetry_revisit_reuses_the_fit_and_a_new_setting_refits(demo, monkeypatch):
    # the fit is memoised on the file's content and the settings: the same page state twice fits once
    from thermo.calorimetry import report as calreport
    from webapp.pages import calorimetry
    calls = []
    real = calreport.analyse
    monkeypatch.setattr(calorimetry, "analyse", lambda *a, **k: calls.append(1) or real(*a, **k))
    settings = dict(stored=None, workspace=demo, lattice="dos", terms=["electronic"], fix="", fit_range="2:250",
                    atoms=1, unit="header", formula="")
    first = calorimetry.draw(**settings)
    second = calorimetry.draw(**settings)
    assert len(calls) == 1
    assert repr(first[3:5]) == repr(second[3:5])      # key numbers and parameter table
    calorimetry.draw(**{**settings, "terms": []})
    assert len(calls) == 2
