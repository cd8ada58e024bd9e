"""Sending a result on to the Phases page (headless Chromium, port 8097): the comparison the page downloads
equals ``modeheat phases`` run in-process on the table that was sent (read from the browser's store),
beside the active dataset's DOS file.
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest

from tests.browser.test_dashboard import no_console_errors, wait_drawn
from tests.browser.waits import text, until
from thermo.cli.main import main
from thermo.io.readback import read_exported_csv
from webapp.app import create_app
from webapp.demo import demo_file, demo_workspace

pytestmark = pytest.mark.browser
PORT = 8097


@pytest.fixture
def duo(dash_duo):
    dash_duo.start_server(create_app(), port=PORT)
    dash_duo.driver.set_window_size(1280, 1000)
    return dash_duo


def _value(driver, css):
    return driver.execute_script("const e = document.querySelector(arguments[0]); return e ? e.value : '';", css)


def _sent_to_phases_equals_command(duo, prefix, tmp_path):
    duo.find_element(f"#{prefix}-send-phases").click()
    note = until(lambda: text(duo.driver, f"#{prefix}-send-phases-note").startswith("sent ")
                 and text(duo.driver, f"#{prefix}-send-phases-note"))
    name = note[len("sent "):].split(" — ")[0].strip()

    def stored():           # the item this click sent (the store may still hold an earlier one)
        item = json.loads(duo.driver.execute_script("return window.sessionStorage.getItem('mh-sent') || '{}';"))
        return item.get("phases") if (item.get("phases") or {}).get("name") == name else None
    until(stored)
    until(lambda: duo.driver.execute_script(          # the link of the note (clicked in one call: no stale handle)
        "const a = document.querySelector(arguments[0]); if (a) { a.click(); } return !!a;",
        f"#{prefix}-send-phases-note a[href='/phases']"))
    until(lambda: "sent from" in text(duo.driver, "#ph-choice"))
    until(lambda: "stable" in text(duo.driver, "#ph-transitions") or "→" in text(duo.driver, "#ph-transitions"))
    wait_drawn(duo.driver, ["ph-delta-graph"])
    low, high = float(_value(duo.driver, "#ph-tmin")), float(_value(duo.driver, "#ph-tmax"))
    names = duo.driver.execute_script("return Array.from(document.querySelectorAll('#ph-rows td[data-dash-column="
                                      "phase]')).map(e => e.innerText.trim());")
    duo.find_element("#ph-download-btn").click()
    target = Path(duo.download_path) / f"phases-{'-'.join(names)}.csv"
    until(lambda: target.exists() and target.stat().st_size > 0)
    item = until(stored)          # what the Phases page compared: the store as it is now
    sent = tmp_path / item["name"]
    sent.write_text(item["csv"], encoding="utf-8")
    ws = demo_workspace()                           # the page's workspace on a first visit
    active = next(d["name"] for d in ws["datasets"] if d["id"] == ws["active"])
    cli = tmp_path / "cli.csv"
    assert main(["phases", f"{names[0]}={sent}", f"{names[1]}={demo_file(active)}", "--temperatures",
                 f"{low:g}:{high:g}:10", "--output", str(cli)]) == 0
    ours, meta = read_exported_csv(target)
    theirs, cli_meta = read_exported_csv(cli)
    assert list(ours.columns) == list(theirs.columns) and len(ours) > 10
    np.testing.assert_array_equal(ours.select_dtypes("number").to_numpy(), theirs.select_dtypes("number").to_numpy())
    assert [i["sha256"] for i in meta["inputs"]] == [i["sha256"] for i in cli_meta["inputs"]]
    no_console_errors(duo)
    return low, high, meta


def test_quasiharmonic_table_sent_to_phases_equals_the_phases_command(duo, tmp_path):
    from webapp.pages.quasiharmonic import _GRAPHS
    duo.driver.get(duo.server_url + "/quasiharmonic")
    wait_drawn(duo.driver, list(_GRAPHS))
    low, high, meta = _sent_to_phases_equals_command(duo, "qh", tmp_path)
    assert (low, high) == (0.0, 1000.0) and meta["inputs"][0]["role"].endswith("quasi-harmonic table")


def test_calorimetry_table_sent_to_phases_equals_the_phases_command(duo, tmp_path):
    from webapp.pages.calorimetry import _GRAPHS
    duo.driver.get(duo.server_url + "/calorimetry")
    wait_drawn(duo.driver, list(_GRAPHS))
    low, high, meta = _sent_to_phases_equals_command(duo, "cal", tmp_path)
    assert 0 < low < 10 and 300 <= high < 1000 and meta["inputs"][0]["role"].endswith("calorimetry table")


def test_quasiharmonic_table_sent_to_compare_is_a_run_as_the_compare_command(duo, tmp_path):
    from webapp.pages.quasiharmonic import _GRAPHS
    duo.driver.get(duo.server_url + "/quasiharmonic")
    wait_drawn(duo.driver, list(_GRAPHS))
    duo.find_element("#qh-send-compare").click()
    note = until(lambda: text(duo.driver, "#qh-send-compare-note").startswith("sent ")
                 and text(duo.driver, "#qh-send-compare-note"))
    name = note[len("sent "):].split(" — ")[0].strip()
    until(lambda: duo.driver.execute_script(
        "const a = document.querySelector(arguments[0]); if (a) { a.click(); } return !!a;",
        "#qh-send-compare-note a[href='/compare']"))
    until(lambda: duo.driver.execute_script(
        "const e = document.querySelector('#cmp-sent input[value=sent]'); return e && e.checked;"))
    until(lambda: name in text(duo.driver, "#cmp-difference-table"))
    duo.driver.find_element("css selector", "#cmp-dl-format input[value='csv']").click()
    duo.find_element("#cmp-dl-btn").click()
    shown = until(lambda: text(duo.driver, "#cmp-dl-note").startswith("prepared ")
                  and text(duo.driver, "#cmp-dl-note"))[len("prepared "):]
    target = Path(duo.download_path) / shown
    until(lambda: target.exists() and target.stat().st_size > 0)
    item = json.loads(duo.driver.execute_script("return window.sessionStorage.getItem('mh-sent') || '{}';"))["compare"]
    sent = tmp_path / item["name"]
    sent.write_text(item["csv"], encoding="utf-8")
    ws = demo_workspace()
    active = next(d["name"] for d in ws["datasets"] if d["id"] == ws["active"])
    cli = tmp_path / "cli.csv"
    assert main(["compare", str(demo_file(active)), "--table", str(sent), "--per", "atom", "--temperatures",
                 "5,20,298.15", "--output", str(cli)]) == 0
    ours, meta = read_exported_csv(target)
    theirs, cli_meta = read_exported_csv(cli)
    assert list(ours["run"]) == [active] * 3 + [name] * 3 and list(ours.columns) == list(theirs.columns)
    np.testing.assert_array_equal(ours.select_dtypes("number").to_numpy(), theirs.select_dtypes("number").to_numpy())
    assert [i["sha256"] for i in meta["inputs"]] == [i["sha256"] for i in cli_meta["inputs"]]
    assert meta["inputs"][-1]["role"] == "table run"
    no_console_errors(duo)
