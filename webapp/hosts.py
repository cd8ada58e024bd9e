"""Which Host names the server answers, and which proxies' ``X-Forwarded-*`` headers it believes.

*Host check.*  A page on another site can make a browser send requests to
``127.0.0.1`` under a name the attacker controls (DNS rebinding); the browser
then treats the dashboard as that site.  Every request whose ``Host`` is not
allowed is refused with HTTP 400 before any page or callback runs.  Allowed:
``localhost``, ``127.0.0.1``, ``[::1]``, the host the server was bound to,
and the names in ``MODEHEAT_ALLOWED_HOSTS`` (comma-separated; ``*`` turns the
check off, e.g. behind a proxy that checks names itself).

*Trusted proxies.*  Behind a TLS proxy the server sees plain HTTP; the proxy
says ``X-Forwarded-Proto: https``.  Those headers are believed only from the
addresses or networks in ``MODEHEAT_TRUSTED_PROXIES`` (comma-separated, e.g.
``127.0.0.1,10.0.0.0/8``), one proxy hop (werkzeug's ``ProxyFix``); from any
other client they are ignored, so nobody can claim HTTPS or another address.
The space cookie is then ``Secure`` exactly when the browser's connection is.

References
----------
.. [1] RFC 9110, *HTTP Semantics* (2022), section 7.2 ("Host and :authority").
.. [2] RFC 7239, *Forwarded HTTP Extension* (2014), section 8 (trusting proxies).
"""

from __future__ import annotations

import ipaddress
import os

import flask
from werkzeug.middleware.proxy_fix import ProxyFix

#: Host names always allowed (loopback).
LOOPBACK_HOSTS = ("localhost", "127.0.0.1", "::1")


def _split(text):
    return [item.strip() for item in str(text or "").split(",") if item.strip()]


def host_name(host) -> str:
    """The name part of a ``Host`` value, lower case, without port or IPv6 brackets.

    Examples
    --------
    >>> host_name("LocalHost:8050"), host_name("[::1]:8050"), host_name("127.0.0.1")
    ('localhost', '::1', '127.0.0.1')
    """
    host = str(host or "").strip().lower()
    if host.startswith("["):
        return host[1:host.find("]")] if "]" in host else host[1:]
    return host.rsplit(":", 1)[0] if host.count(":") == 1 else host


def allowed_hosts(bound_host=None, environ=None) -> tuple:
    """The allowed host names: loopback, the bound host, ``$MODEHEAT_ALLOWED_HOSTS`` (``("*",)``: any)."""
    env = os.environ if environ is None else environ
    extra = [host_name(h) if h != "*" else "*" for h in _split(env.get("MODEHEAT_ALLOWED_HOSTS"))]
    bound = host_name(bound_host) if bound_host and bound_host not in ("0.0.0.0", "::") else None
    names = [*LOOPBACK_HOSTS, *([bound] if bound else []), *extra]
    return ("*",) if "*" in names else tuple(dict.fromkeys(names))


def trusted_proxies(environ=None) -> tuple:
    """Networks whose ``X-Forwarded-*`` headers are believed (``$MODEHEAT_TRUSTED_PROXIES``).

    Raises
    ------
    ValueError
        An entry that is not an address or network (the server refuses to start).
    """
    env = os.environ if environ is None else environ
    out = []
    for item in _split(env.get("MODEHEAT_TRUSTED_PROXIES")):
        try:
            out.append(ipaddress.ip_network(item, strict=False))
        except ValueError:
            raise ValueError(f"MODEHEAT_TRUSTED_PROXIES: {item!r} is not an IP address or network") from None
    return tuple(out)


class TrustedProxyFix:
    """WSGI middleware: ``ProxyFix`` (one hop of ``X-Forwarded-For/Proto/Host``) for trusted peers only."""

    def __init__(self, app, server):
        self.app, self.server = app, server
        self.fixed = ProxyFix(app, x_for=1, x_proto=1, x_host=1)

    def __call__(self, environ, start_response):
        trusted = self.server.config.get("MODEHEAT_TRUSTED_PROXIES") or ()
        try:
            peer = ipaddress.ip_address(str(environ.get("REMOTE_ADDR") or "").split("%")[0])
        except ValueError:
            peer = None
        if peer is not None and any(peer in net for net in trusted):
            return self.fixed(environ, start_response)
        return self.app(environ, start_response)


def configure(server, bound_host=None):
    """Store the allowed hosts and trusted proxies in ``server.config`` (from the environment)."""
    server.config["MODEHEAT_ALLOWED_HOSTS"] = allowed_hosts(bound_host)
    server.config["MODEHEAT_TRUSTED_PROXIES"] = trusted_proxies()


def install(server):
    """Put the proxy middleware in front of ``server`` and refuse unknown hosts (once per server)."""
    if getattr(server, "_mh_hosts_installed", False):
        return
    server._mh_hosts_installed = True
    server.wsgi_app = TrustedProxyFix(server.wsgi_app, server)

    @server.before_request
    def _check_host():
        allowed = server.config.get("MODEHEAT_ALLOWED_HOSTS") or LOOPBACK_HOSTS
        if "*" in allowed or host_name(flask.request.host) in allowed:
            return None
        return flask.Response("host not allowed: start the server with MODEHEAT_ALLOWED_HOSTS naming it\n",
                              status=400, mimetype="text/plain")
