"""Models page: the DOS result against Einstein, Debye and composite models, and every θ."""

from __future__ import annotations

import numpy as np
import plotly.graph_objects as go
from dash import Input, Output, State, html

from .. import components as c
from .. import state

WORKSPACE = "mod-workspace"
PATH = "/models"
NAME = "Models"
RESIDUAL_CHOICES = [{"label": "C_v", "value": 1}, {"label": "S", "value": 2}, {"label": "U", "value": 3},
                    {"label": "F", "value": 4}]
_GRAPHS = ("mod-values-graph", "mod-residual-graph", "mod-lowt-graph", "mod-thetad-graph")


def thetas(dataset):
    """Every θ definition of the dataset (cached), as dicts of :func:`thermo.models.theta_definitions`."""
    from thermo import models
    return state.derived("thetas", dataset, models.theta_definitions)


def theta_options(dataset, prefix):
    """Dropdown options of the defined θ whose key starts with ``prefix``."""
    return [{"label": f"{_short(t['key'])} = {t['value_K']:.4g} K", "value": t["key"]}
            for t in thetas(dataset) if t["key"].startswith(prefix) and t["value_K"] is not None]


def _short(key):
    return key.removesuffix("_K").replace("_", " ")


def _theta(dataset, key):
    for t in thetas(dataset):
        if t["key"] == key and t["value_K"] is not None:
            return float(t["value_K"])
    return None


def model_tables(dataset, temperatures, per, einstein_key, debye_key, optical_terms):
    """``{label: DataFrame}`` of the DOS result and each chosen model, same columns."""
    from thermo import models
    dos = state.load(dataset)
    formula = dataset.get("options", {}).get("formula") or None
    extra = {"atoms": dos.atoms, "formula": formula if per == "gram" else None}
    modes = 3 * dos.atoms
    tables = {"DOS": state.table(dataset, temperatures, per)}
    theta_e, theta_d = _theta(dataset, einstein_key), _theta(dataset, debye_key)
    if theta_e is not None:
        tables[f"Einstein θ_E = {theta_e:.4g} K"] = models.einstein_table(theta_e, modes, temperatures,
                                                                          per=per, **extra)
    if theta_d is not None:
        tables[f"Debye θ_D = {theta_d:.4g} K"] = models.debye_table(theta_d, modes, temperatures,
                                                                    per=per, **extra)
    if optical_terms:
        composite = state.derived("composite", dataset,
                                  lambda d: models.composite_model(d, optical_terms=int(optical_terms)),
                                  int(optical_terms))
        tables[f"Debye + {int(optical_terms)} Einstein"] = models.composite_table(composite, temperatures, per=per, **extra)
    return tables


def figures(dataset, temperatures, per, einstein_key, debye_key, optical_terms, residual_index):
    from thermo import models
    tables = model_tables(dataset, temperatures, per, einstein_key, debye_key, optical_terms)
    dos_table = tables["DOS"]
    cols = list(dos_table.columns)
    values = c.figure("temperature T [K]", state.COLUMN_LABELS[cols[1]])
    residual = c.figure("temperature T [K]",
                        f"model − DOS: {state.COLUMN_LABELS[cols[residual_index]]}")
    for k, (label, df) in enumerate(tables.items()):
        style = {"width": 3 if label == "DOS" else 2, "color": c.PALETTE[k % len(c.PALETTE)],
                 "dash": None if label == "DOS" else ("dash", "dot", "dashdot")[k % 3]}
        values.add_trace(go.Scatter(x=df[cols[0]], y=df[cols[1]], name=label, mode="lines", line=style,
                                    hovertemplate="%{y:.5g}"))
        if label != "DOS":
            res = models.residual_table(dos_table, df)
            residual.add_trace(go.Scatter(x=res[cols[0]], y=res[res.columns[residual_index]], name=label,
                                          mode="lines", line=style, hovertemplate="%{y:.3g}"))
    residual.add_hline(y=0, line_color="#9aa7b0")

    low_t = np.geomspace(1.0, max(2.0, min(float(np.max(temperatures)), 300.0)), 120)
    formula_tables = model_tables(dataset, low_t, "formula", einstein_key, debye_key, optical_terms)
    ratio = models.cv_over_t3(formula_tables)
    lowt = c.figure("temperature T [K]", "C_v/T³ [J/(mol·K⁴)]")
    for k, name in enumerate(ratio.columns[1:]):
        lowt.add_trace(go.Scatter(x=ratio["temperature_K"], y=ratio[name], name=name, mode="lines",
                                  line={"width": 2, "color": c.PALETTE[k % len(c.PALETTE)]},
                                  hovertemplate="%{y:.4g}"))
    lowt.update_xaxes(type="log")

    grid = np.asarray(temperatures, dtype=float)
    grid = grid[grid > 0]
    theta_t = state.derived("theta_of_t", dataset,
                            lambda d: models.equivalent_debye_temperature(d, grid), grid.tobytes())
    thetad = c.figure("temperature T [K]", "equivalent Debye temperature θ_D(T) [K]")
    thetad.add_trace(go.Scatter(x=grid, y=theta_t, mode="lines", name="θ_D(T) from the DOS C_v",
                                line={"width": 2.2, "color": c.PALETTE[0]}, hovertemplate="%{y:.4g} K"))
    return values, residual, lowt, thetad


