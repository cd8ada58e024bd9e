"""Electronic page: an electronic DOS, C_el/T and S_el against T, γ from g(E_F) (the electronic term of metals)."""

from __future__ import annotations

import hashlib

import dash
import numpy as np
import plotly.graph_objects as go
from dash import Input, Output, State, callback, dcc, html

from thermo.columns import column_name
from thermo.electronic import CAUTIONS, electronic_table
from thermo.electronic.segments import window_work
from thermo.unit_names import ELECTRON_ENERGY_UNITS

from .. import budget, cache, intake
from .. import components as c
from .. import exports
from .. import figures as fg
from ..demo import electronic_demo_entry
from ..reporting import reported

PATH, NAME, ORDER = "/electronic", "Electronic", 7.5

_GRAPHS = ("el-dos-graph", "el-ct-graph", "el-s-graph")
_UNITS = [{"label": "as the file states", "value": "file"}] + [{"label": u, "value": u} for u in ELECTRON_ENERGY_UNITS]
_SPIN = [{"label": " as the column names say", "value": "auto"}, {"label": " already summed", "value": "summed"},
         {"label": " columns 2 and 3 are up and down", "value": "pair"}]


def layout(**_query):
    """The electronic page."""
    return c.page(
        "Electronic", "Electronic heat capacity, entropy and free energy of a metal from its electronic DOS: "
                           "Fermi–Dirac occupation at fixed electron count, and γ from the DOS at the Fermi level.",
        html.Div([dcc.Upload(id="el-upload", className="mh-upload",
                             children=html.Div(["Drop an electronic DOS here or ", html.U("choose a file"), html.Br(),
                                                html.Small("energy (relative to E_F, or absolute with '# Fermi "
                                                           "energy: … eV'), total DOS per formula unit, optional "
                                                           "projected columns; text or .xlsx")])),
                  html.Button("Use the demo electronic DOS", id="el-demo", n_clicks=0, className="mh-button")]),
        html.P(id="el-file", className="mh-active-note"),
        c.controls(
            _kept(c.dropdown("el-unit", _UNITS, "file", "Energy unit")),
            _kept(c.text("el-fermi", "", "Fermi energy [eV]", "as the file states", hint="only for absolute energies")),
            c.radio("el-spin", _SPIN, "auto", "Spin columns", persist=True),
            _kept(c.number("el-fu", 1, "Formula units per cell", min_value=0)),
            *c.temperature_fields("el", 0, 1500, 10)),
        c.messages_panel("el-messages"),
        html.Div(id="el-keys"),
        exports.download_bar("el", "electronic table"),
        html.Div([c.graph("el-dos-graph", "Electronic DOS against E − E_F, with the projected columns"),
                  c.graph("el-ct-graph", "C_el/T against T: the Sommerfeld γ at low T, the DOS shape above"),
                  c.graph("el-s-graph", "Electronic entropy S_el and Helmholtz energy F_el against T")],
                 className="mh-grid"),
        html.Div([html.P(text, className="mh-msg mh-msg-info") for text in CAUTIONS], id="el-cautions"),
    )


def _kept(field):
    """The field with its value kept for the browser tab (the stored options follow the fields)."""
    field.children[1].persistence, field.children[1].persistence_type = True, "session"
    return field


@callback(Output("mh-electronic", "data"), Input("el-upload", "contents"), Input("el-demo", "n_clicks"),
          Input("el-unit", "value"), Input("el-fermi", "value"), Input("el-spin", "value"), Input("el-fu", "value"),
          State("el-upload", "filename"), State("mh-electronic", "data"), prevent_initial_call=True)
def keep_file(contents, _clicks, unit, fermi, spin, formula_units, name, stored):
    """The chosen file (data URL) and the reading fields as typed in the shell's session store
    ``mh-electronic``, which the Calorimetry page reads too (:func:`webapp.cache.electronic_dos`)."""
    trigger = dash.ctx.triggered_id
    if trigger == "el-demo" or not (stored or {}).get("contents"):
        stored = electronic_demo_entry()
    if trigger == "el-upload" and contents:
        stored = {"name": name or "upload", "contents": contents}
    return dict(stored, fields={"unit": unit, "fermi": fermi, "spin": spin, "formula_units": formula_units})


def _failed(message):
    blank = fg.message_figure("nothing to show for these settings")
    return (blank,) * 3 + ([], dash.no_update, c.message_items([("error", message)]))


def computed(stored, temperatures, max_bytes=None):
    """(ElectronicDOS, table) of the stored file and fields, memoised on content, options and temperatures."""
    edos = intake.electronic_dos(stored, max_bytes)
    t = np.asarray(temperatures, dtype=float)
    budget.checked_work(window_work(edos.energies_ev, t), stored["name"])
    options = tuple(sorted(intake.electronic_options(stored.get("fields")).items()))
    key = ("electronic table", edos.source.get("sha256"), stored["name"], options, hashlib.sha1(t.tobytes()).hexdigest())
    return edos, cache.result(key, lambda: electronic_table(edos, t))


