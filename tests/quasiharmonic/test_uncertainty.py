"""The quasi-harmonic ± against a directly minimised Debye solid (truth known; see debye_solid.py).

The solid has γ = 3 and a Morse static energy, so none of the three equations of state is exact
and S(V) ∝ V^{3γ} at low T is strongly curved.  The reference V, α, B_T, C_p, C_v and G = F(V, T)
come from mpmath (root of ∂F/∂V, derivatives by mpmath.diff), never from modeheat; the mean
Grüneisen parameter α B_T V / C_v equals the constant γ of the construction (Grüneisen relation).  Cases of known truth:
11 volumes spanning ±10 % (the clean case), 5 volumes with the minimum near and beyond the
upper edge, 5 compressed volumes with every minimum extrapolated, a coarse 101-point DOS, and
DOS grids of 41-200 points drawn per volume (discretisation errors that differ from volume to
volume, which the derivatives amplify).
Coverage is counted row by row: every |tool − reference| must lie inside 1u (share 100 %).
"""

from __future__ import annotations

import numpy as np
import pytest

from tests.quasiharmonic.debye_solid import V0, Solid
from thermo.quasiharmonic import quasiharmonic_table

SOLID = Solid(gamma=3.0, static="morse")
TEMPERATURES = np.array([5.0, 10.0, 20.0, 50.0, 100.0, 200.0, 300.0, 600.0, 900.0, 1200.0])
#: (reference key, value column, error column)
CHECKED = (("V", "volume_A3", "volume_error_A3"),
           ("alpha", "thermal_expansion_per_K", "thermal_expansion_error_per_K"),
           ("B", "bulk_modulus_T_GPa", "bulk_modulus_T_error_GPa"),
           ("cp", "heat_capacity_p_J_per_mol_K", "heat_capacity_p_error_J_per_mol_K"),
           ("cv", "heat_capacity_v_J_per_mol_K", "heat_capacity_v_error_J_per_mol_K"),
           ("G", "gibbs_energy_kJ_per_mol", "gibbs_energy_error_kJ_per_mol"),
           ("gamma", "gruneisen_parameter", "gruneisen_parameter_error"))
CASES = {  # name: (volumes as multiples of V0, points per DOS)
    "eleven_volumes_10_percent": (np.linspace(0.9, 1.1, 11), 2001),
    "five_volumes_edge": (np.linspace(0.97, 1.03, 5), 2001),
    "five_compressed_volumes": (np.linspace(0.88, 0.98, 5), 2001),
    "coarse_dos": (np.linspace(0.9, 1.1, 11), 101),
    "mixed_grids": (np.linspace(0.9, 1.1, 11), np.random.default_rng(5).integers(41, 201, 11)),
}


@pytest.fixture(scope="module")
def reference():
    return SOLID.references(TEMPERATURES)


@pytest.fixture(scope="module")
def entries():
    return {name: [entry for v, n in zip(volumes, np.broadcast_to(points, volumes.shape))
                   for entry in SOLID.entries([V0 * v], int(n))] for name, (volumes, points) in CASES.items()}


def coverage(table, reference):
    """Largest |tool - reference| / u per checked quantity over the rows with a minimum."""
    found = np.isfinite(table.volume_A3.to_numpy())
    out = {}
    for key, column, error in CHECKED:
        miss = np.abs(table[column].to_numpy() - reference[key])[found]
        u = table[error].to_numpy()[found]
        assert np.all(u > 0), (column, u)
        out[key] = float(np.max(miss / u))
    return out


@pytest.mark.parametrize("eos", ["birch-murnaghan", "vinet", "spline"])
def test_alpha_within_half_percent_and_covered_eleven_volumes(entries, reference, eos):
    # Issue 24: α within 0.5 % of the exact reference at T >= 10 K for 11 volumes spanning ±10 %
    # (the old 4-term S(V) fit missed by 1.2 % at 5-10 K for this solid), and the ± covers every row.
    table = quasiharmonic_table(entries["eleven_volumes_10_percent"], TEMPERATURES, eos=eos, errors=True)
    hot = TEMPERATURES >= 10.0
    alpha = table.thermal_expansion_per_K.to_numpy()
    assert np.max(np.abs(alpha / reference["alpha"] - 1)[hot]) < 5e-3
    gamma = table.gruneisen_parameter.to_numpy()
    assert np.max(np.abs(gamma / SOLID.gamma - 1)[hot]) < 1e-3      # γ = 3 exactly by construction
    worst = coverage(table, reference)
    assert max(worst.values()) <= 1.0, worst
    # useful as well as safe: the ± stays below 1 % of α and B_T and 0.05 % of V on this clean set
    assert np.max(table.thermal_expansion_error_per_K / alpha) < 0.01
    assert np.max(table.bulk_modulus_T_error_GPa / table.bulk_modulus_T_GPa) < 0.01
    assert np.max(table.volume_error_A3 / table.volume_A3) < 5e-4
    assert not table.outside_volume_range.any()


