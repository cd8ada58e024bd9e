"""Electronic page: an electronic DOS, C_el/T and S_el against T, γ from g(E_F) (the electronic term of metals)."""

from __future__ import annotations

import base64
import hashlib

import dash
import numpy as np
import plotly.graph_objects as go
from dash import Input, Output, State, callback, dcc, html

from thermo.columns import column_name
from thermo.electronic import CAUTIONS, electronic_table, load_electronic_dos
from thermo.errors import OptionError
from thermo.temperatures import temperature_range
from thermo.unit_names import ELECTRON_ENERGY_UNITS

from .. import cache
from .. import components as c
from .. import figures as fg
from ..demo import demo_file
from ..intake import decode_upload
from ..reporting import reported

PATH, NAME, ORDER = "/electronic", "Electronic", 7.5

#: The invented demo electronic DOS (see ``sample_dos/electronic/generate_electronic.py``).
DEMO_FILE = demo_file("electronic", "springium_edos.dat")
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
        dcc.Store(id="el-file-store", storage_type="session"),
        html.P(id="el-file", className="mh-active-note"),
        c.controls(
            c.dropdown("el-unit", _UNITS, "file", "Energy unit"),
            c.text("el-fermi", "", "Fermi energy [eV]", "as the file states",
                   hint="only for absolute energies"),
            c.radio("el-spin", _SPIN, "auto", "Spin columns"),
            c.number("el-fu", 1, "Formula units per cell", min_value=0),
            *c.temperature_fields("el", 0, 1500, 10)),
        c.messages_panel("el-messages"),
        html.Div(id="el-keys"),
        html.Div([c.graph("el-dos-graph", "Electronic DOS against E − E_F, with the projected columns"),
                  c.graph("el-ct-graph", "C_el/T against T: the Sommerfeld γ at low T, the DOS shape above"),
                  c.graph("el-s-graph", "Electronic entropy S_el and Helmholtz energy F_el against T")],
                 className="mh-grid"),
        html.Div([html.P(text, className="mh-msg mh-msg-info") for text in CAUTIONS], id="el-cautions"),
    )


@callback(Output("el-file-store", "data"), Input("el-upload", "contents"), Input("el-demo", "n_clicks"),
          State("el-upload", "filename"), prevent_initial_call=True)
def keep_file(contents, _clicks, name):
    """The chosen file as a data URL in the browser's session store."""
    if dash.ctx.triggered_id == "el-demo" or not contents:
        return demo_entry()
    return {"name": name or "upload", "contents": contents}


def demo_entry():
    """Store entry of the invented demo electronic DOS."""
    return {"name": DEMO_FILE.name, "contents": "data:text/plain;base64,"
            + base64.b64encode(DEMO_FILE.read_bytes()).decode("ascii")}


def _failed(message):
    blank = fg.message_figure("nothing to show for these settings")
    return (blank,) * 3 + ([], dash.no_update, c.message_items([("error", message)]))


def _options(unit, fermi, spin, formula_units):
    """Keyword arguments of :func:`load_electronic_dos` from the page's fields ('' and defaults: not given)."""
    text = str(fermi or "").strip()
    try:
        fermi_ev = float(text) if text else None
    except ValueError:
        raise OptionError(f"the Fermi energy {text!r} is not a number of eV") from None
    return {"energy_unit": None if unit in (None, "file") else unit,
            "fermi_energy_ev": fermi_ev,
            "spin": None if spin in (None, "auto") else spin,
            "formula_units": None if formula_units in (None, "") else float(formula_units)}


def computed(stored, options, temperatures, max_bytes=None):
    """(ElectronicDOS, table) of the stored file, memoised on its content, the options and the temperatures."""
    raw = decode_upload(stored["contents"], stored["name"], max_bytes)
    t = np.asarray(temperatures, dtype=float)
    key = ("electronic", hashlib.sha256(raw).hexdigest(), tuple(sorted(options.items())),
           hashlib.sha1(t.tobytes()).hexdigest())

    def compute():
        edos = load_electronic_dos(raw, name=stored["name"], **options)
        return edos, electronic_table(edos, t)
    return cache.result(key, compute)


@callback(*[Output(g, "figure") for g in _GRAPHS], Output("el-keys", "children"), Output("el-file", "children"),
          Output("el-messages", "children"),
          Input("el-file-store", "data"), Input("el-unit", "value"), Input("el-fermi", "value"),
          Input("el-spin", "value"), Input("el-fu", "value"), Input("el-tmin", "value"), Input("el-tmax", "value"),
          Input("el-step", "value"), State("mh-config", "data"))
@reported(_failed)
def draw(stored, unit, fermi, spin, formula_units, t_min, t_max, step, config):
    """Read, compute and draw for the page's settings."""
    notes = []
    if not stored:
        stored = demo_entry()
        notes.append(("info", "Showing the invented demo electronic DOS (imaginary metal 'springium'); "
                              "upload your own file above."))
    temperatures = temperature_range(t_min, t_max, step)
    edos, table = computed(stored, _options(unit, fermi, spin, formula_units), temperatures, (config or {}).get("max_upload_bytes"))
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
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
