"""``--histogram``: a file's rows read as histogram bins (Σ g·Δν) when the file does not say so itself.

Input: the 16³ Monkhorst–Pack mesh of the spring-model bcc test crystal (tests/crystal.py, invented springs)
counted in 0.05 THz bins whose edges sit at ±Δ/2 around multiples of Δ — bin centres 0, Δ, 2Δ …, which the
automatic detection (centres (i + ½)Δ) cannot recognise. Independent check: the Planck sum over the bins
(centre, g·Δ) done here with tests/crystal.planck_sums (CODATA constants via scipy.constants).
"""

import json

import numpy as np
import pytest
from scipy import constants as sc

from tests import crystal as C
from tests.clirun import run_main

BIN = 0.05


@pytest.fixture(scope="module")
def shifted_histogram(tmp_path_factory):
    _q, w, nu = C.mesh_modes(C.BCC, 16)
    edges = np.arange(-BIN / 2, nu.max() + BIN, BIN)
    counts, _ = np.histogram(nu.ravel(), bins=edges, weights=np.repeat(w, 3))
    centres, g = (edges[:-1] + edges[1:]) / 2, counts / BIN
    path = tmp_path_factory.mktemp("hist") / "bcc16_bins.dat"
    path.write_text(C.dos_text(centres, g), encoding="utf-8")
    return path, centres, counts


def test_the_histogram_option_sums_the_bins(shifted_histogram):
    path, centres, counts = shifted_histogram
    plain = json.loads(run_main("summary", path, "--atoms", "1").stdout)
    binned = run_main("summary", path, "--atoms", "1", "--histogram")
    assert binned.returncode == 0, binned.stderr
    binned = json.loads(binned.stdout)
    assert binned["raw_integral"] == pytest.approx(3.0, rel=1e-9)            # Σ g·Δν of a normalised count
    assert abs(plain["raw_integral"] - 3.0) > 1e-3                            # the curve rule reads it otherwise
    # C_v and S at 298.15 K: the bins as modes at their centres (independent Planck sum)
    real = centres > 0
    ref = C.planck_sums(centres[real], counts[real] * 3.0 / counts[real].sum(), [298.15])
    assert binned["heat_capacity_v_298K_J_per_mol_K"] == pytest.approx(sc.R * ref["c"][0], rel=1e-9)
    assert binned["entropy_298K_J_per_mol_K"] == pytest.approx(sc.R * ref["s"][0], rel=1e-9)


def test_the_histogram_option_is_recorded_and_refuses_unequal_rows(shifted_histogram, tmp_path):
    path = shifted_histogram[0]
    out = tmp_path / "t.json"
    done = run_main("table", path, "--atoms", "1", "--histogram", "--temperatures", "100,300",
                    "--format", "json", "--output", out)
    assert done.returncode == 0, done.stderr
    record = json.loads(out.read_text(encoding="utf-8"))
    assert "read as a histogram" in " ".join(record["provenance"]["warnings"])
    uneven = tmp_path / "uneven.dat"
    rows = [0.1, 0.2, 0.35] + [0.35 + 0.1 * k for k in range(1, 10)]             # the 4th line is 0.15 from the 3rd
    uneven.write_text("frequency_THz total\n" + "".join(f"{f:.2f} {f * f:.4f}\n" for f in rows), encoding="utf-8")
    bad = run_main("table", uneven, "--histogram")
    assert bad.returncode == 2 and bad.stderr.count("\n") == 1
    assert "equally spaced bin centres" in bad.stderr and "line 4" in bad.stderr
