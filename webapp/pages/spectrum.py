"""Spectrum page: upload DOS files, set how they are read, see the DOS and g/ν²."""

from __future__ import annotations

import uuid

import numpy as np
import plotly.graph_objects as go
from dash import Input, Output, State, ctx, dcc, html, no_update

from thermo.preparation.lowfreq import reduced_dos
from thermo.units import FREQUENCY_UNITS

from .. import components as c
from .. import state

WORKSPACE = "sp-workspace"
PATH = "/spectrum"
NAME = "Spectrum"

NEGATIVE_CHOICES = [{"label": "leave out, rescale rest to 3n", "value": "drop"},
                    {"label": "leave out, keep count", "value": "keep-count"},
                    {"label": "refuse the file", "value": "refuse"}]
LOW_CHOICES = [{"label": "automatic", "value": "auto"}, {"label": "window", "value": "manual"},
               {"label": "off", "value": "off"}]
_CONTROL_IDS = ("sp-unit", "sp-atoms", "sp-formula", "sp-negative", "sp-lowmode", "sp-low-lo", "sp-low-hi")


# ---------------------------------------------------------------- pure logic

def unit_options(dataset):
    stated = None
    if dataset is not None:
        explicit = dataset.get("options", {}).get("freq_unit")
        try:   # with no unit chosen, the loaded unit is the one the file states
            stated = state.stated_unit(dataset) if explicit else state.load(dataset).source.get("freq_unit")
        except Exception:  # an unloadable dataset simply has no stated unit to show
            stated = None
    first = {"label": f"as stated in file ({stated})" if stated else "as stated in file (none found)",
             "value": "auto"}
    return [first] + [{"label": u, "value": u} for u in FREQUENCY_UNITS]


def control_values(workspace):
    """Values of the option controls for the active dataset (dict by control id)."""
    d = state.active(workspace)
    opts = {**state.DEFAULT_OPTIONS, **(d or {}).get("options", {})}
    low = opts["low_frequency"]
    mode, lo, hi = ("auto", None, None) if low == "auto" else ("off", None, None) if low == "off" \
        else ("manual", *(float(v) for v in str(low).split(":")))
    return {"sp-unit": opts["freq_unit"] or "auto", "sp-atoms": opts["atoms"],
            "sp-formula": opts["formula"] or "", "sp-negative": opts["negative"],
            "sp-lowmode": mode, "sp-low-lo": lo, "sp-low-hi": hi}


def options_from_controls(values):
    """Load options from control values; raises OptionError for a bad window."""
    from thermo.errors import OptionError
    atoms = values.get("sp-atoms")
    if atoms in ("", None):
        atoms = None
    else:
        if float(atoms) != int(float(atoms)) or int(float(atoms)) < 1:
            raise OptionError(f"atoms per formula unit must be a whole number >= 1, not {atoms}")
        atoms = int(float(atoms))
    mode = values.get("sp-lowmode") or "auto"
    if mode == "manual":
        lo, hi = values.get("sp-low-lo"), values.get("sp-low-hi")
        if lo is None or hi is None or not 0 <= float(lo) < float(hi):
            raise OptionError("the low-frequency window needs 0 <= low < high (THz)")
        low = f"{float(lo)}:{float(hi)}"
    else:
        low = mode
    unit = values.get("sp-unit")
    return {"freq_unit": None if unit in (None, "auto") else unit, "atoms": atoms,
            "formula": (values.get("sp-formula") or "").strip(),
            "negative": values.get("sp-negative") or "drop", "low_frequency": low}


