"""Compare page: several datasets overlaid, with differences against a reference (convergence checks)."""

from __future__ import annotations

import numpy as np
import plotly.graph_objects as go
from dash import Input, Output, html

from .. import components as c
from .. import state

WORKSPACE = "cmp-workspace"
PATH = "/compare"
NAME = "Compare"
QUANTITIES = [{"label": "DOS", "value": "dos"}, {"label": "C_v", "value": 1}, {"label": "S", "value": 2},
              {"label": "F", "value": 4}]


def _dos_curves(datasets):
    out = {}
    for d in datasets:
        dos = state.load(d)
        out[d["id"]] = (dos.input_frequency_thz, dos.input_dos)
    return out, "frequency ν [THz]", "g(ν) [states/THz per formula unit]"


def _table_curves(datasets, temperatures, per, index):
    out, label = {}, None
    for d in datasets:
        df = state.table(d, temperatures, per)
        out[d["id"]] = (df.iloc[:, 0].to_numpy(), df.iloc[:, index].to_numpy())
        label = state.COLUMN_LABELS[df.columns[index]]
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
        blank = c.message_figure("choose datasets to compare")
        return blank, blank, []
    ref = state.find(workspace, reference) or chosen[0]
    if ref not in chosen:
        chosen = [ref] + chosen
    if quantity == "dos":
        curves, x_title, y_title = _dos_curves(chosen)
    else:
        curves, x_title, y_title = _table_curves(chosen, temperatures, per, int(quantity))
    over = c.figure(x_title, y_title)
    diff = c.figure(x_title, f"Δ from reference ({y_title})")
    x_ref, y_ref = curves[ref["id"]]
    rows = []
    for k, d in enumerate(chosen):
        x, y = curves[d["id"]]
        colour = c.PALETTE[k % len(c.PALETTE)]
        over.add_trace(go.Scatter(x=x, y=y, mode="lines", name=d["name"], hovertemplate="%{y:.5g}",
                                  line={"width": 2, "color": colour}))
        if d["id"] == ref["id"]:
            continue
        delta = np.interp(x_ref, x, y, left=np.nan, right=np.nan) - y_ref
        diff.add_trace(go.Scatter(x=x_ref, y=delta, mode="lines", name=d["name"], hovertemplate="%{y:.3g}",
                                  line={"width": 2, "color": colour}))
        worst = int(np.nanargmax(np.abs(delta))) if np.any(np.isfinite(delta)) else None
        rows.append(html.Tr([html.Td(d["name"]),
                             html.Td("—" if worst is None else f"{delta[worst]:+.4g}"),
                             html.Td("—" if worst is None else f"{x_ref[worst]:.4g}")]))
    diff.add_hline(y=0, line_color="#9aa7b0")
    table = html.Table([html.Thead(html.Tr([html.Th("dataset"), html.Th("largest difference"),
                                            html.Th(f"at {x_title.split(' ')[-2]}")])),
                        html.Tbody(rows)], className="mh-table") if rows else []
    return over, diff, table


def layout(workspace, prefs=None):
    options = [{"label": d["name"], "value": d["id"]} for d in workspace.get("datasets", [])]
    ids = [o["value"] for o in options]
    current = state.active(workspace)
    return c.page(
        "Compare", "Overlay datasets — e.g. the same crystal with larger supercells, denser meshes or "
                   "less smearing — and see how far each is from a reference.",
        c.controls(c.dropdown("cmp-datasets", options, ids, "Datasets", multi=True),
                   c.dropdown("cmp-reference", options, current and current["id"], "Reference"),
                   c.radio("cmp-quantity", QUANTITIES, 1, "Quantity")),
        c.controls(*c.temperature_fields("cmp"), c.basis_field("cmp-per", value="atom")),
        c.messages_panel("cmp-messages"),
        html.Div([c.graph("cmp-overlay-graph", "The chosen quantity for each dataset"),
                  c.graph("cmp-diff-graph", "Difference from the reference")], className="mh-grid"),
        html.H2("Largest differences"),
        html.Div(id="cmp-table"),
    )


def draw(workspace, ids, reference, quantity, t_min, t_max, step, per):
    try:
        temperatures = state.temperature_grid(t_min, t_max, step)
        over, diff, table = comparison(workspace or state.empty_workspace(), ids, reference, quantity,
                                       temperatures, per)
        return over, diff, table, []
    except Exception as exc:  # message, nothing raised
        blank = c.message_figure("nothing to compare for these settings")
        return blank, blank, [], c.message_items([("error", state.one_line(exc))])


def register(app):
    app.callback(Output("cmp-overlay-graph", "figure"), Output("cmp-diff-graph", "figure"),
                  Output("cmp-table", "children"), Output("cmp-messages", "children"),
                  Input(WORKSPACE, "data"), Input("cmp-datasets", "value"), Input("cmp-reference", "value"),
                  Input("cmp-quantity", "value"), Input("cmp-tmin", "value"), Input("cmp-tmax", "value"),
                  Input("cmp-step", "value"), Input("cmp-per", "value"))(draw)