def theta_table(dataset):
    rows = []
    for t in thetas(dataset):
        value = "undefined" if t["value_K"] is None else f"{t['value_K']:.5g}"
        unc = "—" if t.get("uncertainty_K") in (None, 0) else f"± {t['uncertainty_K']:.2g}"
        rng = t.get("fit_range_K")
        rows.append(html.Tr([html.Td(_short(t["key"])), html.Td(value), html.Td(unc),
                             html.Td("—" if not rng else f"{rng[0]:.4g}–{rng[1]:.4g} K"),
                             html.Td(t.get("definition", "")), html.Td(t.get("reference", ""), className="mh-ref")]))
    head = html.Tr([html.Th(h) for h in ("θ", "value [K]", "uncertainty [K]", "fit range", "definition",
                                         "reference")])
    return html.Table([html.Thead(head), html.Tbody(rows)], className="mh-table mh-theta-table")


def layout(workspace, prefs=None):
    current = state.active(workspace)
    return c.page(
        "Models", "How well do an Einstein, a Debye or a composite model describe the DOS result? "
                  "Each θ definition gives a different model; pick one and look at the residuals.",
        c.active_note(current),
        c.controls(c.dropdown("mod-einstein", [], None, "Einstein θ_E", clearable=True),
                   c.dropdown("mod-debye", [], None, "Debye θ_D", clearable=True),
                   c.radio("mod-optical", [{"label": "none", "value": 0}, {"label": "1", "value": 1},
                                           {"label": "2", "value": 2}], 1, "Composite: Einstein terms")),
        c.controls(*c.temperature_fields("mod", 0, 800, 5), c.basis_field("mod-per"),
                   c.radio("mod-residual", RESIDUAL_CHOICES, 1, "Residual of")),
        c.messages_panel("mod-messages"),
        html.Div([c.graph("mod-values-graph", "Heat capacity: DOS result and models"),
                  c.graph("mod-residual-graph", "Residuals: model minus DOS result"),
                  c.graph("mod-lowt-graph", "Low-temperature check: C_v/T³ (flat for a Debye solid)"),
                  c.graph("mod-thetad-graph", "Equivalent Debye temperature versus T")], className="mh-grid"),
        html.H2("Characteristic temperatures"),
        html.Div(id="mod-theta-table"),
    )


def choices(workspace, einstein_key, debye_key):
    current = state.active(workspace)
    if current is None:
        return [], None, [], None, c.no_data_note()
    try:
        e_opts, d_opts = theta_options(current, "einstein"), theta_options(current, "debye")
    except Exception as exc:  # message, nothing raised
        return [], None, [], None, c.message_items([("error", state.one_line(exc))])
    pick = (lambda opts, key: key if key in [o["value"] for o in opts]
            else (opts[0]["value"] if opts else None))
    return e_opts, pick(e_opts, einstein_key), d_opts, pick(d_opts, debye_key), theta_table(current)


def draw(workspace, einstein_key, debye_key, optical, t_min, t_max, step, per, residual_index):
    current = state.active(workspace)
    if current is None:
        blank = c.message_figure("no dataset loaded")
        return blank, blank, blank, blank, []
    try:
        temperatures = state.temperature_grid(t_min, t_max, step)
        return (*figures(current, temperatures, per, einstein_key, debye_key, optical,
                         int(residual_index or 1)), [])
    except Exception as exc:  # message, nothing raised
        blank = c.message_figure("nothing to show for these settings")
        return blank, blank, blank, blank, c.message_items([("error", state.one_line(exc))])


def register(app):
    app.callback(Output("mod-einstein", "options"), Output("mod-einstein", "value"),
                  Output("mod-debye", "options"), Output("mod-debye", "value"),
                  Output("mod-theta-table", "children"),
                  Input(WORKSPACE, "data"), State("mod-einstein", "value"), State("mod-debye", "value"))(choices)
    app.callback(*[Output(g, "figure") for g in _GRAPHS], Output("mod-messages", "children"),
                  Input(WORKSPACE, "data"), Input("mod-einstein", "value"), Input("mod-debye", "value"),
                  Input("mod-optical", "value"), Input("mod-tmin", "value"), Input("mod-tmax", "value"),
                  Input("mod-step", "value"), Input("mod-per", "value"), Input("mod-residual", "value"))(draw)
