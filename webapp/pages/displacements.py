"""Displacements page: ⟨u²⟩, B and θ_M per species versus T, the Lindemann caution, elastic θ_D."""

from __future__ import annotations

import dash
from dash import Input, Output, State, callback, dcc, html, no_update

from thermo.columns import column_name, label
from thermo.io.writers import DEFAULT_DIGITS, export_table
from thermo.vibration.displacements import (CONVENTION, displacement_provenance, displacement_summary,
                                            displacement_table)
from thermo.vibration.elastic import compare_debye_temperatures, elastic_debye_temperature
from thermo.vibration.inputs import parse_distance, parse_masses
from thermo.vibration.lindemann import LINDEMANN_THRESHOLD

from .. import budget, cache, session
from .. import components as c
from .. import figures as fg
from ..reporting import reported

PATH, NAME, ORDER = "/displacements", "Displacements", 8

#: Masses [u] of the invented species of the demo files (sample_dos/generate.py), used when the
#: mass field is empty.
DEMO_MASSES = {"lightheavy_rocksalt.tsv": "Ly=12.4, Hv=88.6", "lightheavy_soft.dat": "Ly=12.4, Hv=88.6",
               "springium_fcc.dat": "Sp=47.1", "springium_md.csv": "Sp=47.1"}
_GRAPHS = ("dw-msd-graph", "dw-b-graph", "dw-theta-graph", "dw-lindemann-graph")
_CAUTION = ("Harmonic approximation: real crystals vibrate more at high temperature (anharmonicity) and the "
            "numbers lose meaning near melting. Compare with refined displacement parameters and validated "
            "data before relying on them.")


def _masses(dataset, text):
    """Masses from the field, else the demo masses of a demo file (with a note), else none."""
    if str(text or "").strip():
        return parse_masses(text), []
    demo = DEMO_MASSES.get(dataset["name"])
    if demo:
        return parse_masses(demo), [("info", f"masses of the invented demo species used: {demo} u")]
    return {}, []


def _settings(dataset, masses_text, distance):
    masses, notes = _masses(dataset, masses_text)
    formula = session.options_of(dataset).get("formula") or None
    return formula, masses, parse_distance(distance) if distance not in (None, "") else None, notes


def results(dataset, temperatures, masses_text, distance):
    """Table, summary and notes of one dataset (cached per settings)."""
    formula, masses, d, notes = _settings(dataset, masses_text, distance)
    key = (tuple(temperatures), formula, tuple(sorted(masses.items())), d)
    table = cache.derived("displacements", dataset,
                          lambda dos: displacement_table(dos, temperatures, formula, masses, d), *key)
    summary = cache.derived("displacement-summary", dataset,
                            lambda dos: displacement_summary(dos, formula, masses, d, temperatures), *key)
    return table, summary, notes


def export_bytes(dataset, temperatures, masses_text, distance, fmt):
    """File name and content of the displacement table with its provenance (as the CLI writes it)."""
    table, summary, _ = results(dataset, temperatures, masses_text, distance)
    formula, masses, d, _ = _settings(dataset, masses_text, distance)
    info = displacement_provenance(cache.load(dataset), temperatures, formula, masses, d, summary)
    stem = dataset["name"].rsplit(".", 1)[0]
    return f"{stem}_displacements.{fmt}", export_table(table, info, fmt, digits=DEFAULT_DIGITS)


def figures(table, distance=None):
    """⟨u²⟩ (with the classical limit), B, θ_M and rms-displacement figures, one trace per species.

    The last figure shows √⟨u²⟩ [Å]; with a neighbour distance d it adds the line 0.1·d
    above which the Lindemann ratio exceeds the common-practice limit.
    """
    sp, t = column_name("species"), column_name("temperature")
    u_col = column_name("mean_square_displacement")
    figs = []
    for key in ("mean_square_displacement", "debye_waller_b", "debye_waller_temperature", None):
        col = column_name(key) if key else None
        fig = fg.figure("temperature T [K]", label(col) if col else "√⟨u²⟩ [Å]")
        for k, (name, rows) in enumerate(table.groupby(sp, sort=False)):
            y = rows[col] if col else rows[u_col] ** 0.5
            fig.add_trace(fg.line(rows[t], y, name, k))
            if key == "mean_square_displacement":
                fig.add_trace(fg.line(rows[t], rows[column_name("classical_mean_square_displacement")],
                                      f"{name}: classical limit", k, width=1.4, dash="dot"))
        if key is None and distance:
            fig.add_hline(y=LINDEMANN_THRESHOLD * distance, line_dash="dash", line_color=fg.INK,
                          annotation_text=f"{LINDEMANN_THRESHOLD:g}·d: harmonic results not meaningful above",
                          annotation_position="top left")
        figs.append(fig)
    return figs


