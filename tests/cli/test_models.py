"""``modeheat models`` command: JSON keys and values on Debye, Einstein-like and two-band spectra.

Outside references: Barron, Berg & Morrison, Proc. R. Soc. Lond. A 242, 478
(1957) (moment θ's of a Debye spectrum equal θ_D); Einstein (1907) (a narrow
peak at ν₀ has θ_E = hν₀/k_B); CODATA h/k_B via scipy.constants; the CSV is
read back with pandas, an independent parser.
"""

from __future__ import annotations

import io
import json

import numpy as np
import pandas as pd
import pytest
from scipy import constants as sc

from tests.spectra import gaussian, write_text
from tests.clirun import run_main
from thermo.cli.main import main
from thermo.tables import COLUMNS

H_OVER_K = sc.h * 1e12 / sc.k
REQUIRED = ("einstein_theta_entropy_K", "einstein_theta_fit_K", "einstein_theta_mean_K",
            "debye_theta_low_frequency_K", "debye_theta_moment_m2_K", "debye_theta_moment_m1_K",
            "debye_theta_moment_0_K", "debye_theta_moment_1_K", "debye_theta_moment_2_K", "debye_theta_fit_K",
            "composite_debye_theta_K", "composite_einstein_theta_K")


@pytest.fixture
def debye_file(tmp_path):
    nu = np.linspace(0.0, 5.0, 501)
    return write_text(tmp_path / "debye.dat", nu, 9 / 125 * nu ** 2)


@pytest.fixture
def peak_file(tmp_path):
    nu = np.linspace(0.0, 8.0, 1601)
    return write_text(tmp_path / "peak.dat", nu, gaussian(nu, 5.0, 0.03, 3.0))


@pytest.fixture
def two_band_file(tmp_path):
    nu = np.linspace(0.0, 10.0, 2001)
    g = np.where(nu <= 3.0, 9 / 27 * nu ** 2, 0.0) + gaussian(nu, 6.0, 0.1, 3.0) + gaussian(nu, 8.5, 0.1, 3.0)
    return write_text(tmp_path / "twoband.dat", nu, g)


def run_json(capsys, *argv):
    assert main(["models", *map(str, argv)]) == 0
    return json.loads(capsys.readouterr().out)


def test_debye_file_json_keys_and_equal_thetas(capsys, debye_file):
    r = run_json(capsys, debye_file, "--temperatures", "0:300:50")
    assert set(REQUIRED) <= set(r)
    for key in REQUIRED:
        if key.startswith("debye") or key == "composite_debye_theta_K":
            assert r[key] == pytest.approx(5.0 * H_OVER_K, rel=1e-4), key    # Barron et al. 1957
    assert r["composite_einstein_theta_K"] is None                           # one atom: no optical modes
    assert len(r["temperature_K"]) == len(r["equivalent_debye_temperature_K"]) == 7
    assert r["equivalent_debye_temperature_K"][0] is None                    # T = 0: undefined
    assert r["equivalent_debye_temperature_K"][1:] == pytest.approx([5.0 * H_OVER_K] * 6, rel=1e-4)


def test_einstein_like_file(capsys, peak_file):
    r = run_json(capsys, peak_file, "--fit-range", "20:600")
    assert set(REQUIRED) <= set(r) and "temperature_K" not in r
    assert r["einstein_theta_entropy_K"] == pytest.approx(5.0 * H_OVER_K, rel=1e-4)
    assert r["einstein_theta_fit_K"] == pytest.approx(5.0 * H_OVER_K, rel=1e-4)
    assert r["einstein_theta_mean_K"] == pytest.approx(5.0 * H_OVER_K, rel=1e-4)
    assert r["debye_theta_low_frequency_K"] is None                          # no ν² region
    assert r["fit_range_K"] == [20.0, 600.0]


def test_two_band_file_with_one_and_two_optical_terms(capsys, two_band_file):
    one = run_json(capsys, two_band_file, "--temperatures", "5,50,500")
    assert set(REQUIRED) <= set(one)
    assert isinstance(one["composite_einstein_theta_K"], float)
    assert one["composite"]["initial"]["debye_theta_K"] == pytest.approx(3.0 * H_OVER_K, rel=2e-3)
    # optical log-moment of two equal peaks at 6 and 8.5 THz: sqrt(6 · 8.5) THz (entropy matching)
    assert one["composite"]["initial"]["einstein_thetas_K"][0] == pytest.approx(np.sqrt(6 * 8.5) * H_OVER_K, rel=2e-3)
    two = run_json(capsys, two_band_file, "--optical-terms", "2")
    assert two["composite_einstein_theta_K"] == pytest.approx([6.0 * H_OVER_K, 8.5 * H_OVER_K], rel=2e-3)
    assert two["composite_debye_theta_K"] == pytest.approx(3.0 * H_OVER_K, rel=2e-3)
    # one Einstein term for two separate peaks is a worse description: larger C_v misfit
    assert one["composite"]["rms_residual_J_per_mol_K"] > 3 * two["composite"]["rms_residual_J_per_mol_K"]
    assert [d["key"] for d in two["definitions"]][:3] == ["einstein_theta_entropy_K", "einstein_theta_fit_K",
                                                          "einstein_theta_mean_K"]


def test_csv_side_by_side(capsys, peak_file):
    assert main(["models", str(peak_file), "--format", "csv", "--temperatures", "0:400:100"]) == 0
    text = capsys.readouterr().out
    df = pd.read_csv(io.StringIO(text), comment="#")
    assert df.temperature_K.tolist() == [0.0, 100.0, 200.0, 300.0, 400.0]
    for prefix in ("dos", "einstein", "debye", "composite"):
        for col in COLUMNS["formula"][1:]:
            assert f"{prefix}_{col}" in df.columns
    assert "# einstein_theta_K:" in text


def test_csv_without_temperatures_uses_a_default_grid(capsys, debye_file):
    assert main(["models", str(debye_file), "--format", "csv"]) == 0
    df = pd.read_csv(io.StringIO(capsys.readouterr().out), comment="#")
    assert len(df) > 10 and df.temperature_K.iloc[0] == 0.0


@pytest.mark.parametrize("argv", [["--fit-range", "300:10"], ["--fit-range", "abc"], ["--optical-terms", "0"],
                                  ["--temperatures", "1:0:1"]])
def test_bad_options_exit_2_with_one_line(capsys, debye_file, argv):
    assert main(["models", str(debye_file), *argv]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and err[0].startswith("error:")


def test_default_output_is_json(debye_file):
    out = run_main("models", debye_file)          # in-process; the real process: tests/cli/test_smoke.py
    assert out.returncode == 0, out.stderr
    assert json.loads(out.stdout)["debye_theta_moment_0_K"] == pytest.approx(5.0 * H_OVER_K, rel=1e-4)
