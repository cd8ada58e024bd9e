"""Phases page: pick phases (datasets or volume sets), type static energies, see ΔG(T) with its band,
the transitions and, for volume sets, the p–T boundary; download the comparison with its provenance."""

from __future__ import annotations

import hashlib
import json

import dash
import numpy as np
from dash import Input, Output, State, callback, dash_table, dcc, html, no_update

from thermo.columns import error_column_for, find
from thermo.errors import OptionError
from thermo.io.writers import DEFAULT_DIGITS, export_table
from thermo.phases import ENERGY_UNITS, Phase, compare_phases, energy_in_ev
from thermo.phases.report import CAUTIONS, comparison_json, comparison_provenance
from thermo.quasiharmonic import read_manifest

from .. import budget, cache, exports, filesets, handoff, session
from .. import components as c
from .. import figures as fg
from ..demo import demo_file
from ..labels import axis_title
from ..reporting import reported

PATH, NAME, ORDER = "/phases", "Phases", 6.5

#: The invented demo phases: two volume sets of sample_dos/ (fcc springium and simple-cubic springium-β).
DEMO_SETS = {"demo:alpha": ("springium α (invented demo, fcc, 11 volumes)", ("volumes", "springium_volumes.csv")),
             "demo:beta": ("springium β (invented demo, simple cubic, 11 volumes)",
                           ("phases", "springium_beta_volumes.csv"))}
DEFAULT_CHOICE = ["demo:alpha", "demo:beta"]
UNIT_CHOICES = [{"label": u, "value": u} for u in ENERGY_UNITS]
FORMAT_CHOICES = [{"label": "CSV", "value": "csv"}, {"label": "JSON", "value": "json"}]
INPUT_COLUMNS = [{"name": "phase", "id": "phase"}, {"name": "from", "id": "label", "editable": False},
                 {"name": "static energy per formula unit", "id": "static", "type": "numeric"},
                 {"name": "± static", "id": "static_u", "type": "numeric"},
                 {"name": "atoms per formula unit", "id": "atoms", "type": "numeric"}]


def _sent_label(item):
    return f"sent from {item['from']}: {item['name']} (table)"


def choices(workspace, sent=None):
    """Dropdown options: a table sent from another page, the demo volume sets, the kept volume sets, then the
    workspace datasets (harmonic)."""
    item = handoff.received(sent, "phases")
    out = [{"label": _sent_label(item), "value": "sent"}] if item else []
    out += [{"label": label, "value": key} for key, (label, _) in DEMO_SETS.items()]
    out += [{"label": f"volume set {n}", "value": f"set:{n}"} for n in filesets.names("volume")]
    out += [{"label": f"dataset {d['name']} (harmonic)", "value": f"ds:{d['id']}"}
            for d in (workspace or {}).get("datasets", [])]
    return out


def _short(value, workspace, sent=None):
    if value == "sent":
        return exports.file_stem((handoff.received(sent, "phases") or {}).get("name"), "sent")
    if value in DEMO_SETS:
        return value.split(":", 1)[1]
    if value.startswith("set:"):
        return value[4:].rsplit(".", 1)[0]
    dataset = session.find(workspace, value[3:])
    return (dataset or {}).get("name", value).rsplit(".", 1)[0]


def _label_of(value, workspace, sent=None):
    if value == "sent":
        item = handoff.received(sent, "phases")
        return _sent_label(item) if item else "sent table (no longer there)"
    if value in DEMO_SETS:
        return DEMO_SETS[value][0]
    if value.startswith("set:"):
        return f"volume set {value[4:]}"
    return f"dataset {(session.find(workspace, value[3:]) or {}).get('name', '?')}"


def input_rows(chosen, workspace, previous, sent=None):
    """One editable row per chosen phase; values typed before for the same source are kept."""
    kept = {r.get("source"): r for r in previous or []}
    rows = []
    for value in chosen or []:
        old = kept.get(value) or {}
        rows.append({"phase": old.get("phase") or _short(value, workspace, sent), "source": value,
                     "label": _label_of(value, workspace, sent),
                     "static": old.get("static", 0.0), "static_u": old.get("static_u", 0.0),
                     "atoms": old.get("atoms")})
    return rows


