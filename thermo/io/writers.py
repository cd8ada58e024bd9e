r"""Export a thermodynamic table with its provenance (CSV, JSON, .xlsx).

Layouts
-------
CSV
    Provenance first, one ``# key: value`` line per entry (strings as they
    are, other values as JSON), then an ordinary CSV header and rows.  Floats
    are written with their shortest exact representation (``repr``), so they
    read back bit for bit; missing values are empty cells.
JSON
    One object ``{"format": "modeheat-table", "version": 1,
    "provenance": {...}, "columns": [name, ...], "data": [[row], ...]}``
    with rows in column order; NaN and infinities become ``null``.
XLSX
    Sheet ``table`` with header and rows, sheet ``provenance`` with
    ``key`` / ``value`` rows (lists and dicts as JSON text).

Exports are inert
-----------------
Text from users (dataset and file names, column headers, labels) never
becomes a spreadsheet formula, following OWASP's CSV-injection guidance [3]:

* XLSX: every text is written as a text cell (never a formula cell);
* CSV table cells and headers that are text and start with ``=``, ``+``,
  ``-``, ``@``, tab or carriage return get a leading ``'``
  (:func:`neutralised_cell`); :func:`thermo.io.readback.read_exported_csv` removes it again;
* CSV provenance lines: a ``,`` or ``;`` followed by a formula character
  is written as a JSON escape (``\u002c``, ``\u003b``; the value is then
  JSON), so no cell a spreadsheet splits off a ``# key: value`` line starts
  like a formula.

.. [3] OWASP Foundation, "CSV Injection",
   https://owasp.org/www-community/attacks/CSV_Injection (accessed 2026).

Every error is a one-line :class:`thermo.errors.OptionError` (bad format,
refused overwrite, unwritable path) or :class:`thermo.errors.DosInputError`
(unreadable export on reading back).
"""

from __future__ import annotations

import csv
import io
import json
import math
from pathlib import Path

import numpy as np
import pandas as pd

from ..errors import OptionError
from .floattext import rounded_csv_rows, rounded_floats
from .inert import FORMULA_PREFIXES, _RISKY_SPLIT, append_inert, inert_json, neutralised_cell, restored_cell, write_file

__all__ = ["EXPORT_FORMATS", "FORMULA_PREFIXES", "export_table", "neutralised_cell", "report_text", "restored_cell", "rounded_report", "write_file",
           "write_table"]

#: Significant digits the command line and the dashboard write by default: the
#: quadrature and low-frequency treatment support about 1e-5 relative at worst,
#: so 8 digits lose nothing and stay readable.
DEFAULT_DIGITS = 8
#: Export formats accepted by :func:`export_table` and :func:`write_table`.
EXPORT_FORMATS = ("csv", "json", "xlsx")

from .readback import JSON_FORMAT_TAG as _JSON_FORMAT_TAG
from .readback import PROVENANCE_PREFIX as _PROVENANCE_PREFIX
from .readback import decode_value as _decode_value


def _check_digits(digits):
    if not isinstance(digits, int) or isinstance(digits, bool) or not 1 <= digits <= 17:
        raise OptionError(f"significant digits must be a whole number from 1 to 17, not {digits!r}")


def _rounded(df, digits):
    """Copy of ``df`` with floats rounded to ``digits`` significant digits (None: unchanged)."""
    if digits is None:
        return df
    _check_digits(digits)
    if len(df.columns) and all(dtype == np.float64 for dtype in df.dtypes):   # tables: one block at once
        out = pd.DataFrame(rounded_floats(df.to_numpy(dtype=float), digits), columns=df.columns, index=df.index)
        out.attrs.update(df.attrs)
        return out
    out = df.copy()
    for name in out.columns:
        if pd.api.types.is_float_dtype(out[name]):
            out[name] = rounded_floats(out[name].to_numpy(dtype=float), digits)
    return out


