"""``batch --kind quasiharmonic|polynomial``: many materials to one merged coefficient file.

External references: the Shomate equation C_p = A + Bt + Ct² + Dt³ + E/t², t = T/1000 K
(Chase, NIST-JANAF Thermochemical Tables, 4th ed., 1998; the form the NIST WebBook uses),
re-typed here and evaluated on the merged coefficients; the Debye heat capacity
C_v = 9R (T/θ)³ ∫₀^{θ/T} x⁴eˣ/(eˣ−1)² dx (Debye, Ann. Phys. 344, 789 (1912)) by mpmath
quadrature; the quasi-harmonic Debye solid of tests/quasiharmonic/debye_solid.py (C_p by a
direct mpmath minimisation of F(V, T)); SHA-256 by ``hashlib``. The spectra are invented.
"""

import csv
import hashlib
import json
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from tests.quasiharmonic import debye_solid as ds
from tests.quasiharmonic.test_volume_set import write_set
from tests.spectra import debye_table, dos_text
from thermo.campaign import CampaignOptions, run_campaign
from thermo.cli.main import main
from thermo.io.readback import read_exported_csv

J_PER_EV = sc.electron_volt * sc.N_A      # eV per formula unit -> J/mol (CODATA via scipy.constants)


def shomate_cp(coefficients, temperature):
    # Chase (1998): C_p = A + B t + C t² + D t³ + E / t², t = T / 1000 K
    t = temperature / 1000.0
    c = coefficients
    return c["A"] + c["B"] * t + c["C"] * t ** 2 + c["D"] * t ** 3 + c["E"] / t ** 2


def debye_cv(theta, temperature):
    # Debye (1912), one atom: C_v = 9R (T/θ)³ ∫₀^{θ/T} x⁴ eˣ / (eˣ − 1)² dx, by mpmath
    x_d = mp.mpf(theta) / temperature
    integral = mp.quad(lambda x: x ** 4 * mp.exp(x) / mp.expm1(x) ** 2, [0, x_d])
    return float(9 * sc.R * (temperature / mp.mpf(theta)) ** 3 * integral)


def _index(folder):
    with open(Path(folder) / "index.csv", newline="", encoding="utf-8") as handle:
        return list(csv.DictReader(handle))


def _check_hashes(inputs, folders):
    files = {p.name: p for folder in folders for p in Path(folder).iterdir() if p.is_file()}
    for item in inputs:
        assert item["sha256"] == hashlib.sha256(files[item["name"]].read_bytes()).hexdigest()


def test_quasiharmonic_campaign_merges_the_fits_of_every_volume_set(tmp_path, capsys):
    folders = [tmp_path / name for name in ("a", "b", "c_short")]
    for folder in folders:
        folder.mkdir()
    manifests = [write_set(folders[0]), write_set(folders[1], volumes=ds.VOLUMES[::-1]),
                 write_set(folders[2], volumes=ds.VOLUMES[:4])]          # 4 volumes: refused alone
    out = tmp_path / "out"
    code = main(["batch", *map(str, manifests), "--kind", "quasiharmonic", "--form", "shomate",
                 "--range", "298.15:700", "--temperatures", "0:700:10,298.15", "--output", str(out),
                 "--workers", "2"])
    assert code == 1
    rows = _index(out)
    assert [r["status"] for r in rows] == ["ok", "ok", "failed"] and "at least 5" in rows[2]["error"]
    assert [r["output"] for r in rows] == ["set.csv", "set-2.csv", ""] and rows[0]["volumes"] == "11"
    assert sorted(p.name for p in out.iterdir()) == ["coefficients.json", "index.csv", "set-2.csv", "set.csv"]
    assert "c_short" in capsys.readouterr().err

    merged = json.loads((out / "coefficients.json").read_text())
    assert [e["name"] for e in merged["entries"]] == ["set", "set-2"]
    assert [Path(f["input"]).parent.name for f in merged["failed"]] == ["c_short"]
    # every input of every entry (the manifest, then each DOS) with its SHA-256, at the top as well
    assert len(merged["provenance"]["inputs"]) == 2 * 12
    for entry, folder in zip(merged["entries"], folders):
        assert len(entry["inputs"]) == 12
        _check_hashes(entry["inputs"], [folder])
    assert merged["provenance"]["settings"]["form"] == "shomate"
    # the merged coefficients against the mpmath minimisation of the Debye solid's F(V, T)
    coefficients = merged["entries"][0]["ranges"][0]["coefficients"]
    expected = ds.reference(550.0)["cp"] * J_PER_EV
    assert shomate_cp(coefficients, 550.0) == pytest.approx(expected, rel=2e-3)
    # same volumes in another order: the same fit (to the precision the fit itself carries)
    other = merged["entries"][1]["ranges"][0]["coefficients"]
    assert shomate_cp(other, 500.0) == pytest.approx(shomate_cp(coefficients, 500.0), rel=1e-9)


