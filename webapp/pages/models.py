"""Models page: the DOS result against Einstein, Debye and composite models, and every θ."""

from __future__ import annotations

import dash
import numpy as np
import plotly.graph_objects as go
from dash import Input, Output, State, callback, html

from thermo import models
from thermo.columns import find

from .. import budget, cache, session
from .. import components as c
from .. import reading
from .. import exports, notices
from .. import figures as fg
from ..labels import axis_title, theta_label
from ..reporting import reported

PATH, NAME, ORDER = "/models", "Models", 3

RESIDUAL_CHOICES = [{"label": "C_v", "value": "heat_capacity_v"}, {"label": "S", "value": "entropy"},
                    {"label": "U", "value": "internal_energy"}, {"label": "F", "value": "helmholtz_energy"}]
_GRAPHS = ("mod-values-graph", "mod-residual-graph", "mod-lowt-graph", "mod-thetad-graph")


def thetas(dataset):
    """Every θ definition of the dataset (cached), as dicts of :func:`thermo.models.theta_definitions`."""
    return cache.derived("thetas", dataset, models.theta_definitions)


def theta_options(dataset, prefix):
    """Dropdown options of the defined θ whose key starts with ``prefix``."""
    return [{"label": f"{theta_label(t['key'])} = {t['value_K']:.4g} K", "value": t["key"]}
            for t in thetas(dataset) if t["key"].startswith(prefix) and t["value_K"] is not None]


def _theta(dataset, key):
    for t in thetas(dataset):
        if t["key"] == key and t["value_K"] is not None:
            return float(t["value_K"])
    return None


def model_tables(dataset, temperatures, per, einstein_key, debye_key, optical_terms):
    """``{label: DataFrame}`` of the DOS result and each chosen model, same columns."""
    dos = cache.load(dataset)
    extra = {"atoms": dos.atoms, "formula": cache.formula_for(dataset, per)}
    modes = 3 * dos.atoms
    tables = {"DOS": cache.table(dataset, temperatures, per)}
    theta_e, theta_d = _theta(dataset, einstein_key), _theta(dataset, debye_key)
    if theta_e is not None:
        tables[f"Einstein θ_E = {theta_e:.4g} K"] = models.einstein_table(theta_e, modes, temperatures,
                                                                          per=per, **extra)
    if theta_d is not None:
        tables[f"Debye θ_D = {theta_d:.4g} K"] = models.debye_table(theta_d, modes, temperatures,
                                                                    per=per, **extra)
    if optical_terms:
        composite = cache.derived("composite", dataset,
                                  lambda d: models.composite_model(d, optical_terms=int(optical_terms)),
                                  int(optical_terms))
        tables[f"Debye + {int(optical_terms)} Einstein"] = models.composite_table(composite, temperatures, per=per, **extra)
    return tables


def figures(dataset, temperatures, per, einstein_key, debye_key, optical_terms, residual_key):
    """Values, residuals, C_v/T³ and θ_D(T) figures of the DOS result and the chosen models."""
    tables = model_tables(dataset, temperatures, per, einstein_key, debye_key, optical_terms)
    dos_table = tables["DOS"]
    t, cv = find(dos_table, "temperature"), find(dos_table, "heat_capacity_v")
    values = fg.figure("temperature T [K]", axis_title(cv))
    residual = fg.figure("temperature T [K]", f"model − DOS: {axis_title(find(dos_table, residual_key))}")
    for k, (label, df) in enumerate(tables.items()):
        style = {"width": 3 if label == "DOS" else 2, "color": fg.PALETTE[k % len(fg.PALETTE)],
                 "dash": None if label == "DOS" else ("dash", "dot", "dashdot")[k % 3]}
        values.add_trace(go.Scatter(x=df[t], y=df[cv], name=fg.plot_text(label), mode="lines", line=style,
                                    hovertemplate="%{y:.5g}"))
        if label != "DOS":
            res = models.residual_table(dos_table, df)
            residual.add_trace(go.Scatter(x=res[find(res, "temperature")], y=res[find(res, residual_key)],
                                          name=fg.plot_text(label), mode="lines", line=style, hovertemplate="%{y:.3g}"))
    residual.add_hline(y=0, line_color="#9aa7b0")

    low_t = np.geomspace(1.0, max(2.0, min(float(np.max(temperatures)), 300.0)), 120)
    formula_tables = model_tables(dataset, low_t, "formula", einstein_key, debye_key, optical_terms)
    ratio = models.cv_over_t3(formula_tables)
    lowt = fg.figure("temperature T [K]", "C_v/T³ [J/(mol·K⁴)]")
    t_ratio = find(ratio, "temperature")
    for k, name in enumerate(col for col in ratio.columns if col != t_ratio):
        lowt.add_trace(fg.line(ratio[t_ratio], ratio[name], name, k, width=2, hover="%{y:.4g}"))
    lowt.update_xaxes(type="log")
    lowt.update_yaxes(exponentformat="e", tickformat=".2~e")   # scientific notation, no SI prefixes

    grid = np.asarray(temperatures, dtype=float)
    grid = grid[grid > 0]
    theta_t = cache.derived("theta_of_t", dataset,
                            lambda d: models.equivalent_debye_temperature(d, grid), grid.tobytes())
    thetad = fg.figure("temperature T [K]", "equivalent Debye temperature θ_D(T) [K]")
    thetad.add_trace(fg.line(grid, theta_t, "θ_D(T) from the DOS C_v", hover="%{y:.4g} K"))
    return values, residual, lowt, thetad