def apply_edit(workspace, trigger, values, upload=None, rename_text=None, selected=None):
    """New workspace and messages after one user action on this page.

    Parameters
    ----------
    workspace : dict
        Current workspace.
    trigger : str
        Id of the control that changed.
    values : dict
        Option control values by id.
    upload : dict, optional
        Output of the client-side size check: ``files`` and ``refused``.
    rename_text, selected : str, optional
        Rename box text; dataset chosen in the selector.

    Returns
    -------
    (dict, list of (kind, text))
    """
    ws = workspace or state.empty_workspace()
    if trigger == "mh-upload-checked" and upload:
        refused = [("error", text) for text in upload.get("refused", [])]
        files = upload.get("files", [])
        new, notes = state.add_uploads(ws, [f["contents"] for f in files], [f["name"] for f in files],
                                       upload.get("max_bytes", 10 ** 12))
        return new, refused + notes
    current = state.active(ws)
    if trigger == "sp-dataset":
        return state.activated(ws, selected), []
    if current is None:
        return ws, []
    if trigger == "sp-rename-btn":
        return state.renamed(ws, current["id"], rename_text), []
    if trigger == "sp-remove-btn":
        return state.removed(ws, current["id"]), [("info", f"removed {current['name']}")]
    if trigger in _CONTROL_IDS:
        try:
            options = options_from_controls(values)
        except Exception as exc:  # one-line message, keep the dataset as it was
            return ws, [("error", state.one_line(exc))]
        new, error = state.with_options(ws, current["id"], options)
        return new, [("error", f"{current['name']}: {error}; previous settings kept")] if error else []
    return ws, []


def dataset_summary(dataset):
    """One row of facts about a dataset, or its load error."""
    try:
        dos = state.load(dataset)
    except Exception as exc:  # shown in the list, never raised
        return [dataset["name"], "—", "—", "—", state.one_line(exc)]
    src = dos.source
    return [dataset["name"], str(dos.atoms) + (" (inferred)" if src.get("atoms_inferred") else ""),
            src.get("freq_unit", "?"), str(len(dos.input_frequency_thz)),
            f"{100 * src.get('negative_mode_fraction', 0):.3g} %"]


def warning_items(dos):
    """``(kind, text)`` cautions and facts for the warnings panel."""
    src = dos.source
    share = src.get("negative_mode_fraction", 0.0)
    items = [("warn" if share > 0 else "info", f"imaginary modes: {100 * share:.3g} % of all modes "
              f"(policy: {src.get('negative_policy')})"),
             ("info", f"normalised to 3n = {3 * dos.atoms} modes; the file integrates to "
              f"{src.get('raw_integral', float('nan')):.6g} (scale factor {src.get('scale_factor', 1):.6g})"),
             ("info", f"atoms per formula unit: {dos.atoms} "
              f"({'inferred from the DOS integral' if src.get('atoms_inferred') else 'as given'})")]
    fit = dos.low_frequency
    if fit is not None:
        theta = dos.low_frequency_debye_temperature_k()
        items.append(("info", f"ν² form below {fit.cutoff_thz:.4g} THz, fitted over "
                      f"{fit.window_thz[0]:.3g}–{fit.window_thz[1]:.3g} THz "
                      f"(misfit {100 * fit.rms_relative_residual:.2g} %"
                      + (f", elastic-limit θ_D ≈ {theta:.4g} K)" if theta else ")")))
    items += [("warn", w) for w in dos.warnings]
    return items


def dos_figure(dos):
    fig = c.figure("frequency ν [THz]", "DOS g(ν) [states/THz per formula unit]")
    nu, g = dos.input_frequency_thz, dos.input_dos
    fig.add_trace(go.Scatter(x=nu, y=g, name="total (as read, normalised)", mode="lines",
                             line={"width": 2, "color": c.PALETTE[0]},
                             hovertemplate="%{y:.4g}"))
    for k, (name, col) in enumerate(dos.input_partials.items()):
        fig.add_trace(go.Scatter(x=nu, y=col, name=f"partial: {name}", mode="lines",
                                 line={"width": 1.4, "color": c.PALETTE[(k + 1) % len(c.PALETTE)]},
                                 hovertemplate="%{y:.4g}"))
    fit = dos.low_frequency
    if fit is not None:
        x = np.linspace(0.0, fit.cutoff_thz, 80)
        fig.add_trace(go.Scatter(x=x, y=fit.coefficient * x * x, name="ν² form used below cut-off",
                                 mode="lines", line={"width": 2, "dash": "dash", "color": c.INK},
                                 hovertemplate="%{y:.4g}"))
    if nu.size and nu[0] < 0:
        fig.add_vrect(x0=float(nu[0]), x1=0.0, fillcolor="#b3443a", opacity=0.08, line_width=0,
                      annotation_text="imaginary", annotation_position="top left")
    return fig


