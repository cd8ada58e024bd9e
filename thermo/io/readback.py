"""Reading back the tables modeheat wrote (CSV with ``# key: value`` provenance, JSON).

Used by tests, by ``modeheat polynomial --cp-table`` and by anyone checking an
export: the inverse of :func:`thermo.io.writers.export_table` for CSV and JSON.
"""

from __future__ import annotations

import io
import json
from pathlib import Path

import pandas as pd

from ..errors import DosInputError
from .inert import restored_cell

#: Tag of the JSON export format.
JSON_FORMAT_TAG = "modeheat-table"
#: Prefix of a provenance line in CSV exports.
PROVENANCE_PREFIX = "# "


def read_exported_csv(source) -> tuple[pd.DataFrame, dict]:
    r"""Read back a CSV written by :func:`export_table`.

    Parameters
    ----------
    source : str, pathlib.Path or bytes
        Path, file content, or file text (a ``str`` with a line break).

    Returns
    -------
    df : pandas.DataFrame
        The table, floats exactly as written.
    provenance : dict
        The ``# key: value`` lines, values decoded from JSON where possible.

    Raises
    ------
    DosInputError
        Unreadable file or a malformed provenance line.

    Notes
    -----
    Values are parsed with round-trip float precision.

    References
    ----------
    .. [1] Y. Shafranovich, "Common Format and MIME Type for Comma-Separated
       Values (CSV) Files", RFC 4180 (IETF, 2005).

    Examples
    --------
    >>> df, meta = read_exported_csv("# unit: THz\n# atoms: 2\nT,S\n1.0,0.5\n")
    >>> meta, df["S"].tolist()
    ({'unit': 'THz', 'atoms': 2}, [0.5])
    """
    text, name = _exported_text(source)
    lines = text.splitlines(keepends=True)
    provenance = {}
    start = 0
    for start, line in enumerate(lines):
        if not line.startswith(PROVENANCE_PREFIX):
            break
        key, sep, value = line[len(PROVENANCE_PREFIX):].rstrip("\r\n").partition(": ")
        if not sep:
            raise DosInputError("provenance line without 'key: value'", name, start + 1)
        provenance[key] = decode_value(value)
    else:
        start = len(lines)
    body = "".join(lines[start:])
    if not body.strip():
        return pd.DataFrame(), provenance
    try:
        df = pd.read_csv(io.StringIO(body))
    except Exception as exc:  # pandas parser errors come in many types
        raise DosInputError(f"not a readable CSV table ({type(exc).__name__})",
                            name, start + 1) from None
    df = df.rename(columns=restored_cell)
    for c in df.columns:
        if df[c].dtype == object or pd.api.types.is_string_dtype(df[c]):
            df[c] = df[c].map(restored_cell)
    return df, provenance



def read_exported_json(source) -> tuple[pd.DataFrame, dict]:
    r"""Read back a JSON file written by :func:`export_table`.

    Parameters
    ----------
    source : str, pathlib.Path or bytes
        JSON export as a path, raw bytes or text (text must span lines).

    Returns
    -------
    df : pandas.DataFrame
        The table; ``null`` cells become NaN.
    provenance : dict
        Provenance entries.

    Raises
    ------
    DosInputError
        Not JSON or not the layout described in this module.

    Notes
    -----
    Layout: ``{"provenance": {...}, "columns": [...], "data": [[...], ...]}``.

    References
    ----------
    .. [1] T. Bray (ed.), "The JavaScript Object Notation (JSON) Data
       Interchange Format", RFC 8259 (IETF, 2017).

    Examples
    --------
    >>> text = '{"provenance": {"unit": "THz"},\n "columns": ["T"], "data": [[1.5], [null]]}'
    >>> df, meta = read_exported_json(text)
    >>> meta, df["T"].tolist()[0]
    ({'unit': 'THz'}, 1.5)
    """
    text, name = _exported_text(source)
    try:
        obj = json.loads(text)
        columns = [str(c) for c in obj["columns"]]
        rows = [list(r) for r in obj["data"]]
        provenance = dict(obj.get("provenance", {}))
        if any(len(r) != len(columns) for r in rows):
            raise ValueError("row length")
    except Exception as exc:  # JSON and layout errors alike
        raise DosInputError(f"not a table export in JSON ({type(exc).__name__})",
                            name) from None
    df = pd.DataFrame(rows, columns=columns)
    for col in df.columns:
        if df[col].dtype == object:
            try:
                df[col] = df[col].astype(float)
            except (TypeError, ValueError):
                pass
    return df, provenance


# ----------------------------------------------------------------------------
# helpers



def decode_value(text: str):
    """A provenance value from its CSV text: JSON where it parses, else the text itself."""
    try:
        return json.loads(text)
    except ValueError:
        return text



def _exported_text(source):
    if isinstance(source, (bytes, bytearray)):
        raw, name = bytes(source), "<bytes>"
    elif isinstance(source, str) and ("\n" in source or "\r" in source):
        return source, "<text>"
    else:
        path = Path(source)
        name = path.name
        try:
            raw = path.read_bytes()
        except OSError as exc:
            raise DosInputError(f"cannot read file: {exc.strerror or exc}", name) from None
    try:
        return raw.decode("utf-8-sig"), name
    except UnicodeDecodeError:
        raise DosInputError("not UTF-8 text", name) from None