@pytest.mark.parametrize("case, eos", [("five_volumes_edge", "birch-murnaghan"), ("five_volumes_edge", "vinet"),
                                       ("five_compressed_volumes", "birch-murnaghan"),
                                       ("five_compressed_volumes", "spline"), ("coarse_dos", "birch-murnaghan"),
                                       ("mixed_grids", "birch-murnaghan"), ("mixed_grids", "vinet")])
def test_uncertainty_covers_few_volumes_edges_and_coarse_dos(entries, reference, case, eos):
    table = quasiharmonic_table(entries[case], TEMPERATURES, eos=eos, errors=True)
    outside = table.outside_volume_range.to_numpy()
    if case == "five_volumes_edge":
        assert outside[-1] and not outside[0]          # the minimum crosses the upper edge
    if case == "five_compressed_volumes":
        assert outside.all()
    worst = coverage(table, reference)
    assert max(worst.values()) <= 1.0, worst
    found = np.isfinite(table.volume_A3.to_numpy())
    assert found[TEMPERATURES <= 900.0].all()


def test_extrapolated_rows_are_off_by_more_than_a_percent_and_still_covered(entries, reference):
    # The contrast: the compressed set misses α and B_T at 1,200 K by more than 1 % (extrapolated
    # rows), which a ± made of the fit alone would not show; the total ± covers it.
    table = quasiharmonic_table(entries["five_compressed_volumes"], TEMPERATURES, errors=True)
    miss = abs(table.bulk_modulus_T_GPa.iloc[-1] / reference["B"][-1] - 1)
    assert miss > 0.01
    parts = table.attrs["uncertainty"]["bulk_modulus_T"]
    assert parts["volume_sampling"] + parts["edge"] > parts["harmonic"]
    assert table.bulk_modulus_T_error_GPa.iloc[-1] >= abs(table.bulk_modulus_T_GPa.iloc[-1] - reference["B"][-1])


def test_harmonic_part_dominates_on_a_coarse_dos_at_low_temperature(entries):
    # On a 101-point DOS the per-volume harmonic error estimate at 5 K exceeds the EOS terms,
    # and it is carried into C_v and α (not dropped on the way through the minimisation).
    coarse = quasiharmonic_table(entries["coarse_dos"], [5.0], errors=True)
    fine = quasiharmonic_table(entries["eleven_volumes_10_percent"], [5.0], errors=True)
    assert coarse.heat_capacity_v_error_J_per_mol_K[0] > 10 * fine.heat_capacity_v_error_J_per_mol_K[0]
    parts = coarse.attrs["uncertainty"]["heat_capacity_v"]
    assert parts["harmonic"] > parts["equation_of_state"] + parts["volume_sampling"]


def test_error_columns_follow_the_basis(entries):
    # 1 k_B per atom = R J/(mol K) for one atom per formula unit (CODATA via scipy.constants)
    from scipy import constants as sc
    mol = quasiharmonic_table(entries["five_volumes_edge"], [300.0], errors=True)
    atom = quasiharmonic_table(entries["five_volumes_edge"], [300.0], errors=True, per="atom")
    assert atom.heat_capacity_p_error_kB_per_atom[0] * sc.R == pytest.approx(mol.heat_capacity_p_error_J_per_mol_K[0])
    assert atom.gibbs_energy_error_meV_per_atom[0] == pytest.approx(
        mol.gibbs_energy_error_kJ_per_mol[0] * 1e6 / (sc.N_A * sc.electron_volt))
    assert "volume_error_A3" not in quasiharmonic_table(entries["five_volumes_edge"], [300.0]).columns


def test_uncertainty_covers_a_metal_with_the_electronic_part():
    # The free-electron gas of tests/electronic/test_quasiharmonic.py (Sommerfeld F_el, Ashcroft &
    # Mermin 1976, ch. 2) on the default Debye solid: the electronic part joins the surface with its
    # own numerical error, and the ± still covers the directly minimised reference for V, α, B_T.
    # C_v and C_p are not compared: the Sommerfeld reference drops the (k_BT/E_F)² order, 9e-4 of
    # C_el at 600 K, which is the reference's error, not the tool's.
    from tests.electronic.test_quasiharmonic import electronic_table, sommerfeld_free_energy
    from tests.quasiharmonic import debye_solid as ds
    from thermo.electronic import make_electronic_dos
    from thermo.quasiharmonic import make_volume_set
    from thermo.quasiharmonic.surface import free_energy_surface
    temperatures = [100.0, 600.0]
    entries = [(v, e, dos, dos.source.get("name"), make_electronic_dos(*electronic_table(v)))
               for v, e, dos in ds.volume_entries(points=801)]
    volume_set = make_volume_set(entries)
    assert free_energy_surface(volume_set, temperatures, errors=True).parts["electronic"].errors is not None
    table = quasiharmonic_table(volume_set, temperatures, errors=True)
    rows = [ds.reference(t, extra=sommerfeld_free_energy) for t in temperatures]
    for key, column, error in CHECKED[:3]:
        miss = np.abs(table[column].to_numpy() - np.array([r[key] for r in rows]))
        assert np.all(miss <= table[error].to_numpy()), (column, miss, table[error].to_numpy())
