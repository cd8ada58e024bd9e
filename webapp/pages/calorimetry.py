"""Calorimetry page: measured C_p next to the DOS, fitted model, residuals, C/T vs T², S°(298.15 K)."""

from __future__ import annotations

import base64
import hashlib

import dash
import numpy as np
import plotly.graph_objects as go
from dash import Input, Output, State, callback, dcc, html, no_update

from thermo.calorimetry import HeatCapacityModel, parse_fixed, read_heat_capacity
from thermo.calorimetry.report import CAUTIONS, analyse, electronic_comparison
from thermo.cli.models import parse_fit_range
from thermo.columns import column_name, find
from thermo.errors import ModeheatError, OptionError

from .. import budget, cache, filesets, session
from ..demo import demo_file, electronic_demo_entry
from .. import components as c
from .. import exports, handoff, reading
from .. import figures as fg
from .. import intake
from ..intake import decode_upload
from ..reporting import attempt, reported

PATH, NAME, ORDER = "/calorimetry", "Calorimetry", 7

#: The invented measured demo file (see ``sample_dos/generate_calorimetry.py``).
DEMO_FILE = demo_file("measured", "springium_cp.csv")
#: The demo DOS the demo measurement was generated from.
DEMO_DOS = "springium_fcc.dat"
ROOM_K = 298.15
_GRAPHS = ("cal-overlay-graph", "cal-residual-graph", "cal-lowt-graph")
_UNITS = [{"label": "as the header states", "value": "header"}] + [
    {"label": u, "value": u} for u in ("J/(mol K)", "J/(g K)", "cal/(mol K)", "mJ/(mol K)")]
_PARAM_TEXT = {"theta_D_K": ("θ_D", "K"), "scale": ("frequency scale s", "1"),
               "gamma_J_per_mol_K2": ("γ", "J/(mol K²)"), "dilation_A_mol_per_J": ("A (Nernst–Lindemann)", "mol/J")}


#: The demo's entry in the list of measured sets.
DEMO_LABEL = "invented demo measurement (springium)"


def layout(**_query):
    """The calorimetry page (opens the measured set opened last in the workspace, else the demo)."""
    name, files = filesets.last("measured")
    return c.page(
        "Calorimetry", "Measured heat capacity against the DOS: fit lattice, electronic γT and dilation terms "
                       "with uncertainties, and the third-law entropy S°(298.15 K) from data and model.",
        html.Div([dcc.Upload(id="cal-upload", className="mh-upload",
                             children=html.Div(["Drop a measured C_p file here or ", html.U("choose a file"),
                                                html.Br(), html.Small("columns T [K], C_p, optional standard "
                                                                      "uncertainty; text or .xlsx")])),
                  html.Button("Use the demo measurement", id="cal-demo", n_clicks=0, className="mh-button"),
                  c.dropdown("cal-set-choice", filesets.choices("measured", DEMO_LABEL), name or "demo",
                             "Measured set", hint="uploads are kept in the workspace" if filesets.enabled() else None)]),
        # with a workspace file the kept set is reopened by the server; without one the tab keeps the file
        dcc.Store(id="cal-measured", storage_type="memory", data=_entry(*files[0][1:]) if name else None)
        if filesets.enabled() else dcc.Store(id="cal-measured", storage_type="session"),
        html.P(id="cal-file", className="mh-active-note"),
        c.active_slot("cal"),
        c.controls(
            c.radio("cal-lattice", [{"label": " Debye θ_D", "value": "debye"},
                                    {"label": " active DOS × scale s", "value": "dos"}], "dos", "Lattice part"),
            c.field("Further terms", dcc.Checklist(id="cal-terms", value=["nernst-lindemann"],
                                                   options=[{"label": " a metal: electronic γT", "value": "electronic"},
                                                            {"label": " dilation A·C_p²·T (Nernst–Lindemann)",
                                                             "value": "nernst-lindemann"}]), "cal-terms",
                    hint="without γT an insulator is assumed (γ = 0); holding gamma=… adds it"),
            c.text("cal-fix", "", "Hold parameters", "gamma=1.35e-3±0.05e-3, A=4e-6",
                   hint="NAME=VALUE or NAME=VALUE±U, comma separated: theta_D, scale, gamma, A"),
            c.text("cal-range", "", "Fit range [K]", "LO:HI (default all points)"),
            c.number("cal-atoms", 1, "Atoms per formula unit", step=1, min_value=1),
            c.dropdown("cal-unit", _UNITS, "header", "C_p unit"),
            c.text("cal-formula", "", "Formula", "for J/(g K), e.g. Cu", hint="blank: the active dataset's")),
        reading.panel("cal"),
        c.messages_panel("cal-messages"),
        html.Div(id="cal-keys"),
        html.Div([c.graph("cal-overlay-graph", "Measured C_p with the fitted C_p, its terms and the DOS C_v"),
                  c.graph("cal-residual-graph", "Relative residual (model − measured)/measured"),
                  c.graph("cal-lowt-graph", "C/T against T² at low temperature: intercept γ, slope β")],
                 className="mh-grid"),
        html.H2("Fitted parameters"),
        dcc.Loading(html.Div(id="cal-params"), type="dot"),
        exports.download_bar("cal", "calorimetry result", formats=("json", "csv", "xlsx")),
        handoff.send_bar("cal", "the fitted C_p table", ("polynomials", "phases", "compare")),
        html.Div([html.P(text, className="mh-msg mh-msg-info") for text in CAUTIONS], id="cal-cautions"),
    )