def _source(value, workspace, sent=None):
    """PhononDOS, VolumeSet or table (:mod:`thermo.phases.tabulated`) of one choice."""
    if value == "sent":
        item = handoff.received(sent, "phases")
        if item is None:
            raise OptionError("the table sent to this page is no longer there: send it again")
        from thermo.phases.tabulated import read_phase_table
        return read_phase_table(item["csv"].encode("utf-8"), item["name"])
    if value in DEMO_SETS:
        return read_manifest(demo_file(*DEMO_SETS[value][1]))
    if value.startswith("set:"):
        files = filesets.contents(value[4:])
        manifest = next((name, raw) for role, name, raw in files if role == "manifest")
        return read_manifest(manifest[1], files={n: raw for role, n, raw in files if role == "dos"}, name=manifest[0])
    dataset = session.find(workspace, value[3:])
    if dataset is None:
        raise OptionError(f"the dataset of {value!r} is no longer in the workspace")
    return cache.load(dataset)


def _number(value, what, name, default=0.0):
    if value in (None, ""):
        return default
    try:
        return float(value)
    except (TypeError, ValueError):
        raise OptionError(f"phase {name}: {what} {value!r} is not a number") from None


def build_phases(rows, workspace, unit, sent=None):
    """The :class:`~thermo.phases.Phase` of every row (static energies in ``unit``)."""
    phases = []
    for row in rows or []:
        name = str(row.get("phase") or "").strip() or _short(row["source"], workspace, sent)
        atoms = row.get("atoms")
        phases.append(Phase(name, _source(row["source"], workspace, sent),
                            static_ev=energy_in_ev(_number(row.get("static"), "static energy", name), unit),
                            static_uncertainty_ev=energy_in_ev(_number(row.get("static_u"), "± static", name), unit),
                            atoms=None if atoms in (None, "") else int(_number(atoms, "atoms", name))))
    return phases


def parse_pressures(text):
    """``"0, 2, 5"`` → [0.0, 2.0, 5.0] (GPa)."""
    try:
        out = sorted({float(x) for x in str(text or "0").replace(";", ",").split(",") if x.strip()})
    except ValueError:
        raise OptionError(f"pressures {text!r}: give numbers in GPa separated by commas") from None
    return out or [0.0]


def results(rows, workspace, unit, temperatures, pressures, boundary, sent=None):
    """``(phases, comparison)`` memoised on the inputs' content (a sent table's too) and the settings."""
    phases = build_phases(rows, workspace, unit, sent)
    quasi = bool(phases) and phases[0].quasiharmonic
    if quasi:                       # an equation-of-state fit per temperature: the Quasi-harmonic page's budget
        budget.checked_count(temperatures, name="MODEHEAT_MAX_QHA_TEMPERATURES")
    table = (handoff.received(sent, "phases") or {}).get("sha256") if any(r["source"] == "sent" for r in rows or []) \
        else None
    digest = hashlib.sha256(json.dumps([rows, unit, table,
                                        [cache.verified(d) for d in (workspace or {}).get("datasets", [])
                                         if f"ds:{d['id']}" in {r['source'] for r in rows or []}]],
                                        sort_keys=True, default=str).encode()).hexdigest()
    key = ("phases", digest, tuple(temperatures.tolist()), tuple(pressures) if quasi else None, bool(boundary))

    def compute():
        return compare_phases(phases, temperatures, pressures_gpa=pressures if quasi else None,
                              boundary=bool(boundary) and quasi and len(pressures) > 1)
    return phases, cache.result(key, compute)


