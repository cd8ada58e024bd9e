"""Compare page: a convergence tool — runs of one solid against a reference, with each run's own error estimate.

Runs are chosen by workspace group, all or none (the first visit takes the active dataset's
group, or the active dataset alone); the numbers come from :func:`thermo.convergence.compare_runs`,
the one implementation the ``modeheat compare`` command uses, and the download is that command's file.
"""

from __future__ import annotations

import dash
import numpy as np
from dash import Input, Output, State, callback, html

from thermo.columns import column_name, error_key
from thermo.convergence import (DEFAULT_TEMPERATURES, compare_runs, comparison_provenance, difference_key,
                                table_run_input, with_table_run)
from thermo.errors import OptionError

from .. import budget, cache, exports, handoff, session
from .. import components as c
from .. import reading
from .. import figures as fg
from ..labels import axis_title, unit_of
from ..reporting import reported

PATH, NAME, ORDER = "/compare", "Compare", 5

QUANTITIES = [{"label": "C_v", "value": "heat_capacity_v"}, {"label": "S", "value": "entropy"},
              {"label": "U", "value": "internal_energy"}, {"label": "F", "value": "helmholtz_energy"}]
VIEWS = [{"label": "relative to the reference [%]", "value": "relative"},
         {"label": "absolute (in the quantity's unit)", "value": "absolute"}]
KEYS = [q["value"] for q in QUANTITIES]
SYMBOLS = {q["value"]: q["label"] for q in QUANTITIES}
#: Temperatures the on-screen difference table shows at most (a row of cells per run and temperature); the
#: download carries up to the page budget (``MODEHEAT_MAX_TEMPERATURES``).
TABLE_SHOWN = 200
TABLE_TEMPERATURES = ",".join(f"{t:g}" for t in DEFAULT_TEMPERATURES)


def groups(workspace):
    """The workspace's group labels, sorted (blank ones left out)."""
    return sorted({d.get("group", "") for d in (workspace or {}).get("datasets", [])} - {""})


def first_selection(workspace):
    """The runs of a first visit: the active dataset's group, else the active dataset alone (never all)."""
    current = session.active(workspace)
    if current is None:
        return []
    group = current.get("group", "")
    if group:
        return [d["id"] for d in workspace["datasets"] if d.get("group", "") == group]
    return [current["id"]]


def selection(workspace, trigger, ids, group):
    """Chosen dataset ids after a control changed: by group, all, none, or the kept choice."""
    datasets = (workspace or {}).get("datasets", [])
    known = [d["id"] for d in datasets]
    if trigger == "cmp-group" and group:
        return [d["id"] for d in datasets if d.get("group", "") == group]
    if trigger == "cmp-all":
        return known
    if trigger == "cmp-none":
        return []
    if ids is None:
        return first_selection(workspace)
    return [i for i in ids if i in known]


def runs(workspace, ids, reference):
    """``(datasets, reference index)`` of the chosen runs (the reference put first when not chosen)."""
    chosen = [d for d in (workspace or {}).get("datasets", []) if d["id"] in (ids or [])]
    ref = session.find(workspace, reference)
    if ref is None and chosen:
        ref = chosen[0]
    if ref is not None and ref not in chosen:
        chosen = [ref] + chosen
    if not chosen:
        raise OptionError("choose runs: a workspace group, All, or datasets in the list")
    return chosen, chosen.index(ref)


def _formula(datasets, per):
    return cache.formula_for(datasets[0], per)


def compared(workspace, ids, reference, temperatures, per, item=None):
    """:func:`thermo.convergence.compare_runs` of the chosen runs (names: the dataset names), with a sent table
    ``item`` (:mod:`webapp.handoff`) as one more run (:func:`thermo.convergence.with_table_run`)."""
    chosen, ref = runs(workspace, ids, reference)
    doses = [cache.load(d) for d in chosen]
    names = [d["name"] for d in chosen]
    # one run alone is its own reference: its values and its own error estimate
    table = compare_runs(doses, temperatures, reference=ref, names=names, per=per, formula=_formula(chosen, per))
    if item is not None:
        table, _ = with_table_run(table, None, item["csv"].encode("utf-8"), item["name"], _formula(chosen, per))
    return chosen, ref, doses, names, table


def _sent(choice, sent):
    """The sent table when the page's choice includes it, else None."""
    return handoff.received(sent, "compare") if choice == "sent" else None


def _pm(value, err):
    """``value ± error`` of a table cell ('—' where a table run has no value; '± ?' where no error is stated)."""
    if not np.isfinite(value):
        return "—"
    return f"{value:.6g} ± " + (f"{err:.2g}" if np.isfinite(err) else "?")


