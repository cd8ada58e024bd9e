"""Thermodynamics page: C_v, S, U, F versus temperature for the active dataset."""

from __future__ import annotations

import dash
import numpy as np
from dash import Input, Output, State, callback, dcc, html

from thermo.columns import error_column_for, find
from thermo.tables import classical_heat_capacity, provenance

from .. import budget, cache, session
from .. import components as c
from .. import reading
from .. import exports, handoff, notices
from .. import figures as fg
from ..labels import axis_title, unit_of
from ..reporting import reported

PATH, NAME, ORDER = "/thermodynamics", "Thermodynamics", 2

ROOM_K = 298.15
#: Quantity keys of the four plots, in order, and their graphs.
QUANTITIES = ("heat_capacity_v", "entropy", "internal_energy", "helmholtz_energy")
_GRAPHS = ("th-cv-graph", "th-s-graph", "th-u-graph", "th-f-graph")


def key_numbers(dataset, per):
    """Zero-point energy and C_v, S at 298.15 K in the units of ``per``."""
    point = cache.table(dataset, [0.0, ROOM_K], per)
    u, cv, s = (find(point, key) for key in ("internal_energy", "heat_capacity_v", "entropy"))
    keys = [("zero-point energy", f"{point[u].iloc[0]:.5g} {unit_of(u)}"),
            (f"C_v at {ROOM_K} K", f"{point[cv].iloc[1]:.5g} {unit_of(cv)}"),
            (f"S at {ROOM_K} K", f"{point[s].iloc[1]:.5g} {unit_of(s)}")]
    return c.key_numbers(keys)


def dulong_petit(dataset, per):
    """The classical limit 3nR of the dataset in the units of ``per``."""
    return classical_heat_capacity(cache.load(dataset).atoms, per, cache.formula_for(dataset, per))


def preview_temperatures(temperatures, rows=12):
    """About ``rows`` temperatures of the grid for the preview, with 298.15 K when in range.

    Examples
    --------
    >>> preview_temperatures(np.arange(0.0, 1001.0, 10.0)).tolist()[:4]
    [0.0, 80.0, 160.0, 240.0]
    >>> 298.15 in preview_temperatures(np.arange(0.0, 1001.0, 10.0))
    True
    """
    t = np.asarray(temperatures, dtype=float)
    picked = t[::max(1, len(t) // rows)]
    if t.size and t.min() <= ROOM_K <= t.max():
        picked = np.union1d(picked, [ROOM_K])
    return picked


def figures(dataset, temperatures, per, log_t):
    """The four figures, key numbers and preview rows for one dataset."""
    df = cache.table_with_errors(dataset, temperatures, per)
    t = find(df, "temperature")
    figs = []
    for k, key in enumerate(QUANTITIES):
        col = find(df, key)
        fig = fg.figure("temperature T [K]", axis_title(col))
        err = error_column_for(df, col)
        if err is not None:        # shaded: the estimated error (numerical, low-frequency, resolution, smearing)
            x, y, e = df[t].to_numpy(), df[col].to_numpy(), df[err].to_numpy()
            fig.add_trace(fg.band(x, y - e, y + e, "estimated error", k))
        fig.add_trace(fg.line(df[t], df[col], dataset["name"], k))
        if key == "heat_capacity_v":
            limit = dulong_petit(dataset, per)
            fig.add_hline(y=limit, line_dash="dot", line_color=fg.INK,
                          annotation_text=f"3nR (Dulong–Petit) = {limit:.4g}", annotation_position="bottom right")
        if log_t:
            fig.update_xaxes(type="log")
        figs.append(fig)
    preview = cache.table_with_errors(dataset, preview_temperatures(df[t].to_numpy()), per)
    table = html.Table([html.Thead(html.Tr([html.Th(axis_title(col)) for col in preview.columns])),
                        html.Tbody([html.Tr([html.Td(_cell(v)) for v in row])
                                    for row in preview.itertuples(index=False)])],
                       className="mh-table mh-numbers")
    return figs, key_numbers(dataset, per), table


def _cell(value):
    """A preview cell: numbers to 6 digits, the flag and its reason as they are."""
    if isinstance(value, (bool, np.bool_)):
        return "over 1 %" if value else ""
    return f"{value:.6g}" if isinstance(value, (int, float, np.floating)) else str(value)


def layout(**_query):
    """The thermodynamics page."""
    return c.page(
        "Thermodynamics", "Harmonic heat capacity, entropy, internal and Helmholtz energy of the active "
                          "dataset. U and F include the zero-point energy. Shaded: the estimated error "
                          "(numerical, low-frequency, resolution and smearing parts).",
        c.active_slot("th"),
        reading.panel("th"),
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
        exports.download_bar("th", "table"),
        handoff.send_bar("th", "the table", ("compare",)),
        html.H2("Table preview"),
        dcc.Loading(html.Div(id="th-table"), type="dot"),
    )


def _failed(message):
    blank = fg.message_figure("nothing to show for these settings")
    return (blank,) * 4 + ([], [], c.message_items([("error", message)]))


@callback(*[Output(g, "figure") for g in _GRAPHS], Output("th-keys", "children"),
          Output("th-table", "children"), Output("th-messages", "children"),
          Input("mh-workspace", "data"), Input("th-tmin", "value"), Input("th-tmax", "value"),
          Input("th-step", "value"), Input("th-per", "value"), Input("th-logt", "value"))
@reported(_failed)
def draw(workspace, t_min, t_max, step, per, log_t):
    """Plots, key numbers and table preview for the page's settings."""
    current = session.active(workspace)
    if current is None:
        blank = fg.message_figure("no dataset loaded")
        return blank, blank, blank, blank, [], [], []
    figs, keys, table = figures(current, budget.temperatures(t_min, t_max, step), per, bool(log_t))
    warnings = [(current["name"], w) for w in cache.load(current).warnings]
    return (*figs, keys, table, notices.warning_items(warnings))


def table_download(fmt, workspace, t_min, t_max, step, per):
    """The table as ``modeheat table --temperatures T_MIN:T_MAX:STEP --per PER --errors`` writes it."""
    current = session.active(workspace)
    if current is None:
        return None
    temperatures = budget.temperatures(t_min, t_max, step)
    formula = session.options_of(current).get("formula") or None
    info = provenance(cache.load(current), temperatures, per=per, formula=formula)
    return exports.table_file(f"{exports.file_stem(current['name'])}-{per}",
                              cache.table_with_errors(current, temperatures, per), info, fmt)


_STATES = [State("mh-workspace", "data"), State("th-tmin", "value"), State("th-tmax", "value"),
           State("th-step", "value"), State("th-per", "value")]
exports.register_download("th", _STATES, table_download)
handoff.register_send("th", "compare", _STATES, lambda *values: table_download("csv", *values), NAME)
c.follow_active("th")
c.follow_image_format(*_GRAPHS)
reading.register("th")
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
