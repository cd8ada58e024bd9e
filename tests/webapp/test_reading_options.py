"""Spectrum page: reading options apply to the next upload, refused files can be read again,
the manual low-frequency window starts from the automatic one.

The spectra are invented Debye-like test data; the reference is the library's own
load_dos with the same options (the thermodynamics themselves are checked against
mpmath in tests/preparation and tests/tables).
"""

import base64

import numpy as np
import pytest

from tests.spectra import debye_entropy, debye_table
from thermo import load_dos, tabulate
from webapp import session
from webapp.pages import spectrum

NU = np.linspace(0, 6, 121)
G3 = 9 * NU ** 2 / 6 ** 3           # 3 modes: one atom
NORMALISED = "# frequency (THz) dos\n" + "\n".join(f"{a} {b / 6}" for a, b in zip(NU, 2 * G3)) + "\n"   # integrates to 1
BARE = "\n".join(f"{a} {b}" for a, b in zip(NU, G3)) + "\n"                                            # no unit
STATED = "# frequency (THz) dos\n" + BARE


def _upload(ws, values, *texts, trigger="mh-upload-checked"):
    files = [{"name": f"f{k}.dat", "contents": "data:text/plain;base64," + base64.b64encode(t.encode()).decode()}
             for k, t in enumerate(texts)]
    job = {"files": files, "max_bytes": 10 ** 6, "pending": []}
    new, notes = spectrum.apply_edit(ws, trigger, values, job)
    return new, notes, job["pending"]


def _values(**change):
    values = spectrum.control_values(session.empty_workspace())
    values.update(change)
    return values


def test_atoms_typed_first_apply_to_the_upload():
    new, notes, pending = _upload(session.empty_workspace(), _values(**{"sp-atoms": 2}), NORMALISED)
    assert notes == [("info", "loaded f0.dat")] and pending == []
    d = session.active(new)
    assert session.options_of(d)["atoms"] == 2
    assert spectrum.control_values(new)["sp-atoms"] == 2


def test_unit_chosen_first_applies_to_a_bare_file():
    new, notes, _ = _upload(session.empty_workspace(), _values(**{"sp-unit": "THz"}), BARE)
    assert notes == [("info", "loaded f0.dat")]
    assert session.options_of(session.active(new))["freq_unit"] == "THz"


def test_refused_file_names_the_fix_and_is_read_again():
    ws = session.empty_workspace()
    new, notes, pending = _upload(ws, _values(), BARE)
    assert new["datasets"] == [] and len(pending) == 1
    kind, text = notes[0]
    assert kind == "error" and "frequency unit is not stated" in text
    assert "choose the Frequency unit under Reading options, then press Read again" in text
    assert text.count("f0.dat") == 1                      # the file is named once
    job = {"files": pending, "max_bytes": 10 ** 6, "pending": []}
    again, notes = spectrum.apply_edit(new, "sp-retry-btn", _values(**{"sp-unit": "THz"}), job)
    assert notes == [("info", "loaded f0.dat")] and job["pending"] == []
    reference = load_dos(BARE, freq_unit="THz")
    np.testing.assert_allclose(spectrum.cache.load(session.active(again)).dos, reference.dos, rtol=1e-12)


def test_options_carried_from_another_file_do_not_override_what_a_file_states():
    new, notes, _ = _upload(session.empty_workspace(), _values(**{"sp-unit": "cm-1", "sp-atoms": 2}), STATED)
    d = session.active(new)
    assert session.options_of(d)["freq_unit"] is None and session.options_of(d)["atoms"] is None
    assert spectrum.cache.load(d).source["freq_unit"] == "THz" and spectrum.cache.load(d).atoms == 1


def test_window_fields_start_from_the_automatic_window_and_typing_chooses_the_window():
    ws, _, _ = _upload(session.empty_workspace(), _values(), STATED)
    shown = spectrum.control_values(ws)
    fit = spectrum.cache.load(session.active(ws)).low_frequency
    assert shown["sp-lowmode"] == "auto"
    assert shown["sp-low-lo"] == pytest.approx(fit.window_thz[0], rel=1e-3)
    assert shown["sp-low-hi"] == pytest.approx(fit.window_thz[1], rel=1e-3)
    # choosing "window" with the pre-filled limits works (it used to say "needs 0 <= low < high")
    chosen, notes = spectrum.apply_edit(ws, "sp-lowmode", {**shown, "sp-lowmode": "manual"})
    assert notes == []
    assert session.options_of(session.active(chosen))["low_frequency"] != "auto"
    # a number typed while "automatic" is selected is used, not wiped
    typed, notes = spectrum.apply_edit(ws, "sp-low-hi", {**shown, "sp-low-lo": 0.5, "sp-low-hi": 1.5})
    assert notes == []
    assert session.options_of(session.active(typed))["low_frequency"] == "0.5:1.5"
    assert spectrum.control_values(typed)["sp-lowmode"] == "manual"