@callback(Output("cal-measured", "data"), Output("cal-set-choice", "options"), Output("cal-set-choice", "value"),
          Input("cal-upload", "contents"), Input("cal-demo", "n_clicks"), Input("cal-set-choice", "value"),
          State("cal-upload", "filename"), prevent_initial_call=True)
@reported(lambda message: ({"name": "upload", "refused": message}, no_update, no_update))
def keep_measured(contents, _clicks, choice, name):
    """The measured file for the page: an upload (kept in the workspace when there is one and it reads),
    a kept set, or the demo."""
    trigger = dash.ctx.triggered_id
    if trigger == "cal-demo" or (trigger == "cal-set-choice" and choice in (None, "demo")):
        return demo_measurement(), no_update, "demo"
    if trigger == "cal-set-choice":
        return _entry(*filesets.reopen("measured", choice)[0][1:]), no_update, no_update
    entry = uploaded_measurement(contents, name, upload_limit())
    if entry.get("refused"):
        return entry, no_update, no_update
    raw = decode_upload(entry["contents"], entry["name"])
    _, error = attempt(read_heat_capacity, raw, name=entry["name"])
    kept = None if error else filesets.keep("measured", [("measured", entry["name"], raw)])[0]
    return entry, filesets.choices("measured", DEMO_LABEL), kept or no_update


def _entry(name, raw):
    """Store entry of kept bytes."""
    return {"name": name, "contents": "data:application/octet-stream;base64," + base64.b64encode(raw).decode("ascii")}


@callback(Output("cal-terms", "value"), Input("cal-measured", "data"), State("cal-terms", "value"))
def metal_for_the_demo(stored, terms):
    """The invented demo measurement is of a metal: γT is ticked when it is shown; an upload keeps the choice."""
    terms = list(terms or [])
    if (stored or {}).get("name", DEMO_FILE.name) == DEMO_FILE.name and "electronic" not in terms:
        return ["electronic"] + terms
    return dash.no_update


def upload_limit():
    """Per-file upload limit [bytes] from the server's settings (never from the browser)."""
    return intake.upload_limit()


def uploaded_measurement(contents, name, max_bytes=None):
    """Store entry of an upload, or of its refusal (size limit) shown by :func:`draw`."""
    name = name or "upload"
    size = len(contents or "") * 3 // 4          # base64 carries 3 bytes in 4 characters
    if max_bytes and size > max_bytes:
        return {"name": name, "refused": f"{name}: the file is {size / 1e6:.3g} MB; "
                                         f"the upload limit is {max_bytes / 1e6:g} MB"}
    return {"name": name, "contents": contents}


def demo_measurement():
    """Store entry of the invented demo measurement."""
    return {"name": DEMO_FILE.name, "contents": "data:text/csv;base64,"
            + base64.b64encode(DEMO_FILE.read_bytes()).decode("ascii")}


def _failed(message):
    blank = fg.message_figure("nothing to show for these settings")
    return (blank,) * 3 + ([], [], dash.no_update, dash.no_update, c.message_items([("error", message)]))


