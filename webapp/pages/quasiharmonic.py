"""Quasi-harmonic page: a volume set (manifest + DOS files, or loaded datasets) -> V(T), α, B_T, C_p, G."""

from __future__ import annotations

import base64
import hashlib
import json

import dash
import numpy as np
from dash import Input, Output, State, callback, dash_table, dcc, html, no_update

from thermo.columns import error_column_for, find, lookup
from thermo.errors import DosInputError, OptionError
from thermo.quasiharmonic import (CAUTIONS, free_energy_curves, free_energy_surface, make_volume_set,
                                  quasiharmonic_table, read_manifest)
from thermo.quasiharmonic.report import quasiharmonic_provenance
from thermo.temperatures import STANDARD_TEMPERATURE, with_standard_temperature

from .. import budget, cache, filesets, intake, session
from ..demo import demo_file
from .. import components as c
from .. import exports, handoff, notices, reading
from .. import figures as fg
from ..labels import PER_CHOICES, axis_title
from ..reporting import reported

PATH, NAME, ORDER = "/quasiharmonic", "Quasi-harmonic", 6

DEMO_MANIFEST = demo_file("volumes", "springium_volumes.csv")
EOS_CHOICES = [{"label": "Birch–Murnaghan (3rd order)", "value": "birch-murnaghan"},
               {"label": "Vinet", "value": "vinet"},
               {"label": "cubic spline through every volume", "value": "spline"}]
ERROR_CHOICES = [{"label": "estimate, shown as bands", "value": "on"}, {"label": "off", "value": "off"}]
SOURCE_CHOICES = [{"label": "manifest + DOS files", "value": "manifest"},
                  {"label": "loaded datasets (type volumes and energies)", "value": "datasets"}]
#: Temperatures of the F(V) curves [K].
CURVE_TEMPERATURES = (0.0, 200.0, 400.0, 600.0, 800.0, 1000.0)
_GRAPHS = ("qh-fv-graph", "qh-v-graph", "qh-alpha-graph", "qh-b-graph", "qh-cp-graph", "qh-gamma-graph",
           "qh-residual-graph")


def _entry(name, raw):
    return {"name": name, "content": base64.b64encode(raw).decode("ascii")}


def demo_set():
    """The invented springium volume set of ``sample_dos/volumes/`` as a browser-side record."""
    folder = DEMO_MANIFEST.parent
    names = [line.split(",")[2].strip() for line in DEMO_MANIFEST.read_text().splitlines()[3:] if line.strip()]
    return {"manifest": _entry(DEMO_MANIFEST.name, DEMO_MANIFEST.read_bytes()),
            "files": [_entry(n, (folder / n).read_bytes()) for n in names]}


#: The demo's entry in the list of volume sets.
DEMO_LABEL = "invented demo set (springium, 11 volumes)"


def _decoded(entry):
    """The bytes of a record's file (base64), each within the server's per-file upload limit."""
    return intake.decode_upload("data:;base64," + str(entry["content"]), str(entry["name"]))


def set_files(record):
    """``[(role, name, bytes), ...]`` of a record: the manifest first, then its DOS files."""
    return [("manifest", record["manifest"]["name"], _decoded(record["manifest"]))] + \
        [("dos", f["name"], _decoded(f)) for f in record["files"]]


def record_of(files):
    """The browser-side record of kept files (:func:`set_files` reversed)."""
    return {"manifest": next(_entry(n, raw) for role, n, raw in files if role == "manifest"),
            "files": [_entry(n, raw) for role, n, raw in files if role == "dos"]}


def _note(record, kept=None):
    text = f"{record['manifest']['name']} with {len(record['files'])} DOS file(s)"
    return text + (f", kept in the workspace as {kept}" if kept else "")


def opening_set():
    """``(record, choice)`` a page load starts from: the set opened last in the workspace, else the demo."""
    name, files = filesets.last("volume")
    return (record_of(files), name) if name else (demo_set(), "demo")


