"""Polynomials page: Shomate, NASA 7-term or SGTE coefficients of the active dataset, with the fit quality."""

from __future__ import annotations

import dash
import numpy as np
from dash import Input, Output, State, callback, dcc, html, no_update

from thermo.errors import ModeheatError
from thermo.polynomials.cantera_yaml import polynomial_export, species_name
from thermo.provenance import dos_input
from thermo.polynomials import fit_polynomial, harmonic_source

from .. import cache, handoff, reading, session
from .. import components as c
from .. import figures as fg
from ..reporting import one_line, reported

PATH, NAME, ORDER = "/polynomials", "Polynomials", 9

FORM_CHOICES = [{"label": "Shomate", "value": "shomate"}, {"label": "NASA 7-term", "value": "nasa7"},
                {"label": "SGTE (Gibbs energy)", "value": "sgte"}]
OUTPUT_CHOICES = [{"label": "JSON", "value": "json"}, {"label": "CSV", "value": "csv"},
                  {"label": "Cantera YAML", "value": "yaml"}]
#: Compared quantities: error key, legend text.
ERROR_CURVES = (("heat_capacity_p", "C_p"), ("enthalpy_increment", "H − H°(298.15 K)"), ("entropy", "S"))
_GRAPHS = ("po-fit-graph", "po-error-graph")


def _number(value, default):
    return default if value in (None, "") else float(value)


def fitted(dataset, form, t_min, t_max, t_mid, formation, phase, formula):
    """The fit of a dataset (memoised by content, options and settings) and its source."""
    lo, hi = _number(t_min, 298.15), _number(t_max, 1500.0)
    mid = None if t_mid in (None, "") else float(t_mid)
    name = species_name(formula, phase) if formula else None

    def compute(dos):
        source = harmonic_source(dos, lo, hi)
        return source, fit_polynomial(source, form, (lo, hi), t_mid=mid, formation_enthalpy=_number(formation, 0.0),
                                      phase=phase or "cr", name=name)
    return cache.derived("polynomial", dataset, compute, form, lo, hi, mid, _number(formation, 0.0),
                         phase or "cr", name)


def fitted_table(item, form, t_min, t_max, t_mid, formation, phase, formula):
    """The fit of a table sent from another page, as ``modeheat polynomial --cp-table FILE`` fits the downloaded
    file (memoised by the sent bytes and the settings); ``(source, fit, inputs entry)``."""
    from thermo.polynomials import source_from_table
    from thermo.provenance import input_record
    lo, hi = _number(t_min, 298.15), _number(t_max, 1500.0)
    mid = None if t_mid in (None, "") else float(t_mid)
    name = species_name(formula, phase) if formula else None
    raw = item["csv"].encode("utf-8")
    entry = input_record(item["name"], data=raw, options={"entropy_298_J_per_mol_K": None},
                         role="heat-capacity table")

    def compute():
        table, _ = handoff.sent_table(item)
        source = source_from_table(table, label=f"C_p table {item['name']}")
        return source, fit_polynomial(source, form, (lo, hi), t_mid=mid, formation_enthalpy=_number(formation, 0.0),
                                      phase=phase or "cr", name=name)
    source, fit = cache.result(("polynomial-table", item["sha256"], form, lo, hi, mid, _number(formation, 0.0),
                                phase or "cr", name), compute)
    return source, fit, entry


def export_text(dataset, fit, fmt, formula, entry=None):
    """The coefficient file with its provenance, as ``modeheat polynomial`` writes it."""
    entry = entry if entry is not None else dos_input(cache.load(dataset))
    return polynomial_export(fit, fmt, formula, fit.provenance([entry], formula))


def _fit_of(workspace, sent, choice, settings):
    """``(label, source, fit, entry)`` of the chosen C_p: the active dataset's harmonic table or a sent table."""
    item = handoff.received(sent, "polynomials") if choice == "sent" else None
    if item is not None:
        source, fit, entry = fitted_table(item, *settings)
        return item["name"], source, fit, entry
    current = session.active(workspace)
    if current is None:
        return None
    source, fit = fitted(current, *settings)
    return current["name"], source, fit, dos_input(cache.load(current))


