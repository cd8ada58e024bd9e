"""Export page: download the table (CSV, XLSX, JSON with provenance) and pick the figure image format."""

from __future__ import annotations

import dash
import plotly.graph_objects as go
from dash import Input, Output, State, callback, dcc, html, no_update

from thermo.columns import find
from thermo.io.writers import DEFAULT_DIGITS, export_table
from thermo.tables import provenance
from thermo.temperatures import DEFAULT_TEMPERATURES

from .. import budget, cache, session
from .. import components as c
from .. import figures as fg
from ..labels import axis_title
from ..reporting import reported

PATH, NAME, ORDER = "/export", "Export", 10

#: Value columns one may keep, by quantity key (the temperature column is always kept).
VALUE_CHOICES = [{"label": "heat capacity C_v", "value": "heat_capacity_v"},
                 {"label": "entropy S", "value": "entropy"},
                 {"label": "internal energy U", "value": "internal_energy"},
                 {"label": "Helmholtz energy F", "value": "helmholtz_energy"}]
ALL_VALUES = [o["value"] for o in VALUE_CHOICES]
FORMAT_CHOICES = [{"label": "CSV", "value": "csv"}, {"label": "Excel (XLSX)", "value": "xlsx"},
                  {"label": "JSON", "value": "json"}]
IMAGE_CHOICES = [{"label": "PNG", "value": "png"}, {"label": "SVG", "value": "svg"}]


def export_bytes(dataset, spec, per, value_keys, fmt):
    """File name and content of a table export, as the CLI ``table`` command writes it.

    ``value_keys`` are the quantity keys of the value columns to keep, in
    table order (the temperature column is always first).
    """
    temperatures = budget.parsed_temperatures(spec)
    df = cache.table(dataset, temperatures, per)
    chosen = set(value_keys or ALL_VALUES)
    keep = [find(df, "temperature")] + [find(df, key) for key in ALL_VALUES if key in chosen]
    formula = session.options_of(dataset).get("formula") or None
    info = provenance(cache.load(dataset), temperatures, per=per, formula=formula)
    stem = dataset["name"].rsplit(".", 1)[0] or "table"
    return f"{stem}-{per}.{fmt}", export_table(df[keep], info, fmt, digits=DEFAULT_DIGITS)


def layout(**_query):
    """The export page."""
    return c.page(
        "Export", "Download the thermodynamic table with its provenance — the same content the "
                  "command line writes (only the creation time differs).",
        c.active_slot("ex"),
        c.controls(c.text("ex-temperatures", DEFAULT_TEMPERATURES, "Temperatures [K]",
                          hint="START:STOP:STEP (STOP included) or a comma list"),
                   c.basis_field("ex-per"),
                   c.field("Columns", dcc.Checklist(id="ex-columns", options=VALUE_CHOICES, value=ALL_VALUES,
                                                    inline=True, className="mh-radio"), "ex-columns"),
                   c.radio("ex-format", FORMAT_CHOICES, "csv", "File format")),
        html.Div([html.Button("Download table", id="ex-download-btn", className="mh-button mh-primary"),
                  dcc.Download(id="ex-download")], className="mh-inline"),
        c.messages_panel("ex-messages"),
        html.H2("Preview"),
        html.Div([c.graph("ex-preview-graph", "First chosen column of the export against temperature"),
                  dcc.Loading(html.Pre(id="ex-preview", className="mh-pre"), type="dot")], className="mh-grid"),
        html.H2("Figures"),
        html.P("Every plot has a camera button in its toolbar that saves the figure. Choose its format "
               "here; it applies to the pages you open next.", className="mh-intro"),
        c.radio("ex-image", IMAGE_CHOICES, "png", "Figure image format", persist=True),
    )


def preview_figure(dataset, spec, per, keys):
    """The first chosen value column of the export against temperature."""
    df = cache.table(dataset, budget.parsed_temperatures(spec), per)
    chosen = set(keys or ALL_VALUES)
    col = find(df, next(key for key in ALL_VALUES if key in chosen))
    t = find(df, "temperature")
    fig = fg.figure("temperature T [K]", axis_title(col))
    fig.add_trace(go.Scatter(x=df[t], y=df[col], mode="lines+markers", name=fg.plot_text(col),
                             marker={"size": 4}, line={"color": fg.PALETTE[0]}, hovertemplate="%{y:.6g}"))
    return fig


def _no_preview(message):
    return "", fg.message_figure("nothing to export"), c.message_items([("error", message)])


@callback(Output("ex-preview", "children"), Output("ex-preview-graph", "figure"), Output("ex-messages", "children"),
          Input("mh-workspace", "data"), Input("ex-temperatures", "value"),
          Input("ex-per", "value"), Input("ex-columns", "value"))
@reported(_no_preview)
def preview(workspace, spec, per, columns):
    """The first lines of the CSV export and a plot of its first chosen column."""
    current = session.active(workspace)
    if current is None:
        return "", fg.message_figure("no dataset loaded"), [c.no_data_note()]
    _, content = export_bytes(current, spec, per, columns, "csv")
    fig = preview_figure(current, spec, per, columns)
    lines = content.decode("utf-8").splitlines()
    return "\n".join(lines[:40] + (["…"] if len(lines) > 40 else [])), fig, []


@callback(Output("ex-download", "data"), Output("ex-messages", "children", allow_duplicate=True),
          Input("ex-download-btn", "n_clicks"), State("mh-workspace", "data"),
          State("ex-temperatures", "value"), State("ex-per", "value"), State("ex-columns", "value"),
          State("ex-format", "value"), prevent_initial_call=True)
@reported(lambda message: (no_update, c.message_items([("error", message)])))
def download(_clicks, workspace, spec, per, columns, fmt):
    """The export file, as the command line writes it."""
    current = session.active(workspace)
    if current is None:
        return no_update, [c.no_data_note()]
    name, content = export_bytes(current, spec, per, columns, fmt)
    return dcc.send_bytes(content, name), c.message_items([("info", f"prepared {name}")])


@callback(Output("mh-prefs", "data"), Input("ex-image", "value"), State("mh-prefs", "data"))
def image_format(fmt, prefs):
    """Remember the figure image format for every page's plots."""
    return {**(prefs or {}), "image_format": fmt if fmt in ("png", "svg") else "png"}


c.follow_active("ex")
c.follow_image_format("ex-preview-graph")
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
