"""``modeheat calorimetry``: JSON keys of issue 13, csv/xlsx tables, one-line errors (exit 2)."""

import io
import json

import janaf
import numpy as np
import pandas as pd
import pytest

from thermo.cli.main import main

from .test_external import GAMMA_FROM_MEMORY


def _janaf_file(tmp_path, element):
    # NIST-JANAF (Chase 1998) C_p of the crystal, 100-700 K, via the `janaf` package.
    df = janaf.search(formula=f"^{element}$", phase="^cr$").df
    t, cp = df["T(K)"].to_numpy(), df["Cp"].to_numpy()
    keep = (t >= 100) & (t <= 700)
    path = tmp_path / f"{element}.csv"
    path.write_text("T (K),Cp (J/(mol K))\n" + "".join(f"{a},{b}\n" for a, b in zip(t[keep], cp[keep])))
    return path


def test_json_keys_and_janaf_aluminium_entropy(tmp_path, capsys):
    # S°(298.15 K) of Al(cr) 28.275 J/(mol K) (NIST-JANAF, Chase 1998).
    path = _janaf_file(tmp_path, "Al")
    assert main(["calorimetry", str(path), "--atoms", "1", "--fix", f"gamma={GAMMA_FROM_MEMORY['Al']}"]) == 0
    captured = capsys.readouterr()
    out = json.loads(captured.out)
    for key in ("theta_D_K", "gamma_J_per_mol_K2", "dilation_A_mol_per_J"):
        assert set(out["fit"][key]) >= {"value", "uncertainty"}
    assert out["fit"]["gamma_J_per_mol_K2"] == {"value": 1.35e-3, "uncertainty": 0.0, "fixed": True}
    assert "scale" not in out["fit"]
    assert out["entropy_298_15_J_per_mol_K"]["value"] == pytest.approx(28.275, rel=0.01)
    # The data start at 100 K, above θ_D/10: S° from data is weakly determined, its ± says so and covers
    # JANAF; the T³ form alone (C(100 K)/3 = 4.33 vs JANAF S(100 K) = 6.987) is one end of the range.
    data = out["entropy_298_15_from_data_J_per_mol_K"]
    assert abs(data["value"] - 28.275) <= 2 * data["uncertainty"]
    below = out["below_first_point"]
    # C = γT + bT³ through C(T₁): S(T₁) = C₁/3 + 2γT₁/3 with the held γ.
    assert below["forms"]["debye T³"]["entropy_J_per_mol_K"]["value"] == pytest.approx((12.997 + 2 * 1.35e-3 * 100) / 3)
    assert below["entropy_J_per_mol_K"]["uncertainty"] > 0.5 and 0.1 < below["share_of_entropy_298_15"] < 0.4
    assert any("weakly determined" in n and "(100 K)" in n for n in out["notes"]) and "note:" in captured.err
    assert out["max_relative_residual"] <= 0.015
    assert len(out["residuals"]["temperature_K"]) == out["points_fitted"] == 11


def test_demo_with_dos_reports_scale_and_dos_entropy(capsys):
    # Invented demo: the generator softened the DOS by 4 % (scale 0.96) and used
    # γ = 1.1 mJ/(mol K²), A = 6e-6 mol/J; the fit must find them within 3σ (springium is a metal).
    assert main(["calorimetry", "sample_dos/measured/springium_cp.csv", "--dos", "sample_dos/springium_fcc.dat",
                 "--metal"]) == 0
    out = json.loads(capsys.readouterr().out)
    for key, true in (("scale", 0.96), ("gamma_J_per_mol_K2", 1.1e-3), ("dilation_A_mol_per_J", 6e-6)):
        assert abs(out["fit"][key]["value"] - true) <= 3 * out["fit"][key]["uncertainty"], key
    data, model = out["entropy_298_15_from_data_J_per_mol_K"], out["entropy_298_15_J_per_mol_K"]
    assert abs(data["value"] - model["value"]) <= 3 * np.hypot(data["uncertainty"], model["uncertainty"])
    assert out["entropy_298_15_from_dos_J_per_mol_K"] < model["value"]   # harmonic, stiffer, no γT


def test_csv_and_xlsx_tables(tmp_path, capsys):
    assert main(["calorimetry", "sample_dos/measured/springium_cp.csv", "--atoms", "1", "--range", "20:350",
                 "--format", "csv"]) == 0
    text = capsys.readouterr().out
    df = pd.read_csv(io.StringIO(text), comment="#")
    assert df["relative_residual"].isna().sum() == int((df["temperature_K"] < 20).sum()) > 0
    assert np.all(np.diff(df["entropy_third_law_J_per_mol_K"]) > 0)
    out = tmp_path / "cal.xlsx"
    assert main(["calorimetry", "sample_dos/measured/springium_cp.csv", "--format", "xlsx", "--output", str(out)]) == 0
    assert out.read_bytes()[:2] == b"PK"


@pytest.mark.parametrize("extra, message", [
    (["--fix", "zeta=1"], "unknown parameter 'zeta'"),
    (["--model", "dos"], "needs --dos"),
    (["--range", "400:500"], "holds 0 measured point"),
    (["--format", "xlsx"], "needs --output"),
    (["--model", "debye+dilation-values"], "needs --dilation-values"),
])
def test_bad_options_exit_2_with_one_line(extra, message, capsys):
    assert main(["calorimetry", "sample_dos/measured/springium_cp.csv", "--atoms", "1", *extra]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert err[-1].startswith("error:") and message in err[-1]


def test_dilation_values_file_is_used_as_given(tmp_path, capsys):
    # Data = Debye(θ_D 320 K) + a given C_p − C_v = α²B_T V T (made-up α, B_T, V); with the same
    # values supplied through --dilation-values the Debye fit must be exact.
    from thermo.calorimetry import dilation_from_expansion
    from .test_external import _debye_cv_mpmath
    t = np.linspace(20.0, 500.0, 25)
    dc = dilation_from_expansion(4e-5, 1.2e11, 8e-6, t)
    cp = np.array([_debye_cv_mpmath(x, 320.0) for x in t]) + dc
    measured = tmp_path / "m.txt"
    measured.write_text("T Cp\n" + "".join(f"{a:.10g} {b:.12g}\n" for a, b in zip(t, cp)))
    given = tmp_path / "dilation.txt"
    given.write_text("".join(f"{a:.10g} {b:.12g}\n" for a, b in zip(t, dc)))
    assert main(["calorimetry", str(measured), "--atoms", "1", "--model", "debye+dilation-values",
                 "--dilation-values", str(given)]) == 0
    out = json.loads(capsys.readouterr().out)
    assert out["fit"]["theta_D_K"]["value"] == pytest.approx(320.0, rel=1e-7)
    assert out["max_relative_residual"] < 1e-8
    assert np.array(out["residuals"]["heat_capacity_dilation_J_per_mol_K"]) == pytest.approx(dc, rel=1e-9)


def test_undetermined_parameters_give_strict_json(tmp_path, capsys):
    # Two points far above θ_D: A and γ cannot both be found; the JSON must still be strict
    # (no NaN/Infinity tokens) and say so through null uncertainties or a correlation warning.
    path = tmp_path / "flat.csv"
    path.write_text("T,Cp\n800,25.1\n900,25.3\n1000,25.5\n")
    assert main(["calorimetry", str(path), "--atoms", "1", "--fix", "theta_D=300"]) == 0
    text = capsys.readouterr().out
    assert "NaN" not in text and "Infinity" not in text
    json.loads(text)