def figures(source, fit):
    """C_p of the table with the fit overlaid, and the relative-error curves [%]."""
    t = source.within(fit.t_min, fit.t_max).temperature
    data = source.within(fit.t_min, fit.t_max)
    p = fit.properties(t)
    over = fg.figure("temperature T [K]", "C_p [J/(mol·K)]")
    over.add_trace(fg.line(t, data.heat_capacity, data.label if str(data.label).startswith("C_p table")
                           else "harmonic table (C_p = C_v)", 0, width=5))
    over.add_trace(fg.line(t, p["heat_capacity_p"], f"{fit.form} fit", 1, dash="dash"))
    if data.uncertainty is not None:
        u = data.uncertainty["heat_capacity"]
        over.add_trace(fg.band(t, data.heat_capacity - u, data.heat_capacity + u, "± estimated error of the table", 0))
    for r in fit.ranges[1:]:
        over.add_vline(x=r.T_min_K, line_dash="dot", line_color=fg.INK, annotation_text="midpoint")
    err = fg.figure("temperature T [K]", "fit − table [% of table]")
    sources = {"heat_capacity_p": data.heat_capacity, "enthalpy_increment": data.enthalpy_increment,
               "entropy": data.entropy}
    for k, (key, text) in enumerate(ERROR_CURVES):
        ref = sources[key]
        scale = np.maximum(np.abs(ref), 1e-3 * float(np.max(np.abs(ref))))
        err.add_trace(fg.line(t, 100.0 * (p[key] - ref) / scale, text, k, hover="%{y:.3g} %"))
    err.add_hrect(y0=-0.1, y1=0.1, fillcolor=fg.PALETTE[3], opacity=0.08, line_width=0,
                  annotation_text="±0.1 %", annotation_position="top left")
    if data.uncertainty is not None:
        share = 100.0 * data.uncertainty["heat_capacity"] / np.abs(data.heat_capacity)
        err.add_trace(fg.band(t, -share, share, "± estimated error of the table's C_p", 0))
    return over, err


def error_numbers(fit):
    """Key numbers: maximum and RMS relative error of each compared quantity, and beside it the
    uncertainty the source's own error estimate carries into the fit (when it has one)."""
    pairs = [(f"{text}: max / rms error",
              f"{100 * fit.errors[key]['max_relative']:.3g} % / {100 * fit.errors[key]['rms_relative']:.2g} %")
             for key, text in ERROR_CURVES]
    if fit.uncertainty:
        pairs += [(f"{text}: ± from the table's error", f"{100 * fit.uncertainty[key]['max_relative']:.2g} %")
                  for key, text in ERROR_CURVES]
        at = fit.uncertainty.get("at_298_15_K", {})
        pairs += [(f"{symbol} at 298.15 K", f"{at[key]['value']:.5g} ± {at[key]['uncertainty']:.2g} J/(mol·K)")
                  for key, symbol in (("heat_capacity_p", "C_p"), ("entropy", "S")) if key in at]
    return c.key_numbers(pairs)


def layout(**_query):
    """The polynomials page."""
    return c.page(
        "Polynomials", "Coefficients of published polynomial forms fitted to the harmonic heat capacity of the "
                       "active dataset, ready for thermochemical databases. C_p is fitted; H and S follow "
                       "from it, anchored to the table at 298.15 K.",
        c.active_slot("po"),
        c.radio("po-source", [{"label": "active dataset (harmonic C_p = C_v)", "value": "dataset"}], "dataset",
                "C_p from"),
        c.controls(c.radio("po-form", FORM_CHOICES, "shomate", "Form"),
                   c.number("po-tmin", 298.15, "T from [K]", min_value=1),
                   c.number("po-tmax", 1500, "T to [K]", min_value=1),
                   c.number("po-mid", None, "Midpoint [K]",
                            hint="two ranges; blank: one range, NASA √(T_from·T_to) to 10 K"),
                   c.number("po-formation", 0, "Δ_fH°(298.15 K) [kJ/mol]", hint="0 for an element in its reference state"),
                   c.text("po-phase", "cr", "Phase label"),
                   c.text("po-formula", "", "Formula", placeholder="e.g. MgO",
                          hint="needed for Cantera YAML; blank: the active dataset's (reading options)")),
        reading.panel("po"),
        c.messages_panel("po-messages"),
        html.P(c.CAUTION + " Polynomial coefficients carry the harmonic C_p (= C_v) further into database "
                           "use; compare with validated data before a design decision.", className="mh-msg mh-msg-info"),
        html.Div(id="po-keys"),
        html.Div([c.graph("po-fit-graph", "C_p of the table and the fitted polynomial"),
                  c.graph("po-error-graph", "Relative error of the fit: C_p, H − H°(298.15 K), S")],
                 className="mh-grid"),
        html.H2("Coefficients"),
        c.controls(c.radio("po-output", OUTPUT_CHOICES, "json", "Block format")),
        html.Div([html.Button("Download coefficients", id="po-download-btn", className="mh-button mh-primary"),
                  dcc.Download(id="po-download"),
                  dcc.Clipboard(target_id="po-block", title="copy the block", className="mh-copy")],
                 className="mh-inline"),
        dcc.Loading(html.Pre(id="po-block", className="mh-pre"), type="dot"),
    )


