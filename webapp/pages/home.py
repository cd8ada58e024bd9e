"""Overview page: the active dataset at a glance and a link to every page."""

from __future__ import annotations

from dash import Input, Output, dcc, html

from .. import components as c
from .. import state
from . import spectrum, thermodynamics

WORKSPACE = "home-workspace"
PATH = "/"
NAME = "Overview"
GUIDE = [("/spectrum", "Spectrum", "load DOS files, set units and atoms, check imaginary modes and the ν² fit"),
         ("/thermodynamics", "Thermodynamics", "C_v, S, U, F versus temperature, key numbers, table preview"),
         ("/models", "Models", "Einstein, Debye and composite models against the DOS, every θ with its definition"),
         ("/modes", "Mode map", "which frequencies carry the heat capacity and entropy at each temperature"),
         ("/compare", "Compare", "several datasets overlaid, differences against a reference"),
         ("/export", "Export", "tables as CSV, XLSX or JSON with provenance; figure image format")]


def layout(workspace, prefs=None):
    return c.page(
        "Overview", "From a phonon density of states to harmonic thermodynamic tables, model "
                    "comparisons and exports.",
        html.Div([
            html.Div([html.H2("Active dataset"), html.Div(id="home-summary"),
                      c.graph("home-dos-graph", "Phonon DOS of the active dataset")], className="mh-content"),
            html.Div([html.H2("Pages"),
                      html.Ul([html.Li([dcc.Link(name, href=href, className="mh-guide-link"), f" — {text}"])
                               for href, name, text in GUIDE], className="mh-guide")], className="mh-side"),
        ], className="mh-split mh-split-right"))


def summary(workspace):
    current = state.active(workspace)
    if current is None:
        return c.no_data_note(), c.message_figure("no dataset loaded")
    try:
        dos = state.load(current)
        keys = thermodynamics.key_numbers(current, "formula")
        facts = html.P([html.Strong(current["name"], className="mh-dataset-name"),
                        f" — {dos.atoms} atom(s) per formula unit, read in {dos.source.get('freq_unit')}, "
                        f"{len((workspace or {}).get('datasets', []))} dataset(s) loaded"])
        notes = c.message_items([("warn", w) for w in dos.warnings])
        return [facts, keys, *notes], spectrum.dos_figure(dos)
    except Exception as exc:  # message, nothing raised
        return c.message_items([("error", state.one_line(exc))]), c.message_figure("cannot draw")


def register(app):
    app.callback(Output("home-summary", "children"), Output("home-dos-graph", "figure"),
                  Input(WORKSPACE, "data"))(summary)
