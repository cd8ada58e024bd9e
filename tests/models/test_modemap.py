"""Mode map, residuals, C_v/T³ and the occupation explorer against closed forms.

Outside references: Debye (1912) closed forms (C_v/T³ plateau 12π⁴R/(5θ³),
share of C_v below ν in a Debye solid as a ratio of Debye integrals, evaluated
with mpmath); Planck (1901) occupation and equipartition (common-practice
limits); CODATA h, k_B, e via scipy.constants.
"""

from __future__ import annotations

import math

import mpmath as mp
import numpy as np
import pytest
from scipy import constants as sc

from tests.spectra import debye_spectrum, peak_dos, theta_of
from thermo.errors import OptionError
from thermo.models import (cv_over_t3, debye_table, einstein_table, largest_deviations, mode_share_map,
                           model_tables, occupation_explorer, residual_table, side_by_side)
from thermo.tables import COLUMNS, tabulate

R = sc.R


def test_mode_shares_sum_to_one_and_follow_mode_fractions_when_classical():
    dos = debye_spectrum(5.0)
    m = mode_share_map(dos, [0.0, 10.0, 1e7], bins=10)
    assert m["heat_capacity_share"].shape == (10, 3) and m["entropy_share"].shape == (10, 3)
    assert np.isnan(m["heat_capacity_share"][:, 0]).all()          # undefined at T = 0
    np.testing.assert_allclose(m["heat_capacity_share"][:, 1:].sum(axis=0), 1.0, rtol=1e-12)
    np.testing.assert_allclose(m["entropy_share"][:, 1:].sum(axis=0), 1.0, rtol=1e-12)
    np.testing.assert_allclose(m["cumulative_heat_capacity_share"][-1, 1:], 1.0, rtol=1e-12)
    # classical limit: every mode carries k_B, so the cumulative C_v share below ν is (ν/ν_D)^3 for Debye
    edges = m["bin_edges_thz"][1:]
    # (bins collect whole Gauss nodes of the ν² part, hence the 0.03 tolerance)
    np.testing.assert_allclose(m["cumulative_heat_capacity_share"][:, 2], (edges / 5.0) ** 3, atol=0.03)


def test_cumulative_heat_capacity_share_of_a_debye_solid_matches_mpmath():
    # Share of C_v from ν < ν' = ∫_0^{x'} x^4 e^x/(e^x-1)^2 / ∫_0^{y} (same), x' = hν'/k_BT (Debye 1912).
    nu_d, t = 5.0, 40.0
    m = mode_share_map(debye_spectrum(nu_d), [t], bins=10)
    mp.mp.dps = 25
    kernel = lambda x: x ** 4 * mp.exp(x) / mp.expm1(x) ** 2
    y = theta_of(nu_d) / t
    total = mp.quad(kernel, [0, y])
    for edge, share in zip(m["bin_edges_thz"][1:], m["cumulative_heat_capacity_share"][:, 0]):
        # bins collect whole quadrature nodes, so compare at 1/(64 nodes) resolution
        ref = float(mp.quad(kernel, [0, theta_of(edge) / t]) / total)
        assert share == pytest.approx(ref, abs=0.03)


def test_mode_map_bins_are_limited():
    with pytest.raises(OptionError):
        mode_share_map(debye_spectrum(5.0), [10.0], bins=0)


def test_residuals_vanish_for_the_model_of_its_own_spectrum_and_show_the_einstein_failure():
    # The Debye model of a Debye DOS equals it (Debye 1912); an Einstein model of it misses most at low T.
    theta = theta_of(5.0)
    t = np.array([0.0, 5.0, 20.0, 100.0, 300.0])
    dos = debye_spectrum(5.0)
    reference = tabulate(dos, t)
    same = residual_table(reference, debye_table(theta, 3, t))
    assert list(same.columns) == list(COLUMNS["formula"])
    assert np.abs(same.iloc[:, 1:].to_numpy()).max() < 1e-9
    worst = largest_deviations(residual_table(reference, einstein_table(0.75 * theta, 3, t)))
    assert set(worst) == set(COLUMNS["formula"][1:])
    assert worst["heat_capacity_v_J_per_mol_K"]["temperature_K"] in (20.0, 100.0)
    assert worst["heat_capacity_v_J_per_mol_K"]["deviation"] < 0        # Einstein C_v too low
    with pytest.raises(OptionError):
        residual_table(reference, einstein_table(theta, 3, t[:-1]))


def test_cv_over_t3_plateau_of_debye_and_fall_of_einstein():
    # Debye: C_v/T^3 -> 12π^4 R/(5θ^3) (closed form); Einstein: -> 0 exponentially.
    theta = 300.0
    t = np.array([0.0, 1.0, 2.0, 4.0])
    out = cv_over_t3({"debye": debye_table(theta, 3, t), "einstein": einstein_table(theta, 3, t)})
    assert out.temperature_K.tolist() == [1.0, 2.0, 4.0]
    np.testing.assert_allclose(out.debye, 12 * math.pi ** 4 * R / (5 * theta ** 3), rtol=1e-12)
    assert (out.einstein < 1e-20).all()