def reduced_figure(dos):
    fig = c.figure("frequency ν [THz]", "g(ν)/ν² [states/THz³ per formula unit]")
    nu, red = reduced_dos(dos.input_frequency_thz, dos.input_dos)
    fit = dos.low_frequency
    top = float(nu.max()) if nu.size else 1.0
    x_max = min(top, 2.5 * fit.cutoff_thz) if fit is not None else 0.4 * top
    keep = nu <= x_max
    fig.add_trace(go.Scatter(x=nu[keep], y=red[keep], name="g/ν² of the input", mode="lines",
                             line={"width": 2, "color": c.PALETTE[0]}, hovertemplate="%{y:.4g}"))
    if fit is not None:
        lo, hi = fit.window_thz
        fig.add_vrect(x0=lo, x1=hi, fillcolor=c.PALETTE[1], opacity=0.15, line_width=0,
                      annotation_text="fit window", annotation_position="top left")
        fig.add_trace(go.Scatter(x=[0.0, fit.cutoff_thz], y=[fit.coefficient] * 2, mode="lines",
                                 name=f"fitted A = {fit.coefficient:.4g}",
                                 line={"width": 2, "dash": "dash", "color": c.INK}))
        ref = red[(nu >= lo) & (nu <= hi)]
        if ref.size:
            span = float(np.nanmax(ref) - np.nanmin(ref)) or abs(fit.coefficient)
            fig.update_yaxes(range=[max(0.0, float(np.nanmin(ref)) - 2 * span), float(np.nanmax(ref)) + 3 * span])
    else:
        finite = red[keep & (nu > 0.05 * x_max)]
        if finite.size:
            fig.update_yaxes(range=[0, float(np.nanpercentile(finite, 98)) * 1.3])
    return fig


# ---------------------------------------------------------------- layout

def layout(workspace, prefs=None):
    values = control_values(workspace)
    current = state.active(workspace)
    return c.page(
        "Spectrum", "Load phonon DOS files, tell how to read them, and check the spectrum before any "
                    "thermodynamics.",
        html.Div([
            html.Div([
                dcc.Upload(id="mh-upload", multiple=True, className="mh-upload",
                           children=html.Div(["Drop DOS files here or ", html.U("choose files"),
                                              html.Br(), html.Small("text (.dat, .txt, .csv, .tsv) or .xlsx; "
                                                                    "several at once")])),
                dcc.Store(id="mh-upload-checked"),
                c.messages_panel("sp-messages"),
                html.H2("Datasets"),
                c.dropdown("sp-dataset", _dataset_options(workspace), current and current["id"],
                           "Active dataset"),
                html.Div([c.text("sp-rename", current["name"] if current else "", "New name"),
                          html.Button("Rename", id="sp-rename-btn", className="mh-button"),
                          html.Button("Remove", id="sp-remove-btn", className="mh-button mh-danger")],
                         className="mh-inline"),
                html.H2("Reading options"),
                c.dropdown("sp-unit", unit_options(current), values["sp-unit"], "Frequency unit"),
                c.number("sp-atoms", values["sp-atoms"], "Atoms per formula unit", step=1, min_value=1,
                         hint="empty: inferred from the DOS integral"),
                c.text("sp-formula", values["sp-formula"], "Formula", placeholder="e.g. MgO",
                       hint="needed for values per gram"),
                c.radio("sp-negative", NEGATIVE_CHOICES, values["sp-negative"], "Imaginary modes"),
                c.radio("sp-lowmode", LOW_CHOICES, values["sp-lowmode"], "Low-frequency ν² form"),
                html.Div([c.number("sp-low-lo", values["sp-low-lo"], "Window from [THz]", min_value=0),
                          c.number("sp-low-hi", values["sp-low-hi"], "to [THz]", min_value=0)],
                         className="mh-inline"),
            ], className="mh-side"),
            html.Div([
                c.graph("sp-dos-graph", "Phonon DOS with partial columns; dashed: the ν² form used below "
                                        "the cut-off"),
                c.graph("sp-reduced-graph", "Reduced DOS g/ν²: flat where the spectrum is Debye-like; "
                                            "shaded: the fitted window"),
                html.H2("Checks"),
                c.messages_panel("sp-warnings"),
                html.H2("Loaded datasets"),
                html.Div(id="sp-list"),
            ], className="mh-content"),
        ], className="mh-split"))