def delta_figure(result):
    """ΔG (ΔF) of every phase against the reference, ± its error as a band, crossings marked."""
    table = result.table
    key = "gibbs_energy_difference" if "pressure_GPa" in table else "helmholtz_energy_difference"
    column = find(table, key)
    error = error_column_for(table, column)
    t_col = find(table, "temperature")
    fig = fg.figure("temperature T [K]", f"{axis_title(column)} vs {result.settings['reference_phase']}")
    groups = table.groupby(["phase"] + (["pressure_GPa"] if "pressure_GPa" in table else []), sort=False)
    for k, (label, part) in enumerate(groups):
        name = label[0] if len(label) == 1 else f"{label[0]} at {label[1]:g} GPa"
        t, y, u = part[t_col].to_numpy(), part[column].to_numpy(), part[error].to_numpy()
        fig.add_trace(fg.band(t, y - u, y + u, f"{name} ± error", k))
        fig.add_trace(fg.line(t, y, name, k))
    fig.add_hline(y=0, line_color="#9aa7b0")
    for tr in result.transitions:
        fig.add_vrect(x0=tr["temperature_K"] - tr["uncertainty_K"], x1=tr["temperature_K"] + tr["uncertainty_K"],
                      fillcolor=fg.INK, opacity=0.12, line_width=0)
        fig.add_trace(fg.go.Scatter(x=[tr["temperature_K"]], y=[0.0], mode="markers", name=_label(tr),
                                    marker={"symbol": "x", "size": 11, "color": fg.INK},
                                    hovertemplate="T* = %{x:.5g} K"))
    return fig


def _label(tr):
    where = "" if tr["pressure_GPa"] is None else f" at {tr['pressure_GPa']:g} GPa"
    return f"{tr['low_phase']} → {tr['high_phase']}{where}: {tr['temperature_K']:.5g} ± {tr['uncertainty_K']:.2g} K"


def boundary_figure(result):
    """T*(p) with ± u(T*) and the Clausius–Clapeyron tangent at every point."""
    if not result.boundary:
        return fg.message_figure("p–T boundary: choose volume sets and two or more pressures")
    fig = fg.figure("pressure p [GPa]", "transition temperature T* [K]")
    pairs = {}
    for point in result.boundary:
        pairs.setdefault((point["low_phase"], point["high_phase"]), []).append(point)
    for k, ((low, high), points) in enumerate(pairs.items()):
        p = np.array([x["pressure_GPa"] for x in points])
        t = np.array([x["temperature_K"] for x in points])
        fig.add_trace(fg.go.Scatter(x=p, y=t, mode="lines+markers", name=f"{low} → {high}",
                                    error_y={"type": "data", "array": [x["uncertainty_K"] for x in points]},
                                    line={"color": fg.PALETTE[k % len(fg.PALETTE)]}))
        half = 0.25 * (p.max() - p.min()) / max(len(p) - 1, 1)
        for x in points:
            slope = x["clapeyron_slope_K_per_GPa"]
            fig.add_trace(fg.line([x["pressure_GPa"] - half, x["pressure_GPa"] + half],
                                  [x["temperature_K"] - slope * half, x["temperature_K"] + slope * half],
                                  "ΔV/ΔS", k, width=1.2, dash="dot", showlegend=False))
    return fig


def transitions_table(result):
    """Transitions (and pairs without one) as a small table."""
    rows = [html.Tr([html.Td(tr["low_phase"]), html.Td(tr["high_phase"]),
                     html.Td("—" if tr["pressure_GPa"] is None else f"{tr['pressure_GPa']:g}"),
                     html.Td(f"{tr['temperature_K']:.5g} ± {tr['uncertainty_K']:.2g}")])
            for tr in result.transitions]
    rows += [html.Tr([html.Td(" / ".join(n["phases"])), html.Td(f"no crossing; {n['stable_phase']} stays lower"),
                      html.Td("—" if n["pressure_GPa"] is None else f"{n['pressure_GPa']:g}"),
                      html.Td(f"closest at {(n['closest_approach'] or {}).get('temperature_K', float('nan')):g} K")])
             for n in result.no_crossing]
    head = html.Thead(html.Tr([html.Th("stable below"), html.Th("stable above"), html.Th("p [GPa]"),
                               html.Th("T* [K]")]))
    return html.Table([head, html.Tbody(rows)], className="mh-table", id="ph-transitions-table")


