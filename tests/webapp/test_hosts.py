"""Host check (DNS rebinding) and X-Forwarded-Proto from trusted proxies only, on the real app (issue 26)."""

import pytest

from webapp import persistence
from webapp.app import create_app


@pytest.fixture
def make(tmp_path, monkeypatch):
    def build(allowed=None, trusted=None, bound_host=None):
        for name, value in (("MODEHEAT_ALLOWED_HOSTS", allowed), ("MODEHEAT_TRUSTED_PROXIES", trusted)):
            if value is None:
                monkeypatch.delenv(name, raising=False)
            else:
                monkeypatch.setenv(name, value)
        return create_app(workspace=tmp_path / "w.sqlite", demo_dir=tmp_path / "no-demo",
                          bound_host=bound_host).server
    yield build
    monkeypatch.delenv("MODEHEAT_ALLOWED_HOSTS", raising=False)
    monkeypatch.delenv("MODEHEAT_TRUSTED_PROXIES", raising=False)
    create_app()


@pytest.mark.parametrize("host", ["localhost", "127.0.0.1:8050", "[::1]:8050", "LOCALHOST:8050"])
def test_loopback_names_are_answered(make, host):
    server = make()
    assert server.test_client().get("/_dash-layout", headers={"Host": host}).status_code == 200


@pytest.mark.parametrize("path", ["/", "/_dash-layout", "/_dash-dependencies", "/workspace"])
def test_a_rebound_name_is_refused(make, path):
    # DNS rebinding: attacker.example resolves to 127.0.0.1, the browser sends Host: attacker.example
    server = make()
    r = server.test_client().get(path, headers={"Host": "attacker.example:8050"})
    assert r.status_code == 400 and b"host not allowed" in r.data


def test_a_callback_post_under_a_foreign_host_is_refused(make):
    server = make()
    r = server.test_client().post("/_dash-update-component", json={}, headers={"Host": "attacker.example"})
    assert r.status_code == 400


def test_names_from_the_environment_and_the_bound_host(make):
    server = make(allowed="lab.example, dash.lab.example", bound_host="192.0.2.7")
    client = server.test_client()
    for host in ("lab.example", "dash.lab.example:443", "192.0.2.7:8050"):
        assert client.get("/_dash-layout", headers={"Host": host}).status_code == 200
    assert client.get("/_dash-layout", headers={"Host": "other.example"}).status_code == 400
    assert make(allowed="*").test_client().get("/", headers={"Host": "any.example"}).status_code == 200


def _cookie(server, remote, proto):
    client = server.test_client()
    r = client.get("/", headers={"X-Forwarded-Proto": proto, "X-Forwarded-Host": "localhost"},
                   environ_base={"REMOTE_ADDR": remote})
    return r.headers.get("Set-Cookie", "")


def test_secure_cookie_behind_a_trusted_tls_proxy(make):
    server = make(trusted="127.0.0.1, 10.1.0.0/16")
    for proxy in ("127.0.0.1", "10.1.2.3"):
        cookie = _cookie(server, proxy, "https")
        assert cookie.startswith(persistence.COOKIE) and "Secure" in cookie
    assert "Secure" not in _cookie(server, "127.0.0.1", "http")


def test_forwarded_headers_from_anyone_else_are_ignored(make):
    assert "Secure" not in _cookie(make(trusted="10.1.0.0/16"), "192.0.2.50", "https")
    assert "Secure" not in _cookie(make(), "127.0.0.1", "https")      # no proxy trusted by default


def test_a_bad_trusted_proxy_entry_is_refused(make):
    with pytest.raises(ValueError, match="MODEHEAT_TRUSTED_PROXIES"):
        make(trusted="10.0.0.1, not-an-address")
