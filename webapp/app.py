"""Entry point of the dashboard: the Dash app with every page registered.

``app`` and ``server`` (the WSGI object, ``gunicorn webapp.app:server``) are
module-level; :func:`create_app` applies settings and returns the same app —
Dash's pages mechanism keeps one page registry per process, so there is one
dashboard per process.
"""

from __future__ import annotations

from . import pages  # noqa: F401  (registers every page with the app)
from .shell import app, configure, server

__all__ = ["app", "server", "create_app"]


def _set_up_before_serving():
    """Run Dash's first-request set-up now, in one thread.

    Dash registers the page router and copies the pages' callbacks into the
    app on the first request, flagging it done before the work is done; under
    a threaded server (gunicorn ``--threads``) concurrent first requests then
    saw an app without some callbacks (found by bench figure P13).  Running
    the ``before_request`` hooks once at import closes that window.
    """
    with server.test_request_context("/"):
        server.preprocess_request()


_set_up_before_serving()


def create_app(max_upload_mb=None, demo_dir=None, saved_limit_chars=None, workspace=None, bound_host=None):
    """Configure the dashboard and return it.

    Parameters
    ----------
    max_upload_mb : float, optional
        Per-file upload limit [MB]; default from ``MODEHEAT_MAX_UPLOAD_MB`` or 20.
    demo_dir : path, optional
        Folder of demo DOS files loaded on a first visit (default: the installed ``sample_dos`` data package).
    saved_limit_chars : int, optional
        Largest workspace kept in the tab's session storage (see
        :func:`webapp.session.persistable`).
    workspace : path, optional
        SQLite workspace file (:mod:`thermo.workspace`) keeping every
        browser's datasets across reloads and restarts; None keeps them in
        the browser tab only.
    bound_host : str, optional
        The address the server listens on: allowed in the ``Host`` header besides loopback and
        ``MODEHEAT_ALLOWED_HOSTS`` (:mod:`webapp.hosts`).
    """
    configure(max_upload_mb, demo_dir, saved_limit_chars, workspace, bound_host)
    return app