def key_numbers(summary):
    """Zero-point ⟨u²⟩, B and θ_M at 298.15 K and the window sensitivity, per species."""
    pairs = []
    sens = summary["window_sensitivity"]["per_species"]
    for name, s in summary["species"].items():
        pairs += [(f"{name}: ⟨u²⟩ at 0 K", f"{s['msd_zero_point_A2']:.4g} Å²"),
                  (f"{name}: B at 298.15 K", f"{s['b_298K_A2']:.4g} Å²"),
                  (f"{name}: θ_M at 298.15 K", f"{s['theta_m_298K_K']:.4g} K")]
        if name in sens:
            pairs.append((f"{name}: change under other ν² windows", f"{100 * sens[name]:.2g} %"))
    return c.key_numbers(pairs)


def elastic_comparison(dataset, values):
    """Elastic θ_D (Anderson, VRH) beside the DOS's low-frequency θ_D, or a hint."""
    c11, c12, c44, rho, vl, vt = values
    if rho in (None, "") or (None in (c11, c12, c44) and None in (vl, vt)):
        return html.P("Enter the density and C11, C12, C44 (or v_L and v_T) to compare.", className="mh-msg mh-msg-info")
    from thermo.formula import formula_unit
    formula = session.options_of(dataset).get("formula") or None
    if not formula:
        return html.P("Set the chemical formula on the Spectrum page (molar mass needed).",
                      className="mh-msg mh-msg-warn")
    mass, atoms = formula_unit(formula)
    use_c = None not in (c11, c12, c44)
    r = elastic_debye_temperature(rho, mass, atoms, **({"c11": c11, "c12": c12, "c44": c44} if use_c
                                                          else {"v_l": vl, "v_t": vt}))
    cmp = compare_debye_temperatures(r["theta_K"], cache.load(dataset).low_frequency_debye_temperature_k())
    pairs = [("θ_D from elastic data", f"{r['theta_K']:.4g} K"), ("mean sound velocity", f"{r['v_mean_m_per_s']:.4g} m/s")]
    if cmp["dos_K"] is not None:
        pairs += [("θ_D of the DOS (ν² region)", f"{cmp['dos_K']:.4g} K"),
                  ("difference (DOS − elastic)", f"{cmp['difference_K']:+.3g} K ({100 * cmp['relative_difference']:+.2g} %)")]
    far = cmp["relative_difference"] is not None and abs(cmp["relative_difference"]) > 0.05
    return html.Div([c.key_numbers(pairs), html.P(cmp["note"], className=f"mh-msg mh-msg-{'warn' if far else 'info'}")])


