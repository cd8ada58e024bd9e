"""Sending results on (webapp/handoff.py): what the receiving page fits equals the command on the downloaded file.

The reference is ``modeheat polynomial FILE --cp-table`` run in-process on the file the sending page's
download writes; the coefficients must be the same numbers.
"""

from __future__ import annotations

import hashlib
import json

import pytest

from thermo.cli.main import main
from webapp import handoff
from webapp.app import create_app
from webapp.demo import demo_workspace


@pytest.fixture(scope="module", autouse=True)
def _app():
    create_app()


def _item(name, content, page):
    text = content.decode("utf-8")
    return {"name": name, "from": page, "csv": text, "sha256": hashlib.sha256(content).hexdigest()}


def test_calorimetry_table_sent_to_polynomials_fits_as_the_command(tmp_path, capsys):
    from webapp.pages import calorimetry, polynomials
    ws = demo_workspace()
    name, content = calorimetry.calorimetry_download("csv", None, ws, "dos", ["electronic", "nernst-lindemann"],
                                                     "", "", 1, "header", "", None, None)
    sent = {"polynomials": _item(name, content, "Calorimetry")}
    assert handoff.received(sent, "polynomials")["name"] == name and handoff.received(sent, "phases") is None
    _, fit, entry = polynomials.fitted_table(handoff.received(sent, "polynomials"), "shomate", 200, 350, None, 0,
                                             "cr", "")
    assert entry["role"] == "heat-capacity table" and entry["sha256"] == hashlib.sha256(content).hexdigest()
    path = tmp_path / name
    path.write_bytes(content)
    assert main(["polynomial", str(path), "--cp-table", "--range", "200:350"]) == 0
    theirs = json.loads(capsys.readouterr().out)
    assert [r["coefficients"] for r in fit.to_dict()["ranges"]] == [r["coefficients"] for r in theirs["ranges"]]
    # the page's choice offers the sent table beside its own source and selects it
    options, value = handoff.offered(sent, "polynomials", [{"label": "own", "value": "dataset"}])
    assert value == "sent" and [o["value"] for o in options] == ["dataset", "sent"]
    options, value = handoff.offered({}, "polynomials", options)
    assert value == "dataset" and len(options) == 1
