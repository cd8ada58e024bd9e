"""Mode map page: which frequencies carry C_v or S at each temperature; Planck occupation explorer."""

from __future__ import annotations

import dash
import numpy as np
import plotly.graph_objects as go
from dash import Input, Output, State, callback, dcc, html

from thermo import models
from thermo.errors import OptionError

from .. import cache, session
from .. import components as c
from .. import exports
from .. import figures as fg
from ..reporting import reported

PATH, NAME, ORDER = "/modes", "Mode map", 4

BINS = 160
MAP_TEMPERATURES = 120
#: Colour scales: per-temperature normalisation (default) or the logarithm of the share.
SCALE_CHOICES = [{"label": "per temperature (largest bin = 100)", "value": "column"},
                 {"label": "log₁₀ of the share", "value": "log"}]
SHARE_CHOICES = [{"label": "heat capacity C_v", "value": "heat_capacity_share"},
                 {"label": "entropy S", "value": "entropy_share"}]
#: Slider marks of the explorer temperature: log10(T/K).
_MARKS = {np.log10(t): f"{t:g} K" for t in (1, 10, 100, 300, 1000, 3000)}


def slider_temperature(position):
    """Temperature [K] of a slider position (log10 scale), at least 1 K."""
    return float(10 ** float(position if position is not None else np.log10(300.0)))


def share_map(dataset, temperatures):
    """Share of C_v and S per frequency bin at each temperature (cached)."""
    t = np.asarray(temperatures, dtype=float)
    return cache.derived("share_map", dataset, lambda d: models.mode_share_map(d, t, bins=BINS),
                         t.tobytes(), BINS)


def colour_values(share_percent, scale="column"):
    """Colour values of a share map [% per bin] (frequency × temperature) and the colour bar title.

    ``column``: each temperature's shares divided by its largest, in % (every
    column reaches 100, so high temperatures, where the share spreads over
    many bins, are as visible as low ones); ``log``: log₁₀ of the share in %,
    floored at 10⁻⁴ %.

    Examples
    --------
    >>> z, title = colour_values(np.array([[50.0, 1.0], [50.0, 0.5]]))
    >>> z[:, 1].tolist(), title
    ([100.0, 50.0], 'share relative to the largest bin at that T [%]')
    """
    z = np.asarray(share_percent, dtype=float)
    if scale == "log":
        return np.log10(np.maximum(z, 1e-4)), "log₁₀(share [% per bin])"
    top = np.max(z, axis=0, keepdims=True)
    return 100.0 * np.divide(z, top, out=np.zeros_like(z), where=top > 0), \
        "share relative to the largest bin at that T [%]"


def heat_map_figure(dataset, temperatures, quantity, scale="column"):
    """Heat map of the chosen share over temperature × frequency, coloured by ``scale`` (:func:`colour_values`)."""
    data = share_map(dataset, temperatures)
    label = "C_v" if quantity == "heat_capacity_share" else "S"
    z = np.asarray(data[quantity], dtype=float) * 100.0
    colour, title = colour_values(z, scale)
    fig = fg.figure("temperature T [K]", "frequency ν [THz]")
    fig.add_trace(go.Heatmap(x=data["temperature_K"], y=data["frequency_thz"], z=colour, customdata=z,
                             colorscale=[[0, "#f7f4ea"], [0.35, "#e3b15c"], [0.7, "#b85b2c"], [1, "#3a1f3d"]],
                             colorbar={"title": {"text": f"{label}: {title}", "side": "right"}},
                             hovertemplate="T %{x:.4g} K<br>ν %{y:.3g} THz<br>%{customdata:.3g} % of "
                                           + label + "<extra></extra>"))
    fig.update_layout(hovermode="closest")
    fig.update_xaxes(type="log")
    return fig


def explorer_figures(dataset, temperature):
    """Cumulative share of C_v, occupation n(ν,T) and energy per mode at one temperature."""
    dos = cache.load(dataset)
    cumulative = share_map(dataset, np.array([temperature]))
    edges = np.asarray(cumulative["bin_edges_thz"], dtype=float)[1:]
    cum = fg.figure("frequency ν [THz]", "cumulative share of C_v [%]")
    cum.add_trace(go.Scatter(x=edges, y=100 * np.asarray(cumulative["cumulative_heat_capacity_share"])[:, 0],
                             mode="lines", name=f"modes below ν, T = {temperature:.4g} K",
                             line={"width": 2.4, "color": fg.PALETTE[0]}, hovertemplate="%{y:.3g} %"))
    cum.update_yaxes(range=[0, 101])
    top = float(np.max(dos.input_frequency_thz))
    nu = np.linspace(top / 400, top, 400)
    occ = models.occupation_explorer(nu, np.array([temperature]))
    planck = fg.figure("frequency ν [THz]", "occupation n(ν, T) [1]")
    planck.add_trace(go.Scatter(x=nu, y=np.asarray(occ["occupation"])[:, 0], mode="lines",
                                name="Planck occupation n", line={"width": 2.4, "color": fg.PALETTE[2]},
                                hovertemplate="n = %{y:.4g}"))
    planck.add_trace(go.Scatter(x=nu, y=np.asarray(occ["mean_energy_meV"])[:, 0], mode="lines",
                                name="energy per mode hν(n+½) [meV]", yaxis="y2",
                                line={"width": 2, "dash": "dash", "color": fg.PALETTE[1]},
                                hovertemplate="%{y:.4g} meV"))
    planck.update_layout(yaxis={"type": "log"}, margin={"r": 70},
                         yaxis2={"title": {"text": "energy per mode [meV]"}, "overlaying": "y", "side": "right",
                                 "showgrid": False, "type": "linear", "rangemode": "tozero",
                                 "tickmode": "auto", "nticks": 6})
    return cum, planck


