"""CLI cases whose outputs on ``sample_dos/`` are kept in ``tests/cli/reference/``.

The reference files pin the command line's behaviour: a refactor must leave them
identical (apart from ``created_utc`` and the tool ``version``; numbers at the precision they are
printed, see test_reference_outputs).  A deliberate change of behaviour
regenerates them with ``python -m tests.cli.reference_cases`` and says so in the
commit message.
"""

from __future__ import annotations

import contextlib
import io
import re
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
SAMPLES = sorted(p for p in (ROOT / "sample_dos").iterdir()
                 if p.suffix in (".dat", ".tsv", ".csv") and p.parent.name == "sample_dos")
REFERENCE = Path(__file__).resolve().parent / "reference"

#: (case name, argument list after the file name)
CASES = (
    ("table_csv", ["table"]),
    ("table_json_atom", ["table", "--format", "json", "--per", "atom", "--temperatures", "0:300:25"]),
    ("summary", ["summary"]),
    ("models_json", ["models", "--format", "json"]),
    ("models_csv", ["models", "--format", "csv", "--temperatures", "0:600:50"]),
)

_CREATED = re.compile(r'("created_utc"\s*:\s*"[^"]*"|created_utc[=:,][^\n]*)')
_VERSION = re.compile(r'(?<="version": )"[^"]*"|(?<=# version: )[^\n]*')


def normalised(text: str) -> str:
    """Output text with the creation time and the tool version blanked (they change without a change of behaviour)."""
    return _VERSION.sub('"version"', _CREATED.sub("created_utc", text))


def run_case(sample: Path, args) -> str:
    """Standard output of ``modeheat ARGS[0] SAMPLE ARGS[1:]`` (relative path)."""
    from thermo.cli.main import main
    out = io.StringIO()
    argv = [args[0], str(sample.relative_to(ROOT)), *args[1:]]
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(io.StringIO()):
        import os
        cwd = os.getcwd()
        os.chdir(ROOT)
        try:
            code = main(argv)
        finally:
            os.chdir(cwd)
    return f"exit {code}\n" + normalised(out.getvalue())


def reference_path(sample: Path, case: str) -> Path:
    return REFERENCE / f"{sample.stem}.{case}.txt"


if __name__ == "__main__":
    REFERENCE.mkdir(exist_ok=True)
    for sample in SAMPLES:
        for case, args in CASES:
            reference_path(sample, case).write_text(run_case(sample, args), encoding="utf-8")
    print(f"wrote {len(SAMPLES) * len(CASES)} reference outputs to {REFERENCE}")