def figures(table, key, per, view):
    """Values of each run, and the difference from the reference with each run's error as a band."""
    t_col, value, err = column_name("temperature"), column_name(key, per), column_name(error_key(key), per)
    rel = column_name(difference_key(key))
    reference = table.attrs["reference"]
    over = fg.figure("temperature T [K]", axis_title(value))
    unit = unit_of(value)
    diff = fg.figure("temperature T [K]", f"Δ{SYMBOLS[key]}/{SYMBOLS[key]} from {fg.plot_text(reference)} [%]"
                     if view == "relative" else f"Δ{SYMBOLS[key]} from {fg.plot_text(reference)} [{unit}]")
    base = table[table["reference"]].set_index(t_col)[value]
    for k, (name, rows) in enumerate(table.groupby("run", sort=False)):
        t = rows[t_col].to_numpy()
        over.add_trace(fg.line(t, rows[value], name, k))
        if name == reference:        # the reference's own error, as a band around zero
            u = rows[err].to_numpy() * (100.0 / np.abs(rows[value].to_numpy()) if view == "relative" else 1.0)
            diff.add_trace(fg.band(t, -u, u, f"{name} (reference): ± its estimated error", k))
            continue
        scale = 100.0 / np.abs(base.loc[t].to_numpy()) if view == "relative" else 1.0
        delta = rows[rel].to_numpy() * 100.0 if view == "relative" else rows[value].to_numpy() - base.loc[t].to_numpy()
        u = rows[err].to_numpy() * scale
        diff.add_trace(fg.band(t, delta - u, delta + u, f"{name}: ± its estimated error", k))
        diff.add_trace(fg.line(t, delta, name, k, hover="%{y:.3g}"))
    diff.add_hline(y=0, line_color="#9aa7b0")
    return over, diff


def difference_table(table, per, view):
    """Rows run × temperature: each quantity's value ± the run's error, and the difference from the reference.

    A difference larger than the run's own error estimate is marked (the estimate does not cover it).
    """
    t_col = column_name("temperature")
    head = [html.Th("run"), html.Th("T [K]")]
    for key in KEYS:
        unit = unit_of(column_name(key, per))
        head += [html.Th(f"{SYMBOLS[key]} ± error [{unit}]"),
                 html.Th(f"Δ{SYMBOLS[key]}/{SYMBOLS[key]} [%]" if view == "relative" else f"Δ{SYMBOLS[key]} [{unit}]")]
    base = table[table["reference"]].set_index(t_col)
    body = []
    for _, row in table.iterrows():
        cells = [html.Td(row["run"] + (" (reference)" if row["reference"] else "")), html.Td(f"{row[t_col]:g}")]
        for key in KEYS:
            value, err = row[column_name(key, per)], row[column_name(error_key(key), per)]
            absolute = value - base.loc[row[t_col], column_name(key, per)]
            shown = (f"{100.0 * row[column_name(difference_key(key))]:+.3g}" if view == "relative"
                     else f"{absolute:+.4g}")
            shown = shown if np.isfinite(absolute) else "—"
            beyond = not row["reference"] and abs(absolute) > err
            cells += [html.Td(_pm(value, err)),
                      html.Td("—" if row["reference"] else shown + (" ⚑" if beyond else ""),
                              className="mh-beyond" if beyond else None,
                              title="larger than this run's estimated error" if beyond else None)]
        body.append(html.Tr(cells))
    return html.Table([html.Thead(html.Tr(head)), html.Tbody(body)], className="mh-table mh-numbers",
                      id="cmp-difference-table")


def layout(**_query):
    """The compare page (dataset choices are filled by :func:`choices`)."""
    return c.page(
        "Compare", "Convergence of runs of one solid — denser meshes, larger supercells, less smearing: each "
                   "run's difference from a reference, beside the error the run itself claims.",
        c.controls(c.dropdown("cmp-group", [], None, "Workspace group", clearable=True,
                              hint="groups are set on the Workspace page"),
                   html.Button("All", id="cmp-all", n_clicks=0, className="mh-button"),
                   html.Button("None", id="cmp-none", n_clicks=0, className="mh-button")),
        c.controls(c.dropdown("cmp-datasets", [], None, "Runs", multi=True),
                   c.dropdown("cmp-reference", [], None, "Reference run"),
                   c.radio("cmp-quantity", QUANTITIES, "entropy", "Plotted quantity"),
                   c.radio("cmp-view", VIEWS, "relative", "Differences"),
                   c.radio("cmp-sent", [{"label": "runs only", "value": "none"}], "none",
                           "Table sent from a page (one more run, interpolated between its rows)")),
        c.controls(c.text("cmp-temperatures", TABLE_TEMPERATURES, "Table temperatures [K]",
                          hint="comma list and/or START:STOP:STEP, > 0"),
                   *c.temperature_fields("cmp", 2, 1500, 5), c.basis_field("cmp-per", value="atom")),
        c.messages_panel("cmp-messages"),
        reading.panel("cmp"),
        html.H2("Differences at chosen temperatures"),
        html.Div(id="cmp-table"),
        exports.download_bar("cmp", "comparison"),
        html.Div([c.graph("cmp-overlay-graph", "The plotted quantity of each run"),
                  c.graph("cmp-diff-graph", "Difference from the reference run; band: the run's estimated error")],
                 className="mh-grid"),
    )


