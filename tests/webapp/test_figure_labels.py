"""Names from users are plain text in figures (issue 26): plotly renders <b>, <span style>, <a href> and
follows right-to-left overrides in trace names, so a dataset named with markup restyled every legend.
The callbacks are posted to the real app through its Flask test client."""

import json
from pathlib import Path

import pytest

from webapp import session
from webapp.app import create_app
from webapp.pages import compare, thermodynamics

ROOT = Path(__file__).resolve().parents[2]
HOSTILE = "<b>bold</b><span style='font-size:90px'>big</span><a href='javascript:alert(1)'>x</a>\u202eevil"
MARKUP = ("<b>", "<span", "<a ", "\u202e")


def _defaults(layout):
    """``{component id: value}`` of a page layout (what the page sends before anyone types)."""
    found = {}

    def walk(node):
        if isinstance(node, (list, tuple)):
            for item in node:
                walk(item)
            return
        ident = getattr(node, "id", None)
        if isinstance(ident, str) and hasattr(node, "value"):
            found[ident] = getattr(node, "value", None)
        walk(getattr(node, "children", None) or [])
    walk(layout)
    return found


def _post(client, output_prefix, workspace, defaults):
    deps = client.get("/_dash-dependencies").get_json()
    dep = next(d for d in deps if d["output"].startswith(output_prefix))
    def entry(spec):
        value = workspace if spec["id"] == "mh-workspace" else defaults.get(spec["id"])
        return {"id": spec["id"], "property": spec["property"], "value": value}
    parts = dep["output"][2:-2].split("...")
    body = {"output": dep["output"], "outputs": [{"id": p.rsplit(".", 1)[0], "property": p.rsplit(".", 1)[1]}
                                                 for p in parts],
            "inputs": [entry(x) for x in dep["inputs"]], "state": [entry(x) for x in dep.get("state", [])],
            "changedPropIds": ["mh-workspace.data"]}
    r = client.post("/_dash-update-component", json=body)
    assert r.status_code == 200, r.get_data(as_text=True)[:300]
    return r.get_json()["response"]


def _trace_names(response):
    names = []
    for outputs in response.values():
        for value in outputs.values():
            if isinstance(value, dict) and "data" in value:
                names += [t.get("name", "") for t in value["data"]]
    return names


@pytest.fixture
def client():
    yield create_app().server.test_client()
    create_app()


def _workspace(*names):
    raw = (ROOT / "sample_dos" / "springium_fcc.dat").read_bytes()
    ws = session.empty_workspace()
    for name in names:
        ws = session.with_dataset(ws, session.new_dataset(name, raw))
    return ws


def test_thermodynamics_legend_shows_markup_as_text(client):
    response = _post(client, "..th-cv-graph.figure", _workspace(HOSTILE), _defaults(thermodynamics.layout()))
    names = _trace_names(response)
    assert names and all(m not in n for n in names for m in MARKUP), names
    assert any("&lt;b&gt;bold&lt;/b&gt;" in n and "\\u202eevil" in n for n in names)


def test_compare_legend_shows_markup_as_text(client):
    ws = _workspace(HOSTILE, "plain")
    defaults = {**_defaults(compare.layout()), "cmp-datasets": [d["id"] for d in ws["datasets"]],
                "cmp-reference": ws["datasets"][1]["id"]}
    names = _trace_names(_post(client, "..cmp-overlay-graph.figure", ws, defaults))
    assert len(names) >= 2 and all(m not in n for n in names for m in MARKUP), names
    assert "plain" in names                                   # ordinary names are unchanged
