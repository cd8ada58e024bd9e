"""Per-request budgets of the dashboard, from the server's settings only (environment, never the browser).

Every setting is read once by :func:`configure` into the Flask config
(``MODEHEAT_*`` keys) and documented in ``docs/limits.md``:

``MODEHEAT_MAX_TEMPERATURES``
    temperatures one page request may ask for (default 20,000; the command
    line allows :data:`thermo.temperatures.MAX_TEMPERATURES`);
``MODEHEAT_MAX_QHA_TEMPERATURES``
    temperatures of one Quasi-harmonic page request (default 2,000: each
    carries an equation-of-state fit per volume left out for its error);
``MODEHEAT_MAX_ELECTRONIC_WORK``
    electronic-DOS points × temperatures one Electronic page request
    evaluates (:func:`thermo.electronic.segments.window_work`; default
    5,000,000, about 5 s);
``MODEHEAT_MAX_INFLIGHT_MB``
    decoded upload bytes a worker process holds at once, summed over its
    threads (default three files at the upload limit); a request over it is
    refused with "busy, try again" instead of growing the process;
``MODEHEAT_MAX_JSON_DEPTH`` / ``MODEHEAT_MAX_JSON_CONTAINERS``
    nesting depth and number of objects and arrays of a JSON request body
    (defaults 64 and 200,000), checked on the raw bytes before the body is
    parsed: a deeper or larger body gets HTTP 400 and one line.

The request body size itself is Flask's ``MAX_CONTENT_LENGTH`` (HTTP 413),
set from the upload limit by :func:`webapp.shell.configure`.
"""

from __future__ import annotations

import os
import threading
from contextlib import contextmanager

import numpy as np

from thermo.errors import ModeheatError, OptionError
from thermo.temperatures import parse_temperatures, temperature_range

#: Defaults of the settings (environment variable → value).
DEFAULTS = {"MODEHEAT_MAX_TEMPERATURES": 20_000, "MODEHEAT_MAX_QHA_TEMPERATURES": 2_000,
            "MODEHEAT_MAX_ELECTRONIC_WORK": 5_000_000,
            "MODEHEAT_MAX_JSON_DEPTH": 64, "MODEHEAT_MAX_JSON_CONTAINERS": 200_000, "MODEHEAT_MAX_INFLIGHT_MB": None}
#: Files at the upload limit a worker decodes at once when ``MODEHEAT_MAX_INFLIGHT_MB`` is not set.
INFLIGHT_FILES = 3
_SCAN_BLOCK = 1 << 22


class Busy(ModeheatError):
    """The worker holds as many decoded bytes as its budget allows; the request may be repeated."""


def configure(config, max_upload_bytes):
    """Read the budget settings from the environment into ``config`` (a Flask config mapping)."""
    for name, default in DEFAULTS.items():
        raw = os.environ.get(name)
        if name == "MODEHEAT_MAX_INFLIGHT_MB":
            value = float(raw) * 1e6 if raw else INFLIGHT_FILES * max_upload_bytes
            config["MODEHEAT_MAX_INFLIGHT_BYTES"] = int(value)
            continue
        value = int(float(raw)) if raw else default
        if not value > 0:
            raise ValueError(f"{name} must be > 0, not {raw!r}")
        config[name] = value


def setting(name):
    """A budget setting of the running server (the configured app's, outside a request too)."""
    import dash
    import flask
    if flask.has_app_context():
        return flask.current_app.config[name]
    return dash.get_app().server.config[name]


def checked_count(values, what="temperatures", name="MODEHEAT_MAX_TEMPERATURES"):
    """``values`` when they hold at most the setting ``name`` points, else a one-line OptionError."""
    limit = setting(name)
    if np.size(values) > limit:
        raise OptionError(f"{np.size(values):,} {what} asked for; this page computes at most {limit:,} "
                          f"(server setting {name}; the command line allows more)")
    return values


