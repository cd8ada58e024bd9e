"""Compare page: several datasets overlaid, with differences against a reference (convergence checks)."""

from __future__ import annotations

import dash
import numpy as np
import plotly.graph_objects as go
from dash import Input, Output, State, callback, html

from thermo.columns import find

from .. import budget, cache, session
from .. import components as c
from .. import figures as fg
from ..labels import axis_title
from ..reporting import reported

PATH, NAME, ORDER = "/compare", "Compare", 5

QUANTITIES = [{"label": "DOS", "value": "dos"}, {"label": "C_v", "value": "heat_capacity_v"},
              {"label": "S", "value": "entropy"}, {"label": "F", "value": "helmholtz_energy"}]


def _dos_curves(datasets):
    out = {}
    for d in datasets:
        dos = cache.load(d)
        out[d["id"]] = (dos.input_frequency_thz, dos.input_dos)
    return out, "frequency ν [THz]", "g(ν) [states/THz per formula unit]"


def _table_curves(datasets, temperatures, per, key):
    out, label = {}, None
    for d in datasets:
        df = cache.table(d, temperatures, per)
        column = find(df, key)
        out[d["id"]] = (df[find(df, "temperature")].to_numpy(), df[column].to_numpy())
        label = axis_title(column)
    return out, "temperature T [K]", label


def comparison(workspace, ids, reference, quantity, temperatures, per):
    """Overlay and difference figures plus a table of largest differences.

    The page starts per atom, so crystals with different atoms per formula
    unit (or supercells written per cell) compare directly.

    Differences are ``dataset − reference`` on the reference's grid (DOS
    interpolated linearly onto the reference frequencies).
    """
    chosen = [d for d in workspace["datasets"] if d["id"] in (ids or [])]
    if not chosen:
        blank = fg.message_figure("choose datasets to compare")
        return blank, blank, []
    ref = session.find(workspace, reference) or chosen[0]
    if ref not in chosen:
        chosen = [ref] + chosen
    if quantity == "dos":
        curves, x_title, y_title = _dos_curves(chosen)
    else:
        curves, x_title, y_title = _table_curves(chosen, temperatures, per, quantity)
    over = fg.figure(x_title, y_title)
    diff = fg.figure(x_title, f"Δ from reference ({y_title})")
    x_ref, y_ref = curves[ref["id"]]
    rows = []
    for k, d in enumerate(chosen):
        x, y = curves[d["id"]]
        colour = fg.PALETTE[k % len(fg.PALETTE)]
        over.add_trace(go.Scatter(x=x, y=y, mode="lines", name=fg.plot_text(d["name"]), hovertemplate="%{y:.5g}",
                                  line={"width": 2, "color": colour}))
        if d["id"] == ref["id"]:
            continue
        delta = np.interp(x_ref, x, y, left=np.nan, right=np.nan) - y_ref
        diff.add_trace(go.Scatter(x=x_ref, y=delta, mode="lines", name=fg.plot_text(d["name"]), hovertemplate="%{y:.3g}",
                                  line={"width": 2, "color": colour}))
        worst = int(np.nanargmax(np.abs(delta))) if np.any(np.isfinite(delta)) else None
        rows.append(html.Tr([html.Td(d["name"]),
                             html.Td("—" if worst is None else f"{delta[worst]:+.4g}"),
                             html.Td("—" if worst is None else f"{x_ref[worst]:.4g}")]))
    diff.add_hline(y=0, line_color="#9aa7b0")
    at = "ν [THz]" if quantity == "dos" else "T [K]"
    table = html.Table([html.Thead(html.Tr([html.Th("dataset"), html.Th("largest difference"),
                                            html.Th(f"at {at}")])),
                        html.Tbody(rows)], className="mh-table") if rows else []
    return over, diff, table


def layout(**_query):
    """The compare page (dataset choices are filled by :func:`choices`)."""
    return c.page(
        "Compare", "Overlay datasets — e.g. the same crystal with larger supercells, denser meshes or "
                   "less smearing — and see how far each is from a reference.",
        c.controls(c.dropdown("cmp-datasets", [], [], "Datasets", multi=True),
                   c.dropdown("cmp-reference", [], None, "Reference"),
                   c.radio("cmp-quantity", QUANTITIES, "heat_capacity_v", "Quantity")),
        c.controls(*c.temperature_fields("cmp"), c.basis_field("cmp-per", value="atom")),
        c.messages_panel("cmp-messages"),
        html.Div([c.graph("cmp-overlay-graph", "The chosen quantity for each dataset"),
                  c.graph("cmp-diff-graph", "Difference from the reference")], className="mh-grid"),
        html.H2("Largest differences"),
        html.Div(id="cmp-table"),
    )


@callback(Output("cmp-datasets", "options"), Output("cmp-datasets", "value"), Output("cmp-reference", "options"),
          Output("cmp-reference", "value"), Input("mh-workspace", "data"), State("cmp-datasets", "value"),
          State("cmp-reference", "value"))
def choices(workspace, ids, reference):
    """Dataset choices; a first visit compares all datasets against the active one."""
    options = [{"label": d["name"], "value": d["id"]} for d in (workspace or {}).get("datasets", [])]
    known = [o["value"] for o in options]
    ids = [i for i in (ids or []) if i in known] or known
    if reference not in known:
        reference = (session.active(workspace) or {}).get("id")
    return options, ids, options, reference


def _failed(message):
    blank = fg.message_figure("nothing to compare for these settings")
    return blank, blank, [], c.message_items([("error", message)])


@callback(Output("cmp-overlay-graph", "figure"), Output("cmp-diff-graph", "figure"),
          Output("cmp-table", "children"), Output("cmp-messages", "children"),
          Input("mh-workspace", "data"), Input("cmp-datasets", "value"), Input("cmp-reference", "value"),
          Input("cmp-quantity", "value"), Input("cmp-tmin", "value"), Input("cmp-tmax", "value"),
          Input("cmp-step", "value"), Input("cmp-per", "value"))
@reported(_failed)
def draw(workspace, ids, reference, quantity, t_min, t_max, step, per):
    """Overlay, difference and largest-difference table for the chosen datasets."""
    temperatures = budget.temperatures(t_min, t_max, step)
    over, diff, table = comparison(workspace or session.empty_workspace(), ids, reference, quantity,
                                   temperatures, per)
    return over, diff, table, []


c.follow_image_format("cmp-overlay-graph", "cmp-diff-graph")
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