@pytest.fixture
def debye_files(tmp_path):
    folder = tmp_path / "dos"
    folder.mkdir()
    thetas = {"soft.dat": 250.0, "stiff.dat": 450.0}
    for name, theta in thetas.items():
        (folder / name).write_text(dos_text(*debye_table(theta, 1, 1001)))
    (folder / "broken.dat").write_text("# frequency_THz total\n0 0\n1 x\n")
    return folder, thetas


def test_polynomial_campaign_of_dos_files_in_one_csv(debye_files, tmp_path):
    folder, thetas = debye_files
    out = tmp_path / "out"
    assert main(["batch", str(folder), "--kind", "polynomial", "--range", "298.15:1000",
                 "--coefficients", "csv", "--output", str(out)]) == 1
    assert [r["status"] for r in _index(out)] == ["failed", "ok", "ok"]        # broken, soft, stiff
    table, info = read_exported_csv(out / "coefficients.csv")
    _check_hashes(info["inputs"], [folder])
    assert [f["input"].endswith("broken.dat") for f in info["failed"]] == [True]
    for name, theta in thetas.items():
        rows = table[table["name"] == Path(name).stem]
        assert set(rows["form"]) == {"shomate"}
        coefficients = dict(zip(rows["coefficient"], rows["value"]))
        for t in (300.0, 800.0):
            assert shomate_cp(coefficients, t) == pytest.approx(debye_cv(theta, t), rel=2e-3)


def test_campaign_results_do_not_depend_on_the_executor(debye_files, tmp_path):
    folder, _ = debye_files
    options = CampaignOptions("polynomial", form="nasa7", fit_range=(298.15, 1000.0))
    alone = run_campaign([folder], tmp_path / "one", options, workers=1, progress=False)
    pooled = run_campaign([folder], tmp_path / "pool", options, workers=2, progress=False)
    with ThreadPoolExecutor(2) as pool:
        threaded = run_campaign([folder], tmp_path / "threads", options, progress=False, executor=pool)
    for other in (pooled, threaded):
        assert [r["entry"] for r in other] == [r["entry"] for r in alone]
        assert [r["row"] for r in other] == [r["row"] for r in alone]


def test_campaign_options_are_checked_before_any_work(debye_files, tmp_path, capsys):
    folder, _ = debye_files
    out = tmp_path / "out"
    assert main(["batch", str(folder), "--kind", "polynomial", "--per", "atom", "--output", str(out)]) == 2
    assert main(["batch", str(folder), "--kind", "quasiharmonic", "--form", "sgte", "--range", "298.15:1500",
                 "--temperatures", "0:1000:10", "--output", str(out)]) == 2
    errors = capsys.readouterr().err.strip().splitlines()
    assert len(errors) == 2 and "--per" in errors[0] and "must cover the fit range" in errors[1]
    assert not out.exists()


def test_merged_csv_carries_the_coefficient_uncertainties(debye_files, tmp_path):
    # The harmonic source carries its error estimate; each coefficient's propagated uncertainty is
    # written beside it, as the single-file polynomial CSV does (same numbers, same fit).
    folder, _ = debye_files
    out = tmp_path / "out"
    run_campaign([folder / "soft.dat"], out, CampaignOptions("polynomial", fit_range=(298.15, 1000.0)),
                 workers=1, progress=False, coefficients="csv")
    merged, _ = read_exported_csv(out / "coefficients.csv")
    assert main(["polynomial", str(folder / "soft.dat"), "--range", "298.15:1000", "--format", "csv",
                 "--output", str(tmp_path / "single.csv")]) == 0
    single, _ = read_exported_csv(tmp_path / "single.csv")
    assert list(merged["coefficient"]) == list(single["coefficient"])
    np.testing.assert_array_equal(merged["value"], single["value"])
    np.testing.assert_array_equal(merged["uncertainty"], single["uncertainty"])
