"""The active dataset's reading options as one panel: formula, atoms per formula unit, frequency unit.

Every page that needs them (values per gram, molar masses, atom counts) shows the same panel
(:func:`panel` in its layout, :func:`register` once per page prefix).  A change re-reads the
active dataset with the new options (:func:`webapp.intake.with_options`) and is kept in the
workspace, so all pages — and a download — use it; the Spectrum page shows the same options.
"""

from __future__ import annotations

from dash import Input, Output, State, callback, html, no_update

from . import components as c
from . import intake, session
from .reporting import reported


def panel(prefix):
    """The reading-options panel, ids ``<prefix>-rd-*``."""
    return html.Details([
        html.Summary(html.Span(id=f"{prefix}-rd-summary"), className="mh-reading-summary"),
        c.controls(c.text(f"{prefix}-rd-formula", "", "Formula", placeholder="e.g. MgO",
                          hint="values per gram, molar mass"),
                   c.number(f"{prefix}-rd-atoms", None, "Atoms per formula unit", step=1, min_value=1,
                            hint="blank: from the DOS integral"),
                   html.Span(id=f"{prefix}-rd-note", className="mh-hint", role="status"))],
        className="mh-reading", id=f"{prefix}-rd", open=False)


def summary(dataset):
    """One line naming the dataset's unit, atom count and formula as it was read.

    Examples
    --------
    >>> summary(None)
    'Reading options: no dataset loaded'
    """
    if dataset is None:
        return "Reading options: no dataset loaded"
    from . import cache
    dos = cache.load(dataset)
    options = session.options_of(dataset)
    unit = dos.source.get("freq_unit") or options.get("freq_unit") or "?"
    inferred = " (from the DOS integral)" if not options.get("atoms") else ""
    formula = options.get("formula") or "not given"
    return (f"Reading options of {dataset['name']}: frequency unit {unit}, {dos.atoms} atoms per formula "
            f"unit{inferred}, formula {formula}")


def formula_of(workspace, typed=None):
    """The formula a page uses: the one typed in its own field, else the active dataset's (from this panel).

    Examples
    --------
    >>> formula_of(None, " MgO ")
    'MgO'
    >>> formula_of(None, "") is None
    True
    """
    typed = " ".join(str(typed or "").split())
    if typed:
        return typed
    current = session.active(workspace)
    return (session.options_of(current).get("formula") or None) if current else None


def edited(workspace, formula, atoms):
    """``(workspace, note)`` after the panel changed: the active dataset re-read with the formula and atom count
    (unchanged and no note when they equal its options; the old workspace and the reason when they do not load)."""
    current = session.active(workspace)
    if current is None:
        return workspace, None
    options = session.options_of(current)
    wanted = {"formula": " ".join(str(formula or "").split()), "atoms": int(atoms) if atoms not in (None, "") else None}
    if (options.get("formula") or "") == wanted["formula"] and options.get("atoms") == wanted["atoms"]:
        return workspace, None
    new, error = intake.with_options(workspace, current["id"], wanted)
    if error:
        return workspace, error
    return new, f"{current['name']} re-read with formula {wanted['formula'] or 'none'}, atoms " \
                f"{wanted['atoms'] or 'from the integral'}"


def register(prefix):
    """Register the panel's callbacks for page ``prefix`` (fill from the workspace; apply a change)."""
    @callback(Output(f"{prefix}-rd-summary", "children"), Output(f"{prefix}-rd-formula", "value"),
              Output(f"{prefix}-rd-atoms", "value"), Input("mh-workspace", "data"))
    @reported(lambda message: (message, no_update, no_update))
    def fill(workspace):
        current = session.active(workspace)
        options = session.options_of(current) if current else {}
        return summary(current), options.get("formula") or "", options.get("atoms")

    @callback(Output("mh-workspace", "data", allow_duplicate=True), Output("mh-saved", "data", allow_duplicate=True),
              Output(f"{prefix}-rd-note", "children"), Input(f"{prefix}-rd-formula", "value"),
              Input(f"{prefix}-rd-atoms", "value"), State("mh-workspace", "data"), State("mh-config", "data"),
              prevent_initial_call=True)
    @reported(lambda message: (no_update, no_update, message))
    def apply(formula, atoms, workspace, config):
        new, note = edited(workspace, formula, atoms)
        if new is workspace:
            return no_update, no_update, note if note else no_update
        new = session.revised(new)
        kept, _ = session.persistable(new, (config or {}).get("saved_limit_chars", session.SAVED_LIMIT_CHARS))
        return new, kept, note
    return fill, apply
