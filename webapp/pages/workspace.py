"""Workspace page: rename, annotate, group and delete datasets (with undo); remove deleted files for good;
switch named workspaces."""

from __future__ import annotations

import dash
from dash import Input, Output, State, callback, ctx, dcc, html, no_update

from thermo.errors import WorkspaceError

from .. import cache, persistence, session
from .. import components as c
from .. import figures as fg
from ..reporting import reported

PATH, NAME, ORDER = "/workspace", "Workspace", 11


# ---------------------------------------------------------------- pure edits of the workspace dict

def edited(workspace, dataset_id, name, group, note):
    """Workspace with one dataset renamed, regrouped and annotated (a blank name keeps the old one)."""
    old = session.find(workspace, dataset_id)
    if old is None:
        return workspace
    ws = session.renamed(workspace, dataset_id, name) if name and name != old["name"] else workspace
    if name and name != old["name"] and name in {d["name"] for d in workspace["datasets"]}:
        raise WorkspaceError(f"a dataset named {name!r} exists already")
    current = session.find(ws, dataset_id)
    return session.replaced(ws, {**current, "group": " ".join(str(group or "").split()),
                                 "note": str(note or "").strip()})


def deleted(workspace, dataset_id, trash):
    """``(workspace without the dataset, trash with it appended)``."""
    old = session.find(workspace, dataset_id)
    if old is None:
        return workspace, trash
    return session.removed(workspace, dataset_id), list(trash or []) + [old]


def undone(workspace, trash):
    """``(workspace with the last deleted dataset back, shorter trash, its name)``."""
    if not trash:
        return workspace, trash, None
    back = trash[-1]
    ws = session.with_dataset(workspace, {**back, "name": session.unique_name(workspace, back["name"])})
    return ws, trash[:-1], back["name"]


# ---------------------------------------------------------------- layout

def layout(**_query):
    """The workspace panel."""
    editor = c.controls(c.dropdown("ws-dataset", [], None, "Dataset"),
                        c.text("ws-name", "", "Name"),
                        c.text("ws-group", "", "Group", placeholder="e.g. convergence: mesh"),
                        c.text("ws-note", "", "Note"))
    buttons = html.Div([html.Button("Save", id="ws-save", className="mh-button"),
                        html.Button("Delete…", id="ws-delete", className="mh-button"),
                        html.Button("Undo delete", id="ws-undo", className="mh-button"),
                        html.Button("Remove deleted files for good", id="ws-purge", className="mh-button",
                                    title="Deleted datasets can no longer be undone; their bytes leave the "
                                          "server's file")], className="mh-controls")
    named = html.Div([
        html.H2("Named workspaces"),
        html.P("A named workspace is opened with its key (keep it private: whoever has it sees the datasets). "
               "The command line lists keys with `modeheat workspace spaces`.", className="mh-intro"),
        c.controls(c.field("Key", dcc.Input(id="ws-open-key", type="password", className="mh-input"), "ws-open-key"),
                   html.Button("Open", id="ws-open", className="mh-button"),
                   c.text("ws-new-name", "", "New named workspace"),
                   html.Button("Create", id="ws-create", className="mh-button"),
                   html.Button("Back to this browser's own workspace", id="ws-own", className="mh-button")),
        html.Div(id="ws-key-shown"),
    ], id="ws-named")
    return c.page(
        "Workspace", "Every dataset of this workspace with its group and note; rename, annotate, group or delete.",
        html.P(id="ws-where", className="mh-active-note"),
        c.messages_panel("ws-messages"),
        editor, buttons,
        dcc.ConfirmDialog(id="ws-confirm"),
        dcc.ConfirmDialog(id="ws-purge-confirm", message="Remove the deleted datasets of this workspace for good? "
                                                         "Undo delete cannot bring them back afterwards."),
        html.Div(id="ws-purged"),
        dcc.Store(id="ws-trash", storage_type="session", data=[]),
        dcc.Location(id="ws-reload", refresh=True),
        html.Div([html.Div(id="ws-list", className="mh-content"),
                  html.Div(c.graph("ws-preview-graph", "Phonon DOS of the chosen dataset"), className="mh-side")],
                 className="mh-split mh-split-right"),
        named)