def layout(**_query):
    """The phases page (choices filled from the workspace and the kept volume sets)."""
    return c.page(
        "Phases", "Which phase is stable, and where is the boundary? Pick two or more phases — DOS datasets "
                  "(harmonic, fixed volume) or volume sets (quasi-harmonic) — and type their static energies.",
        dcc.Store(id="ph-seen", storage_type="memory"),
        c.controls(c.dropdown("ph-choice", choices(None), DEFAULT_CHOICE, "Phases (the first is the reference)",
                              multi=True, hint="a table sent from the Quasi-harmonic or Calorimetry page is offered "
                                               "first, beside the active dataset"),
                   c.radio("ph-unit", UNIT_CHOICES, "eV", "Static energy unit")),
        # the default phases' rows from the start: the first draw already compares them (a first draw of
        # "choose two phases" racing the real one could leave a graph on the message)
        dash_table.DataTable(id="ph-rows", columns=INPUT_COLUMNS, data=input_rows(DEFAULT_CHOICE, None, None),
                             editable=True,
                             style_table={"maxWidth": "900px"}, style_cell={"textAlign": "left"}),
        c.controls(*c.temperature_fields("ph", 0, 1000, 10),
                   c.text("ph-pressures", "0, 1, 2", "pressures p [GPa] (volume sets)"),
                   c.radio("ph-boundary", [{"label": "show", "value": "on"}, {"label": "off", "value": "off"}],
                           "on", "p–T boundary")),
        c.messages_panel("ph-messages"),
        html.Div(id="ph-transitions"),
        html.Div([c.graph("ph-delta-graph", "ΔG(T) against the reference phase, ± its estimated error; "
                                            "crossings marked with their uncertainty"),
                  c.graph("ph-boundary-graph", "p–T boundary T*(p) with the Clausius–Clapeyron slope ΔV/ΔS")],
                 className="mh-grid"),
        html.H2("Export"),
        html.Div([c.radio("ph-format", FORMAT_CHOICES, "csv", "File format"),
                  html.Button("Download comparison", id="ph-download-btn", className="mh-button mh-primary"),
                  dcc.Download(id="ph-download")], className="mh-inline"),
        html.Ul([html.Li(text) for text in CAUTIONS], className="mh-caution"),
    )


def sent_phase(item):
    """The :class:`~thermo.phases.tabulated.TabulatedPhase` of a sent table (memoised on its bytes)."""
    from thermo.phases.tabulated import read_phase_table
    return cache.result(("phase-table", item["sha256"]),
                        lambda: read_phase_table(item["csv"].encode("utf-8"), item["name"]))


def arrival(sent, seen, workspace, chosen, t_min, t_max):
    """``(chosen, seen, T from, T to)`` after the sent store changed: a table not seen yet is chosen with the
    active dataset beside it (both of the fixed kind), and the temperatures are kept inside its rows."""
    item = handoff.received(sent, "phases")
    if item is None or item["sha256"] == seen:
        return chosen, seen, no_update, no_update
    current = session.active(workspace)
    rows = sent_phase(item).temperatures_k
    low = max(float(rows[0]), float(t_min) if t_min not in (None, "") else float(rows[0]))
    high = min(float(rows[-1]), float(t_max) if t_max not in (None, "") else float(rows[-1]))
    return ["sent"] + ([f"ds:{current['id']}"] if current else []), item["sha256"], low, high


@callback(Output("ph-choice", "options"), Output("ph-choice", "value"), Output("ph-seen", "data"),
          Output("ph-tmin", "value"), Output("ph-tmax", "value"), Input("mh-workspace", "data"),
          Input(handoff.STORE_ID, "data"), State("ph-choice", "value"), State("ph-seen", "data"),
          State("ph-tmin", "value"), State("ph-tmax", "value"))
