"""Phases given by tables (thermo/phases/tabulated.py): a quasi-harmonic table's G and a calorimetry table's
H° − H°(0) and S°, interpolated between rows with an error that covers the interpolation.

Truth: the closed-form Debye free energy (Debye 1912) and Einstein free energy (Einstein 1907) with mpmath
(tests/phases/references.py); S = −∂F/∂T by mpmath's numerical derivative; crossings by mpmath's root finder.
"""

from __future__ import annotations

import mpmath as mp
import numpy as np
import pandas as pd
import pytest
from scipy import constants as sc

from tests.phases.references import KB_EV, crossing, debye_free_energy, einstein_free_energy
from thermo.columns import column_name
from thermo.errors import OptionError
from thermo.io.writers import export_table
from thermo.phases import Phase, compare_phases
from thermo.phases.tabulated import read_phase_table, tabulated_phase

J_PER_MOL_PER_EV = sc.N_A * sc.electron_volt      # CODATA via scipy.constants


def _entropy(free_energy, theta, t):
    """S = −∂F/∂T per atom [eV/K] (mpmath derivative; 0 at T = 0)."""
    if t == 0:
        return 0.0
    with mp.workdps(30):
        return float(-mp.diff(lambda x: free_energy(theta, x), mp.mpf(t)))


def qh_kind(theta, temperatures):
    """A quasi-harmonic-style table (G, S per formula unit of one atom) of a Debye solid."""
    g = np.array([float(debye_free_energy(theta, t)) for t in temperatures])
    s = np.array([_entropy(debye_free_energy, theta, t) for t in temperatures])
    return pd.DataFrame({column_name("temperature"): temperatures,
                         column_name("gibbs_energy"): g * J_PER_MOL_PER_EV / sc.kilo,
                         column_name("entropy"): s * J_PER_MOL_PER_EV})


def calorimetry_kind(theta, temperatures):
    """A calorimetry-style table (H° − H°(0), S° per mole) of an Einstein solid."""
    f0 = float(einstein_free_energy(theta, 0))
    f = np.array([float(einstein_free_energy(theta, t)) for t in temperatures])
    s = np.array([_entropy(einstein_free_energy, theta, t) for t in temperatures])
    h = f + temperatures * s - f0                       # H − H(0) = F + TS − F(0)
    return pd.DataFrame({column_name("temperature"): temperatures,
                         column_name("entropy_third_law"): s * J_PER_MOL_PER_EV,
                         column_name("entropy_third_law_error"): np.zeros_like(s),
                         column_name("enthalpy_from_zero"): h * J_PER_MOL_PER_EV / sc.kilo,
                         column_name("enthalpy_from_zero_error"): np.zeros_like(s)})


def test_a_coarse_table_interpolates_within_its_stated_error():
    # 50 K rows: between them the stated error must cover the distance to the closed form, and stay small
    rows = np.arange(0.0, 1001.0, 50.0)
    tab = tabulated_phase(qh_kind(400.0, rows), {"atoms": 1}, "debye.csv")
    mid = np.arange(25.0, 1000.0, 50.0)
    g, s, u = tab.values(mid)
    truth = np.array([float(debye_free_energy(400.0, t)) for t in mid])
    s_truth = np.array([_entropy(debye_free_energy, 400.0, t) for t in mid])
    assert np.all(np.abs(g - truth) <= u)
    assert u.max() < 2e-3 and np.abs(g - truth).max() > 0        # meaningful, not a blanket
    np.testing.assert_allclose(s, s_truth, rtol=2e-2, atol=1e-3 * KB_EV)
    g_rows, _, u_rows = tab.values(rows)
    np.testing.assert_allclose(g_rows, [float(debye_free_energy(400.0, t)) for t in rows], rtol=1e-12)
    assert np.all(u_rows == 0)


def test_calorimetry_table_gives_g_from_its_own_zero():
    rows = np.arange(2.0, 351.0, 4.0)
    tab = tabulated_phase(calorimetry_kind(200.0, rows), {"atoms": 1}, "cp.csv")
    assert tab.kind == "calorimetry table" and any("H°(0)" in w for w in tab.warnings)
    f0 = float(einstein_free_energy(200.0, 0))
    np.testing.assert_allclose(tab.gibbs_ev, [float(einstein_free_energy(200.0, t)) - f0 for t in rows],
                               rtol=1e-9, atol=1e-12)


def test_transition_between_two_tables_matches_the_closed_form_crossing():
    # Debye θ = 400 K (reference) against Einstein θ_E = 150 K lying 0.01 eV higher at 0 K (static + zero point)
    rows = np.arange(2.0, 801.0, 10.0)
    debye = tabulated_phase(qh_kind(400.0, rows), {"atoms": 1}, "debye.csv")
    einstein = tabulated_phase(calorimetry_kind(150.0, rows), {"atoms": 1}, "einstein.csv")
    lift = float(debye_free_energy(400.0, 0)) + 0.01            # H°(0) of the Einstein phase
    phases = [Phase("a", debye), Phase("b", einstein, static_ev=lift)]
    result = compare_phases(phases, np.arange(10.0, 800.0, 10.0))
    f0 = float(einstein_free_energy(150.0, 0))
    truth = crossing(lambda t: einstein_free_energy(150.0, t) - f0 + lift - debye_free_energy(400.0, t), 200.0)
    (found,) = result.transitions
    assert (found["low_phase"], found["high_phase"]) == ("a", "b")
    assert abs(found["temperature_K"] - truth) <= max(found["uncertainty_K"], 1e-6)
    assert found["uncertainty_K"] < 1.0


def test_an_exported_table_reads_back_as_a_phase(tmp_path):
    rows = np.arange(0.0, 101.0, 10.0)
    path = tmp_path / "qh.csv"
    path.write_bytes(export_table(qh_kind(300.0, rows), {"tool": "modeheat", "atoms": 1}, "csv"))
    tab = read_phase_table(path)
    assert tab.name == "qh.csv" and tab.atoms == 1 and len(tab.sha256) == 64
    np.testing.assert_allclose(tab.gibbs_ev, [float(debye_free_energy(300.0, t)) for t in rows], rtol=1e-6)


def test_refusals_say_what_and_where():
    rows = np.arange(0.0, 101.0, 10.0)
    tab = tabulated_phase(qh_kind(300.0, rows), {"atoms": 1}, "qh.csv")
    with pytest.raises(OptionError, match=r"qh.csv.*0–100 K.*150 K is outside"):
        tab.values([50.0, 150.0])
    per_gram = qh_kind(300.0, rows).rename(columns={column_name("entropy"): column_name("entropy", "gram")})
    with pytest.raises(OptionError, match="per gram"):
        tabulated_phase(per_gram, {"atoms": 1})
    with pytest.raises(OptionError, match="cannot be a phase"):
        tabulated_phase(pd.DataFrame({column_name("temperature"): rows}), {})
    from thermo.quasiharmonic import read_manifest
    from webapp.demo import demo_file
    with pytest.raises(OptionError, match="all volume sets"):
        compare_phases([Phase("t", tab), Phase("v", read_manifest(demo_file("volumes", "springium_volumes.csv")))],
                       rows)