def _listing(workspace):
    datasets = (workspace or {}).get("datasets", [])
    if not datasets:
        return c.no_data_note()
    head = html.Tr([html.Th(h) for h in ("name", "group", "note", "sha256", "size [bytes]", "origin")])
    body = [html.Tr([html.Td(d["name"]), html.Td(d.get("group", "")), html.Td(d.get("note", "")),
                     html.Td(d["sha256"][:12], title=d["sha256"]), html.Td(d.get("size") or len(session.content_bytes(d))),
                     html.Td("invented demo data" if d.get("invented") else "added")])
            for d in sorted(datasets, key=lambda d: (d.get("group", ""), d["name"]))]
    return html.Table([html.Thead(head), html.Tbody(body)], className="mh-table", id="ws-table")


# ---------------------------------------------------------------- callbacks

@callback(Output("ws-list", "children"), Output("ws-dataset", "options"), Output("ws-dataset", "value"),
          Output("ws-where", "children"), Input("mh-workspace", "data"), State("ws-dataset", "value"),
          State("mh-space", "data"))
@reported(lambda message: (c.message_items([("error", message)]), [], None, ""))
def show(workspace, selected, space):
    """The dataset table, the dataset choice and where the workspace is kept."""
    options = [{"label": d["name"], "value": d["id"]} for d in (workspace or {}).get("datasets", [])]
    ids = [o["value"] for o in options]
    value = selected if selected in ids else (session.active(workspace) or {}).get("id")
    if (space or {}).get("stored"):
        where = f"Kept on this server in workspace {persistence.current_space(dash.get_app().server).name!r}; " \
                "it is here after a reload, a closed tab or a server restart."
    else:
        where = "Kept in this browser tab only (the server has no workspace file): closing the tab loses it."
    return _listing(workspace), options, value, where


@callback(Output("ws-name", "value"), Output("ws-group", "value"), Output("ws-note", "value"),
          Input("ws-dataset", "value"), State("mh-workspace", "data"))
def pick(dataset_id, workspace):
    """The chosen dataset's name, group and note in the fields."""
    d = session.find(workspace, dataset_id) or {}
    return d.get("name", ""), d.get("group", ""), d.get("note", "")


@callback(Output("ws-preview-graph", "figure"), Input("ws-dataset", "value"), State("mh-workspace", "data"))
@reported(lambda message: fg.message_figure(message))
def preview(dataset_id, workspace):
    """The chosen dataset's DOS, to tell datasets apart while naming and grouping them."""
    d = session.find(workspace, dataset_id)
    return fg.dos_figure(cache.load(d)) if d is not None else fg.message_figure("no dataset chosen")


@callback(Output("ws-confirm", "displayed"), Output("ws-confirm", "message"), Input("ws-delete", "n_clicks"),
          State("ws-dataset", "value"), State("mh-workspace", "data"), prevent_initial_call=True)
def ask(_n, dataset_id, workspace):
    """Ask once before deleting."""
    d = session.find(workspace, dataset_id)
    if d is None:
        return False, ""
    return True, f"Delete {d['name']}? You can undo this until the tab is closed."


def _failed(message):
    return no_update, no_update, no_update, c.message_items([("error", message)])


@callback(Output("mh-workspace", "data", allow_duplicate=True), Output("mh-saved", "data", allow_duplicate=True),
          Output("ws-trash", "data"), Output("ws-messages", "children"),
          Input("ws-save", "n_clicks"), Input("ws-confirm", "submit_n_clicks"), Input("ws-undo", "n_clicks"),
          State("ws-dataset", "value"), State("ws-name", "value"), State("ws-group", "value"),
          State("ws-note", "value"), State("mh-workspace", "data"), State("ws-trash", "data"),
          State("mh-space", "data"), State("mh-config", "data"), prevent_initial_call=True)
