"""One real ``python -m thermo`` process per command (the other CLI tests call ``main()`` in-process,
tests/clirun.py): the entry point, the imports of each command and the exit code in a fresh
interpreter. A command without a case below is still started once, with ``--help``.
"""

from __future__ import annotations

import pytest

from tests.clirun import run_subprocess
from thermo.cli.main import build_parser

DOS = "sample_dos/springium_fcc.dat"
#: command -> (arguments, a text its standard output must contain)
CASES = {
    "table": ([DOS, "--temperatures", "100:300:100"], "temperature_K"),
    "summary": ([DOS], '"atoms'),
    "models": ([DOS, "--format", "json"], "theta"),
    "quasiharmonic": (["sample_dos/volumes/springium_volumes.csv", "--temperatures", "0:300:150"], "volume"),
    "calorimetry": (["sample_dos/measured/springium_cp.csv"], "provenance"),
    "displacements": ([DOS, "--temperatures", "0:300:150", "--formula", "Al"], "temperature_K"),
    "elastic": (["--c11", "108", "--c12", "62", "--c44", "28", "--density", "2.7", "--formula", "Al"],
                "elastic_theta_K"),
    "polynomial": ([DOS], "coefficients"),
    "electronic": (["sample_dos/electronic/springium_edos.dat", "--temperatures", "0:300:150"], "temperature_K"),
    "serve": (["--help"], "--port"),
}


def _commands():
    parser = build_parser()
    (sub,) = [a for a in parser._actions if a.__class__.__name__ == "_SubParsersAction"]
    return sorted(sub.choices)


@pytest.mark.parametrize("command", _commands())
def test_command_runs_in_a_fresh_interpreter(command):
    args, expected = CASES.get(command, (["--help"], command))
    done = run_subprocess(command, *args, timeout=300)
    assert done.returncode == 0, done.stderr[-2000:]
    assert expected in done.stdout, done.stdout[:2000]
    assert "Traceback" not in done.stderr
