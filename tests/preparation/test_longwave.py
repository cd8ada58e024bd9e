"""The long-wave region of mode lists: elastic continuum from the sound speeds near Γ.

Checked against the test crystals of tests/crystal.py (invented springs): their
exact reference tables (smooth partition of the zone, ~1e-6) and their Debye
T³ limit with the direction-averaged 1/c³ of the long-wave dynamical matrix
(N. W. Ashcroft and N. D. Mermin, *Solid State Physics*, 1976, ch. 23).
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy import constants as sc

from tests import crystal as cr
from thermo import load_dos, tabulate

TEMPERATURES = np.array([2.0, 3, 4, 5, 7, 10, 12, 15, 20, 25, 30, 40, 50, 70, 100, 150, 200, 250, 298.15, 300])
CRYSTALS = {"bcc": cr.BCC, "fcc": cr.FCC}


def _errors(crystal, n, gamma=False, **options):
    dos = load_dos(cr.mode_list_text(crystal, n, gamma), **options)
    table = tabulate(dos, TEMPERATURES)
    ref = cr.reference(crystal, TEMPERATURES)
    cv = np.abs(table.heat_capacity_v_J_per_mol_K.to_numpy() / ref["heat_capacity_v"] - 1)
    s = np.abs(table.entropy_J_per_mol_K.to_numpy() / ref["entropy"] - 1)
    return dos, cv, s


@pytest.mark.parametrize("name", CRYSTALS)
@pytest.mark.parametrize("n, gamma", [(8, False), (8, True), (16, False), (16, True)])
def test_mode_lists_match_the_exact_tables(name, n, gamma):
    _dos, cv, s = _errors(CRYSTALS[name], n, gamma)
    cold = TEMPERATURES <= 20
    low_bound = 0.03 if n == 8 else 0.01          # issue 23: 8³ within 3 % at <= 20 K, else 1 %
    assert cv[cold].max() < low_bound and s[cold].max() < low_bound
    assert cv[~cold].max() < 0.01 and s[~cold].max() < 0.01


@pytest.mark.parametrize("name", CRYSTALS)
def test_the_cold_limit_is_the_debye_law_of_the_sound_speeds(name):
    crystal = CRYSTALS[name]
    dos = load_dos(cr.mode_list_text(crystal, 16))
    t = np.array([0.5, 1.0])
    cv = tabulate(dos, t).heat_capacity_v_J_per_mol_K.to_numpy()
    debye = 12 * np.pi ** 4 / 5 * sc.R * (t / crystal.debye_temperature()) ** 3   # Ashcroft & Mermin ch. 23
    assert np.allclose(cv, debye, rtol=0.005)
    assert dos.low_frequency_debye_temperature_k() == pytest.approx(crystal.debye_temperature(), rel=0.002)


def test_without_the_continuum_the_cold_end_is_far_off_and_said_to_be():
    # the plain mode sum (no cell volume): the long-wave region is missing, as the warning says
    text = cr.mode_list_text(cr.BCC, 8).replace("# cell volume", "# volume of the cell")
    dos = load_dos(text)
    cv = tabulate(dos, [5.0]).heat_capacity_v_J_per_mol_K.to_numpy()[0]
    ref = cr.reference(cr.BCC, [5.0])["heat_capacity_v"][0]
    assert abs(cv / ref - 1) > 0.5
    note = next(w for w in dos.warnings if "long-wave region is not resolved" in w)
    limit = float(note.split("below ")[1].split(" K")[0])
    assert limit > 5.0 and "cell volume" in note


def test_without_q_vectors_the_undetermined_range_is_stated():
    dos = load_dos(cr.mode_list_text(cr.FCC, 8, with_q=False))
    note = next(w for w in dos.warnings if "not determined" in w)
    assert "no wave vectors" in note
    assert dos.modes.continuum == ()


def test_weights_in_any_normalisation_give_the_same_table():
    text = cr.mode_list_text(cr.FCC, 8)
    lines = text.splitlines()
    head, rows = lines[:3], lines[3:]
    scaled = head + [f"{float(r.split()[0]) * 48:.17g} " + " ".join(r.split()[1:]) for r in rows]
    a = tabulate(load_dos(text), TEMPERATURES)
    b = tabulate(load_dos("\n".join(scaled) + "\n"), TEMPERATURES)
    assert np.allclose(a.to_numpy(), b.to_numpy(), rtol=1e-10)


@pytest.mark.parametrize("name", CRYSTALS)
@pytest.mark.parametrize("n, with_q", [(8, False), (16, False), (8, True)])
def test_the_elastic_anchor_sets_the_cold_end(name, n, with_q):
    # θ from the crystal's long-wave sound speeds (Ashcroft & Mermin ch. 23), as 'modeheat elastic' gives one
    crystal = CRYSTALS[name]
    theta = crystal.debye_temperature()
    dos = load_dos(cr.mode_list_text(crystal, n, with_q=with_q), low_frequency=f"elastic:{theta}")
    t = np.array([2.0, 5.0])
    cv = tabulate(dos, t).heat_capacity_v_J_per_mol_K.to_numpy()
    assert np.allclose(cv, cr.reference(crystal, t)["heat_capacity_v"], rtol=0.03)     # issue 23: within 3 %
    assert dos.low_frequency_debye_temperature_k() == pytest.approx(theta, rel=1e-9)
    assert any("anchored by the elastic Debye temperature" in w for w in dos.warnings)


@pytest.mark.parametrize("value", ["elastic:", "elastic:-3", "elastic:abc", "elastic:1e9"])
def test_a_bad_elastic_anchor_is_one_line(value):
    from thermo.errors import OptionError
    with pytest.raises(OptionError) as err:
        load_dos(cr.mode_list_text(cr.BCC, 8), low_frequency=value)
    assert "\n" not in str(err.value) and "elastic" in str(err.value)


def test_an_elastic_anchor_on_a_dos_keeps_its_law_absolute():
    # a Debye DOS (P. Debye, Ann. Phys. 39, 789 (1912)) given with a coarse, noisy start and anchored by its own θ:
    # the table is the Debye entropy (mpmath quadrature in tests/spectra.py) at low T
    from tests.spectra import debye_entropy, debye_table, dos_text
    nu, g = debye_table(300.0, atoms=2, points=401)
    g = g * (1 + 0.3 * np.sin(40 * nu) * (nu < 0.8))          # the low end not resolved
    dos = load_dos(dos_text(nu, g), low_frequency="elastic:300")
    assert dos.low_frequency.coefficient == pytest.approx(18 / (300.0 / cr.K_PER_THZ) ** 3, rel=1e-12)
    assert dos.mode_count == pytest.approx(6.0, rel=1e-9)
    s = tabulate(dos, [3.0]).entropy_J_per_mol_K.to_numpy()[0] / 2
    assert s == pytest.approx(debye_entropy(300.0, 3.0), rel=0.01)
    assert any("resolved limit" in w for w in dos.warnings)


def test_mean_square_displacement_of_a_mode_list_is_the_zone_average():
    # ⟨u²⟩ = Σ_modes (ħ/2Mω) coth(ħω/2k_BT) over the zone (Maradudin et al. 1971, ch. 4), from the
    # crystal's exact reference nodes (tests/crystal.py), CODATA constants from scipy.constants
    from thermo.vibration.displacements import mean_square_displacement
    crystal = cr.BCC
    t = np.array([20.0, 300.0])
    nu, w = cr.reference_nodes(crystal)
    omega = 2 * np.pi * nu * 1e12
    mass = crystal.mass_amu * sc.atomic_mass
    x = sc.hbar * omega[:, None] / (sc.k * t[None, :])
    exact = (w / omega) @ (1 / np.tanh(x / 2)) * sc.hbar / (2 * mass) * 1e20     # Å², 3 branches
    dos = load_dos(cr.mode_list_text(crystal, 16))
    got = mean_square_displacement(dos, t, masses={"X": crystal.mass_amu})["X"]["msd"]
    assert np.allclose(got, exact, rtol=0.005)


@pytest.mark.parametrize("name", CRYSTALS)
@pytest.mark.parametrize("n", [8, 12, 16, 24])
@pytest.mark.parametrize("kind", ["gaussian", "histogram"])
def test_the_elastic_anchor_on_mesh_dos_files(name, n, kind):
    # DOS files of the test crystals (Gaussian σ = 0.12 THz or 0.05 THz bins) anchored by the θ of their sound
    # speeds (Ashcroft & Mermin ch. 23): C_v(2 K, 5 K) within 3 % of the exact tables (issue 23)
    crystal = CRYSTALS[name]
    nu, g = cr.gaussian_dos(crystal, n, 0.12) if kind == "gaussian" else cr.histogram_dos(crystal, n, 0.05)
    dos = load_dos(cr.dos_text(nu, g), atoms=1, low_frequency=f"elastic:{crystal.debye_temperature()}")
    t = np.array([2.0, 5.0])
    cv = tabulate(dos, t).heat_capacity_v_J_per_mol_K.to_numpy()
    assert np.allclose(cv, cr.reference(crystal, t)["heat_capacity_v"], rtol=0.03)