def _measured(stored, unit, formula):
    if stored.get("refused"):
        raise OptionError(stored["refused"])
    # the store is the browser's: its size is checked against the server's limit again, before decoding
    with budget.holding(intake.decoded_size(stored["contents"]), stored["name"]):
        raw = decode_upload(stored["contents"], stored["name"], upload_limit())
        return read_heat_capacity(raw, cp_unit=None if unit == "header" else unit, formula=formula or None,
                                  name=stored["name"])


def _fixed(text):
    items = [p.strip() for p in str(text or "").replace(";", ",").split(",") if p.strip()]
    return parse_fixed(items)


@callback(*[Output(g, "figure") for g in _GRAPHS], Output("cal-keys", "children"), Output("cal-params", "children"),
          Output("cal-active", "children"), Output("cal-file", "children"), Output("cal-messages", "children"),
          Input("cal-measured", "data"), Input("mh-workspace", "data"), Input("cal-lattice", "value"),
          Input("cal-terms", "value"), Input("cal-fix", "value"), Input("cal-range", "value"),
          Input("cal-atoms", "value"), Input("cal-unit", "value"), Input("cal-formula", "value"),
          Input("mh-electronic", "data"), State("mh-config", "data"))
@reported(_failed)
def draw(stored, workspace, lattice, terms, fix, fit_range, atoms, unit, formula, electronic=None, config=None):
    """Fit and draw for the page's settings (and the band γ of the electronic DOS chosen on the Electronic
    page, or of the demo electronic DOS beside the demo measurement)."""
    demo_note = []
    if not stored:   # first visit: the invented demo measurement, as the DOS demos
        stored = demo_measurement()
        demo_note = [("info", "Showing the invented demo measurement (imaginary metal 'springium'); "
                              "upload your own file above.")]
    current, formula = _dos_dataset(workspace, stored), reading.formula_of(workspace, formula)
    measured = _measured(stored, unit, formula)
    dos = cache.load(current) if current is not None else None
    if lattice == "dos" and dos is None:
        raise OptionError("the DOS lattice part needs an active dataset (load one on the Spectrum page)")
    active = session.active(workspace)
    paired = current is not None and (active is None or current["id"] != active["id"])
    if paired:
        demo_note.append(("info", f"The demo measurement is paired with the demo DOS {current['name']}"
                                  + (f"; the active dataset {active['name']} is not used" if active else "") + "."))
    n = int(dos.atoms if dos is not None and lattice == "dos" else (atoms or 1))
    if dos is not None and dos.atoms != n:
        demo_note.append(("warn", f"the DOS {current['name']} has {dos.atoms} atoms per formula unit, the "
                                  f"measurement is analysed for {n}: its C_v curve is per its own formula unit"))
    report, fit = _analysis(stored, measured, (unit, formula), current, dos, n, lattice, terms or [], fix,
                            fit_range)
    if dos is not None and "entropy_298_15_from_dos_J_per_mol_K" not in report:
        report["entropy_298_15_from_dos_J_per_mol_K"] = float(
            cache.table(current, [ROOM_K])[column_name("entropy")].iloc[0])
    figs = [_overlay(measured, fit, current), _residuals(fit), _low_t(report, measured)]
    notes = [("warn", n) for n in report["notes"]] + _with_electronic(report, stored, electronic, config)
    if dos is not None:
        notes += [("warn", f"{current['name']}: {w}") for w in dos.warnings]
    file_note = f"Measured: {measured.source} — {measured.temperature_K.size} points, " \
                f"{measured.temperature_K[0]:g}–{measured.temperature_K[-1]:g} K, read in {measured.unit}; " \
                f"model {report['model']}, weights: {report['weighting']}"
    return (*figs, _keys(report), _parameter_table(report), _used_note(current, active, lattice, paired), file_note,
            c.message_items(demo_note + notes))


def _used_note(dataset, active, lattice, paired):
    """Names the DOS this page actually used, and how, beside the active dataset when they differ."""
    if dataset is None:
        return c.active_note(None)
    role = "lattice part (DOS × scale s) and comparison" if lattice == "dos" else "comparison curve and S(298.15 K)"
    words = ["DOS used for the ", role, ": ", html.Strong(dataset["name"], className="mh-dataset-name")]
    if paired:
        words += [" — paired with the demo measurement",
                  f"; the active dataset {active['name']} is not used" if active else "",
                  " (upload your own measurement to use the active dataset)"]
    else:
        words += [" (the active dataset; change it on the ", dcc.Link("Spectrum", href="/spectrum"), " page)"]
    return html.P(words, className="mh-active-note", id="cal-dos-used")


