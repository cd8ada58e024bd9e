"""Figure builders shared by the pages: the modeheat look, placeholders and the DOS plots."""

from __future__ import annotations

import html

import numpy as np
import plotly.graph_objects as go

from thermo.io.inert import inert_text

from thermo.preparation.lowfreq import reduced_dos

#: Our own trace colours (deep teal, amber, plum, moss, brick, slate, sand).
PALETTE = ("#0f6e7a", "#d0892b", "#7a4f9a", "#4f8a3a", "#b3443a", "#4d5f73", "#a88b4a")
INK = "#1f2a33"
GRID = "#dde4e8"
FONT = "system-ui, -apple-system, 'Segoe UI', Roboto, 'Helvetica Neue', Arial, sans-serif"


def _axis(title):
    return {"title": {"text": title, "font": {"size": 13}}, "showgrid": True, "gridcolor": GRID,
            "zeroline": False, "ticks": "outside", "showline": True, "mirror": True, "linecolor": "#9aa7b0",
            "automargin": True, "exponentformat": "e"}   # scientific notation, never SI prefixes (µ, m)


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


def plot_text(text) -> str:
    """Text from users (dataset, column and species names, messages quoting them) made inert for plotly.

    Plotly renders a subset of HTML in trace names, annotations and titles (``<b>``, ``<span
    style=...>``, ``<a href=...>``, ``<br>``); ``<``, ``>`` and ``&`` are written as entities, which
    plotly shows as the characters themselves, and control characters and bidirectional overrides
    (a right-to-left override reverses the rest of a legend entry) as visible escapes
    (:func:`thermo.io.inert.inert_text`).

    Examples
    --------
    >>> plot_text("<b>Si</b> & Ge")
    '&lt;b&gt;Si&lt;/b&gt; &amp; Ge'
    """
    return html.escape(inert_text(text), quote=False)


def message_figure(text, height=360):
    """A blank figure that states why there is nothing to plot (``text`` shown as plain text)."""
    text = plot_text(text)
    return go.Figure(layout=dict(template={}, height=height, xaxis={"visible": False}, paper_bgcolor="white",
                      plot_bgcolor="white", yaxis={"visible": False}, margin={"l": 10, "r": 10, "t": 10, "b": 10},
                      annotations=[{"text": text, "showarrow": False, "xref": "paper", "yref": "paper",
                                    "x": 0.5, "y": 0.5, "font": {"size": 14, "color": "#6b7780"}}]))


def graph_config(image_format, name):
    """Plotly config: modebar image download in ``image_format`` (png or svg)."""
    return {"displaylogo": False, "responsive": True,
            "toImageButtonOptions": {"format": image_format, "filename": f"modeheat-{name}",
                                     "scale": 2 if image_format == "png" else 1}}


def dos_figure(dos):
    """The DOS as read (normalised), its partial columns and the ν² form used below the cut-off."""
    fig = figure("frequency ν [THz]", "DOS g(ν) [states/THz per formula unit]")
    nu, g = dos.input_frequency_thz, dos.input_dos
    fig.add_trace(go.Scatter(x=nu, y=g, name="total (as read, normalised)", mode="lines",
                             line={"width": 2, "color": PALETTE[0]},
                             hovertemplate="%{y:.4g}"))
    for k, (name, col) in enumerate(dos.input_partials.items()):
        fig.add_trace(go.Scatter(x=nu, y=col, name=f"partial: {plot_text(name)}", mode="lines",
                                 line={"width": 1.4, "color": PALETTE[(k + 1) % len(PALETTE)]},
                                 hovertemplate="%{y:.4g}"))
    fit = dos.low_frequency
    if fit is not None:
        x = np.linspace(0.0, fit.cutoff_thz, 80)
        fig.add_trace(go.Scatter(x=x, y=fit.coefficient * x * x, name="ν² form used below cut-off",
                                 mode="lines", line={"width": 2, "dash": "dash", "color": INK},
                                 hovertemplate="%{y:.4g}"))
    if nu.size and nu[0] < 0:
        fig.add_vrect(x0=float(nu[0]), x1=0.0, fillcolor="#b3443a", opacity=0.08, line_width=0,
                      annotation_text="imaginary", annotation_position="top left")
    return fig