def theta_table(dataset):
    """Every θ definition with value, uncertainty, fit range, definition and reference."""
    rows = []
    for t in thetas(dataset):
        value = "undefined" if t["value_K"] is None else f"{t['value_K']:.5g}"
        unc = "—" if t.get("uncertainty_K") in (None, 0) else f"± {t['uncertainty_K']:.2g}"
        rng = t.get("fit_range_K")
        rows.append(html.Tr([html.Td(theta_label(t["key"])), html.Td(value), html.Td(unc),
                             html.Td("—" if not rng else f"{rng[0]:.4g}–{rng[1]:.4g} K"),
                             html.Td(t.get("definition", "")), html.Td(t.get("reference", ""), className="mh-ref")]))
    head = html.Tr([html.Th(h) for h in ("θ", "value [K]", "uncertainty [K]", "fit range", "definition",
                                         "reference")])
    return html.Table([html.Thead(head), html.Tbody(rows)], className="mh-table mh-theta-table")


def layout(**_query):
    """The models page."""
    return c.page(
        "Models", "How well do an Einstein, a Debye or a composite model describe the DOS result? "
                  "Each θ definition gives a different model; pick one and look at the residuals.",
        c.active_slot("mod"),
        reading.panel("mod"),
        c.controls(c.dropdown("mod-einstein", [], None, "Einstein θ_E", clearable=True),
                   c.dropdown("mod-debye", [], None, "Debye θ_D", clearable=True),
                   c.radio("mod-optical", [{"label": "none", "value": 0}, {"label": "1", "value": 1},
                                           {"label": "2", "value": 2}], 1, "Composite: Einstein terms")),
        c.controls(*c.temperature_fields("mod", 0, 800, 5), c.basis_field("mod-per"),
                   c.radio("mod-residual", RESIDUAL_CHOICES, "heat_capacity_v", "Residual of")),
        c.messages_panel("mod-messages"),
        html.Div([c.graph("mod-values-graph", "Heat capacity: DOS result and models"),
                  c.graph("mod-residual-graph", "Residuals: model minus DOS result"),
                  c.graph("mod-lowt-graph", "Low-temperature check: C_v/T³ (flat for a Debye solid)"),
                  c.graph("mod-thetad-graph", "Equivalent Debye temperature versus T")], className="mh-grid"),
        exports.download_bar("mod", "models result", formats=("json", "csv")),
        html.H2("Characteristic temperatures"),
        html.Div(id="mod-theta-table"),
    )


def _no_choices(message):
    return [], None, [], None, c.message_items([("error", message)])


@callback(Output("mod-einstein", "options"), Output("mod-einstein", "value"),
          Output("mod-debye", "options"), Output("mod-debye", "value"),
          Output("mod-theta-table", "children"),
          Input("mh-workspace", "data"), State("mod-einstein", "value"), State("mod-debye", "value"))
@reported(_no_choices)
def choices(workspace, einstein_key, debye_key):
    """θ choices of the active dataset (keeping the user's picks when they still exist) and the θ table."""
    current = session.active(workspace)
    if current is None:
        return [], None, [], None, c.no_data_note()
    e_opts, d_opts = theta_options(current, "einstein"), theta_options(current, "debye")
    pick = (lambda opts, key: key if key in [o["value"] for o in opts]
            else (opts[0]["value"] if opts else None))
    return e_opts, pick(e_opts, einstein_key), d_opts, pick(d_opts, debye_key), theta_table(current)


def _failed(message):
    blank = fg.message_figure("nothing to show for these settings")
    return blank, blank, blank, blank, c.message_items([("error", message)])


@callback(*[Output(g, "figure") for g in _GRAPHS], Output("mod-messages", "children"),
          Input("mh-workspace", "data"), Input("mod-einstein", "value"), Input("mod-debye", "value"),
          Input("mod-optical", "value"), Input("mod-tmin", "value"), Input("mod-tmax", "value"),
          Input("mod-step", "value"), Input("mod-per", "value"), Input("mod-residual", "value"))
@reported(_failed)
def draw(workspace, einstein_key, debye_key, optical, t_min, t_max, step, per, residual_key):
    """The four model figures for the page's settings."""
    current = session.active(workspace)
    if current is None:
        blank = fg.message_figure("no dataset loaded")
        return blank, blank, blank, blank, []
    temperatures = budget.temperatures(t_min, t_max, step)
    warnings = [(current["name"], w) for w in cache.load(current).warnings]
    return (*figures(current, temperatures, per, einstein_key, debye_key, optical,
                     residual_key or "heat_capacity_v"), notices.warning_items(warnings))


def models_download(fmt, workspace, t_min, t_max, step, optical):
    """The result as ``modeheat models --temperatures T_MIN:T_MAX:STEP --optical-terms K --format FMT`` writes it.

    Fitted θ_E and θ_D (the command's), whatever θ the page draws; K = 1 when the page shows no composite.
    """
    from thermo.models.export import models_export
    current = session.active(workspace)
    if current is None:
        return None
    info, result = models_export(cache.load(current), budget.temperatures(t_min, t_max, step),
                                 optical_terms=int(optical or 1), fmt=fmt)
    stem = f"{exports.file_stem(current['name'])}-models"
    if fmt == "json":
        return exports.report_file(stem, info, result)
    return exports.table_file(stem, result, info, fmt)


exports.register_download("mod", [State("mh-workspace", "data"), State("mod-tmin", "value"), State("mod-tmax", "value"),
                                  State("mod-step", "value"), State("mod-optical", "value")], models_download)
c.follow_active("mod")
c.follow_image_format(*_GRAPHS)
reading.register("mod")
dash.register_page(__name__, path=PATH, name=NAME, order=ORDER, title=f"{NAME} · modeheat", layout=layout)