@callback(Output("cmp-datasets", "options"), Output("cmp-datasets", "value"), Output("cmp-reference", "options"),
          Output("cmp-reference", "value"), Output("cmp-group", "options"),
          Input("mh-workspace", "data"), Input("cmp-group", "value"), Input("cmp-all", "n_clicks"),
          Input("cmp-none", "n_clicks"), State("cmp-datasets", "value"), State("cmp-reference", "value"))
def choices(workspace, group, _all, _none, ids, reference):
    """Run choices: by group, all or none; a first visit takes the active dataset's group (never all)."""
    datasets = (workspace or {}).get("datasets", [])
    options = [{"label": d["name"] + (f"  [{d['group']}]" if d.get("group") else ""), "value": d["id"]}
               for d in datasets]
    ids = selection(workspace, dash.ctx.triggered_id, ids, group)
    chosen = [o for o in options if o["value"] in ids]
    if reference not in ids:
        reference = ids[0] if ids else None
    return options, ids, chosen, reference, [{"label": g, "value": g} for g in groups(workspace)]


def _failed(message):
    blank = fg.message_figure("nothing to compare for these settings")
    return blank, blank, [], c.message_items([("error", message)])


@callback(Output("cmp-overlay-graph", "figure"), Output("cmp-diff-graph", "figure"),
          Output("cmp-table", "children"), Output("cmp-messages", "children"),
          Input("mh-workspace", "data"), Input("cmp-datasets", "value"), Input("cmp-reference", "value"),
          Input("cmp-quantity", "value"), Input("cmp-view", "value"), Input("cmp-temperatures", "value"),
          Input("cmp-tmin", "value"), Input("cmp-tmax", "value"), Input("cmp-step", "value"),
          Input("cmp-per", "value"), Input("cmp-sent", "value"), State(handoff.STORE_ID, "data"))
@reported(_failed)
def draw(workspace, ids, reference, quantity, view, spec, t_min, t_max, step, per, choice=None, sent=None):
    """Table of differences at the chosen temperatures, value and difference curves over the grid."""
    note = [] if len(ids or []) >= 2 else c.message_items([(
        "info", "Choose at least two runs to compare: a workspace group, All, or datasets in the list "
                "(one run shows its values and its own error estimate).")])
    grid = budget.temperatures(t_min, t_max, step)
    grid = grid[grid > 0]
    item = _sent(choice, sent)
    _, _, _, _, curves = compared(workspace, ids, reference, grid, per, item)
    over, diff = figures(curves, quantity or "entropy", per, view)
    table_t = budget.parsed_temperatures(spec or TABLE_TEMPERATURES)
    if table_t.size > TABLE_SHOWN:
        raise OptionError(f"the table shows at most {TABLE_SHOWN} temperatures ({table_t.size:,} asked for); "
                          "the download carries up to the page's temperature budget")
    _, _, _, _, table = compared(workspace, ids, reference, table_t, per, item)
    return over, diff, difference_table(table, per, view), note


def comparison_download(fmt, workspace, ids, reference, spec, per, choice=None, sent=None):
    """The comparison as ``modeheat compare RUN... --reference REF --temperatures SPEC --per PER [--table CSV]``
    writes it."""
    if len(ids or []) + (_sent(choice, sent) is not None) < 2:
        raise OptionError("choose at least two runs (or one and a sent table) to download a comparison")
    temperatures = budget.parsed_temperatures(spec or TABLE_TEMPERATURES)
    item = _sent(choice, sent)
    chosen, ref, doses, names, table = compared(workspace, ids, reference, temperatures, per, item)
    info = comparison_provenance(doses, temperatures, reference=ref, names=names, per=per,
                                 formula=_formula(chosen, per))
    if item is not None:
        info = table_run_input(info, item["name"], item["csv"].encode("utf-8"))
    return exports.table_file(f"{exports.file_stem(names[ref])}-comparison", table, info, fmt)


exports.register_download("cmp", [State("mh-workspace", "data"), State("cmp-datasets", "value"),
                                  State("cmp-reference", "value"), State("cmp-temperatures", "value"),
                                  State("cmp-per", "value"), State("cmp-sent", "value"),
                                  State(handoff.STORE_ID, "data")], comparison_download)
handoff.follow_sent("compare", "cmp-sent")
c.follow_image_format("cmp-overlay-graph", "cmp-diff-graph")
reading.register("cmp")
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