def reduced_range(values, reference=None, min_share=0.25):
    """y-range of a reduced-DOS plot that never zooms into noise.

    The span is at least ``min_share`` of the typical value (the fitted
    coefficient when given, else the median), so a flat g/ν² shows as flat
    rather than as 1e-6 wiggles blown up to the full height.

    Examples
    --------
    >>> reduced_range(np.array([1.0, 1.0, 1.0]), 1.0)
    [0.75, 1.25]
    """
    finite = np.asarray(values, float)
    finite = finite[np.isfinite(finite)]
    if not finite.size:
        return None
    typical = abs(float(reference)) if reference else float(np.nanmedian(np.abs(finite)))
    lo, hi = float(np.nanpercentile(finite, 2)), float(np.nanpercentile(finite, 98))
    span = max(hi - lo, min_share * typical)
    return [max(0.0, lo - span), hi + span]


def reduced_figure(dos):
    """The reduced DOS g/ν² near ν = 0 with the fitted window and coefficient."""
    fig = figure("frequency ν [THz]", "g(ν)/ν² [states/THz³ per formula unit]")
    nu, red = reduced_dos(dos.input_frequency_thz, dos.input_dos)
    fit = dos.low_frequency
    top = float(nu.max()) if nu.size else 1.0
    x_max = min(top, 2.5 * fit.cutoff_thz) if fit is not None else 0.4 * top
    keep = nu <= x_max
    fig.add_trace(go.Scatter(x=nu[keep], y=red[keep], name="g/ν² of the input", mode="lines",
                             line={"width": 2, "color": PALETTE[0]}, hovertemplate="%{y:.4g}"))
    if fit is not None:
        lo, hi = fit.window_thz
        fig.add_vrect(x0=lo, x1=hi, fillcolor=PALETTE[1], opacity=0.15, line_width=0,
                      annotation_text="fit window", annotation_position="top left")
        fig.add_trace(go.Scatter(x=[0.0, fit.cutoff_thz], y=[fit.coefficient] * 2, mode="lines",
                                 name=f"fitted A = {fit.coefficient:.4g}",
                                 line={"width": 2, "dash": "dash", "color": INK}))
        window = reduced_range(red[(nu >= lo) & (nu <= hi)], fit.coefficient)
        if window:
            fig.update_yaxes(range=window)
    else:
        finite = red[keep & (nu > 0.05 * x_max)]
        if finite.size:
            fig.update_yaxes(range=[0, reduced_range(finite)[1]])
    fig.update_yaxes(exponentformat="e", tickformat=".3~g")
    return fig


def band(x, low, high, name, k=0, opacity=0.22):
    """A filled band between ``low`` and ``high`` (value ± uncertainty) in palette colour ``k``
    (``name`` shown as plain text: :func:`plot_text`).

    Rows where either edge is not finite are left out (the band has gaps there, never a made-up edge).
    """
    x, low, high = (np.asarray(a, dtype=float) for a in (x, low, high))
    keep = np.isfinite(x) & np.isfinite(low) & np.isfinite(high)
    x, low, high = x[keep], low[keep], high[keep]
    colour = PALETTE[k % len(PALETTE)]
    return go.Scatter(x=np.concatenate([x, x[::-1]]), y=np.concatenate([high, low[::-1]]), fill="toself",
                      mode="lines", line={"width": 0, "color": colour}, opacity=opacity, name=plot_text(name),
                      hoverinfo="skip")


def line(x, y, name, k=0, width=2.2, dash=None, hover="%{y:.5g}", **extra):
    """A line trace in palette colour ``k`` (``name`` shown as plain text: :func:`plot_text`)."""
    return go.Scatter(x=x, y=y, mode="lines", name=plot_text(name), hovertemplate=hover,
                      line={"width": width, "color": PALETTE[k % len(PALETTE)], "dash": dash}, **extra)
