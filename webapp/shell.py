"""The Dash instance and the page shell: header with navigation, shared stores, the page container, caution.

Dash's pages mechanism is used: each module of :mod:`webapp.pages` calls
``dash.register_page`` and owns its layout and callbacks.  Pages are
registered after this instance exists (Dash requires it), by importing
:mod:`webapp.pages`; :mod:`webapp.app` does both and is the entry point.

Settings live in the Flask config (``MODEHEAT_*`` keys), set by
:func:`configure` from options and the environment, never from the browser.
The request-body limit (Flask ``MAX_CONTENT_LENGTH``) follows from the same
upload setting (:func:`webapp.intake.request_limit`): an oversize request is
refused with HTTP 413 from its ``Content-Length`` (or, streamed, as soon as the
limit is passed) before its body is read; a JSON body nested too deep or holding too many
objects is refused with HTTP 400 before it is parsed, and page requests are held to the
budgets of :mod:`webapp.budget`.  Every response carries the
security headers of :func:`security_headers`.
"""

from __future__ import annotations

import logging
import os
import re

import dash
from dash import ALL, ClientsideFunction, Dash, Input, Output, State, dcc, html, no_update

from . import budget, components, demo, handoff, hosts, intake, persistence, session
from .reporting import attempt, install_guard

ASSETS = os.path.join(os.path.dirname(__file__), "assets")
#: The plotting library's cartesian bundle (scatter, heatmap and the other 2-D traces: 1.5 MB instead of
#: the 4.8 MB full bundle Dash would fetch when the first graph appears), the unchanged file of the npm
#: package ``plotly.js-cartesian-dist-min`` (MIT licence beside it).  Loaded as an asset, it defines
#: ``window.Plotly`` and Dash's graphs use it instead of fetching the full bundle.
PLOT_BUNDLE = os.path.join(ASSETS, "vendor", "plotly-cartesian.min.js")


def plot_bundle_version(path=PLOT_BUNDLE):
    """The plotly.js version stated in the head of the bundled file ('' when it states none)."""
    with open(path, encoding="utf-8") as handle:
        match = re.search(r"plotly\.js \(cartesian[^)]*\) v(\d+\.\d+\.\d+)", handle.read(400))
    return match.group(1) if match else ""


def assets_ignore(plotly_js_version=None):
    """Dash's ``assets_ignore`` pattern: the cartesian bundle is left out when its version is not the
    plotly.js version of the installed plotly package (then Dash serves that package's full bundle)."""
    if plotly_js_version is None:
        from plotly.offline import get_plotlyjs_version
        plotly_js_version = get_plotlyjs_version()
    bundled = plot_bundle_version()
    if bundled == plotly_js_version:
        return ""
    logging.getLogger(__name__).warning(
        "the bundled plotly.js cartesian %s is not plotly's %s: serving plotly's full bundle (4.8 MB) instead",
        bundled or "(no version)", plotly_js_version)
    return r"^plotly-cartesian\.min\.js$"


app = Dash(__name__, title="modeheat", use_pages=True, pages_folder="", suppress_callback_exceptions=True,
           assets_folder=ASSETS, assets_ignore=assets_ignore(), update_title=None)
server = app.server
logging.getLogger("werkzeug").setLevel(logging.WARNING)

_DEMO = {}
_CSP = {}


def configure(max_upload_mb=None, demo_dir=None, saved_limit_chars=None, workspace=None, bound_host=None):
    """Set the server's settings (upload limit [MB], demo folder, session-storage limit [characters],
    workspace file: None keeps the workspace in the browser only; the host bound to, allowed in ``Host``
    besides loopback and ``MODEHEAT_ALLOWED_HOSTS``; trusted proxies: :mod:`webapp.hosts`)."""
    hosts.configure(server, bound_host)
    if max_upload_mb is None:
        max_upload_mb = float(os.environ.get("MODEHEAT_MAX_UPLOAD_MB", intake.DEFAULT_MAX_UPLOAD_MB))
    upload_bytes = int(float(max_upload_mb) * 1e6)
    if not upload_bytes > 0:
        raise ValueError(f"the upload limit must be > 0 MB, not {max_upload_mb!r}")
    server.config["MODEHEAT_MAX_UPLOAD_BYTES"] = upload_bytes
    server.config["MAX_CONTENT_LENGTH"] = intake.request_limit(upload_bytes)
    budget.configure(server.config, upload_bytes)
    server.config["MODEHEAT_DEMO_DIR"] = str(demo_dir) if demo_dir is not None else None
    server.config["MODEHEAT_SAVED_LIMIT_CHARS"] = int(saved_limit_chars or session.SAVED_LIMIT_CHARS)
    workspace = workspace if workspace is not None else os.environ.get("MODEHEAT_WORKSPACE") or None
    server.config["MODEHEAT_WORKSPACE"] = str(workspace) if workspace is not None else None
    if workspace is not None:
        from thermo.errors import ModeheatError
        from thermo.workspace.upkeep import retention_days
        try:
            retention_days()          # a bad MODEHEAT_SPACE_RETENTION_DAYS stops the start, not a sweep later
        except ModeheatError as exc:
            raise ValueError(str(exc)) from None