@callback(*[Output(g, "figure") for g in _GRAPHS], Output("el-keys", "children"), Output("el-file", "children"),
          Output("el-messages", "children"),
          Input("mh-electronic", "data"), Input("el-tmin", "value"), Input("el-tmax", "value"),
          Input("el-step", "value"), State("mh-config", "data"))
@reported(_failed)
def draw(stored, t_min, t_max, step, config):
    """Read, compute and draw for the stored file, its options and the temperature fields."""
    notes = []
    if not stored:
        stored = electronic_demo_entry()
        notes.append(("info", "Showing the invented demo electronic DOS (imaginary metal 'springium'); "
                              "upload your own file above."))
    temperatures = budget.temperatures(t_min, t_max, step)
    edos, table = computed(stored, temperatures)     # the upload limit is the server's (never config's)
    summary = table.attrs["summary"]
    notes += [("info", n) for n in edos.notes] + [("warn", w) for w in table.attrs["warnings"]]
    e = edos.energies_ev
    note = (f"Electronic DOS: {edos.source.get('name')} — {e.size} points, {e[0]:+.4g} … {e[-1]:+.4g} eV about "
            f"E_F, read in {edos.source.get('energy_unit')}; "
            f"{summary['electrons_below_fermi_level']:.6g} electrons per formula unit below E_F in the table")
    return (_dos_figure(edos), _ct_figure(table, summary), _s_figure(table), _keys(summary), note,
            c.message_items(notes))


def _dos_figure(edos):
    fig = fg.figure("E − E_F [eV]", "DOS [states/eV per formula unit]")
    fig.add_trace(fg.line(edos.energies_ev, edos.dos_per_ev, "total (both spins)", 0))
    for k, (name, values) in enumerate(edos.partials.items(), start=1):
        fig.add_trace(fg.line(edos.energies_ev, values, name, k, width=1.5, dash="dot"))
    fig.add_vline(x=0.0, line_color=fg.INK, line_width=1, annotation_text="E_F", annotation_position="top right")
    return fig


def _ct_figure(table, summary):
    t = table[column_name("temperature")].to_numpy()
    hot = t > 0
    c_el = table[column_name("heat_capacity_electronic")].to_numpy()[hot]
    err = table[column_name("heat_capacity_electronic_error")].to_numpy()[hot]
    fig = fg.figure("temperature T [K]", "C_el/T [mJ/(mol K²)]")
    fig.add_trace(go.Scatter(x=t[hot], y=1e3 * c_el / t[hot], mode="lines", name="C_el/T from the DOS",
                             line={"width": 2.2, "color": fg.PALETTE[0]},
                             error_y={"array": 1e3 * err / t[hot], "visible": True, "thickness": 1, "width": 0}))
    gamma = summary["sommerfeld_gamma_mJ_per_mol_K2"]
    fig.add_hline(y=gamma["value"], line_dash="dash", line_color=fg.PALETTE[1],
                  annotation_text=f"γ = {gamma['value']:.4g} ± {gamma['uncertainty']:.2g} mJ/(mol K²)",
                  annotation_position="bottom right")
    return fig


def _s_figure(table):
    t = table[column_name("temperature")]
    fig = fg.figure("temperature T [K]", "S_el [J/(mol K)],  F_el [kJ/mol]")
    fig.add_trace(go.Scatter(x=t, y=table[column_name("entropy_electronic")], mode="lines", name="S_el",
                             line={"width": 2.2, "color": fg.PALETTE[0]},
                             error_y={"array": table[column_name("entropy_electronic_error")], "visible": True,
                                      "thickness": 1, "width": 0}))
    fig.add_trace(fg.line(t, table[column_name("helmholtz_energy_electronic")], "F_el (from the 0 K ground state)",
                          2, dash="dash"))
    return fig


def _keys(summary):
    gamma, g = summary["sommerfeld_gamma_mJ_per_mol_K2"], summary["dos_at_fermi_level_per_eV"]
    pairs = [("γ = (π²/3) k_B² g(E_F)", f"{gamma['value']:.5g} ± {gamma['uncertainty']:.2g} mJ/(mol K²)"),
             ("g(E_F)", f"{g['value']:.5g} ± {g['uncertainty']:.2g} states/eV per formula unit"),
             ("electrons below E_F (in the table)", f"{summary['electrons_below_fermi_level']:.6g}")]
    if summary["gap_eV"]:
        low, high = summary["gap_eV"]
        pairs.append(("gap at E_F", f"{high - low:.4g} eV"))
    return c.key_numbers(pairs)


c.follow_image_format(*_GRAPHS)
def table_download(fmt, stored, t_min, t_max, step):
    """The table as ``modeheat electronic EDOS --temperatures T_MIN:T_MAX:STEP`` writes it (per formula unit)."""
    from thermo.electronic import electronic_provenance
    stored = stored or electronic_demo_entry()
    temperatures = budget.temperatures(t_min, t_max, step)
    edos, table = computed(stored, temperatures)
    return exports.table_file(f"{exports.file_stem(stored['name'])}-electronic", table,
                              electronic_provenance(edos, table.attrs, temperatures), fmt)


exports.register_download("el", [State("mh-electronic", "data"), State("el-tmin", "value"), State("el-tmax", "value"),
                                 State("el-step", "value")], table_download)
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