def _analysis(stored, measured, reading, current, dos, atoms, lattice, terms, fix, fit_range):
    """(report, fit) of :func:`thermo.calorimetry.report.analyse`, memoised on the measured file's content,
    the DOS and the settings (a revisit of the page does not refit)."""
    digest = hashlib.sha256(stored["contents"].encode()).hexdigest()
    dos_key = cache.load_key(current) if (current is not None and lattice == "dos") else None
    key = ("calorimetry", digest, tuple(reading), dos_key, atoms, lattice, tuple(terms),
           str(fix or ""), str(fit_range or ""))

    def compute():
        model = HeatCapacityModel(atoms=atoms, lattice=lattice, electronic="electronic" in terms,
                                  dilation="nernst-lindemann" if "nernst-lindemann" in terms else "none",
                                  dos=dos if lattice == "dos" else None)
        report, fit, _third = analyse(measured, model, _fixed(fix), parse_fit_range(fit_range) if fit_range else None)
        return report, fit
    report, fit = cache.result(key, compute)
    return dict(report), fit


def _with_electronic(report, stored, electronic, config):
    """Add the band γ of the chosen electronic DOS (the demo one beside the demo measurement) to the report;
    the notes to show.  A file that cannot be read gives a note, never a lost fit."""
    if not electronic and stored.get("name") == DEMO_FILE.name:
        electronic = electronic_demo_entry()
    if not electronic:
        return []
    try:
        edos = intake.electronic_dos(electronic)          # the server's upload limit, never the browser's config
    except ModeheatError as exc:
        return [("warn", f"the electronic DOS is not compared: {exc}")]
    report["electronic_dos_comparison"] = electronic_comparison(report, edos)
    return [("info", n) for n in report["electronic_dos_comparison"]["notes"]]


def _dos_dataset(workspace, stored):
    """The DOS to compare with: the demo DOS for the demo measurement when loaded, else the active one."""
    if stored.get("name") == DEMO_FILE.name:
        demo = next((d for d in (workspace or {}).get("datasets", []) if d["name"] == DEMO_DOS), None)
        if demo is not None:
            return demo
    return session.active(workspace)


def _overlay(measured, fit, dataset):
    t = measured.temperature_K
    fig = fg.figure("temperature T [K]", "heat capacity [J/(mol K)]")
    sigma = measured.uncertainty_J_per_mol_K
    fig.add_trace(go.Scatter(x=t, y=measured.heat_capacity_J_per_mol_K, mode="markers", name="measured C_p",
                             marker={"size": 6, "color": fg.PALETTE[1]},
                             error_y=None if sigma is None else {"array": sigma, "visible": True}))
    grid = np.linspace(0.0, float(t[-1]), 300)
    parts = fit.model.parts(grid, fit.values)
    fig.add_trace(fg.line(grid, parts["heat_capacity_p"], "fitted C_p", 0))
    fig.add_trace(fg.line(grid, parts["lattice"], "lattice part", 2, width=1.5, dash="dash"))
    if fit.model.electronic or fit.model.dilation != "none":
        fig.add_trace(fg.line(grid, parts["electronic"] + parts["dilation"], "γT + dilation", 3, width=1.5,
                              dash="dot"))
    if dataset is not None:
        df = cache.table(dataset, grid, "formula")
        fig.add_trace(fg.line(df[find(df, "temperature")], df[find(df, "heat_capacity_v")],
                              f"C_v of the DOS {dataset['name']} (harmonic)", 5, width=1.5))
    return fig


def _residuals(fit):
    df = fit.residuals
    fig = fg.figure("temperature T [K]", "relative residual [%]")
    sigma = df[column_name("heat_capacity_p_uncertainty")] / df[column_name("heat_capacity_p_measured")]
    bars = None if sigma.isna().all() else {"array": 100 * sigma, "visible": True, "thickness": 1}
    fig.add_trace(go.Scatter(x=df[column_name("temperature")], y=100 * df[column_name("relative_residual")],
                             mode="markers", name="(model − measured)/measured; bars: stated uncertainty",
                             marker={"color": fg.PALETTE[0]}, error_y=bars))
    low, high = fit.fit_range_K
    fig.add_vrect(x0=low, x1=high, fillcolor=fg.PALETTE[0], opacity=0.05, line_width=0,
                  annotation_text="fit range", annotation_position="top left")
    fig.add_hline(y=0, line_color=fg.INK, line_width=1)
    return fig


