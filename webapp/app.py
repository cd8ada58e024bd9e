"""The Dash application: shell layout, routing and page registration.

``create_app()`` builds an app; ``app`` and ``server`` (the WSGI object) are
module-level instances for ``gunicorn webapp.app:server``.
"""

from __future__ import annotations

import logging
import os

from dash import Dash, Input, Output, State, ctx, dcc, html, no_update

from . import components, state
from .pages import PAGES

_UPLOAD_CHECK_JS = """
function(contents, names, config) {
    const nu = window.dash_clientside.no_update;
    if (!contents) { return nu; }
    const limit = (config && config.max_upload_bytes) || 0;
    const files = [], refused = [];
    contents.forEach(function(c, i) {
        const comma = c.indexOf(',');
        const b64 = comma < 0 ? c.length : c.length - comma - 1;
        const bytes = Math.floor(b64 * 3 / 4);
        if (limit && bytes > limit) {
            refused.push(names[i] + ': the file is ' + (bytes / 1e6).toFixed(1) +
                         ' MB; the upload limit is ' + (limit / 1e6) + ' MB');
        } else {
            files.push({name: names[i], contents: c});
        }
    });
    return {files: files, refused: refused, stamp: Date.now()};
}
"""


_NAV_JS = """
function(pathname) {
    const paths = %s;
    const here = "/" + (pathname || "/").replace(/^\\/+|\\/+$/g, "");
    return paths.map(p => p === here ? "mh-nav-link mh-nav-here" : "mh-nav-link");
}
""" % [m.PATH for m in PAGES]


def _page_for(pathname):
    path = "/" + (pathname or "/").strip("/")
    for module in PAGES:
        if module.PATH == path:
            return module
    return None


def _with_image_format(node, image_format):
    """Set the modebar image format of every graph in a layout tree."""
    if isinstance(node, (list, tuple)):
        for child in node:
            _with_image_format(child, image_format)
        return node
    if isinstance(node, dcc.Graph):
        node.config = components.graph_config(image_format, node.id)
    children = getattr(node, "children", None)
    if children is not None and not isinstance(children, str):
        _with_image_format(children, image_format)
    return node


def route(pathname, workspace, shown, prefs):
    """Page layout for ``pathname`` and the record of what is shown."""
    workspace = workspace or state.empty_workspace()
    record = {"path": pathname, "rev": workspace.get("rev")}
    if ctx.triggered_id == "mh-workspace" and shown == record:
        return no_update, no_update
    module = _page_for(pathname)
    if module is None:
        return [components.page("Page not found", f"There is no page at {pathname}.",
                                dcc.Link("Go to the overview", href="/"))], record
    fmt = (prefs or {}).get("image_format", "png")
    mirror = dcc.Store(id=module.WORKSPACE, data=workspace)
    try:
        return [mirror, _with_image_format(module.layout(workspace, prefs), fmt)], record
    except Exception as exc:  # never break the shell
        return [mirror, components.page(module.NAME, state.one_line(exc))], record


def restore(saved, workspace):
    """Workspace restored from the tab's session storage (after a reload)."""
    if not saved or (workspace or {}).get("rev") == saved.get("rev"):
        return no_update
    return saved


def shell(demo, max_upload_bytes, saved_limit_chars=state.SAVED_LIMIT_CHARS):
    """The layout common to all pages."""
    nav = [dcc.Link(module.NAME, href=module.PATH, className="mh-nav-link", id=f"mh-nav-{module.PATH.strip('/') or 'home'}")
           for module in PAGES]
    return html.Div([
        dcc.Location(id="mh-url", refresh=False),
        dcc.Store(id="mh-workspace", storage_type="memory", data=demo),
        dcc.Store(id="mh-saved", storage_type="session"),
        dcc.Store(id="mh-prefs", storage_type="session", data={"image_format": "png"}),
        dcc.Store(id="mh-config", data={"max_upload_bytes": max_upload_bytes,
                                        "saved_limit_chars": saved_limit_chars}),
        dcc.Store(id="mh-route", storage_type="memory"),
        html.Header([html.Div([html.Span("mode", className="mh-brand-a"), html.Span("heat", className="mh-brand-b")],
                              className="mh-brand"),
                     html.Nav(nav, className="mh-nav", **{"aria-label": "pages"})], className="mh-header"),
        html.Main(id="mh-page", className="mh-main"),
        html.Footer([html.Strong("Caution. "), components.CAUTION], className="mh-footer", id="mh-caution"),
    ], className="mh-shell")


def create_app(max_upload_mb=None, demo_dir=None, saved_limit_chars=state.SAVED_LIMIT_CHARS):
    """Build the dashboard.

    Parameters
    ----------
    max_upload_mb : float, optional
        Per-file upload limit [MB]; default from ``MODEHEAT_MAX_UPLOAD_MB`` or 20.
    demo_dir : path, optional
        Folder of demo DOS files loaded on a first visit (default ``sample_dos/``).
    saved_limit_chars : int, optional
        Largest workspace kept in the tab's session storage (see
        :func:`webapp.state.persistable`).
    """
    if max_upload_mb is None:
        max_upload_mb = float(os.environ.get("MODEHEAT_MAX_UPLOAD_MB", state.DEFAULT_MAX_UPLOAD_MB))
    max_bytes = int(float(max_upload_mb) * 1e6)
    demo = state.demo_workspace(demo_dir)
    app = Dash(__name__, title="modeheat", suppress_callback_exceptions=True,
               assets_folder=os.path.join(os.path.dirname(__file__), "assets"),
               update_title=None)
    app.layout = shell(demo, max_bytes, saved_limit_chars)
    app.server.config["MODEHEAT_MAX_UPLOAD_BYTES"] = max_bytes

    # Each page reads the workspace from its own store (id ``WORKSPACE``) rendered
    # with it, so no callback mixes inputs of the shell with inputs of a page that
    # may be absent.  The page is rebuilt when the path changes or when the
    # workspace changes from outside the page (restored from "mh-saved", the
    # tab's session storage); a page's own edit is recorded in "mh-route" and
    # not rebuilt.
    app.callback(Output("mh-page", "children"), Output("mh-route", "data"),
                 Input("mh-url", "pathname"), Input("mh-workspace", "data"),
                 State("mh-route", "data"), State("mh-prefs", "data"))(route)

    app.callback(Output("mh-workspace", "data", allow_duplicate=True), Input("mh-saved", "data"),
                 State("mh-workspace", "data"), prevent_initial_call="initial_duplicate")(restore)
    app.clientside_callback(_NAV_JS, [Output(f"mh-nav-{m.PATH.strip('/') or 'home'}", "className") for m in PAGES],
                            Input("mh-url", "pathname"))
    app.clientside_callback(_UPLOAD_CHECK_JS, Output("mh-upload-checked", "data"),
                            Input("mh-upload", "contents"), State("mh-upload", "filename"),
                            State("mh-config", "data"), prevent_initial_call=True)
    for module in PAGES:
        module.register(app)
    return app


logging.getLogger("werkzeug").setLevel(logging.WARNING)
app = create_app()
server = app.server
