"""The reading-options panel (webapp/reading.py): one place for formula and atoms, kept in the workspace.

Reference for per-gram values: the molar mass of Cu, 63.546 g/mol (IUPAC standard atomic weight, as the
``periodictable`` package gives it); values per gram = per mole / molar mass.
"""

from __future__ import annotations

import numpy as np
import pytest

from thermo.columns import column_name
from webapp import cache, reading, session
from webapp.app import create_app
from webapp.demo import demo_workspace


@pytest.fixture(scope="module", autouse=True)
def _app():
    create_app()


def _on_fcc(ws):
    fcc = next(d for d in ws["datasets"] if d["name"] == "springium_fcc.dat")
    return {**ws, "active": fcc["id"]}


def test_formula_from_the_panel_is_the_datasets_and_gives_per_gram_values():
    ws = _on_fcc(demo_workspace())
    assert "formula not given" in reading.summary(session.active(ws))
    new, note = reading.edited(ws, "Cu", None)
    current = session.active(new)
    assert session.options_of(current)["formula"] == "Cu" and "re-read with formula Cu" in note
    assert "formula Cu" in reading.summary(current)
    t = [300.0]
    per_mol = cache.table(current, t, "formula")[column_name("entropy", "formula")].iloc[0]
    per_gram = cache.table(current, t, "gram")[column_name("entropy", "gram")].iloc[0]
    assert per_gram == pytest.approx(per_mol / 63.546, rel=1e-4)
    again, note = reading.edited(new, "Cu", None)
    assert again is new and note is None                     # unchanged: nothing re-read, no loop
    kept, error = reading.edited(new, "Xq2", None)
    assert kept is new and "Xq" in error                     # a bad formula keeps the dataset as it was


def test_atom_count_from_the_panel():
    ws = _on_fcc(demo_workspace())
    assert "1 atoms per formula unit (from the DOS integral)" in reading.summary(session.active(ws))
    new, note = reading.edited(ws, "", 2)
    dos = cache.load(session.active(new))
    # a given count wins: the 3-mode file is read as 2 atoms, rescaled to 6 modes, and the warning says so
    assert dos.atoms == 2 and "atoms 2" in note and any("to 6 modes" in w for w in dos.warnings)
    per_formula = cache.table(session.active(new), [300.0], "formula")[column_name("entropy", "formula")].iloc[0]
    per_atom = cache.table(session.active(new), [300.0], "atom")[column_name("entropy", "atom")].iloc[0]
    assert np.isfinite(per_formula) and "2 atoms per formula unit" in reading.summary(session.active(new))
    assert per_atom > 0


def test_polynomials_calorimetry_and_quasiharmonic_pages_take_the_panels_formula():
    from webapp.pages import calorimetry, polynomials, quasiharmonic
    ws, _ = reading.edited(_on_fcc(demo_workspace()), "Cu", None)
    assert "formula Cu" in reading.summary(session.active(ws))
    # Polynomials: the Cantera block needs a formula; blank field → the dataset's (a typed one wins)
    block = polynomials.draw(ws, "nasa7", 298.15, 1000, None, 0, "cr", "", "yaml")[3]
    assert 'name: "Cu(cr)"' in block and 'composition: {"Cu": 1}' in block
    typed = polynomials.draw(ws, "nasa7", 298.15, 1000, None, 0, "cr", "Ag", "yaml")[3]
    assert 'name: "Ag(cr)"' in typed and 'composition: {"Ag": 1}' in typed
    # Calorimetry: the formula read with the measurement (J/(g K) needs it) is the dataset's
    _, content = calorimetry.calorimetry_download("json", None, ws, "dos", ["electronic"], "", "", 1, "header", "",
                                                  None, None)
    import json
    record = json.loads(content)["provenance"]
    assert record["inputs"][0]["options"]["formula"] == "Cu"
    # Quasi-harmonic: only a volume set made of loaded datasets takes the active dataset's formula
    assert quasiharmonic._formula("datasets", ws, "") == "Cu"
    assert quasiharmonic._formula("manifest", ws, "") is None
    assert quasiharmonic._formula("manifest", ws, "MgO") == "MgO"