def set_from_uploads(names, contents):
    """The record of an upload: the file whose header names ``volume_A3`` is the manifest."""
    manifest, files = None, []
    for name, url in zip(names or [], contents or []):
        raw = intake.decode_upload(url, name)
        if manifest is None and b"volume_A3" in raw[:4000] and b"dos_file" in raw[:4000]:
            manifest = _entry(name, raw)
        else:
            files.append(_entry(name, raw))
    if manifest is None:
        raise DosInputError("no manifest among the files: upload a CSV with the columns volume_A3, "
                         "energy_eV (or energy_Ry/energy_Ha/energy_kJ_per_mol) and dos_file with its DOS files")
    return {"manifest": manifest, "files": files}


def _volume_set(record, source, rows, workspace, negative):
    if source == "datasets":
        entries = []
        for row in rows or []:
            dataset = session.find(workspace, row.get("id"))
            if dataset is None or row.get("volume_A3") in (None, "") or row.get("energy_eV") in (None, ""):
                continue
            opts = session.options_of(dataset)
            dos = cache.load({**dataset, "options": {**opts, "negative": negative}})
            entries.append((float(row["volume_A3"]), float(row["energy_eV"]), dos, dataset["name"]))
        return make_volume_set(entries, {"name": "loaded datasets"})
    manifest = record["manifest"]
    size = sum(len(str(f["content"])) * 3 // 4 for f in [manifest, *record["files"]])
    with budget.holding(size, manifest["name"]):
        files = {f["name"]: _decoded(f) for f in record["files"]}
        return read_manifest(_decoded(manifest), files=files, negative=negative, name=manifest["name"])


def results(record, source, rows, workspace, temperatures, pressure, eos, per, negative, formula=None,
            tolerance_percent=1.0, errors=True):
    """(volume set, table, F(V) curves), memoised on content and settings; ``errors`` adds the ``_error_`` columns."""
    digest = hashlib.sha256(json.dumps([record if source == "manifest" else None, rows if source == "datasets"
                                        else None, [cache.verified(d) for d in (workspace or {}).get("datasets", [])]
                                        if source == "datasets" else None], sort_keys=True).encode()).hexdigest()
    tolerance = _tolerance(tolerance_percent)
    key = (digest, source, tuple(temperatures.tolist()), float(pressure), eos, per, negative, formula, tolerance,
           bool(errors))

    def compute():
        vs = _volume_set(record, source, rows, workspace, negative)
        table = quasiharmonic_table(vs, temperatures, pressure_gpa=pressure, eos=eos, per=per,
                                    formula=formula, imaginary_tolerance=tolerance, errors=errors)
        shown = [t for t in CURVE_TEMPERATURES if t <= temperatures.max()] or [float(temperatures.max())]
        curves = free_energy_curves(free_energy_surface(vs, shown, eos), pressure)
        return vs, table, (shown, curves)
    return cache.result(key, compute)


def figures(table, curves):
    """The figures: F(V) with the minimum path; V, α, B_T, C_p and C_v, γ and the EOS misfit against T.

    A quantity with an ``_error_`` column in ``table`` gets a band value ± estimated error under its line.
    """
    shown, cv = curves
    fv = fg.figure("volume V [Å³ per formula unit]", "G = F + pV [eV per formula unit]")
    for k, t in enumerate(shown):
        fv.add_trace(fg.line(cv["curve_volumes_A3"], cv["curve_eV"][k], f"{t:g} K (fit)", k))
        fv.add_trace(fg.go.Scatter(x=cv["volumes_A3"], y=cv["sampled_eV"][:, k], mode="markers", showlegend=False,
                                   marker={"color": fg.PALETTE[k % len(fg.PALETTE)], "size": 7},
                                   name=f"{t:g} K (sampled)", hovertemplate="%{y:.6g}"))
    fv.add_trace(fg.go.Scatter(x=cv["minimum_volume_A3"], y=cv["minimum_eV"], mode="lines+markers",
                               name="minimum path", line={"color": fg.INK, "dash": "dot"},
                               marker={"symbol": "x", "size": 9, "color": fg.INK}))
    t = table[find(table, "temperature")]
    outside = table[find(table, "outside_volume_range")].astype(bool)
    figs = [fv]
    for k, keys in enumerate((("volume",), ("thermal_expansion",), ("bulk_modulus_T",),
                              ("heat_capacity_p", "heat_capacity_v"), ("gruneisen_parameter",),
                              ("eos_fit_residual",))):
        first = find(table, keys[0])
        fig = fg.figure("temperature T [K]", axis_title(first))
        for j, key in enumerate(keys):
            col = find(table, key)
            fig.add_trace(fg.line(t, table[col], axis_title(col), k + j, dash="dash" if j else None))
        for j, key in enumerate(keys):
            col, err = find(table, key), error_column_for(table, find(table, key))
            if err is not None:
                fig.add_trace(fg.band(t, table[col] - table[err], table[col] + table[err],
                                      f"± estimated error of {lookup(col).quantity.symbol}", k + j))
        if outside.any():
            fig.add_trace(fg.go.Scatter(x=t[outside], y=table[first][outside], mode="markers",
                                        name="outside the sampled volumes (extrapolated)",
                                        marker={"color": fg.PALETTE[4], "size": 6, "symbol": "triangle-up"}))
        figs.append(fig)
    return figs


def layout(**_query):
    """The quasi-harmonic page (opens the volume set opened last in the workspace, else the demo)."""
    record, choice = opening_set()
    return c.page(
        "Quasi-harmonic", "DOS at several volumes plus static lattice energies: F(V,T) = E(V) + F_vib(V,T) "
                          "fitted by an equation of state at each temperature and minimised at pressure p.",
        dcc.Store(id="qh-set", data=record, storage_type="memory"),
        c.controls(c.radio("qh-source", SOURCE_CHOICES, "manifest", "Volume set from"),
                   html.Div([dcc.Upload(id="qh-upload", multiple=True, className="mh-upload",
                                        children=html.Span(["Drop or ", html.A("choose"), " the manifest (CSV: "
                                                            "volume_A3, energy_eV, dos_file) together with its DOS files"])),
                             html.Small(_note(record), id="qh-set-note", className="mh-hint")], className="mh-field"),
                   c.dropdown("qh-set-choice", filesets.choices("volume", DEMO_LABEL), choice, "Volume set",
                              hint="uploaded sets are kept in the workspace" if filesets.enabled() else None)),
        html.Div(id="qh-datasets-panel", children=[
            html.P("Type the volume and static energy of each loaded dataset (at least 5 rows); rows left "
                   "empty are not used.", className="mh-intro"),
            dash_table.DataTable(id="qh-rows", editable=True, data=[],
                                 columns=[{"name": "dataset", "id": "name", "editable": False},
                                          {"name": "V [Å³ per formula unit]", "id": "volume_A3", "type": "numeric"},
                                          {"name": "E static [eV per formula unit]", "id": "energy_eV",
                                           "type": "numeric"}],
                                 style_table={"maxWidth": "720px"}),
            html.Small(id="qh-rows-kept", className="mh-hint")], style={"display": "none"}),
        c.controls(*c.temperature_fields("qh", 0, 1000, 10),
                   c.number("qh-pressure", 0, "pressure p [GPa]"),
                   c.radio("qh-eos", EOS_CHOICES, "birch-murnaghan", "Equation of state"),
                   c.radio("qh-errors", ERROR_CHOICES, "on", "Uncertainty"),
                   c.radio("qh-negative", c.NEGATIVE_CHOICES,
                           "drop", "Imaginary modes"),
                   c.number("qh-tolerance", 1, "imaginary tolerance [%]", min_value=0, max_value=100,
                            hint="volumes above it are listed"),
                   c.radio("qh-per", PER_CHOICES, "formula", "Values"),
                   c.text("qh-formula", "", "Formula (per gram)", placeholder="e.g. MgO",
                          hint="blank with loaded datasets: the active dataset's")),
        reading.panel("qh"),
        c.messages_panel("qh-messages"),
        html.Div(id="qh-keys"),
        html.Div([c.graph("qh-fv-graph", "G(V) at several temperatures: sampled points, fitted equation of state "
                                         "and the minimum path"),
                  c.graph("qh-v-graph", "Equilibrium volume V(T)"),
                  c.graph("qh-alpha-graph", "Volumetric thermal expansion α(T)"),
                  c.graph("qh-b-graph", "Isothermal bulk modulus B_T(T)"),
                  c.graph("qh-cp-graph", "Heat capacity at constant pressure (solid) and at V(T) (dashed)"),
                  c.graph("qh-gamma-graph", "Mean Grüneisen parameter γ = α B_T V / C_v"),
                  c.graph("qh-residual-graph", "Root-mean-square misfit of the equation of state to F(V) "
                                               "at each temperature")], className="mh-grid"),
        html.H2("Export"),
        exports.download_bar("qh", "quasi-harmonic table"),
        handoff.send_bar("qh", "the table", ("polynomials", "phases", "compare")),
        html.Ul([html.Li(text) for text in CAUTIONS], className="mh-caution"),
    )


@callback(Output("qh-set", "data"), Output("qh-set-note", "children"), Output("qh-set-choice", "options"),
          Output("qh-set-choice", "value"), Input("qh-upload", "contents"), Input("qh-set-choice", "value"),
          State("qh-upload", "filename"), prevent_initial_call=True)
@reported(lambda message: (no_update, message, no_update, no_update))
def choose_set(contents, choice, names):
    """Open an uploaded volume set (kept in the workspace when there is one) or a kept one, or the demo."""
    if dash.ctx.triggered_id == "qh-upload":
        record = set_from_uploads(names, contents)
        kept, added = filesets.keep("volume", set_files(record))
        note = _note(record, kept) + ("" if added or kept is None else " (the same files as before)")
        return record, note, filesets.choices("volume", DEMO_LABEL), kept or no_update
    if choice in (None, "demo"):
        record = demo_set()
        return record, _note(record), no_update, no_update
    record = record_of(filesets.reopen("volume", choice))
    return record, _note(record, choice), no_update, no_update


@callback(Output("qh-rows", "data"), Output("qh-datasets-panel", "style"), Input("qh-source", "value"),
          Input("mh-workspace", "data"), State("qh-rows", "data"))
def dataset_rows(source, workspace, rows):
    """One editable row per loaded dataset; typed values kept (in the workspace too, by dataset content)."""
    kept = filesets.typed_values("volume")
    typed = {r.get("id"): r for r in rows or []}
    data = []
    for d in (workspace or {}).get("datasets", []):
        row = {**kept.get(d.get("sha256"), {}),
               **{k: v for k, v in typed.get(d["id"], {}).items() if v not in (None, "")}}
        data.append({"id": d["id"], "name": d["name"], "volume_A3": row.get("volume_A3"),
                     "energy_eV": row.get("energy_eV")})
    return data, ({} if source == "datasets" else {"display": "none"})


@callback(Output("qh-rows-kept", "children"), Input("qh-rows", "data_timestamp"), State("qh-rows", "data"),
          State("mh-workspace", "data"), prevent_initial_call=True)
@reported(lambda message: message)
def keep_rows(_edited, rows, workspace):
    """Keep the typed volumes and energies in the workspace (said beside the table)."""
    if filesets.keep_typed_values("volume", rows, (workspace or {}).get("datasets")):
        return "typed values kept in the workspace"
    return "typed values are kept in this page only (the server keeps no workspace file)"


def _failed(message):
    blank = fg.message_figure("nothing to show for these settings")
    return (blank,) * len(_GRAPHS) + ([], c.message_items([("error", message)]))


def _tolerance(percent):
    """Imaginary-mode tolerance as a fraction from a percentage field (blank: 1 %)."""
    try:
        value = 1.0 if percent in (None, "") else float(percent)
    except (TypeError, ValueError):
        raise OptionError("the imaginary tolerance must be a number in percent") from None
    if not 0 <= value < 100:
        raise OptionError(f"the imaginary tolerance must be between 0 and 100 %, got {value:g}")
    return value / 100.0


def _formula(source, workspace, typed):
    """The typed formula; blank: the active dataset's when the volume set is made of loaded datasets."""
    return reading.formula_of(workspace if source == "datasets" else None, typed)


def _settings(t_min, t_max, step, pressure):
    """The temperature grid (with 298.15 K when inside it) and the pressure [GPa]."""
    return with_standard_temperature(budget.temperatures(t_min, t_max, step,
                                                                "MODEHEAT_MAX_QHA_TEMPERATURES")), float(pressure or 0.0)


def _quoted(table, key):
    """``value ± error`` of ``key`` at 298.15 K (or the first row), for the key numbers."""
    t = table[find(table, "temperature")].to_numpy()
    i = int(np.argmin(np.abs(t - STANDARD_TEMPERATURE)))
    col = find(table, key)
    err = error_column_for(table, col)
    text = f"{table[col].iloc[i]:.5g}" + ("" if err is None else f" ± {table[err].iloc[i]:.2g}")
    column = lookup(col)
    return f"{column.quantity.symbol} at {t[i]:g} K", f"{text} {column.unit}".strip()


@callback(*[Output(g, "figure") for g in _GRAPHS], Output("qh-keys", "children"), Output("qh-messages", "children"),
          Input("qh-set", "data"), Input("qh-source", "value"), Input("qh-rows", "data"), Input("mh-workspace", "data"),
          Input("qh-tmin", "value"), Input("qh-tmax", "value"), Input("qh-step", "value"), Input("qh-pressure", "value"),
          Input("qh-eos", "value"), Input("qh-per", "value"), Input("qh-negative", "value"),
          Input("qh-formula", "value"), Input("qh-tolerance", "value"), Input("qh-errors", "value"))
@reported(_failed)
def draw(record, source, rows, workspace, t_min, t_max, step, pressure, eos, per, negative, formula, tolerance,
         errors="on"):
    """Plots, key numbers and diagnostics for the page's settings."""
    temperatures, p = _settings(t_min, t_max, step, pressure)
    vs, table, curves = results(record, source, rows, workspace, temperatures, p, eos, per, negative,
                                _formula(source, workspace, formula), tolerance, errors != "off")
    diag = table.attrs["diagnostics"]
    keys = c.key_numbers([("volumes", f"{diag['volume_count']} ({diag['volume_range_A3'][0]:g}–"
                                      f"{diag['volume_range_A3'][1]:g} Å³)"),
                          ("largest EOS rms residual", f"{diag['max_fit_residual_meV']:.3g} meV"),
                          ("rows outside the sampled volumes", str(int(table[find(table, 'outside_volume_range')].sum()))),
                          *[_quoted(table, key) for key in ("volume", "thermal_expansion", "bulk_modulus_T")]])
    notes = [(None, w) for w in diag["warnings"]] + [(n, w) for n, d in zip(vs.names, vs.doses) for w in d.warnings]
    return (*figures(table, curves), keys, notices.warning_items(notes))   # each caution once (notices.py)


def table_download(fmt, record, source, rows, workspace, t_min, t_max, step, pressure, eos, per, negative, formula,
                   tolerance, errors="on"):
    """The quasi-harmonic table with its provenance, as ``modeheat quasiharmonic`` writes it (``--errors`` when shown)."""
    temperatures, p = _settings(t_min, t_max, step, pressure)
    vs, table, _ = results(record, source, rows, workspace, temperatures, p, eos, per, negative,
                           _formula(source, workspace, formula), tolerance, errors != "off")
    stem = f"{exports.file_stem(vs.source.get('name'), 'volumes')}-quasiharmonic-{per}"
    return exports.table_file(stem, table, quasiharmonic_provenance(vs, table, temperatures), fmt)


_TABLE_STATES = [State("qh-set", "data"), State("qh-source", "value"), State("qh-rows", "data"),
                 State("mh-workspace", "data"), State("qh-tmin", "value"), State("qh-tmax", "value"),
                 State("qh-step", "value"), State("qh-pressure", "value"), State("qh-eos", "value"),
                 State("qh-per", "value"), State("qh-negative", "value"), State("qh-formula", "value"),
                 State("qh-tolerance", "value"), State("qh-errors", "value")]
exports.register_download("qh", _TABLE_STATES, table_download)
reading.register("qh")
for _target in ("polynomials", "phases", "compare"):      # the CSV the download writes (C_p, G, S with their errors)
    handoff.register_send("qh", _target, _TABLE_STATES, lambda *values: table_download("csv", *values), NAME)
c.follow_image_format(*_GRAPHS)
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