def _low_t(report, measured):
    low = report["low_temperature_analysis"]
    t, cp = measured.temperature_K, measured.heat_capacity_J_per_mol_K
    top = low["range_K"][1] if low else float(t[min(len(t) - 1, 9)])
    keep = t <= 1.5 * top
    fig = fg.figure("T² [K²]", "C_p/T [J/(mol K²)]")
    fig.add_trace(go.Scatter(x=t[keep] ** 2, y=cp[keep] / t[keep], mode="markers", name="measured",
                             marker={"color": fg.PALETTE[1]}))
    if low:
        x = np.linspace(0.0, float(t[keep][-1] ** 2), 50)
        fig.add_trace(fg.line(x, low["gamma_J_per_mol_K2"]["value"] + low["beta_J_per_mol_K4"]["value"] * x,
                              f"γ + βT² over {low['range_K'][0]:g}–{low['range_K'][1]:g} K", 0))
    return fig


def _pm(pair, digits=5):
    """``value ± uncertainty`` (the uncertainty to 2 digits; ``± ?`` when it is not known)."""
    if pair["value"] is None:
        return "—"
    u = pair.get("uncertainty")
    if u is None:
        return f"{pair['value']:.{digits}g} ± ?"
    return f"{pair['value']:.{digits}g} ± {u:.2g}"


def _keys(report):
    below = report["below_first_point"]
    share = below.get("share_of_entropy_298_15")
    pairs = [("S°(298.15 K), model from 0 K", _pm(report["entropy_298_15_J_per_mol_K"]) + " J/(mol K)"),
             ("S°(298.15 K), data + forms below the first point",
              _pm(report["entropy_298_15_from_data_J_per_mol_K"]) + " J/(mol K)"),
             ("H°(298.15 K) − H°(0), model", _pm(report["enthalpy_298_15_minus_0_kJ_per_mol"]) + " kJ/mol"),
             ("H°(298.15 K) − H°(0), data", _pm(report["enthalpy_298_15_minus_0_from_data_kJ_per_mol"]) + " kJ/mol"),
             (f"S below the first point ({below['temperature_K']:g} K)",
              _pm(below["entropy_J_per_mol_K"], 4) + " J/(mol K)"
              + (f", {100 * share:.2g} % of S°" if share is not None else ""))]
    if "entropy_298_15_from_dos_J_per_mol_K" in report:
        pairs.append(("S(298.15 K) of the DOS (harmonic)", f"{report['entropy_298_15_from_dos_J_per_mol_K']:.5g} J/(mol K)"))
    pairs.append(("max |relative residual|", f"{100 * report['max_relative_residual']:.3g} %"))
    return c.key_numbers(pairs)


def _parameter_table(report):
    rows = []
    for key, pair in report["fit"].items():
        name, unit = _PARAM_TEXT[key]
        shown = _pm(pair, 6)
        rows.append(html.Tr([html.Td(name), html.Td(shown),
                             html.Td(("held" + (f" (± {pair['uncertainty']:.2g} given)" if pair["uncertainty"] else ""))
                                     if pair["fixed"] else "fitted"), html.Td(unit)]))
    low = report["low_temperature_analysis"]
    if low:
        for key, label, unit in (("gamma_J_per_mol_K2", "γ from C/T = γ + βT²", "J/(mol K²)"),
                                 ("theta_D_K", "θ_D from β", "K")):
            rows.append(html.Tr([html.Td(label), html.Td(_pm(low[key], 6)), html.Td("C/T = γ + βT²"),
                                 html.Td(unit)]))
    compared = report.get("electronic_dos_comparison")
    if compared:
        band = compared["gamma_from_electronic_dos_J_per_mol_K2"]
        rows.append(html.Tr([html.Td(f"γ of the electronic DOS {compared['electronic_input']} (band value)"),
                             html.Td(_pm(band, 6)), html.Td("electronic DOS"), html.Td("J/(mol K²)")],
                            id="cal-band-gamma"))
        for label, ratio in compared["ratios"].items():
            rows.append(html.Tr([html.Td(f"{label} γ / band γ (1 + λ)"), html.Td(_pm(ratio, 4)),
                                 html.Td("ratio"), html.Td("1")]))
    head = html.Thead(html.Tr([html.Th(h) for h in ("parameter", "value ± standard uncertainty", "how", "unit")]))
    names = report["correlation"]["parameters"]
    shown = [_PARAM_TEXT[n][0] for n in names]
    corr = html.Table([html.Thead(html.Tr([html.Th("r")] + [html.Th(n) for n in shown])),
                       html.Tbody([html.Tr([html.Th(n)] + [html.Td(f"{v:+.3f}") for v in row])
                                   for n, row in zip(shown, report["correlation"]["matrix"])])],
                      className="mh-table mh-numbers", id="cal-correlation")
    return [html.Table([head, html.Tbody(rows)], className="mh-table mh-numbers", id="cal-param-table"),
            html.H3("Correlation of the fitted parameters"), corr]