def test_side_by_side_holds_the_dos_and_model_tables():
    dos = peak_dos(5.0)
    t = [100.0, 300.0]
    tables = model_tables(dos, t, theta_of(5.0), 330.0)
    wide = side_by_side(tables)
    assert wide.columns[0] == "temperature_K"
    np.testing.assert_array_equal(wide["dos_entropy_J_per_mol_K"], tabulate(dos, t).entropy_J_per_mol_K)
    # an Einstein model at the peak frequency reproduces the peak spectrum (Einstein 1907)
    np.testing.assert_allclose(wide["einstein_heat_capacity_v_J_per_mol_K"], wide["dos_heat_capacity_v_J_per_mol_K"],
                               rtol=1e-4)


def test_occupation_explorer_planck_limits():
    # Planck 1901: n(x = ln 2) = 1; mean energy -> k_B T (equipartition) for hν << k_BT and hν/2 at T = 0.
    h_mev_per_thz = sc.physical_constants["Planck constant in eV/Hz"][0] * 1e12 * 1e3
    kb_mev = sc.physical_constants["Boltzmann constant in eV/K"][0] * 1e3
    nu = np.array([1.0, 0.001])
    t_ln2 = theta_of(1.0) / math.log(2.0)
    r = occupation_explorer(nu, [0.0, t_ln2, 3000.0])
    assert r["occupation"][0, 1] == pytest.approx(1.0, rel=1e-12)
    assert r["occupation"][0, 0] == pytest.approx(0.0, abs=1e-300)
    assert r["mean_energy_meV"][0, 0] == pytest.approx(0.5 * h_mev_per_thz, rel=1e-12)
    assert r["mean_energy_meV"][0, 1] == pytest.approx(1.5 * h_mev_per_thz, rel=1e-12)   # hν(n + 1/2), n = 1
    assert r["mean_energy_meV"][1, 2] == pytest.approx(kb_mev * 3000.0, rel=1e-9)        # x ~ 1.6e-5


def test_share_table_columns_come_from_the_column_schema():
    # Common practice (no single source): in the classical limit every mode carries k_B of C_v, so the
    # share of a bin is its share of the modes; each temperature's shares sum to 1.
    from thermo.columns import find, lookup
    from thermo.models.modemap import SHARE_TABLE, share_table
    from thermo.spectrum import PhononDOS
    nu = np.linspace(0.0, 10.0, 1001)
    table = share_table(mode_share_map(PhononDOS(nu, 0.3 * np.ones_like(nu), atoms=1), [1e6, 50.0], bins=10))
    assert [lookup(name).quantity.key for name in table.columns] == list(SHARE_TABLE)
    assert len(table) == 20
    hot = table[table[find(table, "temperature")] == 1e6]
    np.testing.assert_allclose(hot[find(hot, "heat_capacity_v_share")].to_numpy()[1:4], 0.1, atol=2e-3)
    sums = table.groupby(find(table, "temperature"))[[find(table, "heat_capacity_v_share"),
                                                      find(table, "entropy_share")]].sum()
    np.testing.assert_allclose(sums.to_numpy(), 1.0, rtol=1e-9)
    width = table[find(table, "bin_high")] - table[find(table, "bin_low")]
    np.testing.assert_allclose(table[find(table, "frequency")], table[find(table, "bin_low")] + width / 2)


def test_mode_share_map_in_blocks_of_nodes_equals_one_pass(monkeypatch):
    # the map is summed a block of nodes at a time (bounded memory); blocks of 7 × M elements must give the
    # same shares as one pass, checked against the direct per-node sum
    import thermo.models.modemap as module
    from thermo.kernels.planck import heat_capacity_kernel, reduced_frequency
    from thermo.kernels.quadrature import mode_quadrature
    from thermo.spectrum import PhononDOS
    nu = np.linspace(0.0, 6.0, 401)                                     # invented Debye ν² spectrum
    dos = PhononDOS(nu, 9.0 * nu ** 2 / 6.0 ** 3, atoms=1)
    t = np.array([3.0, 40.0, 300.0])
    one = mode_share_map(dos, t, bins=9)
    monkeypatch.setattr(module, "_BLOCK", 7 * t.size)
    blocks = mode_share_map(dos, t, bins=9)
    for key in ("heat_capacity_share", "entropy_share", "cumulative_heat_capacity_share"):
        np.testing.assert_allclose(blocks[key], one[key], rtol=1e-13, atol=1e-15)
    nodes, weights = mode_quadrature(dos)
    keep = (weights > 0) & (nodes > 0)
    nodes, weights = nodes[keep], weights[keep]
    index = np.clip(np.searchsorted(one["bin_edges_thz"], nodes, side="right") - 1, 0, 8)
    c = weights[:, None] * heat_capacity_kernel(reduced_frequency(nodes, t))
    direct = np.array([c[index == b].sum(axis=0) for b in range(9)])
    np.testing.assert_allclose(blocks["heat_capacity_share"], direct / direct.sum(axis=0), rtol=1e-12, atol=1e-15)
