"""The Electronic page's callbacks, called directly (no browser)."""

from __future__ import annotations

import base64
import math

import numpy as np
import pytest
from scipy import constants as sc

from webapp.app import create_app

create_app()
from webapp.pages import PAGES, electronic as page  # noqa: E402  (pages need the app)

KB_EV = sc.k / sc.electron_volt


def _stored(text, name="flat.dat", **fields):
    return {"name": name, "contents": "data:text/plain;base64," + base64.b64encode(text.encode()).decode(),
            "fields": fields}


def _flat(g=2.0, header="E-E_F (eV) total", shift=0.0, extra=""):
    e = np.linspace(-5.0, 5.0, 101) + shift
    return extra + header + "\n" + "".join(f"{a:.6f} {g}\n" for a in e)


def _messages(out):
    return [(p.className, p.children) for p in out[5]]


def test_page_is_registered_and_shows_the_demo():
    assert page in PAGES and page.PATH == "/electronic"
    out = page.draw(None, 0, 600, 50, None)
    dos, ct, s = out[:3]
    assert [t.name for t in dos.data] == ["total (both spins)", "band-like", "d-like"]
    assert len(ct.data[0].x) == 12 and ct.data[0].x[0] == 50           # T = 0 has no C/T
    assert "springium_edos.dat" in out[4]
    assert any("invented demo" in text for _, text in _messages(out))


def test_flat_band_gives_the_sommerfeld_line():
    # A&M ch. 2: a constant g has C_el/T = (π²/3) k_B² g exactly at every T; 2 states/eV here.
    out = page.draw(_stored(_flat()), 10, 300, 10, None)
    expected = math.pi ** 2 / 3 * KB_EV ** 2 * 2.0 * sc.N_A * sc.electron_volt * 1e3   # mJ/(mol K²)
    np.testing.assert_allclose(out[1].data[0].y, expected, rtol=1e-8)
    assert out[1].layout.shapes[0].y0 == pytest.approx(expected, rel=1e-12)
    assert "γ = (π²/3) k_B² g(E_F)" in str(out[3])


def test_options_reach_the_reader():
    # Absolute energies 7 eV up: the Fermi field brings E_F back; formula units halve the DOS.
    text = _flat(shift=7.0, header="E (eV) total")
    out = page.draw(_stored(text, fermi="7", formula_units=2), 10, 20, 10, None)
    assert out[0].data[0].x[0] == pytest.approx(-5.0) and out[0].data[0].y[0] == pytest.approx(1.0)
    assert any("Fermi energy 7 eV" in text for _, text in _messages(out))


@pytest.mark.parametrize("text, fermi, message", [
    ("E (eV) total\n-1 1\n0.5 banana\n", "", "line 3, column 2: 'banana' is not a number"),
    ("-1 1\n1 1\n", "", "the energy unit is not stated"),
    (_flat(), "five", "the Fermi energy 'five' is not a number of eV"),
])
def test_errors_are_one_line(text, fermi, message):
    out = page.draw(_stored(text, fermi=fermi), 0, 100, 10, None)
    kind, shown = _messages(out)[0]
    assert "mh-msg-error" in kind and message in shown and "\n" not in shown and "Traceback" not in shown


def test_stored_entry_follows_upload_demo_and_fields(monkeypatch):
    # keep_file keeps the file and the fields as typed; an option change keeps the uploaded file.
    import dash

    def trigger(name):
        monkeypatch.setattr(dash, "ctx", type("Ctx", (), {"triggered_id": name})())
    upload = _stored(_flat())["contents"]
    trigger("el-upload")
    stored = page.keep_file(upload, 0, "file", "", "auto", 1, "mine.dat", None)
    assert stored["name"] == "mine.dat" and stored["fields"]["formula_units"] == 1
    trigger("el-fu")
    stored = page.keep_file(upload, 0, "file", "", "auto", 4, "mine.dat", stored)
    assert stored["name"] == "mine.dat" and stored["fields"]["formula_units"] == 4
    trigger("el-demo")
    assert page.keep_file(upload, 1, "file", "", "auto", 4, "mine.dat", stored)["name"] == "springium_edos.dat"