def layout(**_query):
    """The mode-map page."""
    return c.page(
        "Mode map", "Each frequency's share of the heat capacity or entropy across temperature: soft modes "
                    "dominate at low T, all modes count near the classical limit.",
        c.active_slot("mm"),
        c.controls(c.radio("mm-quantity", SHARE_CHOICES, "heat_capacity_share", "Share of"),
                   c.number("mm-tmin", 2, "T from [K]", min_value=0.1),
                   c.number("mm-tmax", 1000, "T to [K]", min_value=0.1),
                   c.radio("mm-scale", SCALE_CHOICES, "column", "Colour scale"),
                   html.Small(f"{MAP_TEMPERATURES} temperatures, evenly spaced in log T", className="mh-hint")),
        c.messages_panel("mm-messages"),
        c.graph("mm-map-graph", "Share of the chosen quantity per frequency bin (each column sums to 100 %; the "
                                "colour scale is stated on its bar)"),
        exports.download_bar("mm", "share map"),
        html.H2("At one temperature"),
        c.field("Temperature (log scale)", dcc.Slider(id="mm-temperature", min=0, max=np.log10(3000.0), step=0.01,
                                                      value=np.log10(300.0), marks=_MARKS,
                                                      allow_direct_input=False), "mm-temperature"),
        html.P(id="mm-temperature-text", className="mh-active-note"),
        html.Div([c.graph("mm-cumulative-graph", "Cumulative share of C_v from modes below each frequency"),
                  c.graph("mm-planck-graph", "Planck occupation and mean energy per mode")], className="mh-grid"),
    )


def map_temperatures(t_min, t_max):
    """Log-spaced temperatures of the map [K]; one-line OptionError when the range is empty."""
    try:
        lo, hi = float(t_min), float(t_max)
    except (TypeError, ValueError):
        raise OptionError("the temperature range needs two numbers in kelvin") from None
    if not 0 < lo < hi:
        raise OptionError("the temperature range needs 0 < T from < T to")
    return np.geomspace(lo, hi, MAP_TEMPERATURES)


@callback(Output("mm-map-graph", "figure"), Output("mm-messages", "children"),
          Input("mh-workspace", "data"), Input("mm-quantity", "value"), Input("mm-tmin", "value"),
          Input("mm-tmax", "value"), Input("mm-scale", "value"))
@reported(lambda message: (fg.message_figure("nothing to show"), c.message_items([("error", message)])))
def draw_map(workspace, quantity, t_min, t_max, scale="column"):
    """The share heat map for the chosen quantity, temperature range and colour scale."""
    current = session.active(workspace)
    if current is None:
        return fg.message_figure("no dataset loaded"), []
    return heat_map_figure(current, map_temperatures(t_min, t_max), quantity, scale or "column"), []


@callback(Output("mm-cumulative-graph", "figure"), Output("mm-planck-graph", "figure"),
          Output("mm-temperature-text", "children"), Input("mh-workspace", "data"), Input("mm-temperature", "value"))
def draw_explorer(workspace, position):
    """Cumulative share and Planck occupation at the slider's temperature."""
    current = session.active(workspace)
    temperature = slider_temperature(position)
    text = f"T = {temperature:.4g} K"
    if current is None:
        blank = fg.message_figure("no dataset loaded")
        return blank, blank, text
    return (*_explorer_or_message(current, temperature), text)


@reported(lambda message: (fg.message_figure(message),) * 2)
def _explorer_or_message(dataset, temperature):
    return explorer_figures(dataset, temperature)


def share_table(dataset, temperatures):
    """The share map as a long table (:func:`thermo.models.modemap.share_table`, columns from the column schema)."""
    from thermo.models.modemap import share_table as long_table
    return long_table(share_map(dataset, temperatures))


def map_download(fmt, workspace, t_min, t_max):
    """The share map of the active dataset with its provenance (the DOS, the temperatures, the bins)."""
    from thermo.provenance import dos_input, provenance_record, temperature_settings
    current = session.active(workspace)
    if current is None:
        return None
    temperatures = map_temperatures(t_min, t_max)
    dos = cache.load(current)
    info = provenance_record([dos_input(dos)], {"temperatures_K": temperature_settings(temperatures), "bins": BINS},
                             dos.warnings, note="share of C_v and S per frequency bin; each temperature sums to 1")
    return exports.table_file(f"{exports.file_stem(current['name'])}-mode-shares", share_table(current, temperatures),
                              info, fmt)


exports.register_download("mm", [State("mh-workspace", "data"), State("mm-tmin", "value"), State("mm-tmax", "value")],
                          map_download)
c.follow_active("mm")
c.follow_image_format("mm-map-graph", "mm-cumulative-graph", "mm-planck-graph")
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
