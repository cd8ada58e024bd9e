"""Errors become one-line messages: the wrapper every callback uses, and per-item attempts."""

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
