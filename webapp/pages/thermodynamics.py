"""Thermodynamics page: C_v, S, U, F versus temperature for the active dataset."""

from __future__ import annotations

import plotly.graph_objects as go
from dash import Input, Output, dcc, html

from .. import components as c
from .. import state

WORKSPACE = "th-workspace"
PATH = "/thermodynamics"
NAME = "Thermodynamics"
ROOM_K = 298.15
_GRAPHS = ("th-cv-graph", "th-s-graph", "th-u-graph", "th-f-graph")


def key_numbers(dataset, per):
    """Zero-point energy and C_v, S at 298.15 K in the units of ``per``."""
    point = state.table(dataset, [0.0, ROOM_K], per)
    names = [state.COLUMN_LABELS[col] for col in point.columns]
    u_unit = names[3].split("[")[1].rstrip("]")
    keys = [("zero-point energy", f"{point.iloc[0, 3]:.5g} {u_unit}"),
            (f"C_v at {ROOM_K} K", f"{point.iloc[1, 1]:.5g} {names[1].split('[')[1].rstrip(']')}"),
            (f"S at {ROOM_K} K", f"{point.iloc[1, 2]:.5g} {names[2].split('[')[1].rstrip(']')}")]
    return c.key_numbers(keys)


def figures(dataset, temperatures, per, log_t):
    """The four figures, key numbers and preview rows for one dataset."""
    df = state.table(dataset, temperatures, per)
    columns = list(df.columns)
    figs = []
    for k, col in enumerate(columns[1:]):
        fig = c.figure("temperature T [K]", state.COLUMN_LABELS[col])
        fig.add_trace(go.Scatter(x=df[columns[0]], y=df[col], mode="lines", name=dataset["name"],
                                 line={"width": 2.2, "color": c.PALETTE[k % len(c.PALETTE)]},
                                 hovertemplate="%{y:.5g}"))
        if k == 0:
            limit = state.dulong_petit(dataset, per)
            fig.add_hline(y=limit, line_dash="dot", line_color=c.INK,
                          annotation_text=f"3nR (Dulong–Petit) = {limit:.4g}", annotation_position="bottom right")
        if log_t:
            fig.update_xaxes(type="log")
        figs.append(fig)
    step = max(1, len(df) // 12)
    preview = df.iloc[::step]
    table = html.Table([html.Thead(html.Tr([html.Th(state.COLUMN_LABELS[col]) for col in columns])),
                        html.Tbody([html.Tr([html.Td(f"{v:.6g}") for v in row])
                                    for row in preview.itertuples(index=False)])],
                       className="mh-table mh-numbers")
    return figs, key_numbers(dataset, per), table


def layout(workspace, prefs=None):
    current = state.active(workspace)
    return c.page(
        "Thermodynamics", "Harmonic heat capacity, entropy, internal and Helmholtz energy of the active "
                          "dataset. U and F include the zero-point energy.",
        c.active_note(current),
        c.controls(*c.temperature_fields("th"), c.basis_field("th-per"),
                   c.field("Temperature axis", dcc.Checklist(
                       id="th-logt", options=[{"label": " logarithmic", "value": "log"}], value=[]),
                       "th-logt")),
        c.messages_panel("th-messages"),
        html.Div(id="th-keys"),
        html.Div([c.graph("th-cv-graph", "Heat capacity at constant volume; dotted: classical limit 3nR"),
                  c.graph("th-s-graph", "Entropy"),
                  c.graph("th-u-graph", "Internal energy (with zero-point energy)"),
                  c.graph("th-f-graph", "Helmholtz energy (with zero-point energy)")], className="mh-grid"),
        html.H2("Table preview"),
        dcc.Loading(html.Div(id="th-table"), type="dot"),
    )


def draw(workspace, t_min, t_max, step, per, log_t):
    current = state.active(workspace)
    if current is None:
        blank = c.message_figure("no dataset loaded")
        return blank, blank, blank, blank, [], [], []
    try:
        temperatures = state.temperature_grid(t_min, t_max, step)
        figs, keys, table = figures(current, temperatures, per, bool(log_t))
        return (*figs, keys, table, [])
    except Exception as exc:  # message instead of a broken page
        blank = c.message_figure("nothing to show for these settings")
        return (blank,) * 4 + ([], [], c.message_items([("error", state.one_line(exc))]))


def register(app):
    app.callback(*[Output(g, "figure") for g in _GRAPHS], Output("th-keys", "children"),
                  Output("th-table", "children"), Output("th-messages", "children"),
                  Input(WORKSPACE, "data"), Input("th-tmin", "value"), Input("th-tmax", "value"),
                  Input("th-step", "value"), Input("th-per", "value"), Input("th-logt", "value"))(draw)
