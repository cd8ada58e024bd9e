"""A table as one more run of a comparison (:func:`thermo.convergence.add_table_run`, ``modeheat compare --table``).

Truth: the closed-form Debye free energy (Debye 1912) with mpmath (tests/phases/references.py), S = −∂F/∂T by
mpmath's numerical derivative; J/mol per eV and R from CODATA via scipy.constants.
"""

from __future__ import annotations

import mpmath as mp
import numpy as np
import pandas as pd
import pytest
from scipy import constants as sc

from tests.phases.references import debye_free_energy
from thermo.columns import column_name, error_key
from thermo.convergence import add_table_run, compare_runs, difference_key, with_table_run
from thermo.io.writers import export_table
from thermo.spectrum import PhononDOS

J_PER_MOL_PER_EV = sc.N_A * sc.electron_volt
THETA = 400.0                                   # K, invented


def _s(t):
    with mp.workdps(30):
        return float(-mp.diff(lambda x: debye_free_energy(THETA, x), mp.mpf(t))) if t > 0 else 0.0


def debye_run():
    """A Debye spectrum of one atom with θ_D = 400 K (g ∝ ν² up to ν_D = k θ / h)."""
    nu_d = sc.k * THETA / sc.h / 1e12
    nu = np.linspace(0.0, nu_d, 2001)
    return PhononDOS(nu, 9 * nu**2 / nu_d**3, atoms=1)


def debye_table(rows, third_law=False):
    """S and F per mole (one atom per formula unit) on ``rows``; S as a calorimetric S° when ``third_law``."""
    s = np.array([_s(t) for t in rows]) * J_PER_MOL_PER_EV
    f = np.array([float(debye_free_energy(THETA, t)) for t in rows]) * J_PER_MOL_PER_EV / sc.kilo
    table = {column_name("temperature"): rows}
    if third_law:
        table[column_name("entropy_third_law")] = s
        table[column_name("entropy_third_law_error")] = np.full(rows.size, 0.01)
    else:
        table[column_name("entropy")] = s
        table[column_name(error_key("entropy"))] = np.zeros(rows.size)      # exact to ~1e-12 (mpmath)
        table[column_name("helmholtz_energy")] = f
    return pd.DataFrame(table)


def test_a_coarse_table_run_is_within_its_stated_error_of_the_closed_form():
    at = np.array([5.0, 25.0, 110.0, 298.15, 333.0])
    comparison = compare_runs([debye_run()], at, names=["debye.dat"])
    out = add_table_run(comparison, debye_table(np.arange(0.0, 601.0, 20.0)), "coarse.csv")
    run = out[out["run"] == "coarse.csv"]
    s, u = run[column_name("entropy")].to_numpy(), run[column_name(error_key("entropy"))].to_numpy()
    truth = np.array([_s(t) for t in at]) * J_PER_MOL_PER_EV
    assert np.all(np.abs(s - truth) <= u)
    assert np.all(u[2:] < 0.01 * truth[2:])                      # an honest bound, not a blanket
    assert np.isnan(run[column_name("heat_capacity_v")]).all()   # the table has no C_v: nothing claimed
    # the Debye spectrum and the closed form agree: ΔS/S small at room temperature
    assert abs(run[column_name(difference_key("entropy"))].to_numpy()[3]) < 1e-3


def test_a_calorimetric_entropy_stands_for_s_and_converts_per_atom():
    at = np.array([50.0, 298.15])
    comparison = compare_runs([debye_run()], at, per="atom", names=["debye.dat"])
    out = add_table_run(comparison, debye_table(np.arange(10.0, 401.0, 10.0), third_law=True), "cp.csv", atoms=1)
    run = out[out["run"] == "cp.csv"]
    s_kb = run[column_name("entropy", "atom")].to_numpy()
    truth = np.array([_s(t) for t in at]) / (sc.k / sc.electron_volt)          # k_B per atom
    np.testing.assert_allclose(s_kb, truth, rtol=2e-3)
    assert np.all(run[column_name(error_key("entropy"), "atom")].to_numpy() >= 0.01 / sc.R)
    with pytest.raises(Exception, match="atom count"):
        add_table_run(comparison, debye_table(np.arange(10.0, 401.0, 10.0), third_law=True), "cp.csv")


def test_a_table_without_error_columns_states_no_error():
    rows = np.arange(0.0, 601.0, 20.0)
    table = debye_table(rows).drop(columns=[column_name(error_key("entropy"))])
    out = add_table_run(compare_runs([debye_run()], [25.0, 40.0]), table, "t")
    assert np.isnan(out[out["run"] == "t"][column_name(error_key("entropy"))]).all()


def test_outside_its_rows_a_table_claims_nothing_and_the_command_adds_it(tmp_path, capsys):
    from thermo.cli.main import main
    from thermo.io.readback import read_exported_csv
    out = add_table_run(compare_runs([debye_run()], [5.0, 700.0]), debye_table(np.arange(100.0, 601.0, 50.0)), "t")
    assert np.isnan(out[out["run"] == "t"][column_name("entropy")]).all()
    dos = tmp_path / "debye.dat"
    run = debye_run()
    dos.write_text("".join(f"{a:.17g} {b:.17g}\n" for a, b in zip(run.frequency_thz, run.dos)))
    table = tmp_path / "table.csv"
    table.write_bytes(export_table(debye_table(np.arange(0.0, 601.0, 20.0)), {"tool": "modeheat", "atoms": 1}, "csv"))
    assert main(["compare", str(dos), "--table", str(table), "--temperatures", "25,298.15", "--atoms", "1",
                 "--freq-unit", "THz"]) == 0
    cli, meta = read_exported_csv(capsys.readouterr().out.encode())
    assert list(cli["run"]) == ["debye.dat"] * 2 + ["table.csv"] * 2
    assert meta["inputs"][-1]["role"] == "table run" and meta["comparison"]["runs"][-1] == "table.csv"
    ours, _ = with_table_run(compare_runs([run], [25.0, 298.15], names=["debye.dat"]), None, table.read_bytes(),
                             "table.csv")
    mine = (cli["run"] == "table.csv").to_numpy()          # the table run: the same numbers to the written digits
    np.testing.assert_allclose(cli[column_name("entropy")][mine], ours[column_name("entropy")][mine], rtol=1e-7)