def test_empty_window_asks_for_both_limits():
    ws, _, _ = _upload(session.empty_workspace(), _values(), STATED)
    values = {**spectrum.control_values(ws), "sp-lowmode": "manual", "sp-low-lo": None, "sp-low-hi": None}
    same, notes = spectrum.apply_edit(ws, "sp-lowmode", values)
    assert same is ws and "type both limits" in notes[0][1]


def test_old_policy_name_in_a_saved_workspace_shows_the_new_choice():
    ws, _, _ = _upload(session.empty_workspace(), _values(), STATED)
    d = session.active(ws)
    d["options"]["negative"] = "keep-count"
    assert spectrum.control_values(ws)["sp-negative"] == "drop-unscaled"
    assert "drop-unscaled" in [c["value"] for c in spectrum.NEGATIVE_CHOICES]


def test_filling_in_the_automatic_window_changes_nothing():
    """The page writes the automatic window into the fields; that echo must not choose a window."""
    ws, _, _ = _upload(session.empty_workspace(), _values(), STATED)
    shown = spectrum.control_values(ws)
    same, notes = spectrum.apply_edit(ws, "sp-low-lo", shown)
    assert same is ws and notes == []


def test_showing_the_active_dataset_in_the_selector_keeps_the_messages():
    ws, _, _ = _upload(session.empty_workspace(), _values(), STATED)
    same, notes = spectrum.apply_edit(ws, "sp-dataset", {}, selected=session.active(ws)["id"])
    assert same is ws and notes == []


def test_sheet_option_reads_the_chosen_worksheet_of_an_upload():
    import io

    import openpyxl
    book = openpyxl.Workbook()
    book.active.title = "notes"
    book.active.append(["invented model, for a test"])
    sheet = book.create_sheet("dos")
    sheet.append(["Phonon DOS (invented)"])
    sheet.append(["frequency (THz)", "total"])
    for a, b in zip(NU, G3):
        sheet.append([float(a), float(b)])
    out = io.BytesIO()
    book.save(out)
    url = "data:application/octet-stream;base64," + base64.b64encode(out.getvalue()).decode()
    job = {"files": [{"name": "book.xlsx", "contents": url}], "max_bytes": 10 ** 6, "pending": []}
    refused, notes = spectrum.apply_edit(session.empty_workspace(), "mh-upload-checked", _values(), dict(job))
    assert refused["datasets"] == [] and "sheet" in notes[0][1]
    new, notes = spectrum.apply_edit(session.empty_workspace(), "mh-upload-checked", _values(**{"sp-sheet": "dos"}),
                                     {**job, "pending": []})
    assert notes == [("info", "loaded book.xlsx")]
    dos = spectrum.cache.load(session.active(new))
    assert dos.source["sheet"] == "dos" and dos.atoms == 1


def test_implausible_unit_is_warned_in_the_checks_panel():
    # THz numbers read as cm-1: the highest frequency becomes ~0.2 THz, below what solids have
    ws, _, _ = _upload(session.empty_workspace(), _values(**{"sp-unit": "cm-1"}), BARE)
    items = spectrum.warning_items(spectrum.cache.load(session.active(ws)))
    assert any(kind == "warn" and "check the frequency unit" in text for kind, text in items)


def test_impossible_unit_is_refused_in_one_line():
    # THz numbers read as rad/s: ~1e-12 THz, outside the accepted frequency range, refused (not loaded)
    ws, notes, _ = _upload(session.empty_workspace(), _values(**{"sp-unit": "rad/s"}), BARE)
    assert session.active(ws) is None
    errors = [text for kind, text in notes if kind == "error"]
    assert len(errors) == 1 and "f0.dat" in errors[0] and "\n" not in errors[0]


def test_refused_option_change_names_the_file_once():
    nu = np.linspace(-0.5, 6, 131)
    text = "# frequency (THz) dos\n" + "\n".join(f"{a} {0.01 if a < 0 else 9 * a * a / 216}" for a in nu) + "\n"
    ws, _, _ = _upload(session.empty_workspace(), _values(), text)
    same, notes = spectrum.apply_edit(ws, "sp-negative", {**spectrum.control_values(ws), "sp-negative": "refuse"})
    assert same is ws
    kind, message = notes[0]
    assert kind == "error" and "refuse" in message and message.count("f0.dat") == 1
    assert message.endswith("previous settings kept")


