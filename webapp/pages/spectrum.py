"""Spectrum page: upload DOS files, set how they are read, see the DOS and g/ν²."""

from __future__ import annotations


import dash
from dash import ClientsideFunction, Input, Output, State, callback, clientside_callback, ctx, dcc, html, no_update

from thermo.accuracy.breakdown import FLAG_SPREAD, PARTS, error_column
from thermo.accuracy.resolution import analyse_resolution, resolution_note
from thermo.accuracy.reuse import table_breakdown
from thermo.errors import OptionError
from thermo.preparation.options import ReadingOptions, elastic_theta
from thermo.units import FREQUENCY_UNITS

from .. import cache, intake, session
from .. import components as c
from .. import figures as fg
from ..reporting import attempt, reported

PATH, NAME, ORDER = "/spectrum", "Spectrum", 1

NEGATIVE_CHOICES = c.NEGATIVE_CHOICES
LOW_CHOICES = [{"label": "automatic", "value": "auto"}, {"label": "window", "value": "manual"},
               {"label": "elastic θ_D", "value": "elastic"}, {"label": "off", "value": "off"}]
_CONTROL_IDS = ("sp-unit", "sp-atoms", "sp-formula", "sp-negative", "sp-lowmode", "sp-low-lo", "sp-low-hi",
                "sp-sheet", "sp-elastic")
_UPLOAD = "mh-upload-checked"
_REFUSED = "sp-refused"
_RETRY = "sp-retry-btn"


# ---------------------------------------------------------------- pure logic

def _stated_unit(dataset):
    if session.options_of(dataset)["freq_unit"]:
        return cache.stated_unit(dataset)
    return cache.load(dataset).source.get("freq_unit")   # with no unit chosen, the file's own unit was used


def unit_options(dataset):
    """Choices of the frequency-unit control; the first says what the file states."""
    stated = attempt(_stated_unit, dataset)[0] if dataset is not None else None
    first = {"label": f"as stated in file ({stated})" if stated else "as stated in file (none found)",
             "value": "auto"}
    return [first] + [{"label": u, "value": u} for u in FREQUENCY_UNITS]


def _automatic_window(dataset):
    """The automatic low-frequency fit window [THz] of a dataset, rounded for display, or (None, None)."""
    if dataset is None:
        return None, None
    auto = {**dataset, "options": {**session.options_of(dataset), "low_frequency": "auto"}}
    dos, _ = attempt(cache.load, auto)
    fit = dos.low_frequency if dos is not None else None
    if fit is None:
        return None, None
    return tuple(float(f"{v:.4g}") for v in fit.window_thz)


def control_values(workspace):
    """Values of the option controls for the active dataset (dict by control id).

    The window fields always show a window: the chosen one, else the
    automatic one, so that choosing "window" starts from the automatic fit.
    """
    current = session.active(workspace)
    opts = session.options_of(current)
    low = opts["low_frequency"]
    theta = elastic_theta(low)
    if low in ("auto", "off") or theta is not None:
        mode, (lo, hi) = ("elastic" if theta is not None else low), _automatic_window(current)
    else:
        mode, lo, hi = ("manual", *(float(v) for v in str(low).split(":")))
    negative = {"keep-count": "drop-unscaled"}.get(opts["negative"], opts["negative"])
    return {"sp-unit": opts["freq_unit"] or "auto", "sp-atoms": opts["atoms"],
            "sp-formula": opts["formula"] or "", "sp-negative": negative,
            "sp-lowmode": mode, "sp-low-lo": lo, "sp-low-hi": hi, "sp-sheet": opts.get("sheet") or "",
            "sp-elastic": theta}


def options_from_controls(values, trigger=None, shown_window=(None, None)):
    """Load options from control values; raises OptionError for a bad window.

    Typing a window limit (``trigger`` is a window field) chooses the manual
    window, so typed numbers are used rather than wiped; limits equal to
    ``shown_window`` (the automatic window the page filled in) change nothing.
    Typing an elastic Debye temperature chooses the elastic anchor
    (``elastic:THETA``, :mod:`thermo.preparation.anchor`).
    """
    mode = values.get("sp-lowmode") or "auto"
    lo, hi = values.get("sp-low-lo"), values.get("sp-low-hi")
    theta = values.get("sp-elastic")
    if trigger in ("sp-low-lo", "sp-low-hi") and lo is not None and hi is not None \
            and (lo, hi) != tuple(shown_window):
        mode = "manual"
    if trigger == "sp-elastic" and theta is not None:
        mode = "elastic"
    if mode == "manual" and (lo is None or hi is None):
        raise OptionError("type both limits of the low-frequency window (THz), e.g. 0.2 and 0.6")
    if mode == "elastic" and theta is None:
        raise OptionError("type the elastic Debye temperature θ_D (K), e.g. from the elastic command")
    unit = values.get("sp-unit")
    chosen = ReadingOptions(freq_unit=None if unit in (None, "auto") else unit, atoms=values.get("sp-atoms"),
                            negative=values.get("sp-negative"),
                            low_frequency=(lo, hi) if mode == "manual" else f"elastic:{theta}" if mode == "elastic"
                            else mode,
                            formula=values.get("sp-formula"), sheet=values.get("sp-sheet"))
    return chosen.stored()


