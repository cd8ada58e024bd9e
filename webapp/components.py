"""Shared layout pieces: labelled controls, message panels, figures, graphs."""

from __future__ import annotations

import plotly.graph_objects as go
from dash import dcc, html

#: Our own trace colours (deep teal, amber, plum, moss, brick, slate, sand).
PALETTE = ("#0f6e7a", "#d0892b", "#7a4f9a", "#4f8a3a", "#b3443a", "#4d5f73", "#a88b4a")
INK = "#1f2a33"
GRID = "#dde4e8"
FONT = "system-ui, -apple-system, 'Segoe UI', Roboto, 'Helvetica Neue', Arial, sans-serif"

CAUTION = ("Results use the harmonic approximation at fixed volume (C_v): no thermal expansion, "
           "anharmonicity, electronic terms or melting. Imaginary modes are left out and signal an "
           "unstable structure. Not validated for design use without comparison to measured data "
           "and local practice.")


def _axis(title):
    return {"title": {"text": title, "font": {"size": 13}}, "showgrid": True, "gridcolor": GRID,
            "zeroline": False, "ticks": "outside", "showline": True, "mirror": True, "linecolor": "#9aa7b0",
            "automargin": True}


def figure(x_title, y_title, title=None, height=360):
    """An empty figure in the modeheat style with titled axes (units in brackets).

    The look is set explicitly, without a plotly template, which keeps
    building a figure well under a millisecond.
    """
    return go.Figure(layout={
        "template": {}, "colorway": list(PALETTE), "height": height,
        "font": {"family": FONT, "color": INK, "size": 13},
        "title": {"text": title, "x": 0.01, "xanchor": "left", "font": {"size": 15}} if title else {},
        "margin": {"l": 64, "r": 18, "t": 44 if title else 16, "b": 52},
        "paper_bgcolor": "white", "plot_bgcolor": "#fbfcfc", "hovermode": "x unified",
        "hoverlabel": {"bgcolor": "white", "bordercolor": "#9aa7b0"},
        "legend": {"orientation": "h", "y": -0.22, "x": 0, "font": {"size": 12}},
        "xaxis": _axis(x_title), "yaxis": _axis(y_title)})


def message_figure(text, height=360):
    """A blank figure that states why there is nothing to plot."""
    return go.Figure(layout=dict(template={}, height=height, xaxis={"visible": False}, paper_bgcolor="white",
                      plot_bgcolor="white", yaxis={"visible": False}, margin={"l": 10, "r": 10, "t": 10, "b": 10},
                      annotations=[{"text": text, "showarrow": False, "xref": "paper", "yref": "paper",
                                    "x": 0.5, "y": 0.5, "font": {"size": 14, "color": "#6b7780"}}]))


def graph(graph_id, label):
    """A graph with a loading indicator and an accessible label."""
    return html.Figure(
        [dcc.Loading(dcc.Graph(id=graph_id, figure=message_figure("computing…"),
                               config=graph_config("png", graph_id)),
                     type="dot", color=PALETTE[0], delay_show=150),
         html.Figcaption(label, className="mh-caption")],
        className="mh-figure", **{"aria-label": label})


def graph_config(image_format, name):
    """Plotly config: modebar image download in ``image_format`` (png or svg)."""
    return {"displaylogo": False, "responsive": True,
            "toImageButtonOptions": {"format": image_format, "filename": f"modeheat-{name}",
                                     "scale": 2 if image_format == "png" else 1}}


def field(label, control, control_id, hint=None):
    """A labelled form field (the label is tied to the control for accessibility)."""
    parts = [html.Span(label, className="mh-label"), control]
    if hint:
        parts.append(html.Small(hint, className="mh-hint"))
    return html.Label(parts, htmlFor=control_id, className="mh-field", id=f"{control_id}-field")


def number(control_id, value, label, step="any", min_value=None, max_value=None, hint=None):
    return field(label, dcc.Input(id=control_id, type="number", value=value, step=step, min=min_value,
                                  max=max_value, debounce=True, className="mh-input"),
                 control_id, hint)


def text(control_id, value, label, placeholder=None, hint=None):
    return field(label, dcc.Input(id=control_id, type="text", value=value, placeholder=placeholder,
                                  debounce=True, className="mh-input"),
                 control_id, hint)


def dropdown(control_id, options, value, label, clearable=False, multi=False, hint=None):
    return field(label, dcc.Dropdown(id=control_id, options=options, value=value, clearable=clearable,
                                     multi=multi, className="mh-dropdown"),
                 control_id, hint)


def radio(control_id, options, value, label):
    return html.Div([html.Span(label, className="mh-label", id=f"{control_id}-label"),
                     dcc.RadioItems(id=control_id, options=options, value=value, inline=True,
                                    className="mh-radio", inputClassName="mh-radio-input",
                                    labelClassName="mh-radio-label")],
                    className="mh-field", role="radiogroup", **{"aria-labelledby": f"{control_id}-label"})


def controls(*fields):
    """A row of form fields."""
    return html.Div(list(fields), className="mh-controls")


def messages_panel(panel_id):
    """A live region for warnings and errors."""
    return html.Div(id=panel_id, className="mh-messages", role="status", **{"aria-live": "polite"})


def message_items(items):
    """Children for a messages panel from ``(kind, text)`` pairs."""
    if not items:
        return []
    return [html.P(text, className=f"mh-msg mh-msg-{kind}") for kind, text in items]


def no_data_note():
    return html.P(["No dataset loaded. Add one on the ", dcc.Link("Spectrum", href="/spectrum"),
                   " page."], className="mh-msg mh-msg-info")


def key_numbers(pairs):
    """A row of labelled key values ``(label, value text)``."""
    return html.Dl([html.Div([html.Dt(k), html.Dd(v)], className="mh-key") for k, v in pairs],
                   className="mh-keys")


def page(title, intro, *children):
    return html.Section([html.H1(title), html.P(intro, className="mh-intro"), *children],
                        className="mh-page")


def temperature_fields(prefix, t_min=0, t_max=1000, step=5):
    """Fields ``<prefix>-tmin``, ``-tmax``, ``-step`` of a temperature grid [K]."""
    return [number(f"{prefix}-tmin", t_min, "T from [K]", min_value=0),
            number(f"{prefix}-tmax", t_max, "T to [K]", min_value=0),
            number(f"{prefix}-step", step, "step [K]", min_value=0)]


def basis_field(control_id, value="formula"):
    from .state import PER_CHOICES
    return radio(control_id, PER_CHOICES, value, "Values")


def active_note(dataset):
    """Which dataset a page shows, with a link to change it."""
    if dataset is None:
        return no_data_note()
    return html.P(["Dataset: ", html.Strong(dataset["name"], className="mh-dataset-name"),
                   " (change it on the ", dcc.Link("Spectrum", href="/spectrum"), " page)"],
                  className="mh-active-note")
