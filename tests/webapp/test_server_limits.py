"""The running dashboard enforces its own limits: crafted requests against a real server process.

The server is ``python -m webapp`` in a child process (so its memory can be
read from ``/proc``) with a 1 MB upload limit.  The request limit follows from
it (:func:`webapp.intake.request_limit`); nothing the client sends can raise
either.  Test files are invented (a Debye ν² spectrum).
"""

from __future__ import annotations

import base64
import io
import json
import os
import socket
import subprocess
import sys
import time
import zipfile
from pathlib import Path

import numpy as np
import pytest
import requests

from tests.ports import worker_port
from webapp import intake

PORT = worker_port(8072)
BASE = f"http://127.0.0.1:{PORT}"
LIMIT_MB = 1.0
ROOT = Path(__file__).resolve().parents[2]
PLAIN = "# frequency (THz) dos\n" + "\n".join(f"{a} {9 * a * a / 125}" for a in np.linspace(0, 5, 101)) + "\n"


def _rss_kb(pid):
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmRSS:"):
            return int(line.split()[1])
    raise AssertionError("no VmRSS")


@pytest.fixture(scope="module")
def server():
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    proc = subprocess.Popen([sys.executable, "-m", "webapp", "--port", str(PORT), "--max-upload-mb", str(LIMIT_MB)],
                            cwd=ROOT, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    try:
        for _ in range(200):
            try:
                if requests.get(BASE + "/", timeout=1).status_code == 200:
                    break
            except requests.ConnectionError:
                time.sleep(0.1)
        else:
            raise AssertionError("the dashboard did not start")
        yield proc
    finally:
        proc.terminate()
        proc.wait(timeout=10)


def _upload_callback():
    deps = requests.get(BASE + "/_dash-dependencies", timeout=10).json()
    return next(c for c in deps if any(i["id"] == "mh-upload-checked" for i in c["inputs"]))


def _upload_payload(files, config):
    """A crafted request for the upload callback, built from the server's own dependency list."""
    cb = _upload_callback()
    outputs = [{"id": part.split(".")[0], "property": part.split(".", 1)[1]}
               for part in cb["output"].strip(".").split("...")]
    known = {("mh-upload-checked", "data"): {"files": files, "refused": [], "stamp": 1},
             ("mh-workspace", "data"): {"datasets": [], "active": None},
             ("mh-config", "data"): config}

    def values(items):
        return [{"id": i["id"], "property": i["property"], "value": known.get((i["id"], i["property"]))}
                for i in items]
    return {"output": cb["output"], "outputs": outputs, "inputs": values(cb["inputs"]),
            "state": values(cb["state"]), "changedPropIds": ["mh-upload-checked.data"]}


def _data_url(raw: bytes):
    return "data:application/octet-stream;base64," + base64.b64encode(raw).decode()


def _added(response):
    """Datasets in the workspace after the callback (no update: the empty workspace sent stays)."""
    return response["mh-workspace"]["data"]["datasets"] if "mh-workspace" in response else []


def _post_upload(files, config):
    r = requests.post(BASE + "/_dash-update-component", json=_upload_payload(files, config), timeout=30)
    assert r.status_code == 200, r.text[:300]
    return r.json()["response"], r.elapsed.total_seconds()


def test_request_limit_is_set_from_the_upload_setting(server):
    # base64 carries 3 bytes in 4 characters: the request limit holds REQUEST_FILES files at the limit
    limit = intake.request_limit(int(LIMIT_MB * 1e6))
    assert limit >= intake.REQUEST_FILES * 4 / 3 * LIMIT_MB * 1e6
    over = requests.post(BASE + "/_dash-update-component", data=b" " * (limit + 1),
                         headers={"Content-Type": "application/json"}, timeout=30)
    under = requests.post(BASE + "/_dash-update-component", data=b" " * (limit - 1),
                          headers={"Content-Type": "application/json"}, timeout=30)
    assert over.status_code == 413
    assert under.status_code != 413


def test_oversize_post_refused_from_its_header_with_little_memory(server):
    before = _rss_kb(server.pid)
    declared = 300 * 10 ** 6
    with socket.create_connection(("127.0.0.1", PORT), timeout=10) as sock:
        sock.sendall((f"POST /_dash-update-component HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: application/json\r\n"
                      f"Content-Length: {declared}\r\n\r\n").encode())
        try:   # the server may answer and close before the body is sent
            sock.sendall(b"{" + b" " * 2_000_000)
        except OSError:
            pass
        reply = sock.recv(4096).decode("latin-1")
    assert reply.startswith("HTTP/1.1 413"), reply[:200]
    assert _rss_kb(server.pid) - before < 30_000   # kB: the 300 MB body was never read


def test_streamed_oversize_body_is_cut_at_the_limit(server):
    limit = intake.request_limit(int(LIMIT_MB * 1e6))
    before = _rss_kb(server.pid)

    def chunks():
        for _ in range(limit // 1_000_000 + 20):
            yield b" " * 1_000_000
    try:
        r = requests.post(BASE + "/_dash-update-component", data=chunks(),
                          headers={"Content-Type": "application/json"}, timeout=30)
        status = r.status_code
    except requests.ConnectionError:   # the server closed the connection after refusing
        status = 413
    # 413 when the server decodes chunked bodies (gunicorn); Werkzeug's own server reads no body
    # without a Content-Length and answers 400 (invalid JSON): either way nothing is accepted
    assert status in (400, 413)
    assert _rss_kb(server.pid) - before < 60_000


@pytest.mark.parametrize("config", [None, {"max_upload_bytes": None}, {"max_upload_bytes": 1e12}])
def test_client_cannot_raise_the_upload_limit(server, config):
    big = (PLAIN * 520).encode()          # about 1.2 MB: above the 1 MB limit, below the request limit
    assert int(LIMIT_MB * 1e6) < len(big) < intake.request_limit(int(LIMIT_MB * 1e6)) // 4
    response, _ = _post_upload([{"name": "big.dat", "contents": _data_url(big)}], config)
    assert _added(response) == []
    assert "upload limit is 1 MB" in json.dumps(response["sp-messages"])


def test_small_upload_still_accepted(server):
    response, _ = _post_upload([{"name": "ok.dat", "contents": _data_url(PLAIN.encode())}],
                               {"max_upload_bytes": 1})
    assert [d["name"] for d in response["mh-workspace"]["data"]["datasets"]] == ["ok.dat"]


def xlsx_bomb(unpacked_bytes=200_000_000):
    """A small .xlsx whose sheet XML unpacks to ``unpacked_bytes`` (blank padding inside a row)."""
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w", zipfile.ZIP_DEFLATED, compresslevel=9) as z:
        z.writestr("[Content_Types].xml", '<?xml version="1.0"?><Types xmlns="http://schemas.openxmlformats.org/'
                   'package/2006/content-types"/>')
        with z.open("xl/worksheets/sheet1.xml", "w", force_zip64=True) as f:
            f.write(b'<?xml version="1.0"?><worksheet><sheetData><row r="1">')
            block = b" " * 1_000_000
            for _ in range(unpacked_bytes // len(block)):
                f.write(block)
            f.write(b"</row></sheetData></worksheet>")
    return buf.getvalue()


def test_xlsx_bomb_is_refused_from_the_zip_directory_without_unpacking(monkeypatch):
    # the refusal comes from the sizes in the zip directory: no member is opened (was a wall-clock
    # bound of 1 s; no timing assertions in tests — speed belongs to the bench)
    from thermo.errors import DosInputError
    from thermo.io.readers import read_table

    def unpacking(*args, **kwargs):
        raise AssertionError("a workbook member was unpacked before the size check")
    bomb = xlsx_bomb()
    monkeypatch.setattr(zipfile.ZipFile, "open", unpacking)
    with pytest.raises(DosInputError, match="unpack"):
        read_table(bomb, name="bomb.xlsx")


def test_xlsx_bomb_refused_by_the_server(server):
    bomb = xlsx_bomb()
    assert len(bomb) < LIMIT_MB * 1e6
    response, _ = _post_upload([{"name": "bomb.xlsx", "contents": _data_url(bomb)}], None)
    assert _added(response) == []
    assert "bomb.xlsx" in json.dumps(response["sp-messages"]) and "unpack" in json.dumps(response["sp-messages"])


def test_security_headers_on_pages_and_callbacks(server):
    for r in (requests.get(BASE + "/", timeout=10), requests.get(BASE + "/_dash-layout", timeout=10)):
        assert r.headers["X-Content-Type-Options"] == "nosniff"
        assert r.headers["X-Frame-Options"] == "DENY"
        assert r.headers["Referrer-Policy"] == "no-referrer"
        csp = r.headers["Content-Security-Policy"]
        assert "frame-ancestors 'none'" in csp and "script-src 'self' 'sha256-" in csp
        assert "unsafe-eval" not in csp and "script-src 'self' 'unsafe-inline'" not in csp
