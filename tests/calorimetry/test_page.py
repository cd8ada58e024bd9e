"""Calorimetry page callback: thin over thermo, numbers as the library gives them, errors as messages."""

import numpy as np
import pytest

from webapp.app import create_app


@pytest.fixture(scope="module")
def page():
    create_app()
    from webapp.pages import calorimetry
    return calorimetry


@pytest.fixture(scope="module")
def workspace():
    from webapp import demo, session
    ws = demo.demo_workspace()
    spring = next(d for d in ws["datasets"] if d["name"] == "springium_fcc.dat")
    return session.activated(ws, spring["id"])


def _text(component):
    return str(component)


def test_demo_fit_with_active_dos_shows_scale_and_entropies(page, workspace):
    # The invented demo was generated with the springium DOS softened by 4 % (scale 0.96).
    out = page.draw(page.demo_measurement(), workspace, "dos", ["electronic", "nernst-lindemann"],
                    "", "", 1, "header", "")
    overlay, residual, lowt, keys, params, _active, note, messages = out
    names = [t.name for t in overlay.data]
    assert names[0] == "measured C_p" and "fitted C_p" in names and any("C_v of the DOS" in n for n in names)
    assert len(residual.data[0].x) == 85 and len(lowt.data) == 2
    text = _text(params)
    assert "frequency scale s" in text and "0.959" in text and "cal-correlation" in text
    assert "S°(298.15 K), data" in _text(keys) and "S(298.15 K) of the DOS" in _text(keys)
    assert "85 points" in note
    y_fit = np.asarray(overlay.data[1].y)
    assert np.all(np.isfinite(y_fit)) and y_fit[-1] == pytest.approx(25.0, rel=0.1)


def test_held_gamma_and_bad_fix_text(page, workspace):
    out = page.draw(page.demo_measurement(), workspace, "debye", ["electronic"], "gamma=1.1e-3", "20:350",
                    1, "header", "")
    assert "held" in _text(out[4])
    bad = page.draw(page.demo_measurement(), workspace, "debye", [], "zeta=1", "", 1, "header", "")
    assert "unknown parameter 'zeta'" in _text(bad[-1]) and "Traceback" not in _text(bad[-1])


def test_first_visit_shows_the_demo_measurement(page, workspace):
    out = page.draw(None, workspace, "debye", [], "", "", 1, "header", "")
    assert "springium_cp.csv" in out[-2] and "invented demo measurement" in _text(out[-1])


def test_upload_over_the_limit_is_refused_with_a_message(page, workspace):
    import base64
    contents = "data:text/csv;base64," + base64.b64encode(b"T,Cp\n" + b"1,2\n" * 3000).decode()
    stored = page.uploaded_measurement(contents, "big.csv", max_bytes=1000)
    out = page.draw(stored, workspace, "debye", [], "", "", 1, "header", "")
    assert "big.csv: the file is 0.012 MB; the upload limit is 0.001 MB" in _text(out[-1])
    assert page.uploaded_measurement(contents, "ok.csv", max_bytes=10 ** 6)["contents"] == contents


def test_upload_limit_comes_from_the_server_not_the_browser(page, workspace, monkeypatch):
    # Issue 26: the page read its limit from the browser's mh-config store.  The limit is the server's,
    # and a stored upload (browser state, forgeable) is checked again before it is decoded.
    import base64

    import dash
    from dash._callback import GLOBAL_CALLBACK_MAP
    states = [s["id"] for k, cb in GLOBAL_CALLBACK_MAP.items() if "cal-measured.data" in k for s in cb["state"]]
    assert "mh-config" not in states
    server = dash.get_app().server
    monkeypatch.setitem(server.config, "MODEHEAT_MAX_UPLOAD_BYTES", 1000)
    contents = "data:text/csv;base64," + base64.b64encode(b"T,Cp\n" + b"1,2\n" * 3000).decode()
    assert "refused" in page.uploaded_measurement(contents, "big.csv", page.upload_limit())
    forged = {"name": "big.csv", "contents": contents}          # not marked refused by the browser
    out = page.draw(forged, workspace, "debye", [], "", "", 1, "header", "")
    assert "the upload limit is 0.001 MB" in _text(out[-1])


def test_label_names_the_dataset_actually_used(page):
    # Issue 25 item 7: the demo measurement is paired with the demo DOS while another dataset is active;
    # the label said "Dataset: springium_fcc.dat" as if it were the active one.
    import base64

    from webapp import demo, session
    ws = demo.demo_workspace()
    active = next(d for d in ws["datasets"] if d["name"] == "lightheavy_rocksalt.tsv")
    ws = session.activated(ws, active["id"])
    out = page.draw(page.demo_measurement(), ws, "dos", ["electronic", "nernst-lindemann"], "", "", 1, "header", "")
    label = _text(out[5])
    assert "springium_fcc.dat" in label and "lightheavy_rocksalt.tsv is not used" in label
    # An uploaded measurement uses the active dataset, and the label says so.
    text = "T (K),Cp (J/(mol K))\n" + "".join(f"{t},{49.0 * (t / 300) ** 3 / (1 + (t / 300) ** 3)}\n"
                                               for t in range(10, 310, 10))
    stored = {"name": "mine.csv", "contents": "data:text/csv;base64," + base64.b64encode(text.encode()).decode()}
    mine = page.draw(stored, ws, "debye", [], "", "", 2, "header", "")
    label = _text(mine[5])
    assert "lightheavy_rocksalt.tsv" in label and "not used" not in label and "the active dataset" in label
    assert any("lightheavy_rocksalt.tsv" in t.name for t in mine[0].data)


def test_every_quoted_value_carries_its_uncertainty(page, workspace):
    out = page.draw(page.demo_measurement(), workspace, "dos", ["electronic", "nernst-lindemann"],
                    "", "", 1, "header", "")
    keys, params = _text(out[3]), _text(out[4])
    assert keys.count("±") >= 5 and "H°(298.15 K) − H°(0)" in keys and "below the first point" in keys
    assert params.count("±") >= 3


def test_the_demo_metal_ticks_gamma_an_upload_keeps_the_choice(page):
    import dash
    assert page.metal_for_the_demo(None, ["nernst-lindemann"]) == ["electronic", "nernst-lindemann"]
    assert page.metal_for_the_demo(page.demo_measurement(), ["electronic"]) is dash.no_update
    assert page.metal_for_the_demo({"name": "mine.csv", "contents": ""}, ["nernst-lindemann"]) is dash.no_update
