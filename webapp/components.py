"""Shared layout pieces: labelled controls, message panels, graph containers, the dataset note."""

from __future__ import annotations

from dash import Input, Output, callback, dcc, html

from .figures import PALETTE, graph_config, message_figure
from .labels import PER_CHOICES

CAUTION = ("Results use the harmonic approximation at fixed volume (C_v): no thermal expansion, "
           "anharmonicity, electronic terms or melting. Imaginary modes are left out and signal an "
           "unstable structure. Not validated for design use without comparison to measured data "
           "and local practice.")


#: Choices of an imaginary-mode policy control (the values of ``load_dos(negative=...)``).
NEGATIVE_CHOICES = [{"label": "leave out, rescale rest to 3n", "value": "drop"},
                    {"label": "leave out, do not rescale", "value": "drop-unscaled"},
                    {"label": "refuse the file", "value": "refuse"}]

def graph(graph_id, label):
    """A graph with a loading indicator and an accessible label."""
    return html.Figure(
        [dcc.Loading(dcc.Graph(id=graph_id, figure=message_figure("computing…"),
                               config=graph_config("png", graph_id)),
                     type="dot", color=PALETTE[0], delay_show=150),
         html.Figcaption(label, className="mh-caption")],
        className="mh-figure", **{"aria-label": label})


def field(label, control, control_id, hint=None):
    """A labelled form field (the label is tied to the control for accessibility)."""
    parts = [html.Span(label, className="mh-label"), control]
    if hint:
        parts.append(html.Small(hint, className="mh-hint"))
    return html.Label(parts, htmlFor=control_id, className="mh-field", id=f"{control_id}-field")


def number(control_id, value, label, step="any", min_value=None, max_value=None, hint=None):
    """A labelled number box (sent when the user leaves the field or presses Enter)."""
    return field(label, dcc.Input(id=control_id, type="number", value=value, step=step, min=min_value,
                                  max=max_value, debounce=True, className="mh-input"),
                 control_id, hint)


def text(control_id, value, label, placeholder=None, hint=None):
    """A labelled text box (sent when the user leaves the field or presses Enter)."""
    return field(label, dcc.Input(id=control_id, type="text", value=value, placeholder=placeholder,
                                  debounce=True, className="mh-input"),
                 control_id, hint)


def dropdown(control_id, options, value, label, clearable=False, multi=False, hint=None):
    """A labelled dropdown."""
    return field(label, dcc.Dropdown(id=control_id, options=options, value=value, clearable=clearable,
                                     multi=multi, className="mh-dropdown"),
                 control_id, hint)


def radio(control_id, options, value, label, persist=False):
    """Radio buttons with a label; ``persist`` keeps the choice for the browser tab."""
    kept = {"persistence": True, "persistence_type": "session"} if persist else {}
    return html.Div([html.Span(label, className="mh-label", id=f"{control_id}-label"),
                     dcc.RadioItems(id=control_id, options=options, value=value, inline=True, **kept,
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
    """The note shown when no dataset is loaded, with a link to the Spectrum page."""
    return html.P(["No dataset loaded. Add one on the ", dcc.Link("Spectrum", href="/spectrum"),
                   " page."], className="mh-msg mh-msg-info")


def key_numbers(pairs):
    """A row of labelled key values ``(label, value text)``."""
    return html.Dl([html.Div([html.Dt(k), html.Dd(v)], className="mh-key") for k, v in pairs],
                   className="mh-keys")


def page(title, intro, *children):
    """A page section: heading, one-line introduction, content."""
    return html.Section([html.H1(title), html.P(intro, className="mh-intro"), *children],
                        className="mh-page")


def temperature_fields(prefix, t_min=0, t_max=1500, step=5):
    """Fields ``<prefix>-tmin``, ``-tmax``, ``-step`` of a temperature grid [K].

    No browser-side limits: every typed value reaches
    :func:`thermo.temperatures.temperature_range`, whose message names the
    problem (a browser limit would only blank the field).
    """
    return [number(f"{prefix}-tmin", t_min, "T from [K]"),
            number(f"{prefix}-tmax", t_max, "T to [K]"),
            number(f"{prefix}-step", step, "step [K]")]


def basis_field(control_id, value="formula"):
    """Radio buttons of the basis: per formula unit, per atom, per gram."""
    return radio(control_id, PER_CHOICES, value, "Values")


def active_note(dataset):
    """Which dataset a page shows, with a link to change it."""
    if dataset is None:
        return no_data_note()
    return html.P(["Dataset: ", html.Strong(dataset["name"], className="mh-dataset-name"),
                   " (change it on the ", dcc.Link("Spectrum", href="/spectrum"), " page)"],
                  className="mh-active-note")


def active_slot(prefix):
    """Where a page names its dataset (filled from the workspace alone, see :func:`follow_active`)."""
    return html.Div(id=f"{prefix}-active")


def follow_active(prefix):
    """Register the callback that names the page's dataset in its :func:`active_slot`.

    It depends on the workspace only, so a computation that fails for the
    dataset shows its error beside the dataset's name — never beside "No
    dataset loaded" or the name of the dataset shown before.
    """
    from .session import active
    callback(Output(f"{prefix}-active", "children"), Input("mh-workspace", "data"))(
        lambda workspace: active_note(active(workspace)))


def follow_image_format(*graph_ids):
    """Register the callback that gives the page's graphs the image format chosen on the Export page."""
    outputs = [Output(g, "config") for g in graph_ids]

    def configs(prefs):
        fmt = (prefs or {}).get("image_format", "png")
        out = [graph_config(fmt if fmt in ("png", "svg") else "png", g) for g in graph_ids]
        return out if len(out) > 1 else out[0]
    callback(*outputs, Input("mh-prefs", "data"))(configs)
