"""The documentation site builds without a warning (``mkdocs build --strict``, as ``make docs``).

Catches a broken link between pages, a page missing from the navigation, and an API reference
entry (mkdocstrings) whose object no longer exists or whose numpydoc docstring does not parse.
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def test_docs_build_strict(tmp_path):
    done = subprocess.run([sys.executable, "-m", "mkdocs", "build", "--strict", "--site-dir", str(tmp_path / "site")],
                          cwd=ROOT, capture_output=True, text=True, timeout=300)
    assert done.returncode == 0, done.stderr[-3000:]
    assert "WARNING" not in done.stderr, done.stderr[-3000:]
    api = (tmp_path / "site" / "api" / "index.html").read_text(encoding="utf-8")
    for name in ("tables.tabulate", "preparation.loading.load_dos", "quasiharmonic.quasiharmonic_table",
                 "polynomials.fit_polynomial"):
        assert f'id="thermo.{name}"' in api, f"API reference lacks thermo.{name}"
