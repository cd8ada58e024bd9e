"""Thermodynamics page: the estimated error as a shaded band and as columns of the download (issue 23).

The dataset is an 8³-mesh DOS of the spring-model test crystal (tests/crystal.py; exact values
from a q-sphere integral near Γ plus a fine mesh, Ashcroft & Mermin 1976 ch. 23 for the T³ limit).
"""

import base64
import json

import numpy as np
import pytest

from tests import crystal as C
from webapp import intake, session
from webapp.pages import thermodynamics


@pytest.fixture
def ws():
    text = C.dos_text(*C.gaussian_dos(C.BCC, 8, 0.12))
    url = "data:text/plain;base64," + base64.b64encode(text.encode()).decode()
    return intake.add_uploads(session.empty_workspace(), [url], ["bcc8.dat"], 10 ** 7)[0]


def test_band_is_the_estimated_error_and_covers_the_exact_heat_capacity(ws):
    figs = thermodynamics.draw(ws, 2, 40, 2, "formula", [])[:4]
    cv = figs[0]
    band = [tr for tr in cv.data if tr.name == "estimated error"]
    line = [tr for tr in cv.data if tr.name == "bcc8.dat"]
    assert len(band) == 1 and band[0].fill == "toself"
    t = np.asarray(line[0].x, float)
    y = np.asarray(band[0].y, float)
    high, low = y[: t.size], y[t.size:][::-1]
    exact = C.reference(C.BCC, t)["heat_capacity_v"]
    assert np.all((low <= exact + 1e-12) & (exact <= high + 1e-12))


def test_download_carries_the_error_columns_and_flags(ws):
    name, body = thermodynamics.table_download("json", ws, 2, 300, 2, "formula")
    doc = json.loads(body)
    assert name.endswith(".json")
    assert "entropy_error_J_per_mol_K" in doc["columns"] and "error_reason" in doc["columns"]


def test_spectrum_page_lists_every_part_and_the_undetermined_range():
    from thermo import load_dos
    from webapp.pages.spectrum import accuracy_items
    items = accuracy_items(load_dos(C.dos_text(*C.gaussian_dos(C.BCC, 8, 0.12)), atoms=1))
    texts = [t for _, t in items]
    assert any("not determined by the data" in t for t in texts)
    five = [(k, t) for k, t in items if t.startswith("error estimate C_v(5 K)")]
    assert five[0][0] == "warn" and "resolution ±" in five[0][1] and "smearing ±" in five[0][1]
