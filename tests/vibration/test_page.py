"""The Displacements page's callbacks, called directly (no browser).

Reference: Willis and Pryor's Debye-model ⟨u²⟩ evaluated with mpmath (test_displacements.py);
Anderson's θ_D for aluminium (handbook constants from memory, test_elastic.py).
"""

from __future__ import annotations

import numpy as np
import pytest

from tests.spectra import debye_table, dos_text
from tests.vibration.test_displacements import THETA, willis_pryor_msd
from webapp import session
from webapp.app import create_app
from webapp.demo import demo_workspace

create_app()
from webapp.pages import PAGES, displacements as page  # noqa: E402  (pages need the app)


def _workspace(formula="Al"):
    raw = dos_text(*debye_table(THETA)).encode()        # invented test spectrum, one atom
    ds = session.new_dataset("debye_test.dat", raw, {"formula": formula})
    return session.with_dataset(session.empty_workspace(), ds)


def test_page_is_registered():
    assert page in PAGES and page.PATH == "/displacements"


def test_curves_follow_the_debye_closed_form():
    # Aluminium mass (periodictable via the formula) in Willis and Pryor's formula (mpmath).
    import periodictable
    out = page.draw(_workspace(), 0, 960, 32, "", None)
    msd = out[0].data[0]
    mass = periodictable.elements.symbol("Al").mass
    for t_over in (0.0, 0.1, 1.0, 3.0):
        i = int(round(t_over * THETA / 32))
        assert msd.y[i] == pytest.approx(willis_pryor_msd(msd.x[i] / THETA, THETA, mass), rel=1e-5)
    theta_m = np.asarray(out[2].data[0].y, float)
    np.testing.assert_allclose(theta_m, THETA, rtol=1e-4)       # θ_M of a Debye crystal is θ
    assert out[5] == [] or all("error" not in p.className for p in out[5])


def test_lindemann_warning_and_line_on_the_page():
    out = page.draw(_workspace(), 0, 1000, 10, "", 1.0)
    texts = [p.children for p in out[5]]
    assert any("Lindemann ratio" in t for t in texts)
    assert out[3].layout.shapes and out[3].layout.shapes[0].y0 == pytest.approx(0.1)
    quiet = page.draw(_workspace(), 0, 300, 10, "", 5.0)
    assert not any("Lindemann" in p.children for p in quiet[5])


def test_bad_masses_give_one_line_error():
    out = page.draw(_workspace(), 0, 300, 10, "Al=heavy", None)
    assert "SPECIES=MASS" in out[5][0].children and "mh-msg-error" in out[5][0].className


def test_demo_species_get_their_invented_masses():
    out = page.draw(demo_workspace(), 0, 300, 10, "", None)
    assert "invented demo species" in out[5][0].children
    assert {t.name for t in out[0].data} >= {"Ly", "Hv"}


def test_elastic_comparison():
    # Aluminium constants (from memory, see test_elastic.py) against a Debye DOS with θ = 320 K.
    div = page.elastic(_workspace(), 114.3, 61.92, 31.62, 2.733, None, None)
    text = str(div)
    assert "430.8 K" in text and "'320 K'" in text
    assert "by -25.7 %" in text and "mh-msg-warn" in text              # (320 - 430.8)/430.8 = -25.7 %
    hint = page.elastic(_workspace(), None, None, None, None, None, None)
    assert "Enter the density" in hint.children


def test_download_carries_table_and_cautions():
    # The downloaded CSV reads back to the same ⟨u²⟩ (Willis–Pryor reference) with the caution.
    import base64
    from thermo.io.readback import read_exported_csv
    import periodictable
    data, note = page.download(1, _workspace(), 0, 960, 320, "", 1.0, "csv")
    assert data["filename"] == "debye_test_displacements.csv" and "prepared" in note[0].children
    raw = base64.b64decode(data["content"]) if data.get("base64") else data["content"].encode()
    table, meta = read_exported_csv(raw)
    mass = periodictable.elements.symbol("Al").mass
    want = [willis_pryor_msd(t / THETA, THETA, mass) for t in (0.0, 320.0, 640.0, 960.0)]
    np.testing.assert_allclose(table["mean_square_displacement_A2"], want, rtol=1e-5)
    assert any("Lindemann" in w for w in meta["warnings"])


@pytest.mark.parametrize("prefix", ["dw", "th", "mod", "mm", "po", "ex"])
def test_the_dataset_label_follows_the_workspace_alone(prefix):
    # issue 25 item 7: the Displacements page said "No dataset loaded" beside the error of the
    # dataset it had just tried (the label was an output of the computation, left as it was on failure)
    deps = create_app().server.test_client().get("/_dash-dependencies").get_json()
    producers = [d for d in deps if f"{prefix}-active.children" in d["output"].split("...")
                 or d["output"] == f"{prefix}-active.children"]
    assert len(producers) == 1 and producers[0]["output"] == f"{prefix}-active.children"
    assert [(i["id"], i["property"]) for i in producers[0]["inputs"]] == [("mh-workspace", "data")]


def test_a_failing_computation_keeps_the_dataset_named():
    ws = _workspace()
    out = page.draw(ws, 0, 300, 10, "Al=heavy", None)
    assert "mh-msg-error" in out[5][0].className
    from webapp import components
    note = components.active_note(session.active(ws))
    assert "debye_test.dat" in str(note.children) and "No dataset" not in str(note.children)