c.follow_image_format(*_GRAPHS)


def model_text(lattice, terms):
    """The ``--model`` text of the page's choices (lattice first, then γT, then the dilation term).

    Examples
    --------
    >>> model_text("dos", ["nernst-lindemann", "electronic"])
    'dos+electronic+nernst-lindemann'
    """
    return "+".join([lattice] + [t for t in ("electronic", "nernst-lindemann") if t in (terms or [])])


def calorimetry_download(fmt, stored, workspace, lattice, terms, fix, fit_range, atoms, unit, formula,
                         electronic=None, config=None):
    """The result as ``modeheat calorimetry MEASURED --dos DOS --model TERMS [--atoms N] [--fix ...] [--range LO:HI]
    [--cp-unit U] [--formula F] [--electronic EDOS] --format FMT`` writes it for the page's settings."""
    from thermo.calorimetry.export import calorimetry_export
    stored = stored or demo_measurement()
    current, formula = _dos_dataset(workspace, stored), reading.formula_of(workspace, formula)
    measured = _measured(stored, unit, formula)
    dos = cache.load(current) if current is not None else None
    if lattice == "dos" and dos is None:
        raise OptionError("the DOS lattice part needs an active dataset (load one on the Spectrum page)")
    n = int(dos.atoms if dos is not None and lattice == "dos" else (atoms or 1))
    model = HeatCapacityModel(atoms=n, lattice=lattice, electronic="electronic" in (terms or []),
                              dilation="nernst-lindemann" if "nernst-lindemann" in (terms or []) else "none",
                              dos=dos if lattice == "dos" else None)
    if not electronic and stored.get("name") == DEMO_FILE.name:
        electronic = electronic_demo_entry()
    edos = intake.electronic_dos(electronic) if electronic else None     # the server's upload limit, never config's
    items = [p.strip() for p in str(fix or "").replace(";", ",").split(",") if p.strip()]
    settings = {"model": model_text(lattice, terms), "metal": False, "fixed": items,
                "fit_range_K": fit_range or None, "low_t_max_K": None,
                "atoms": None if dos is not None and lattice == "dos" else n}   # --atoms only without a DOS part
    record, result, _notes = calorimetry_export(
        measured, model, parse_fixed(items), parse_fit_range(fit_range) if fit_range else None, None, edos,
        None if edos is None else electronic["name"], fmt, cp_unit=None if unit == "header" else unit,
        formula=formula or None, dos=dos, dos_label=None if current is None else current["name"],
        settings=settings)
    stem = f"{exports.file_stem(measured.source, 'measured')}-calorimetry"
    if fmt == "json":
        return exports.report_file(stem, record, result)
    return exports.table_file(stem, result, record, fmt, digits=None)


_STATES = [State("cal-measured", "data"), State("mh-workspace", "data"), State("cal-lattice", "value"),
           State("cal-terms", "value"), State("cal-fix", "value"), State("cal-range", "value"),
           State("cal-atoms", "value"), State("cal-unit", "value"), State("cal-formula", "value"),
           State("mh-electronic", "data"), State("mh-config", "data")]
exports.register_download("cal", _STATES, calorimetry_download)
reading.register("cal")
# the residual and third-law table (fitted C_p, S° from the data) as the csv download writes it
for _target in ("polynomials", "phases", "compare"):      # Phases reads its H° − H°(0) and S° (thermo.phases.tabulated)
    handoff.register_send("cal", _target, _STATES, lambda *values: calorimetry_download("csv", *values), NAME)


dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
