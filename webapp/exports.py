"""Downloads of every page that shows a result: one bar (format + button) and one way to build the file.

A page adds :func:`download_bar` to its layout and registers :func:`register_download`
with a ``build(fmt, *states)`` that returns ``(file name, bytes)`` made by
:func:`table_file` or :func:`report_file` from the same :mod:`thermo` functions the
matching command uses, with the one provenance record (:mod:`thermo.provenance`)
and the command line's default digits, so a download equals the command's output.
"""

from __future__ import annotations

import re

from dash import Input, Output, State, callback, dcc, html, no_update

from thermo.io.writers import DEFAULT_DIGITS, export_table, report_text

from . import components as c
from .reporting import reported

#: Labels of the download formats.
FORMAT_LABELS = {"csv": "CSV", "xlsx": "Excel (XLSX)", "json": "JSON"}


def download_bar(prefix, what, formats=("csv", "xlsx", "json"), value=None):
    """Format choice, a "Download …" button, the download and a note, ids ``<prefix>-dl-*``."""
    options = [{"label": FORMAT_LABELS[f], "value": f} for f in formats]
    return html.Div([c.radio(f"{prefix}-dl-format", options, value or formats[0], "File"),
                     html.Button(f"Download {what}", id=f"{prefix}-dl-btn", n_clicks=0,
                                 className="mh-button mh-primary"),
                     dcc.Download(id=f"{prefix}-dl"),
                     html.Span(id=f"{prefix}-dl-note", className="mh-hint", role="status")],
                    className="mh-inline mh-download")


def register_download(prefix, states, build):
    """Register the callback of a :func:`download_bar`: ``build(fmt, *state values) -> (name, bytes)``.

    An error is shown as one line in the bar's note.
    """
    def failed(message):
        return no_update, message

    @callback(Output(f"{prefix}-dl", "data"), Output(f"{prefix}-dl-note", "children"),
              Input(f"{prefix}-dl-btn", "n_clicks"), State(f"{prefix}-dl-format", "value"), *states,
              prevent_initial_call=True)
    @reported(failed)
    def download(_clicks, fmt, *values):
        made = build(fmt, *values)
        if made is None:
            return no_update, "nothing to download: no result shown"
        name, content = made
        return dcc.send_bytes(content, name), f"prepared {name}"
    return download


def file_stem(name, default="result"):
    """A file-name stem from a dataset or file name (extension and unsafe characters removed).

    Examples
    --------
    >>> file_stem("runs/mesh 8.dat")
    'mesh_8'
    """
    stem = str(name or "").replace("\\", "/").rsplit("/", 1)[-1].rsplit(".", 1)[0]
    return re.sub(r"[^A-Za-z0-9_.-]+", "_", stem).strip("._") or default


def table_file(stem, table, info, fmt, digits=DEFAULT_DIGITS):
    """``(name, bytes)`` of a table export (:func:`thermo.io.writers.export_table`, the CLI's default digits)."""
    return f"{stem}.{fmt}", export_table(table, info, fmt, digits=digits)


def report_file(stem, info, report, digits=None):
    """``(name, bytes)`` of a JSON report (:func:`thermo.io.writers.report_text`, as the CLI writes it)."""
    return f"{stem}.json", report_text(info, report, digits).encode("utf-8")