def test_after_a_read_again_in_mev_a_file_stating_wavenumbers_is_read_in_wavenumbers():
    # issue 25 item 1: a bare file read again in meV left meV (and the typed atom count) on the page;
    # the next upload, whose header says omega (cm^-1) but whose integral needs the atom count, was
    # read in meV: S(298 K) came out 0.83 instead of the Debye value.  The file's own unit must win.
    # Reference: Debye entropy by mpmath (tests/spectra.py), θ = 300 K; c = 299 792 458 m/s (exact).
    nu, g = debye_table(300.0, points=801)
    per_thz = 1e12 / 2.99792458e10
    mev_per_thz = 4.135667696            # h·1 THz in meV (CODATA 2018, h and e exact)
    bare = "\n".join(f"{a:.10g} {b:.10g}" for a, b in zip(nu * mev_per_thz, g / mev_per_thz)) + "\n"
    stated = "omega (cm^-1) dos\n" + "\n".join(f"{a:.10g} {b:.10g}" for a, b in zip(nu * per_thz, 0.37 * g / per_thz))
    ws, notes, pending = _upload(session.empty_workspace(), _values(), bare)
    assert pending and notes[0][0] == "error"
    job = {"files": pending, "max_bytes": 10 ** 6, "pending": []}
    ws, notes = spectrum.apply_edit(ws, "sp-retry-btn", _values(**{"sp-unit": "meV"}), job)
    assert notes == [("info", "loaded f0.dat")]
    page = {**spectrum.control_values(ws), "sp-atoms": 1}          # meV still shown, one atom typed
    assert page["sp-unit"] == "meV"
    ws, notes, _ = _upload(ws, page, stated + "\n")
    dos = spectrum.cache.load(session.active(ws))
    assert dos.source["freq_unit"] == "cm-1" and dos.atoms == 1
    s298 = float(tabulate(dos, [298.15])["entropy_J_per_mol_K"].iloc[0])
    assert s298 == pytest.approx(debye_entropy(300.0, 298.15), rel=1e-3)
    assert not any("meV" in w for w in dos.warnings)
    assert any("cm-1, the unit its header states" in text for _, text in notes)
    # the dataset keeps what was used for it: its own unit (none chosen) and the typed atom count
    assert session.options_of(session.active(ws))["freq_unit"] is None
    assert session.options_of(session.active(ws))["atoms"] == 1


def test_an_elastic_debye_temperature_typed_on_the_page_anchors_the_dataset():
    # θ_D = 300 K of the Debye DOS itself: its low-frequency θ is that value (Debye 1912, tests/spectra.py)
    ws, _, _ = _upload(session.empty_workspace(), _values(), STATED)
    shown = spectrum.control_values(ws)
    assert shown["sp-elastic"] is None
    anchored, notes = spectrum.apply_edit(ws, "sp-elastic", {**shown, "sp-elastic": 300})
    assert not [n for n in notes if n[0] == "error"]
    d = session.active(anchored)
    assert session.options_of(d)["low_frequency"] == "elastic:300.0"
    assert spectrum.cache.load(d).low_frequency_debye_temperature_k() == pytest.approx(300.0, rel=1e-9)
    again = spectrum.control_values(anchored)
    assert again["sp-lowmode"] == "elastic" and again["sp-elastic"] == 300.0
    # choosing the anchor without a θ asks for one; the next upload does not inherit it
    empty, notes = spectrum.apply_edit(ws, "sp-lowmode", {**shown, "sp-lowmode": "elastic"})
    assert empty is ws and "elastic Debye temperature" in notes[0][1]
    assert spectrum.upload_options({**again})["low_frequency"] in (None, "auto")


def test_a_mode_list_uploads_like_a_dos_and_lists_its_modes():
    # three Einstein-like modes per q-point (A. Einstein, Ann. Phys. 327, 180 (1907)): the page's dataset gives
    # the table of the modes themselves; the list names the mode count
    text = "weight frequency_THz\n" + "\n".join(f"0.5 {f}" for f in (1.0, 2.0, 3.0) * 2) + "\n"
    ws, notes, pending = _upload(session.empty_workspace(), _values(), text)
    assert pending == [] and not [n for n in notes if n[0] == "error"]
    dos = spectrum.cache.load(session.active(ws))
    assert dos.modes is not None and dos.mode_count == pytest.approx(3.0)
    assert spectrum.dataset_summary(session.active(ws))[3] == "6 modes"
    from scipy import constants as sc
    x = sc.h * np.array([1e12, 2e12, 3e12]) / (sc.k * 50.0)      # h ν / k_B T of the three modes
    cv = tabulate(dos, [50.0]).heat_capacity_v_J_per_mol_K[0]
    assert cv == pytest.approx(sc.R * np.sum(x * x * np.exp(x) / np.expm1(x) ** 2), rel=1e-9)
