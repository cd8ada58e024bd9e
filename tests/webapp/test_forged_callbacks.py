"""Forged callback values (issue 26): every server callback of the real app, each input or state replaced
by a value its component never sends, answers 200 with a message or 400 with one line — never 500."""

import json
import logging

import pytest

from webapp.app import create_app

CALLBACK_PATH = "/_dash-update-component"

#: Values a browser can post in place of anything: a slider at 'abc', a store as a dict/list/number.
FORGED = ("abc", {"x": [1]}, -1e308, ["a", None])


def _entry(spec, value):
    try:
        ident = json.loads(spec["id"])            # pattern ids come as JSON text
    except ValueError:
        ident = spec["id"]
    return {"id": ident, "property": spec["property"], "value": value}


def _outputs(output):
    parts = output[2:-2].split("...") if output.startswith("..") else [output]
    specs = [{"id": p.rsplit(".", 1)[0], "property": p.rsplit(".", 1)[1]} for p in parts]
    return specs if output.startswith("..") else specs[0]


def _forged_requests(deps):
    for dep in deps:
        inputs, states = dep["inputs"], dep.get("state", [])
        if dep.get("clientside_function") or any("[" in str(x["id"]) or "{" in str(x["id"])
                                                 for x in inputs + states + [{"id": dep["output"]}]):
            continue
        for i in range(len(inputs) + len(states)):
            for value in FORGED:
                args = [_entry(x, value if j == i else None) for j, x in enumerate(inputs + states)]
                yield dep["output"], {"output": dep["output"], "outputs": _outputs(dep["output"]),
                                      "inputs": args[:len(inputs)], "state": args[len(inputs):],
                                      "changedPropIds": [f"{inputs[0]['id']}.{inputs[0]['property']}"]}


@pytest.fixture
def client(tmp_path):
    app = create_app(workspace=tmp_path / "w.sqlite")
    logging.disable(logging.CRITICAL)                  # the guard logs each traceback; not needed here
    yield app.server.test_client()
    logging.disable(logging.NOTSET)
    create_app()


def test_a_forged_value_never_gives_500(client):
    client.get("/")
    deps = client.get("/_dash-dependencies").get_json()
    seen, refused, server_errors = 0, 0, []
    for output, body in _forged_requests(deps):
        r = client.post(CALLBACK_PATH, json=body)
        seen += 1
        text = r.get_data(as_text=True)
        assert "Traceback" not in text and 'File "' not in text, output
        if r.status_code >= 500:
            server_errors.append(output[:60])
        elif r.status_code == 400:
            refused += 1
            assert text.count("\n") == 1 and text.startswith("refused: "), text[:200]
    assert seen > 300                                   # every page's callbacks were reached
    assert server_errors == [], f"{len(server_errors)} of {seen} forged requests gave 500: {server_errors[:5]}"


def test_a_genuine_request_still_works(client):
    # the guard changes nothing for values the page sends: the active-dataset note of an empty workspace
    body = {"output": "th-active.children", "outputs": {"id": "th-active", "property": "children"},
            "inputs": [{"id": "mh-workspace", "property": "data", "value": {"datasets": [], "active": None}}],
            "state": [], "changedPropIds": ["mh-workspace.data"]}
    r = client.post(CALLBACK_PATH, json=body)
    assert r.status_code == 200 and "response" in r.get_json()