def _settings(form, t_min, t_max, t_mid, formation, phase, formula):
    return form or "shomate", t_min, t_max, t_mid, formation, (phase or "cr").strip(), (formula or "").strip()


def _failed(message):
    blank = fg.message_figure("nothing to show for these settings")
    return blank, blank, [], "", c.message_items([("error", message)])


_SETTINGS = [Input("po-form", "value"), Input("po-tmin", "value"), Input("po-tmax", "value"),
             Input("po-mid", "value"), Input("po-formation", "value"), Input("po-phase", "value"),
             Input("po-formula", "value")]


@callback(Output("po-fit-graph", "figure"), Output("po-error-graph", "figure"), Output("po-keys", "children"),
          Output("po-block", "children"), Output("po-messages", "children"),
          Input("mh-workspace", "data"), *_SETTINGS, Input("po-output", "value"), Input("po-source", "value"),
          Input(handoff.STORE_ID, "data"))
@reported(_failed)
def draw(workspace, form, t_min, t_max, t_mid, formation, phase, formula, output, choice=None, sent=None):
    """Fit, overlay and error plots, key numbers, the coefficient block and the warnings."""
    settings = _settings(form, t_min, t_max, t_mid, formation, phase, reading.formula_of(workspace, formula))
    chosen = _fit_of(workspace, sent, choice, settings)
    if chosen is None:
        blank = fg.message_figure("no dataset loaded")
        return blank, blank, [], "", []
    _, source, fit, entry = chosen
    over, err = figures(source, fit)
    messages = [("warning", w) for w in fit.warnings]
    try:
        block = export_text(None, fit, output or "json", settings[-1] or None, entry)
    except ModeheatError as exc:  # a format this fit cannot take (SGTE or no formula for YAML): say so
        block, messages = "", messages + [("error", one_line(exc))]
    return over, err, error_numbers(fit), block, c.message_items(messages)


@callback(Output("po-download", "data"), Output("po-messages", "children", allow_duplicate=True),
          Input("po-download-btn", "n_clicks"), State("mh-workspace", "data"),
          *[State(i.component_id, i.component_property) for i in _SETTINGS], State("po-output", "value"),
          State("po-source", "value"), State(handoff.STORE_ID, "data"), prevent_initial_call=True)
@reported(lambda message: (no_update, c.message_items([("error", message)])))
def download(_clicks, workspace, form, t_min, t_max, t_mid, formation, phase, formula, output, choice=None, sent=None):
    """The coefficient file, as ``modeheat polynomial`` writes it (``--cp-table`` for a sent table)."""
    settings = _settings(form, t_min, t_max, t_mid, formation, phase, reading.formula_of(workspace, formula))
    chosen = _fit_of(workspace, sent, choice, settings)
    if chosen is None:
        return no_update, [c.no_data_note()]
    label, _, fit, entry = chosen
    fmt = output or "json"
    text = export_text(None, fit, fmt, settings[-1] or None, entry)
    stem = label.rsplit(".", 1)[0] or "polynomial"
    name = f"{stem}-{fit.form}.{fmt}"
    return dcc.send_string(text, name), no_update


handoff.follow_sent("polynomials", "po-source")
reading.register("po")
c.follow_active("po")
c.follow_image_format(*_GRAPHS)
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