def _dataset_options(workspace):
    return [{"label": d["name"], "value": d["id"]} for d in (workspace or {}).get("datasets", [])]


def _list_table(workspace):
    rows = [dataset_summary(d) for d in (workspace or {}).get("datasets", [])]
    if not rows:
        return c.no_data_note()
    act = (state.active(workspace) or {}).get("id")
    head = html.Tr([html.Th(h) for h in ("name", "atoms", "unit", "points", "imaginary")])
    body = [html.Tr([html.Td(v) for v in row], className="mh-active-row" if d["id"] == act else None)
            for row, d in zip(rows, workspace["datasets"])]
    return html.Table([html.Thead(head), html.Tbody(body)], className="mh-table")


# ---------------------------------------------------------------- callbacks

def edit(upload, selected, unit, atoms, formula, negative, lowmode, lo, hi, _r, _x, workspace,
         rename_text, config):
    trigger = ctx.triggered_id
    values = dict(zip(_CONTROL_IDS, (unit, atoms, formula, negative, lowmode, lo, hi)))
    if upload:
        upload = {**upload, "max_bytes": (config or {}).get("max_upload_bytes", 10 ** 12)}
    try:
        new, notes = apply_edit(workspace, trigger, values, upload, rename_text, selected)
    except Exception as exc:  # last line of defence: message, nothing raised
        new, notes = workspace, [("error", state.one_line(exc))]
    if new is workspace:   # the page copy is always sent, so the plots also draw on the first call
        saved = (new, no_update, no_update, no_update)
    else:
        new = {**new, "rev": uuid.uuid4().hex}
        kept, left_out = state.persistable(new, (config or {}).get("saved_limit_chars",
                                                                   state.SAVED_LIMIT_CHARS))
        notes = notes + [("warn", f"{name} is too large to keep across a page reload; it stays loaded "
                                  "until this tab is reloaded or closed") for name in left_out]
        saved = (new, new, kept, {"path": PATH, "rev": new["rev"]})
    current = state.active(new)
    shown = control_values(new)
    return (*saved, _dataset_options(new),
            current and current["id"], unit_options(current), *[shown[i] for i in _CONTROL_IDS],
            current["name"] if current else "",
            c.message_items(notes))


def draw(workspace):
    listing = _list_table(workspace)
    current = state.active(workspace)
    if current is None:
        blank = c.message_figure("no dataset loaded")
        return blank, blank, [], listing
    try:
        dos = state.load(current)
        return dos_figure(dos), reduced_figure(dos), c.message_items(warning_items(dos)), listing
    except Exception as exc:  # the page stays usable
        blank = c.message_figure("cannot draw this dataset")
        return blank, blank, c.message_items([("error", state.one_line(exc))]), listing


def register(app):
    control_outputs = [Output(i, "value") for i in _CONTROL_IDS]
    app.callback(
        Output(WORKSPACE, "data"), Output("mh-workspace", "data", allow_duplicate=True),
        Output("mh-saved", "data"), Output("mh-route", "data", allow_duplicate=True), Output("sp-dataset", "options"), Output("sp-dataset", "value"),
        Output("sp-unit", "options"), *control_outputs, Output("sp-rename", "value"),
        Output("sp-messages", "children"),
        Input("mh-upload-checked", "data"), Input("sp-dataset", "value"),
        *[Input(i, "value") for i in _CONTROL_IDS],
        Input("sp-rename-btn", "n_clicks"), Input("sp-remove-btn", "n_clicks"),
        State(WORKSPACE, "data"), State("sp-rename", "value"), State("mh-config", "data"),
        prevent_initial_call="initial_duplicate")(edit)
    app.callback(Output("sp-dos-graph", "figure"), Output("sp-reduced-graph", "figure"),
                  Output("sp-warnings", "children"), Output("sp-list", "children"),
                  Input(WORKSPACE, "data"))(draw)