def upload_options(values):
    """Reading options for the next upload from the controls.

    A manual window or an elastic θ_D belongs to one spectrum, so the next
    file gets the automatic treatment; bad control values give the default options.

    Examples
    --------
    >>> upload_options({"sp-atoms": 2, "sp-lowmode": "manual", "sp-low-lo": 1, "sp-low-hi": 2})["atoms"]
    2
    """
    mode = values.get("sp-lowmode")
    options, error = attempt(options_from_controls,
                             {**values, "sp-lowmode": "auto" if mode in ("manual", "elastic") else mode})
    return dict(session.DEFAULT_OPTIONS) if error else options


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
        Output of the client-side size check: ``files`` and ``refused``; with
        ``trigger`` the retry button, ``files`` are the files refused before.
        The files are read with the reading options of ``values``.
        The size limit is always the server's setting; nothing in ``upload``
        can change it.
    rename_text, selected : str, optional
        Rename box text; dataset chosen in the selector.

    Returns
    -------
    (dict, list of (kind, text))
    """
    ws = workspace or session.empty_workspace()
    if trigger in (_UPLOAD, _RETRY) and upload:
        refused = [("error", text) for text in upload.get("refused", [])]
        files = upload.get("files", [])
        pending = upload.setdefault("pending", [])
        new, notes = intake.add_uploads(ws, [f["contents"] for f in files], [f["name"] for f in files],
                                        upload.get("max_bytes", int(intake.DEFAULT_MAX_UPLOAD_MB * 1e6)),
                                        options=upload_options(values), refused=pending)
        if new.get("datasets") == ws.get("datasets") and new.get("active") == ws.get("active"):
            new = ws      # nothing loaded: the workspace (and the messages shown) stay as they are
        return new, refused + notes
    current = session.active(ws)
    if trigger == "sp-dataset":
        if current is not None and selected == current["id"]:
            return ws, []      # the selector was only set to show the active dataset: keep the messages
        return session.activated(ws, selected), []
    if current is None:
        return ws, []
    if trigger == "sp-rename-btn":
        return session.renamed(ws, current["id"], rename_text), []
    if trigger == "sp-remove-btn":
        return session.removed(ws, current["id"]), [("info", f"removed {current['name']}")]
    if trigger in _CONTROL_IDS:
        options, error = attempt(options_from_controls, values, trigger, _automatic_window(current))
        if error:
            return ws, [("error", error)]
        if options == {key: session.options_of(current)[key] for key in options}:
            return ws, []      # the controls were only set to show the dataset's own options
        new, error = intake.with_options(ws, current["id"], options)
        if not error:
            return new, []
        prefix = f"{current['name']}: "
        return new, [("error", prefix + error.removeprefix(prefix) + "; previous settings kept")]
    return ws, []


def dataset_summary(dataset):
    """One row of facts about a dataset, or its load error."""
    dos, error = attempt(cache.load, dataset)
    if error:
        return [dataset["name"], "—", "—", "—", error]
    src = dos.source
    return [dataset["name"], str(dos.atoms) + (" (inferred)" if src.get("atoms_inferred") else ""),
            src.get("freq_unit", "?"), f"{src['modes']} modes" if "modes" in src else str(len(dos.input_frequency_thz)),
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
        items.append(("info", f"ν² form below {fit.cutoff_thz:.4g} THz, blended into the data up to "
                      f"{fit.blend_top_thz or fit.cutoff_thz:.4g} THz, fitted over "
                      f"{fit.window_thz[0]:.3g}–{fit.window_thz[1]:.3g} THz: A = {fit.coefficient:.5g} "
                      f"± {fit.coefficient_uncertainty:.2g} per THz³, b = {fit.curvature:.3g} per THz² "
                      f"(misfit {100 * fit.rms_relative_residual:.2g} %"
                      + (f", elastic-limit θ_D ≈ {theta:.4g} K)" if theta else ")")))
    items += [("warn", w) for w in dos.warnings]
    return items + accuracy_items(dos)


#: Temperatures of the error breakdown shown beside the spectrum [K].
ACCURACY_TEMPERATURES = (5.0, 20.0, 298.15)


def accuracy_items(dos):
    """``(kind, text)`` lines of the error breakdown (every part) of C_v and S, and what the data resolve."""
    table = table_breakdown(dos, ACCURACY_TEMPERATURES)
    items = []
    note = resolution_note(analyse_resolution(dos), ACCURACY_TEMPERATURES)
    if note:
        items.append(("warn", note))
    for key, symbol, unit in (("heat_capacity_v", "C_v", "J/(mol·K)"), ("entropy", "S", "J/(mol·K)")):
        for _, row in table.iterrows():
            parts = ", ".join(f"{_PART_WORDS[p]} ±{row[error_column(key, p)]:.2g} {unit} "
                              f"({100 * row[error_column(key, p, relative=True)]:.2g} %)" for p in PARTS)
            total = sum(row[error_column(key, p, relative=True)] for p in PARTS)
            kind = "warn" if total > FLAG_SPREAD else "info"
            items.append((kind, f"error estimate {symbol}({row['temperature_K']:g} K): {parts}"
                                + (" — over 1 %, check against measured data" if kind == "warn" else "")))
    return items


#: Short words for the parts of the error estimate.
_PART_WORDS = {"numerical": "numerical", "low_frequency": "low-frequency", "resolution": "resolution",
               "smearing": "smearing"}


# ---------------------------------------------------------------- layout

def layout(**_query):
    """The spectrum page (controls are filled from the workspace by :func:`sync`)."""
    values = control_values(None)
    return c.page(
        "Spectrum", "Load phonon DOS files, tell how to read them, and check the spectrum before any "
                    "thermodynamics.",
        html.Div([
            html.Div([
                dcc.Upload(id="mh-upload", multiple=True, className="mh-upload",
                           children=html.Div(["Drop DOS files here or ", html.U("choose files"),
                                              html.Br(), html.Small("text (.dat, .txt, .csv, .tsv) or .xlsx; "
                                                                    "several at once")])),
                dcc.Store(id=_UPLOAD),
                dcc.Store(id=_REFUSED, data=[]),
                c.messages_panel("sp-messages"),
                html.Button("Read again with these options", id=_RETRY, className="mh-button",
                            style={"display": "none"}),
                html.H2("Datasets"),
                c.dropdown("sp-dataset", [], None, "Active dataset"),
                html.Div([c.text("sp-rename", "", "New name"),
                          html.Button("Rename", id="sp-rename-btn", className="mh-button"),
                          html.Button("Remove", id="sp-remove-btn", className="mh-button mh-danger")],
                         className="mh-inline"),
                html.H2("Reading options"),
                html.Small("They apply to the active dataset and to the next upload.", className="mh-hint"),
                c.dropdown("sp-unit", unit_options(None), values["sp-unit"], "Frequency unit"),
                c.number("sp-atoms", values["sp-atoms"], "Atoms per formula unit", step=1, min_value=1,
                         hint="empty: inferred from the DOS integral"),
                c.text("sp-formula", values["sp-formula"], "Formula", placeholder="e.g. MgO",
                       hint="needed for values per gram"),
                c.radio("sp-negative", NEGATIVE_CHOICES, values["sp-negative"], "Imaginary modes"),
                c.radio("sp-lowmode", LOW_CHOICES, values["sp-lowmode"], "Low-frequency ν² form"),
                html.Div([c.number("sp-low-lo", values["sp-low-lo"], "Window from [THz]", min_value=0),
                          c.number("sp-low-hi", values["sp-low-hi"], "to [THz]", min_value=0)],
                         className="mh-inline"),
                c.number("sp-elastic", values["sp-elastic"], "Elastic θ_D [K]", min_value=0,
                         hint="anchors the long-wave limit (e.g. from the elastic command)"),
                c.text("sp-sheet", values["sp-sheet"], "Sheet (.xlsx)", placeholder="first sheet",
                       hint="name or number from 1"),
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
    act = (session.active(workspace) or {}).get("id")
    head = html.Tr([html.Th(h) for h in ("name", "atoms", "unit", "points", "imaginary")])
    body = [html.Tr([html.Td(v) for v in row], className="mh-active-row" if d["id"] == act else None)
            for row, d in zip(rows, workspace["datasets"])]
    return html.Table([html.Thead(head), html.Tbody(body)], className="mh-table")


# ---------------------------------------------------------------- callbacks

def _commit(old, new, notes, config):
    """Outputs (workspace, tab storage, messages) after an action that gave ``new``."""
    if new is old:
        return no_update, no_update, c.message_items(notes) if notes else no_update
    new = session.revised(new)
    kept, left_out = session.persistable(new, (config or {}).get("saved_limit_chars", session.SAVED_LIMIT_CHARS))
    notes = notes + [("warn", f"{name} is too large to keep across a page reload; it stays loaded "
                              "until this tab is reloaded or closed") for name in left_out]
    return new, kept, c.message_items(notes)


def _refused(message):
    return no_update, no_update, c.message_items([("error", message)])


_EDITED = (Output("mh-workspace", "data", allow_duplicate=True), Output("mh-saved", "data", allow_duplicate=True),
           Output("sp-messages", "children", allow_duplicate=True))

clientside_callback(ClientsideFunction("modeheat", "checkUpload"), Output(_UPLOAD, "data"),
                    Input("mh-upload", "contents"), State("mh-upload", "filename"), State("mh-config", "data"),
                    prevent_initial_call=True)


def _refused_upload(message):
    return (*_refused(message), no_update, no_update)


@callback(*_EDITED, Output(_REFUSED, "data"), Output(_RETRY, "style"), Input(_UPLOAD, "data"),
          Input(_RETRY, "n_clicks"), State(_REFUSED, "data"), State("mh-workspace", "data"),
          State("mh-config", "data"), *[State(i, "value") for i in _CONTROL_IDS], prevent_initial_call=True)
@reported(_refused_upload)
def upload(checked, _retry, pending, workspace, config, *values):
    """Read new files (or the refused ones again) with the page's reading options.

    The server checks the size again after the browser's check.
    """
    limit = dash.get_app().server.config["MODEHEAT_MAX_UPLOAD_BYTES"]
    trigger = ctx.triggered_id
    if trigger == _UPLOAD and not checked:      # the page's first render, not an upload
        return (no_update,) * 5
    files = (checked or {}) if trigger == _UPLOAD else {"files": pending or []}
    job = {**files, "max_bytes": limit, "pending": []}
    new, notes = apply_edit(workspace, trigger, dict(zip(_CONTROL_IDS, values)), job)
    left = job["pending"]
    return (*_commit(workspace, new, notes, config), left,
            {"display": "inline-block" if left else "none"})


@callback(*_EDITED, Input("sp-dataset", "value"), Input("sp-rename-btn", "n_clicks"),
          Input("sp-remove-btn", "n_clicks"), State("mh-workspace", "data"), State("sp-rename", "value"),
          State("mh-config", "data"), prevent_initial_call=True)
@reported(_refused)
def choose(selected, _rename, _remove, workspace, rename_text, config):
    """Activate, rename or remove a dataset."""
    new, notes = apply_edit(workspace, ctx.triggered_id, {}, rename_text=rename_text, selected=selected)
    return _commit(workspace, new, notes, config)


@callback(*_EDITED, *[Input(i, "value") for i in _CONTROL_IDS], State("mh-workspace", "data"),
          State("mh-config", "data"), prevent_initial_call=True)
@reported(_refused)
def reread(*args):
    """Re-read the active dataset with the options of the controls (kept as they were if it fails)."""
    *values, workspace, config = args
    new, notes = apply_edit(workspace, ctx.triggered_id, dict(zip(_CONTROL_IDS, values)))
    return _commit(workspace, new, notes, config)


@callback(Output("sp-dataset", "options"), Output("sp-dataset", "value"), Output("sp-unit", "options"),
          *[Output(i, "value") for i in _CONTROL_IDS], Output("sp-rename", "value"), Input("mh-workspace", "data"))
def sync(workspace):
    """Show the workspace in the controls: dataset list, active dataset and its options."""
    current = session.active(workspace)
    shown = control_values(workspace)
    return (_dataset_options(workspace), current and current["id"], unit_options(current),
            *[shown[i] for i in _CONTROL_IDS], current["name"] if current else "")


def _blank(message):
    blank = fg.message_figure("cannot draw this dataset")
    return blank, blank, c.message_items([("error", message)]), no_update


@callback(Output("sp-dos-graph", "figure"), Output("sp-reduced-graph", "figure"),
          Output("sp-warnings", "children"), Output("sp-list", "children"), Input("mh-workspace", "data"))
@reported(_blank)
def draw(workspace):
    """The DOS and reduced-DOS plots, the checks and the list of datasets."""
    listing = _list_table(workspace)
    current = session.active(workspace)
    if current is None:
        blank = fg.message_figure("no dataset loaded")
        return blank, blank, [], listing
    dos = cache.load(current)
    return fg.dos_figure(dos), fg.reduced_figure(dos), c.message_items(warning_items(dos)), listing


c.follow_image_format("sp-dos-graph", "sp-reduced-graph")
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