def layout(**_query):
    """The displacements page."""
    return c.page(
        "Displacements", "Mean-square atomic displacements ⟨u²⟩, isotropic U_iso and Debye–Waller B per "
                         "species from the partial DOS, the Debye–Waller temperature θ_M, and θ_D from "
                         "elastic data. " + CONVENTION + ".",
        c.active_slot("dw"),
        c.controls(*c.temperature_fields("dw", 0, 1000, 10),
                   c.text("dw-masses", "", "Masses [u]", placeholder="e.g. Ly=12.4, Hv=88.6",
                          hint="default: element masses of the species (periodictable) or the formula"),
                   c.number("dw-distance", None, "Nearest-neighbour d [Å]", min_value=0,
                            hint="for the Lindemann ratio √⟨u²⟩/d (warning above 0.1)")),
        c.messages_panel("dw-messages"),
        html.P(_CAUTION, className="mh-msg mh-msg-warn"),
        html.Div(id="dw-keys"),
        html.Div([c.graph("dw-msd-graph", "⟨u²⟩ per species; dotted: classical limit k_BT/(m n) ∫ g/ω²"),
                  c.graph("dw-b-graph", "Debye–Waller B = 8π²⟨u²⟩/3"),
                  c.graph("dw-theta-graph", "Debye–Waller temperature θ_M (Debye θ with the same ⟨u²⟩)"),
                  c.graph("dw-lindemann-graph", "rms displacement √⟨u²⟩; dashed: 0.1·d, the Lindemann limit "
                                                "(common practice; give d)")],
                 className="mh-grid"),
        html.Div([c.radio("dw-format", [{"label": f, "value": f.lower()} for f in ("CSV", "JSON", "XLSX")],
                          "csv", "File format"),
                  html.Button("Download displacement table", id="dw-download-btn", className="mh-button mh-primary"),
                  dcc.Download(id="dw-download"), html.Span(id="dw-download-note")], className="mh-inline"),
        html.H2("θ_D from elastic data (Anderson method, Voigt–Reuss–Hill)"),
        c.controls(c.number("dw-c11", None, "C11 [GPa]"), c.number("dw-c12", None, "C12 [GPa]"),
                   c.number("dw-c44", None, "C44 [GPa]"), c.number("dw-density", None, "density [g/cm³]", min_value=0),
                   c.number("dw-vl", None, "or v_L [m/s]", min_value=0), c.number("dw-vt", None, "v_T [m/s]", min_value=0)),
        html.Div(id="dw-elastic"),
    )


def _failed(message):
    blank = fg.message_figure("nothing to show for these settings")
    return (blank,) * 4 + ([], c.message_items([("error", message)]))


@callback(*[Output(g, "figure") for g in _GRAPHS], Output("dw-keys", "children"), Output("dw-messages", "children"),
          Input("mh-workspace", "data"), Input("dw-tmin", "value"), Input("dw-tmax", "value"),
          Input("dw-step", "value"), Input("dw-masses", "value"), Input("dw-distance", "value"))
@reported(_failed)
def draw(workspace, t_min, t_max, step, masses_text, distance):
    """Figures, key numbers and cautions for the page's settings."""
    current = session.active(workspace)
    if current is None:
        blank = fg.message_figure("no dataset loaded")
        return blank, blank, blank, blank, [], []
    table, summary, notes = results(current, budget.temperatures(t_min, t_max, step), masses_text, distance)
    messages = notes + [("warn", w) for w in summary["warnings"]]
    d = parse_distance(distance) if distance not in (None, "") else None
    return (*figures(table, d), key_numbers(summary), c.message_items(messages))


@callback(Output("dw-elastic", "children"), Input("mh-workspace", "data"),
          Input("dw-c11", "value"), Input("dw-c12", "value"), Input("dw-c44", "value"),
          Input("dw-density", "value"), Input("dw-vl", "value"), Input("dw-vt", "value"))
@reported(lambda message: c.message_items([("error", message)]))
def elastic(workspace, *values):
    """The elastic θ_D comparison."""
    current = session.active(workspace)
    if current is None:
        return c.no_data_note()
    return elastic_comparison(current, values)


@callback(Output("dw-download", "data"), Output("dw-download-note", "children"),
          Input("dw-download-btn", "n_clicks"), State("mh-workspace", "data"), State("dw-tmin", "value"),
          State("dw-tmax", "value"), State("dw-step", "value"), State("dw-masses", "value"),
          State("dw-distance", "value"), State("dw-format", "value"), prevent_initial_call=True)
@reported(lambda message: (no_update, c.message_items([("error", message)])))
def download(_clicks, workspace, t_min, t_max, step, masses_text, distance, fmt):
    """The displacement table with provenance and cautions."""
    current = session.active(workspace)
    if current is None:
        return no_update, c.no_data_note()
    name, content = export_bytes(current, budget.temperatures(t_min, t_max, step), masses_text, distance, fmt)
    return dcc.send_bytes(content, name), c.message_items([("info", f"prepared {name}")])


c.follow_active("dw")
c.follow_image_format(*_GRAPHS)
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
