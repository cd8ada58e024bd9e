"""The Phases page's callbacks, called directly (no browser): the invented demo pair and workspace datasets.

Truth for the harmonic check: the closed-form Debye free energy (Debye 1912) with mpmath.
"""

from __future__ import annotations

import json

import mpmath as mp
import numpy as np
import pytest

from tests.phases.references import crossing, debye_free_energy
from tests.spectra import debye_table, dos_text
from thermo.phases import Phase, compare_phases
from thermo.quasiharmonic import read_manifest
from webapp import session
from webapp.app import create_app

create_app()
from webapp.pages import PAGES, phases as page  # noqa: E402  (pages need the app)


def texts(node):
    """Every text inside a Dash component tree."""
    if isinstance(node, (list, tuple)):
        return " ".join(texts(n) for n in node)
    if hasattr(node, "children"):
        return texts(node.children)
    return "" if node is None else str(node)


def test_registered_and_the_demo_pair_shows_its_transitions():
    assert page in PAGES and page.PATH == "/phases"
    rows = page.input_rows(page.DEFAULT_CHOICE, session.empty_workspace(), [])
    delta, boundary, table, messages = page.draw(rows, "eV", 0, 1000, 10, "0, 1, 2", "on", session.empty_workspace())
    # the same numbers in-process from the demo manifests
    alpha = read_manifest(page.demo_file(*page.DEMO_SETS["demo:alpha"][1]))
    beta = read_manifest(page.demo_file(*page.DEMO_SETS["demo:beta"][1]))
    result = compare_phases([Phase("alpha", alpha), Phase("beta", beta)], np.arange(0.0, 1000.1, 10.0),
                            pressures_gpa=[0.0, 1.0, 2.0])
    text = texts(table)
    for tr in result.transitions:
        assert f"{tr['temperature_K']:.5g} ± {tr['uncertainty_K']:.2g}" in text
    assert len(boundary.data) > 1 and any(t.name == "alpha → beta" for t in boundary.data)
    bands = [t for t in delta.data if t.fill == "toself"]
    assert len(bands) == 3                                  # beta at three pressures


def test_typed_values_stay_with_their_phase():
    ws = session.empty_workspace()
    rows = page.input_rows(page.DEFAULT_CHOICE, ws, [])
    rows[1].update(static="0.01", phase="β")
    again = page.input_rows(list(reversed(page.DEFAULT_CHOICE)), ws, rows)
    assert again[0]["phase"] == "β" and again[0]["static"] == "0.01" and again[1]["static"] == 0.0


def test_workspace_datasets_are_harmonic_phases(tmp_path):
    ws = session.empty_workspace()
    for name, theta, atoms in (("hard.dat", 400.0, 1), ("soft.dat", 300.0, 2)):
        ws = session.with_dataset(ws, session.new_dataset(name, dos_text(*debye_table(theta, atoms, 2001)).encode()))
    chosen = [f"ds:{d['id']}" for d in ws["datasets"]]
    assert {o["value"] for o in page.choices(ws)} >= set(chosen)
    rows = page.input_rows(chosen, ws, [])
    rows[1]["static"] = 6.0
    _, boundary, table, _ = page.draw(rows, "kJ/mol", 0, 1000, 5, "0", "on", ws)
    with mp.workdps(30):
        truth = crossing(lambda t: debye_free_energy(300, t) + mp.mpf(3.0 * page.ENERGY_UNITS["kJ/mol"])
                         - debye_free_energy(400, t), 300.0)
    shown = texts(table)
    assert f"{truth:.5g}" in shown                           # T* within 5 significant digits of mpmath
    assert "choose volume sets" in json.dumps(boundary.to_plotly_json(), default=str)


def test_download_carries_the_provenance():
    rows = page.input_rows(page.DEFAULT_CHOICE, session.empty_workspace(), [])
    sent, _ = page.download(1, rows, session.empty_workspace(), "eV", 0, 1000, 20, "0", "off", "json")
    import base64
    doc = json.loads(base64.b64decode(sent["content"]))
    assert doc["transitions"][0]["low_phase"] == "alpha"
    roles = [i["role"] for i in doc["provenance"]["inputs"]]
    assert sum("manifest" in r for r in roles) == 2 and len(roles) == 24


def test_bad_values_are_one_line_messages():
    rows = page.input_rows(page.DEFAULT_CHOICE, session.empty_workspace(), [])
    rows[0]["static"] = "abc"
    out = page.draw(rows, "eV", 0, 1000, 10, "0", "on", session.empty_workspace())
    assert "not a number" in texts(out[3])
    with pytest.raises(Exception, match="numbers in GPa"):
        page.parse_pressures("1, x")
