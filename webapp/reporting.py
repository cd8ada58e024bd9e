"""Errors become one-line messages: the wrapper every callback uses, per-item attempts, the request guard."""

from __future__ import annotations

import functools
import logging

from thermo.errors import ModeheatError

log = logging.getLogger(__name__)


def one_line(exc: BaseException) -> str:
    """A one-line user message for an exception (no traceback)."""
    if isinstance(exc, ModeheatError):
        text = str(exc)
    else:
        text = f"unexpected error: {type(exc).__name__}: {exc}"
    return " ".join(text.split()) or type(exc).__name__


def _logged(exc):
    if not isinstance(exc, ModeheatError):   # a bug, not bad input: keep the traceback for the server log
        log.exception("dashboard callback failed")
    return one_line(exc)


def attempt(func, *args, **kwargs):
    """``(result, None)``, or ``(None, message)`` when ``func`` raises (one item of a batch)."""
    try:
        return func(*args, **kwargs), None
    except Exception as exc:  # the one place, with reported(), where failures become messages
        return None, _logged(exc)


def reported(fallback):
    """Decorate a callback so that any exception returns ``fallback(message)`` instead.

    ``fallback`` takes the one-line message and returns the callback's
    outputs (e.g. blank figures and the message in the page's panel), so the
    page stays usable and no traceback reaches the browser.
    """
    def decorate(func):
        @functools.wraps(func)
        def wrapper(*args, **kwargs):
            value, message = attempt(func, *args, **kwargs)
            return fallback(message) if message is not None else value
        return wrapper
    return decorate


#: The path Dash posts callback requests to.
CALLBACK_PATH = "/_dash-update-component"


def install_guard(server):
    """The shared guard: a callback request that still raises (a forged value the page never sends:
    a slider at ``'abc'``, a store replaced by a string) is answered 400 with one line, never 500 with
    a traceback; the traceback goes to the server log.  HTTP errors (400, 413, ...) pass unchanged."""
    import flask
    from werkzeug.exceptions import HTTPException

    @server.errorhandler(Exception)
    def _one_line(exc):
        if isinstance(exc, HTTPException):
            return exc
        log.error("request %s failed", flask.request.path, exc_info=exc)
        status = 400 if flask.request.path.endswith(CALLBACK_PATH) else 500
        what = "refused: a value this page never sends" if status == 400 else "the server could not answer"
        return flask.Response(f"{what} ({type(exc).__name__})\n", status=status,
                              mimetype="text/plain")