def checked_work(work, what, name="MODEHEAT_MAX_ELECTRONIC_WORK"):
    """Refuse (one-line OptionError) a request whose ``work`` (points × temperatures) exceeds the setting ``name``."""
    limit = setting(name)
    if work > limit:
        raise OptionError(f"{what}: {work:,} DOS points × temperatures asked for; this page computes at most "
                          f"{limit:,} (server setting {name}): fewer or lower temperatures, a coarser DOS, "
                          "or the command line")
    return work


def temperatures(t_min, t_max, step, name="MODEHEAT_MAX_TEMPERATURES"):
    """:func:`thermo.temperatures.temperature_range` within the page budget (the setting ``name``)."""
    return checked_count(temperature_range(t_min, t_max, step), name=name)


def parsed_temperatures(spec):
    """:func:`thermo.temperatures.parse_temperatures` within the page budget."""
    return checked_count(parse_temperatures(spec))


_INFLIGHT = {"bytes": 0}
_INFLIGHT_LOCK = threading.Lock()


def inflight_bytes() -> int:
    """Decoded upload bytes this process holds now (requests under :func:`holding`)."""
    return _INFLIGHT["bytes"]


@contextmanager
def holding(size, name="the upload"):
    """Reserve ``size`` decoded bytes [bytes] of this worker's budget while the block runs (:class:`Busy` if full)."""
    limit = setting("MODEHEAT_MAX_INFLIGHT_BYTES")
    size = int(size)
    with _INFLIGHT_LOCK:
        if _INFLIGHT["bytes"] and _INFLIGHT["bytes"] + size > limit:
            raise Busy(f"{name}: the server is reading {_INFLIGHT['bytes'] / 1e6:.0f} MB of other uploads "
                       f"(at most {limit / 1e6:g} MB at once); try again in a moment")
        _INFLIGHT["bytes"] += size
    try:
        yield
    finally:
        with _INFLIGHT_LOCK:
            _INFLIGHT["bytes"] -= size


def json_shape(raw: bytes):
    """(largest nesting depth, number of objects and arrays) of a JSON text, from its bytes alone.

    Brackets inside strings are counted as well, so both numbers are upper
    bounds (a file's ``[THz]`` opens and closes again); the scan is linear
    and holds one block of the body at a time.

    Examples
    --------
    >>> json_shape(b'{"a": [1, {"b": []}], "c": "x"}')
    (4, 4)
    """
    buf = np.frombuffer(raw, dtype=np.uint8)
    depth = deepest = count = 0
    for start in range(0, buf.size, _SCAN_BLOCK):
        block = buf[start:start + _SCAN_BLOCK]
        opens = (block == 0x7B) | (block == 0x5B)
        step = opens.astype(np.int32) - ((block == 0x7D) | (block == 0x5D))
        nonzero = np.flatnonzero(step)
        if nonzero.size:
            running = depth + np.cumsum(step[nonzero], dtype=np.int64)
            deepest = max(deepest, int(running.max()))
            depth = int(running[-1])
        count += int(opens.sum())
    return deepest, count


def install(server):
    """Refuse JSON request bodies deeper or larger than the budget with HTTP 400, before they are parsed."""
    import flask

    @server.before_request
    def _json_budget():
        request = flask.request
        if request.method != "POST" or not request.is_json:
            return None
        depth, containers = json_shape(request.get_data(cache=True))
        max_depth, max_count = server.config["MODEHEAT_MAX_JSON_DEPTH"], server.config["MODEHEAT_MAX_JSON_CONTAINERS"]
        if depth > max_depth or containers > max_count:
            what = (f"nested {depth} deep (at most {max_depth})" if depth > max_depth
                    else f"holds {containers:,} objects and arrays (at most {max_count:,})")
            return flask.Response(f"request refused: the JSON body is {what}\n", status=400, mimetype="text/plain")
        return None