def rounded_report(value, digits=None):
    """A JSON report (dicts, lists, numbers) with every float rounded to ``digits`` significant digits.

    Parameters
    ----------
    value : dict, list, float or any JSON-able value
        The report.
    digits : int, optional
        Significant digits from 1 to 17 (None: unchanged).  Integers,
        booleans, texts and None are kept as they are.

    Returns
    -------
    The same structure with rounded floats.

    Examples
    --------
    >>> rounded_report({"theta_K": [412.345678912, 3], "name": "x"}, 4)
    {'theta_K': [412.3, 3], 'name': 'x'}
    """
    if digits is None:
        return value
    _check_digits(digits)
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float):
        return float(f"{value:.{digits}g}") if math.isfinite(value) else value
    if isinstance(value, dict):
        return {k: rounded_report(v, digits) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [rounded_report(v, digits) for v in value]
    return value


def report_text(provenance, report, digits=None, ensure_ascii=True, allow_nan=False) -> str:
    """A JSON report as written by the command line and the dashboard: ``{"provenance": ..., **report}``.

    Parameters
    ----------
    provenance : dict or None
        The record of :func:`thermo.provenance.provenance_record` (never rounded); None: no key.
    report : dict
        The result; its floats rounded to ``digits`` significant digits (:func:`rounded_report`).
    digits : int, optional
        None: all digits.
    ensure_ascii, allow_nan : bool
        As :func:`json.dumps`.

    Returns
    -------
    str
        Indented JSON text ending in a newline.

    Examples
    --------
    >>> json.loads(report_text(None, {"theta_K": 412.3456}, digits=3))
    {'theta_K': 412.0}
    """
    body = rounded_report(dict(report), digits)
    record = body if provenance is None else {"provenance": provenance, **body}
    return json.dumps(record, indent=2, allow_nan=allow_nan, ensure_ascii=ensure_ascii) + "\n"


def export_table(df: pd.DataFrame, provenance: dict, fmt: str, digits: int | None = None) -> bytes:
    """Serialise a table and its provenance.

    Parameters
    ----------
    df : pandas.DataFrame
        Thermodynamic table (column names carry the units, e.g.
        ``entropy_J_per_mol_K``).
    provenance : dict
        Simple JSON-able values (str, int, float, bool, None, lists/dicts of
        them): tool version, input name and SHA-256, unit, settings, ...
    fmt : str
        One of :data:`EXPORT_FORMATS` (case-insensitive, leading dot allowed).
    digits : int, optional
        Round every float to this many significant digits (1–17) and record
        ``significant_digits`` in the provenance; None writes full precision.

    Returns
    -------
    bytes
        File content (UTF-8 text for csv/json, a zip workbook for xlsx).

    Raises
    ------
    OptionError
        Unknown format or a provenance key that cannot be written.

    Notes
    -----
    CSV floats use Python's shortest round-trip ``repr`` [1], so
    ``float(text) == value`` exactly; JSON follows RFC 8259 [2] (no NaN, so
    non-finite values are ``null``).

    References
    ----------
    .. [1] D. M. Gay, "Correctly rounded binary-decimal and decimal-binary
       conversions", AT&T Bell Laboratories Numerical Analysis Manuscript
       90-10 (1990).
    .. [2] T. Bray (ed.), "The JavaScript Object Notation (JSON) Data
       Interchange Format", RFC 8259 (IETF, 2017).

    Examples
    --------
    >>> df = pd.DataFrame({"temperature_K": [0.0, 300.0], "entropy_J_per_mol_K": [0.0, 1 / 3]})
    >>> print(export_table(df, {"input": "demo.dat", "atoms": 2}, "csv").decode())
    # input: demo.dat
    # atoms: 2
    temperature_K,entropy_J_per_mol_K
    0.0,0.0
    300.0,0.3333333333333333
    <BLANKLINE>
    """
    kind = _format_name(fmt)
    if not isinstance(df, pd.DataFrame):
        raise OptionError(f"export needs a pandas DataFrame, got {type(df).__name__}")
    meta = _plain_provenance(provenance)
    if digits is not None:
        if kind == "csv" and _all_float(df):          # rounded and written in one pass, the same text
            _check_digits(digits)
            meta["significant_digits"] = digits
            return _csv_bytes(df, meta, digits)
        df = _rounded(df, digits)
        meta["significant_digits"] = digits
    if kind == "csv":
        return _csv_bytes(df, meta)
    if kind == "json":
        return _json_bytes(df, meta)
    return _xlsx_bytes(df, meta)


def write_table(df: pd.DataFrame, provenance: dict, fmt: str | None, path,
                overwrite: bool = False, digits: int | None = None) -> Path:
    """Write :func:`export_table` output to a file.

    Parameters
    ----------
    df : pandas.DataFrame
        Thermodynamic table.
    provenance : dict
        See :func:`export_table`.
    fmt : str or None
        Export format; None takes it from the file suffix.
    path : str or pathlib.Path
        Destination file.
    overwrite : bool, optional
        Replace an existing file; by default an existing file is an error.
    digits : int, optional
        Significant digits (see :func:`export_table`).

    Returns
    -------
    pathlib.Path
        The path written.

    Raises
    ------
    OptionError
        Unknown format, existing file without ``overwrite=True``, or a path
        that cannot be written.

    Notes
    -----
    Without ``overwrite`` the file is opened in exclusive-create mode, so a
    file appearing between check and write is not replaced either.

    References
    ----------
    .. [1] IEEE Std 1003.1-2017 (POSIX), ``open()`` with ``O_CREAT | O_EXCL``.

    Examples
    --------
    >>> import tempfile
    >>> from thermo.io.readback import read_exported_json
    >>> df = pd.DataFrame({"temperature_K": [300.0]})
    >>> with tempfile.TemporaryDirectory() as tmp:
    ...     out = write_table(df, {}, None, Path(tmp) / "t.json")
    ...     read_exported_json(out)[0]["temperature_K"].tolist()
    [300.0]
    """
    target = Path(path)
    content = export_table(df, provenance, fmt if fmt is not None else format_from_suffix(target),
                           digits=digits)
    return write_file(target, content, overwrite)


def format_from_suffix(path, fmt=None) -> str:
    """Export format of ``path`` from its suffix, checked against an explicit ``fmt``.

    Raises
    ------
    OptionError
        The suffix names another known format than ``fmt``, or it names none
        and ``fmt`` is not given.

    Examples
    --------
    >>> format_from_suffix("out/t.xlsx"), format_from_suffix("t.txt", "csv")
    ('xlsx', 'csv')
    """
    suffix = Path(path).suffix.lower().lstrip(".")
    if fmt is not None:
        kind = _format_name(fmt)
        if suffix in EXPORT_FORMATS and suffix != kind:
            raise OptionError(f"the output {Path(path).name} ends in .{suffix} but the format is {kind}; "
                              "make them agree")
        return kind
    if suffix not in EXPORT_FORMATS:
        raise OptionError(f"cannot tell the format of {Path(path).name} from its suffix; "
                          f"end it in {', '.join('.' + f for f in EXPORT_FORMATS)} or give the format")
    return suffix


def _format_name(fmt) -> str:
    kind = str(fmt).strip().lower().lstrip(".")
    if kind not in EXPORT_FORMATS:
        raise OptionError(
            f"unknown export format {fmt!r}; choose one of {', '.join(EXPORT_FORMATS)}")
    return kind


def plain_value(value):
    """JSON-able Python value: numpy scalars/arrays unwrapped, non-finite -> None."""
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, np.ndarray):
        value = value.tolist()
    if isinstance(value, float) and not math.isfinite(value):
        return None
    if isinstance(value, dict):
        return {str(k): plain_value(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [plain_value(v) for v in value]
    if value is None or isinstance(value, (str, bool, int, float)):
        return value
    return str(value)


def _plain_provenance(provenance) -> dict:
    meta = {}
    for key, value in dict(provenance or {}).items():
        key = str(key)
        if not key or ": " in key or key != " ".join(key.split()):
            raise OptionError(f"provenance key {key!r} must be one line without ': '")
        meta[key] = plain_value(value)
    return meta


def _encode_value(value) -> str:
    """Text of a provenance value on a CSV ``# key: value`` line (no cell separator in it)."""
    if isinstance(value, str) and value == " ".join(value.split()) and not _RISKY_SPLIT.search(value):
        if _decode_value(value) == value:
            return value
    return inert_json(value)


def _all_float(df):
    """An all-float64 table without a carriage return in a name: written by :func:`_float_csv`."""
    return bool(len(df.columns)) and all(dtype == np.float64 for dtype in df.dtypes) \
        and not any("\r" in str(c) for c in df.columns)


def _csv_bytes(df, meta, digits=None) -> bytes:
    head = "".join(f"{_PROVENANCE_PREFIX}{_inert_key(k)}: {_encode_value(v)}\n" for k, v in meta.items())
    if _all_float(df):
        return (head + _float_csv(df, digits)).encode("utf-8")
    safe = df.rename(columns=lambda c: neutralised_cell(str(c)))
    text_columns = [c for c in safe.columns if safe[c].dtype == object or pd.api.types.is_string_dtype(safe[c])]
    if text_columns:
        safe = safe.copy()
        for c in text_columns:
            safe[c] = safe[c].map(neutralised_cell)
    # a carriage return inside text is not quoted by the minimal rule (rows end in \n): quote all text then
    has_cr = any("\r" in str(c) for c in safe.columns) or any(
        safe[c].map(lambda v: isinstance(v, str) and "\r" in v).any() for c in text_columns)
    body = safe.to_csv(index=False, lineterminator="\n", quoting=csv.QUOTE_NONNUMERIC if has_cr else csv.QUOTE_MINIMAL)
    return (head + body).encode("utf-8")


def _float_csv(df, digits=None) -> str:
    """CSV text of an all-float table, as ``DataFrame.to_csv`` writes it (shortest repr, NaN empty), faster;
    with ``digits``, that of the table rounded by :func:`_rounded` (:func:`~.floattext.rounded_csv_rows`)."""
    buffer = io.StringIO()
    csv.writer(buffer, lineterminator="\n").writerow([neutralised_cell(str(c)) for c in df.columns])
    if digits is not None:
        return buffer.getvalue() + rounded_csv_rows(df.to_numpy(dtype=float), digits)
    rows = df.to_numpy(dtype=float).tolist()
    lines = [",".join(["" if v != v else repr(v) for v in row]) for row in rows]
    return buffer.getvalue() + "".join((line or '""') + "\n" for line in lines)   # '""': not a blank line


def _inert_key(key: str) -> str:
    return key.replace(",", " ").replace(";", " ")


def _rows(df):
    return [[plain_value(v) for v in row] for row in df.itertuples(index=False, name=None)]


def _json_bytes(df, meta) -> bytes:
    head = json.dumps({"format": _JSON_FORMAT_TAG, "version": 1, "provenance": meta,
                       "columns": [str(c) for c in df.columns]},
                      indent=1, ensure_ascii=False, allow_nan=False)
    rows = ",\n  ".join(json.dumps(r, allow_nan=False) for r in _rows(df))
    data = f"[\n  {rows}\n ]" if rows else "[]"
    text = head[:-2] + f',\n "data": {data}\n}}\n'   # head ends with "\n}"
    return text.encode("utf-8")


def _xlsx_bytes(df, meta) -> bytes:
    import openpyxl

    book = openpyxl.Workbook()
    table = book.active
    table.title = "table"
    append_inert(table, [str(c) for c in df.columns])
    for row in _rows(df):
        append_inert(table, row)
    sheet = book.create_sheet("provenance")
    sheet.append(["key", "value"])
    for key, value in meta.items():
        cell = json.dumps(value, ensure_ascii=False) if isinstance(value, (list, dict)) \
            else value
        append_inert(sheet, [key, cell])
    out = io.BytesIO()
    book.save(out)
    return out.getvalue()
