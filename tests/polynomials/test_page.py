"""Polynomials page callbacks called directly (no browser): the block shown is the CLI's, plots and errors agree.

Demo data is invented (webapp.demo); the reference here is our own CLI output
and the independently written Shomate formula (NIST Chemistry WebBook form).
"""

from __future__ import annotations

import json

import numpy as np
import pytest

from thermo.cli.main import main
from webapp import session
from webapp.demo import demo_workspace
from webapp.pages import PAGES, polynomials


@pytest.fixture(scope="module")
def demo():
    return demo_workspace()


def test_page_is_registered_and_lays_out():
    assert polynomials in PAGES
    assert polynomials.layout() is not None


def test_block_is_json_with_shomate_keys_and_plots_have_fit_and_errors(demo):
    over, err, keys, block, messages = polynomials.draw(demo, "shomate", 298.15, 1500, None, 0, "cr", "", "json")
    record = json.loads(block)
    coefficients = record["ranges"][0]["coefficients"]
    assert list(coefficients) == list("ABCDEFGH")
    table, fit = over.data[0], over.data[1]
    # the overlaid fit curve is the Shomate formula of the shown coefficients (WebBook form, re-typed here)
    t = np.asarray(fit.x) / 1000.0
    c = coefficients
    cp = c["A"] + c["B"] * t + c["C"] * t ** 2 + c["D"] * t ** 3 + c["E"] / t ** 2
    assert np.allclose(fit.y, cp, rtol=1e-12)
    assert np.max(np.abs(np.asarray(fit.y) / np.asarray(table.y) - 1)) == pytest.approx(
        record["errors"]["heat_capacity_p"]["max_relative"], rel=1e-9)
    # three error curves and the band of the table's own estimated error (± in per cent of C_p)
    assert len(err.data) == 4 and err.data[3].fill == "toself"
    assert max(np.max(np.abs(tr.y)) for tr in err.data) < 100 * 0.05  # per cent
    assert "± from the table's error" in str(keys) and "S at 298.15 K" in str(keys)
    assert any("harmonic" in str(m.children) for m in messages)


def test_page_block_equals_the_cli_output(demo, tmp_path, capsys):
    current = session.active(demo)
    path = tmp_path / current["name"]
    path.write_bytes(session.content_bytes(current))
    opts = session.options_of(current)
    argv = ["polynomial", str(path), "--form", "nasa7", "--range", "298.15:1200", "--format", "csv",
            "--negative", opts["negative"], "--low-frequency", str(opts["low_frequency"])]
    if opts.get("freq_unit"):
        argv += ["--freq-unit", opts["freq_unit"]]
    if opts.get("atoms"):
        argv += ["--atoms", str(opts["atoms"])]
    assert main(argv) == 0
    cli = capsys.readouterr().out
    block = polynomials.draw(demo, "nasa7", 298.15, 1200, None, 0, "cr", "", "csv")[3]
    rows = lambda text: [line for line in text.splitlines() if not line.startswith(("# source", "# created_utc"))]
    assert rows(block) == rows(cli)


def test_sgte_yaml_is_refused_in_one_line_and_bad_range_reported(demo):
    out = polynomials.draw(demo, "sgte", 298.15, 1500, None, 0, "cr", "Cu", "yaml")
    assert out[3] == "" and any("no sgte model" in str(m.children) for m in out[4])
    bad = polynomials.draw(demo, "shomate", 900, 300, None, 0, "cr", "", "json")
    assert "0 < LO < HI" in str(bad[4][0].children)
