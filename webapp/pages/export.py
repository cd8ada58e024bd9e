"""Export page: download the table (CSV, XLSX, JSON with provenance) and pick the figure image format."""

from __future__ import annotations

import plotly.graph_objects as go
from dash import Input, Output, State, dcc, html, no_update

from thermo.cli.options import DEFAULT_TEMPERATURES, parse_temperatures
from thermo.tables import provenance
from thermo.io.writers import export_table

from .. import components as c
from .. import state

WORKSPACE = "ex-workspace"
PATH = "/export"
NAME = "Export"
VALUE_CHOICES = [{"label": "heat capacity C_v", "value": 1}, {"label": "entropy S", "value": 2},
                 {"label": "internal energy U", "value": 3}, {"label": "Helmholtz energy F", "value": 4}]
FORMAT_CHOICES = [{"label": "CSV", "value": "csv"}, {"label": "Excel (XLSX)", "value": "xlsx"},
                  {"label": "JSON", "value": "json"}]
IMAGE_CHOICES = [{"label": "PNG", "value": "png"}, {"label": "SVG", "value": "svg"}]


def export_bytes(dataset, spec, per, value_columns, fmt):
    """File name and content of a table export, as the CLI ``table`` command writes it.

    ``value_columns`` are indices 1-4 of the table's value columns to keep
    (the temperature column is always first).
    """
    temperatures = parse_temperatures(spec)
    df = state.table(dataset, temperatures, per)
    keep = [df.columns[0]] + [df.columns[i] for i in sorted(set(value_columns or [1, 2, 3, 4]))]
    formula = (dataset.get("options", {}).get("formula") or None)
    info = provenance(state.load(dataset), temperatures, per=per, formula=formula)
    stem = dataset["name"].rsplit(".", 1)[0] or "table"
    return f"{stem}-{per}.{fmt}", export_table(df[keep], info, fmt)


def layout(workspace, prefs=None):
    current = state.active(workspace)
    return c.page(
        "Export", "Download the thermodynamic table with its provenance — the same content the "
                  "command line writes (only the creation time differs).",
        c.active_note(current),
        c.controls(c.text("ex-temperatures", DEFAULT_TEMPERATURES, "Temperatures [K]",
                          hint="START:STOP:STEP (STOP included) or a comma list"),
                   c.basis_field("ex-per"),
                   c.field("Columns", dcc.Checklist(id="ex-columns", options=VALUE_CHOICES, value=[1, 2, 3, 4],
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
        c.radio("ex-image", IMAGE_CHOICES, (prefs or {}).get("image_format", "png"), "Figure image format"),
    )


def preview_figure(dataset, spec, per, columns):
    """The first chosen value column of the export against temperature."""
    df = state.table(dataset, parse_temperatures(spec), per)
    col = df.columns[min(columns or [1])]
    fig = c.figure("temperature T [K]", state.COLUMN_LABELS[col])
    fig.add_trace(go.Scatter(x=df.iloc[:, 0], y=df[col], mode="lines+markers", name=col,
                             marker={"size": 4}, line={"color": c.PALETTE[0]}, hovertemplate="%{y:.6g}"))
    return fig


def preview(workspace, spec, per, columns):
    current = state.active(workspace)
    if current is None:
        return "", c.message_figure("no dataset loaded"), [c.no_data_note()]
    try:
        _, content = export_bytes(current, spec, per, columns, "csv")
        fig = preview_figure(current, spec, per, columns)
    except Exception as exc:  # shown, not raised
        return "", c.message_figure("nothing to export"), c.message_items([("error", state.one_line(exc))])
    lines = content.decode("utf-8").splitlines()
    return "\n".join(lines[:40] + (["…"] if len(lines) > 40 else [])), fig, []


def download(_clicks, workspace, spec, per, columns, fmt):
    current = state.active(workspace)
    if current is None:
        return no_update, [c.no_data_note()]
    try:
        name, content = export_bytes(current, spec, per, columns, fmt)
    except Exception as exc:  # shown, not raised
        return no_update, c.message_items([("error", state.one_line(exc))])
    return dcc.send_bytes(content, name), c.message_items([("info", f"prepared {name}")])


def image_format(fmt, prefs):
    return {**(prefs or {}), "image_format": fmt if fmt in ("png", "svg") else "png"}


def register(app):
    app.callback(Output("ex-preview", "children"), Output("ex-preview-graph", "figure"),
                 Output("ex-messages", "children"),
                  Input(WORKSPACE, "data"), Input("ex-temperatures", "value"), Input("ex-per", "value"),
                  Input("ex-columns", "value"))(preview)
    app.callback(Output("ex-download", "data"), Output("ex-messages", "children", allow_duplicate=True),
                  Input("ex-download-btn", "n_clicks"), State(WORKSPACE, "data"),
                  State("ex-temperatures", "value"), State("ex-per", "value"), State("ex-columns", "value"),
                  State("ex-format", "value"), prevent_initial_call=True)(download)
    app.callback(Output("mh-prefs", "data"), Input("ex-image", "value"), State("mh-prefs", "data"),
                  prevent_initial_call=True)(image_format)
