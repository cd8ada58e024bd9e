"""The persistent workspace in headless Chromium against the real server (``python -m webapp`` processes).

Upload, reload, restart the server: the dataset is still there with the same
numbers, which equal :func:`thermo.tabulate` of the file; a second browser does
not see it; the Workspace page groups, deletes (after one confirmation) and undoes.
The uploaded DOS is invented (a Debye ν² spectrum).
"""

import os
import socket
import subprocess
import sys
import time
from pathlib import Path

import numpy as np
import pytest
from tests.browser.waits import until
from selenium.webdriver.common.by import By
from selenium.webdriver.support.ui import WebDriverWait
from selenium.webdriver.support import expected_conditions

from thermo import load_dos, tabulate
from thermo.columns import find
from tests.ports import worker_port
from webapp.browser import start

pytestmark = pytest.mark.browser
ROOT = Path(__file__).resolve().parents[2]
PORT = worker_port(8078)
URL = f"http://127.0.0.1:{PORT}"
PLAIN = "# frequency (THz) dos\n" + "\n".join(f"{a} {9 * a * a / 125}" for a in np.linspace(0, 5, 241)) + "\n"


def _serve(workspace):
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    proc = subprocess.Popen([sys.executable, "-m", "webapp", "--port", str(PORT), "--workspace", str(workspace)],
                            env=env, cwd=str(ROOT), stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    deadline = time.monotonic() + 60
    while time.monotonic() < deadline:
        try:
            socket.create_connection(("127.0.0.1", PORT), timeout=0.5).close()
            return proc
        except OSError:
            if proc.poll() is not None:
                raise RuntimeError(proc.stderr.read().decode())
            time.sleep(0.2)
    proc.kill()
    raise RuntimeError("server did not start")


def _stop(proc):
    proc.terminate()
    try:
        proc.wait(10)
    except subprocess.TimeoutExpired:
        proc.kill()
        proc.wait()


@pytest.fixture
def browsers():
    made = []

    def make():
        made.append(start())
        return made[-1]
    yield make
    for d in made:
        d.quit()


def text_of(driver, css):
    try:
        return driver.find_element(By.CSS_SELECTOR, css).text
    except Exception:  # noqa: BLE001 - not drawn yet
        return ""


def summary(driver):
    """The Overview's active-dataset text once it names a dataset and shows its numbers."""
    driver.get(URL + "/")
    until(lambda: "S at 298.15 K" in text_of(driver, "#home-summary"), 30)
    return text_of(driver, "#home-summary")


def test_upload_survives_reload_and_restart_and_stays_private(tmp_path, browsers):
    src = tmp_path / "kept_debye.dat"
    src.write_text(PLAIN)
    # the page's numbers must equal the library's for the same file (independent of the store)
    table = tabulate(load_dos(PLAIN), [0.0, 298.15])
    entropy = f"{table[find(table, 'entropy')].iloc[1]:.5g}"
    w = tmp_path / "w.sqlite"
    server = _serve(w)
    try:
        first = browsers()
        first.get(URL + "/spectrum")
        until(lambda: "springium" in text_of(first, "#sp-list"), 30)          # demo seeded, once
        first.find_element(By.CSS_SELECTOR, "#mh-upload input[type=file]").send_keys(str(src))
        until(lambda: src.name in text_of(first, "#sp-list"), 30)
        before = summary(first)
        assert src.name in before and entropy in before
        until(lambda: _stored(w, src.name), 30)          # the server's store holds the upload
        first.refresh()
        assert summary(first) == before
        _stop(server)
        server = _serve(w)
        assert summary(first) == before       # same cookie, new server process, same numbers
        first.get(URL + "/spectrum")
        until(lambda: src.name in text_of(first, "#sp-list"), 30)
        assert text_of(first, "#sp-list").count("springium_fcc") == 1    # demo not seeded twice

        second = browsers()
        second.get(URL + "/spectrum")
        until(lambda: "springium" in text_of(second, "#sp-list"), 30)
        assert src.name not in text_of(second, "#sp-list")
        second.get(URL + "/workspace")
        until(lambda: "springium" in text_of(second, "#ws-list"), 30)
        assert src.name not in text_of(second, "#ws-list")

        # the panel: group, delete after one confirmation, undo; all kept across a reload
        first.get(URL + "/workspace")
        until(lambda: src.name in text_of(first, "#ws-list"), 30)
        until(lambda: first.find_element(By.ID, "ws-name").get_attribute("value") == src.name, 30)
        group = first.find_element(By.ID, "ws-group")
        group.clear()
        group.send_keys("convergence: mesh")
        first.find_element(By.ID, "ws-save").click()
        until(lambda: "convergence: mesh" in text_of(first, "#ws-list"), 20)
        until(lambda: getattr(_stored(w, src.name), "group", "") == "convergence: mesh", 30)
        first.refresh()
        until(lambda: "convergence: mesh" in text_of(first, "#ws-list"), 30)
        until(lambda: first.find_element(By.ID, "ws-name").get_attribute("value") == src.name, 30)
        first.find_element(By.ID, "ws-delete").click()
        WebDriverWait(first, 10).until(expected_conditions.alert_is_present())
        assert src.name in first.switch_to.alert.text
        first.switch_to.alert.accept()
        until(lambda: src.name not in text_of(first, "#ws-list"), 20)
        until(lambda: _stored(w, src.name) is None, 30)
        first.refresh()
        until(lambda: "springium" in text_of(first, "#ws-list"), 30)
        assert src.name not in text_of(first, "#ws-list")
        first.find_element(By.ID, "ws-undo").click()
        until(lambda: src.name in text_of(first, "#ws-list"), 20)
        until(lambda: _stored(w, src.name), 30)
        _stop(server)
        server = _serve(w)
        first.get(URL + "/workspace")
        until(lambda: "convergence: mesh" in text_of(first, "#ws-list"), 30)
        assert src.name in text_of(first, "#ws-list")
    finally:
        _stop(server)


def test_named_workspace_created_in_one_browser_opened_by_key_in_another(tmp_path, browsers):
    src = tmp_path / "shared_debye.dat"
    src.write_text(PLAIN)
    server = _serve(tmp_path / "w.sqlite")
    try:
        first = browsers()
        first.get(URL + "/workspace")
        until(lambda: "springium" in text_of(first, "#ws-list"), 30)
        first.find_element(By.ID, "ws-new-name").send_keys("lab study\n")
        first.find_element(By.ID, "ws-create").click()
        until(lambda: text_of(first, "#ws-new-key"), 20)
        key = text_of(first, "#ws-new-key")
        assert len(key) >= 43
        first.get(URL + "/spectrum")                 # the new, empty named workspace
        until(lambda: first.find_elements(By.CSS_SELECTOR, "#mh-upload input[type=file]"), 30)
        first.find_element(By.CSS_SELECTOR, "#mh-upload input[type=file]").send_keys(str(src))
        until(lambda: src.name in text_of(first, "#sp-list"), 30)
        assert "springium" not in text_of(first, "#sp-list")
        until(lambda: _stored(tmp_path / "w.sqlite", src.name), 30)

        second = browsers()
        second.get(URL + "/workspace")
        until(lambda: "springium" in text_of(second, "#ws-list"), 30)
        assert src.name not in text_of(second, "#ws-list")
        second.find_element(By.ID, "ws-open-key").send_keys(key + "\n")
        second.find_element(By.ID, "ws-open").click()
        until(lambda: src.name in text_of(second, "#ws-list"), 30)
        assert "lab study" in text_of(second, "#ws-where")
        second.find_element(By.ID, "ws-own").click()
        until(lambda: "springium" in text_of(second, "#ws-list"), 30)
        assert src.name not in text_of(second, "#ws-list")
    finally:
        _stop(server)


def _stored(path, name):
    """The live dataset ``name`` as the server's store holds it (any space), None while it is not written."""
    from thermo.workspace.store import Workspace
    spaces = Workspace(path).spaces(kinds=("local", "named", "browser"))
    return next((d for sp in spaces for d in sp.datasets() if d.name == name), None)


def _deleted_rows(path):
    import sqlite3
    con = sqlite3.connect(str(path))
    try:
        return con.execute("SELECT count(*) FROM datasets WHERE deleted_utc IS NOT NULL").fetchone()[0]
    finally:
        con.close()


def _file_bytes(path):
    return b"".join(Path(p).read_bytes() for p in (str(path), f"{path}-wal") if os.path.exists(p))


def test_remove_deleted_files_for_good_from_the_page(tmp_path, browsers):
    # issue 26: the page's Delete only marks a dataset; the purge action takes its bytes out of the file
    marker = b"CONFIDENTIAL-page-purge-91c4"
    src = tmp_path / "confidential.dat"
    src.write_bytes(PLAIN.encode() + b"# " + marker + b"\n")
    w = tmp_path / "w.sqlite"
    server = _serve(w)
    try:
        page = browsers()
        page.get(URL + "/spectrum")
        until(lambda: "springium" in text_of(page, "#sp-list"), 30)
        page.find_element(By.CSS_SELECTOR, "#mh-upload input[type=file]").send_keys(str(src))
        until(lambda: src.name in text_of(page, "#sp-list"), 30)
        page.get(URL + "/workspace")
        until(lambda: src.name in text_of(page, "#ws-list"), 30)
        until(lambda: page.find_element(By.ID, "ws-name").get_attribute("value") == src.name, 30)
        page.find_element(By.ID, "ws-delete").click()
        WebDriverWait(page, 10).until(expected_conditions.alert_is_present())
        page.switch_to.alert.accept()
        until(lambda: _deleted_rows(w) == 1, 20)                 # the store has the mark
        assert marker in _file_bytes(w)                          # ... and still the bytes
        page.find_element(By.ID, "ws-purge").click()
        WebDriverWait(page, 10).until(expected_conditions.alert_is_present())
        page.switch_to.alert.accept()
        until(lambda: "removed 1 deleted dataset(s)" in text_of(page, "#ws-purged"), 30)
        assert _deleted_rows(w) == 0 and marker not in _file_bytes(w)
        page.find_element(By.ID, "ws-undo").click()              # nothing left to bring back
        until(lambda: "nothing to undo" in text_of(page, "#ws-messages"), 20)
        assert src.name not in text_of(page, "#ws-list") and "springium" in text_of(page, "#ws-list")
    finally:
        _stop(server)