def demo_workspace():
    """The demo workspace of the configured folder (built once per folder; pure data)."""
    folder = server.config.get("MODEHEAT_DEMO_DIR")
    if folder not in _DEMO:
        _DEMO[folder] = demo.demo_workspace(folder)
    return _DEMO[folder]


def content_security_policy():
    """The Content-Security-Policy value: own origin only, inline scripts by Dash's hashes.

    ``style-src 'unsafe-inline'`` is needed by React's and plotly's inline
    styles; images may be ``data:``/``blob:`` (figure export).  The hashes of
    Dash's inline scripts (:meth:`dash.Dash.csp_hashes`) are taken once, after
    every page has registered its callbacks.
    """
    if "csp" not in _CSP:
        scripts = " ".join(["'self'", *app.csp_hashes()])
        _CSP["csp"] = ("default-src 'self'; "
                       f"script-src {scripts}; "
                       "style-src 'self' 'unsafe-inline'; "
                       "img-src 'self' data: blob:; font-src 'self' data:; connect-src 'self'; "
                       "object-src 'none'; base-uri 'self'; form-action 'self'; frame-ancestors 'none'")
    return _CSP["csp"]


def security_headers(response):
    """Add the security headers to every response (a Flask ``after_request`` hook)."""
    response.headers.setdefault("X-Content-Type-Options", "nosniff")
    response.headers.setdefault("X-Frame-Options", "DENY")
    response.headers.setdefault("Referrer-Policy", "no-referrer")
    response.headers.setdefault("Content-Security-Policy", content_security_policy())
    return response


def _pages():
    return sorted(dash.page_registry.values(), key=lambda p: p.get("order") or 0)


def shell():
    """The layout common to all pages (evaluated on every page load)."""
    stored, note = persistence.enabled(server), ""
    workspace = None
    if stored and not persistence.sends_cookie():        # no space for a client that never keeps the cookie
        stored, note = False, "This browser sends no cookie: its datasets are kept in this tab only."
    if stored:   # a full or read-only disk: the page still opens, with the demo kept in the tab only
        workspace, error = attempt(lambda: persistence.browser_workspace(
            persistence.current_space(server, demo_workspace)))
        if error:
            stored, note = False, (f"The workspace file cannot be used ({error}); this tab keeps its "
                                   "datasets only until it is closed.")
    nav = [dcc.Link(p["name"], href=p["path"], className="mh-nav-link",
                    id={"type": "mh-nav", "path": p["path"]}) for p in _pages()]
    return html.Div([
        dcc.Location(id="mh-url", refresh=False),
        dcc.Store(id="mh-workspace", storage_type="memory", data=workspace if stored else demo_workspace()),
        dcc.Store(id="mh-space", data={"stored": stored, "loaded": persistence.loaded_stamp()}),
        dcc.Store(id="mh-synced"),
        dcc.Store(id="mh-saved", storage_type="session"),
        dcc.Store(id="mh-prefs", storage_type="session", data={"image_format": "png"}),
        dcc.Store(id="mh-electronic", storage_type="session"),
        handoff.store(),                                          # results sent on to another page (handoff.py)   # the electronic DOS chosen (Electronic, Calorimetry)
        dcc.Store(id="mh-config", data={"max_upload_bytes": server.config["MODEHEAT_MAX_UPLOAD_BYTES"],
                                        "saved_limit_chars": None if stored else server.config["MODEHEAT_SAVED_LIMIT_CHARS"]}),
        html.Header([html.Div([html.Span("mode", className="mh-brand-a"), html.Span("heat", className="mh-brand-b")],
                              className="mh-brand"),
                     html.Nav(nav, className="mh-nav", **{"aria-label": "pages"})], className="mh-header"),
        html.Main(dash.page_container, id="mh-page", className="mh-main"),
        html.P(note, id="mh-sync-note", className="mh-msg mh-msg-error", role="alert"),
        html.Footer([html.Strong("Caution. "), components.CAUTION], className="mh-footer", id="mh-caution"),
    ], className="mh-shell")


def restore(saved, workspace):
    """Workspace restored from the tab's session storage (after a reload; not when the server keeps it)."""
    if not saved or saved.get("stored") or (workspace or {}).get("stored") \
            or (workspace or {}).get("rev") == saved.get("rev"):
        return no_update
    return saved


def keep(workspace, space):
    """Write each edit of the page's workspace to the server's store (when it keeps one)."""
    if not (space or {}).get("stored") or workspace is None:
        return no_update, no_update
    changed, error = attempt(lambda: persistence.sync(persistence.current_space(server), workspace, space.get("loaded")))
    note = f"The last change was not saved to the workspace: {error}" if error else ""
    return {"changed": changed, "error": error}, note    # the page keeps its datasets either way


configure()
hosts.install(server)
install_guard(server)
persistence.install(server)
budget.install(server)
server.after_request(security_headers)
app.layout = shell
app.callback(Output("mh-workspace", "data", allow_duplicate=True), Input("mh-saved", "data"),
             State("mh-workspace", "data"), prevent_initial_call="initial_duplicate")(restore)
app.callback(Output("mh-synced", "data"), Output("mh-sync-note", "children"), Input("mh-workspace", "data"),
             State("mh-space", "data"))(keep)
app.clientside_callback(ClientsideFunction("modeheat", "navClasses"),
                        Output({"type": "mh-nav", "path": ALL}, "className"), Input("mh-url", "pathname"))