@reported(_failed)
def edit(_save, _confirm, _undo, dataset_id, name, group, note, workspace, trash, space, config):
    """Save fields, delete (after the dialog) or undo the last delete."""
    trigger = ctx.triggered_id
    if trigger == "ws-save":
        new, notes = edited(workspace, dataset_id, name, group, note), [("info", "saved")]
    elif trigger == "ws-confirm":
        gone = (session.find(workspace, dataset_id) or {}).get("name")
        new, trash = deleted(workspace, dataset_id, trash)
        notes = [("info", f"deleted {gone}; Undo delete brings it back")]
    else:
        if (space or {}).get("stored") and trash:
            try:
                persistence.current_space(dash.get_app().server).restore(trash[-1]["id"])
            except WorkspaceError:
                pass                  # removed for good meanwhile: it is stored again as new
        new, trash, back = undone(workspace, trash)
        notes = [("info", f"{back} is back")] if back else [("warn", "nothing to undo")]
    if new is workspace:
        return no_update, no_update, trash, c.message_items(notes)
    new = session.revised(new)
    kept, _ = session.persistable(new, (config or {}).get("saved_limit_chars", session.SAVED_LIMIT_CHARS))
    return new, kept, trash, c.message_items(notes)


@callback(Output("ws-purge-confirm", "displayed"), Input("ws-purge", "n_clicks"), prevent_initial_call=True)
def ask_purge(_n):
    """Ask once before removing deleted datasets for good."""
    return True


@callback(Output("ws-purged", "children"), Output("ws-trash", "data", allow_duplicate=True),
          Input("ws-purge-confirm", "submit_n_clicks"), State("mh-space", "data"), prevent_initial_call=True)
@reported(lambda message: (c.message_items([("error", message)]), no_update))
def purge(_confirmed, space):
    """Remove this workspace's deleted datasets and every byte no dataset references, then compact the file."""
    if not (space or {}).get("stored"):
        return c.message_items([("info", "nothing kept on the server: deleted datasets are gone already")]), []
    done = persistence.purge(dash.get_app().server)
    return c.message_items([("info", f"removed {done['datasets']} deleted dataset(s) and "
                                     f"{done['blobs']} unused file(s) for good")]), []


@callback(Output("ws-reload", "href"), Output("ws-key-shown", "children"),
          Input("ws-open", "n_clicks"), Input("ws-create", "n_clicks"), Input("ws-own", "n_clicks"),
          State("ws-open-key", "value"), State("ws-new-name", "value"), State("mh-space", "data"),
          prevent_initial_call=True)
@reported(lambda message: (no_update, c.message_items([("error", message)])))
def switch(_open, _create, _own, key, new_name, space):
    """Open a named workspace by its key, create one (its key shown once), or go back to the browser's own."""
    if not (space or {}).get("stored"):
        return no_update, c.message_items([("error", "this server keeps no workspace file; start it with "
                                                     "--workspace PATH to use named workspaces")])
    server = dash.get_app().server
    if ctx.triggered_id == "ws-open":
        if persistence.open_named(server, (key or "").strip()) is None:
            return no_update, c.message_items([("error", "no named workspace has this key")])
        return PATH, no_update
    if ctx.triggered_id == "ws-create":
        made = persistence.create_named(server, new_name)
        return no_update, html.Div([
            html.P(f"Created {made.name!r}; this browser now uses it (reload any other open tab). "
                   "Its key, shown only now, opens it from another browser:", className="mh-msg mh-msg-info"),
            html.Code(made.key, id="ws-new-key"), html.P(dcc.Link("Show it", href=PATH, refresh=True))])
    persistence.own_space(server)
    return PATH, no_update


c.follow_image_format("ws-preview-graph")
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
