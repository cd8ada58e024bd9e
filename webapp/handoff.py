"""Send a result on to the next page: one browser store (``mh-sent`` in the shell) holding what was sent.

A page that can pass a result on adds :func:`send_bar` and registers :func:`register_send` per
target with a ``build(*states)`` returning ``(name, CSV bytes)`` — the same file its download
writes, provenance included.  The receiving page reads it with :func:`received` and
:func:`sent_table`, so what it computes from a sent table equals what the matching command
computes from the downloaded file.  The store is the browser's (session storage): nothing is
shared between users.
"""

from __future__ import annotations

import hashlib

from dash import Input, Output, State, callback, dcc, html, no_update

from .reporting import reported

#: The id of the store in the shell.
STORE_ID = "mh-sent"
#: Pages that receive: key → (path, page name, what they take).
TARGETS = {"polynomials": ("/polynomials", "Polynomials", "a C_p table to fit"),
           "phases": ("/phases", "Phases", "a table to compare as a phase"),
           "compare": ("/compare", "Compare", "a table to compare with other runs"),
           "calorimetry": ("/calorimetry", "Calorimetry", "a fitted γ to compare")}


def store():
    """The store of sent results (one per browser tab)."""
    return dcc.Store(id=STORE_ID, storage_type="session")


def send_bar(prefix, what, targets):
    """Buttons "Send <what> to <page>" with a note each (ids ``<prefix>-send-<target>[-note]``)."""
    parts = []
    for target in targets:
        parts += [html.Button(f"Send {what} to {TARGETS[target][1]}", id=f"{prefix}-send-{target}", n_clicks=0,
                              className="mh-button"),
                  html.Span(id=f"{prefix}-send-{target}-note", className="mh-hint", role="status")]
    return html.Div(parts, className="mh-inline mh-send")


def register_send(prefix, target, states, build, page_name):
    """Register the send button of ``target``: ``build(*state values) -> (name, CSV bytes)`` or None."""
    path, title, _ = TARGETS[target]

    def failed(message):
        return no_update, message

    @callback(Output(STORE_ID, "data", allow_duplicate=True), Output(f"{prefix}-send-{target}-note", "children"),
              Input(f"{prefix}-send-{target}", "n_clicks"), State(STORE_ID, "data"), *states,
              prevent_initial_call=True)
    @reported(failed)
    def send(clicks, sent, *values):
        if not clicks:          # a page opened by its address inserts the button: Dash calls this with 0 clicks
            return no_update, no_update
        made = build(*values)
        if made is None:
            return no_update, "nothing to send: no result shown"
        name, content = made
        text = content.decode("utf-8") if isinstance(content, bytes) else str(content)
        item = {"name": name, "from": page_name, "csv": text,
                "sha256": hashlib.sha256(text.encode("utf-8")).hexdigest()}
        return {**(sent or {}), target: item}, ["sent ", html.Strong(name), " — open ",
                                                 dcc.Link(title, href=path)]
    return send


def received(sent, target):
    """The item sent to ``target`` (``name``, ``from``, ``csv``, ``sha256``), or None."""
    item = (sent or {}).get(target)
    return item if isinstance(item, dict) and item.get("csv") else None


def sent_table(item):
    """``(table, provenance)`` of a sent item, read as the exported CSV is read back."""
    from thermo.io.readback import read_exported_csv
    return read_exported_csv(item["csv"].encode("utf-8"))


def follow_sent(target, choice_id):
    """Register the callback that offers what was sent to ``target`` in the radio ``choice_id``.

    The radio's first option stays the page's own source; a sent item adds the option
    ``sent`` and selects it.
    """
    @callback(Output(choice_id, "options"), Output(choice_id, "value"), Input(STORE_ID, "data"),
              State(choice_id, "options"))
    def offer(sent, options):
        return offered(sent, target, options)
    return offer


def offered(sent, target, options):
    """``(options, value)`` of a receiving page's source choice: its own first option, plus ``sent`` (chosen).

    Examples
    --------
    >>> own = [{"label": "active dataset", "value": "dataset"}]
    >>> offered({}, "polynomials", own)[1]
    'dataset'
    >>> item = {"name": "t.csv", "from": "Quasi-harmonic", "csv": "x"}
    >>> offered({"polynomials": item}, "polynomials", own)[1]
    'sent'
    """
    own = [o for o in options or [] if o.get("value") != "sent"][:1]
    item = received(sent, target)
    if item is None:
        return own, own[0]["value"] if own else None
    return own + [{"label": f"sent from {item['from']}: {item['name']}", "value": "sent"}], "sent"