@reported(lambda message: (no_update,) * 5)
def fill_choices(workspace, sent, chosen, seen, t_min, t_max):
    """Choices from the workspace and a sent table; what is chosen and still there stays chosen."""
    options = choices(workspace, sent)
    chosen, seen, low, high = arrival(sent, seen, workspace, chosen, t_min, t_max)
    known = {o["value"] for o in options}
    return options, [v for v in (chosen or []) if v in known], seen, low, high


@callback(Output("ph-rows", "data"), Input("ph-choice", "value"), State("mh-workspace", "data"),
          State("ph-rows", "data"), State(handoff.STORE_ID, "data"))
def fill_rows(chosen, workspace, previous, sent=None):
    """One editable row per chosen phase."""
    return input_rows(chosen, workspace, previous, sent)


def _failed(message):
    blank = fg.message_figure("no comparison for these settings")
    return blank, blank, [], c.message_items([("error", message)])


def _settings(t_min, t_max, step, pressures):
    return budget.temperatures(t_min, t_max, step), parse_pressures(pressures)


@callback(Output("ph-delta-graph", "figure"), Output("ph-boundary-graph", "figure"),
          Output("ph-transitions", "children"), Output("ph-messages", "children"),
          Input("ph-rows", "data"), Input("ph-unit", "value"), Input("ph-tmin", "value"), Input("ph-tmax", "value"),
          Input("ph-step", "value"), Input("ph-pressures", "value"), Input("ph-boundary", "value"),
          State("mh-workspace", "data"), State(handoff.STORE_ID, "data"))
@reported(_failed)
def draw(rows, unit, t_min, t_max, step, pressures, boundary, workspace, sent=None):
    """ΔG(T) with bands and crossings, the boundary, the transitions table and the warnings."""
    if len(rows or []) < 2:
        blank = fg.message_figure("choose two or more phases")
        return blank, blank, [], c.message_items([("info", "choose two or more phases")])
    temperatures, p = _settings(t_min, t_max, step, pressures)
    phases, result = results(rows, workspace, unit, temperatures, p, boundary == "on", sent)
    notes = [("warning", f"phase {ph.name}: {w}") for ph in phases if getattr(ph.source, "tabulated", False)
             for w in ph.source.warnings] + [("warning", w) for w in result.warnings]
    return delta_figure(result), boundary_figure(result), transitions_table(result), c.message_items(notes)


@callback(Output("ph-download", "data"), Output("ph-messages", "children", allow_duplicate=True),
          Input("ph-download-btn", "n_clicks"), State("ph-rows", "data"), State("mh-workspace", "data"),
          State("ph-unit", "value"), State("ph-tmin", "value"), State("ph-tmax", "value"), State("ph-step", "value"),
          State("ph-pressures", "value"), State("ph-boundary", "value"), State("ph-format", "value"),
          State(handoff.STORE_ID, "data"), prevent_initial_call=True)
@reported(lambda message: (no_update, c.message_items([("error", message)])))
def download(_clicks, rows, workspace, unit, t_min, t_max, step, pressures, boundary, fmt, sent=None):
    """The comparison table with its provenance (transitions included), as ``modeheat phases`` writes it."""
    temperatures, p = _settings(t_min, t_max, step, pressures)
    phases, result = results(rows, workspace, unit, temperatures, p, boundary == "on", sent)
    record = comparison_provenance(result, phases, temperatures, unit)
    if fmt == "json":
        content = comparison_json(result, record, DEFAULT_DIGITS).encode("utf-8")
    else:
        content = export_table(result.table, record, "csv", digits=DEFAULT_DIGITS)
    name = f"phases-{'-'.join(ph.name for ph in phases)}.{fmt}"
    return dcc.send_bytes(content, name), c.message_items([("info", f"prepared {name}")])


c.follow_image_format("ph-delta-graph", "ph-boundary-graph")
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
