"""Overview page: the active dataset at a glance and a link to every page."""

from __future__ import annotations

import dash
from dash import Input, Output, callback, dcc, html

from .. import cache, session
from .. import components as c
from .. import figures as fg
from ..reporting import reported
from .thermodynamics import key_numbers

PATH, NAME, ORDER = "/", "Overview", 0

GUIDE = [("/spectrum", "Spectrum", "load DOS files, set units and atoms, check imaginary modes and the ν² fit"),
         ("/thermodynamics", "Thermodynamics", "C_v, S, U, F versus temperature, key numbers, table preview"),
         ("/models", "Models", "Einstein, Debye and composite models against the DOS, every θ with its definition"),
         ("/modes", "Mode map", "which frequencies carry the heat capacity and entropy at each temperature"),
         ("/compare", "Compare", "several datasets overlaid, differences against a reference"),
         ("/export", "Export", "tables as CSV, XLSX or JSON with provenance; figure image format"),
         ("/quasiharmonic", "Quasi-harmonic", "DOS at several volumes: V(T), thermal expansion, B_T, C_p, G, γ"),
         ("/phases", "Phases", "ΔG(T) of polymorphs, transition temperatures with uncertainty, p–T boundary"),
         ("/calorimetry", "Calorimetry", "measured C_p against the DOS: fitted γT and dilation terms, residuals, S°(298.15 K)"),
         ("/electronic", "Electronic", "metals: C_el, S_el, F_el from an electronic DOS at fixed electron count; γ from g(E_F)"),
         ("/displacements", "Displacements", "⟨u²⟩, Debye–Waller B and θ_M per species, Lindemann caution, elastic θ_D"),
         ("/polynomials", "Polynomials", "Shomate, NASA 7-term or SGTE coefficients with fit errors, JSON/CSV/Cantera YAML"),
         ("/workspace", "Workspace", "rename, group, annotate and delete datasets; named workspaces"),
]


def layout(**_query):
    """The overview page."""
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


@callback(Output("home-summary", "children"), Output("home-dos-graph", "figure"), Input("mh-workspace", "data"))
@reported(lambda message: (c.message_items([("error", message)]), fg.message_figure("cannot draw")))
def summary(workspace):
    """Facts, key numbers and the DOS plot of the active dataset."""
    current = session.active(workspace)
    if current is None:
        return c.no_data_note(), fg.message_figure("no dataset loaded")
    dos = cache.load(current)
    facts = html.P([html.Strong(current["name"], className="mh-dataset-name"),
                    f" — {dos.atoms} atom(s) per formula unit, read in {dos.source.get('freq_unit')}, "
                    f"{len((workspace or {}).get('datasets', []))} dataset(s) loaded"])
    notes = c.message_items([("warn", w) for w in dos.warnings])
    return [facts, key_numbers(current, "formula"), *notes], fg.dos_figure(dos)


c.follow_image_format("home-dos-graph")
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title="modeheat", layout=layout)
