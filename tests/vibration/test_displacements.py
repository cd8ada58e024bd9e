"""⟨u²⟩, B and θ_M checked against the Debye model in closed form and the classical limit."""

from __future__ import annotations

import mpmath
import numpy as np
import pytest
from scipy import constants as sc

from tests.spectra import debye_table, dos_text, peak_dos
from thermo.models.debye import debye_spectrum
from thermo.preparation.loading import load_dos
from thermo.vibration.debye_waller import bose_first_moment, debye_waller_temperature
from thermo.vibration.displacements import (ALL_ATOMS, displacement_summary, displacement_table,
                                            mean_square_displacement, window_sensitivity)

THETA = 320.0
MASS = 47.0   # u (test value)
mpmath.mp.dps = 30


def willis_pryor_msd(t_over_theta, theta=THETA, mass=MASS):
    """Total ⟨u²⟩ [Å²] of a Debye crystal, evaluated independently with mpmath.

    Willis and Pryor, Thermal Vibrations in Crystallography (CUP 1975), eq. 4.66:
    per direction U = (3ħ²T/(m k θ²)) [φ(x) + x/4], x = θ/T, φ(x) = (1/x)∫_0^x t/(eᵗ-1) dt;
    U(T = 0) = 3ħ²/(4 m k θ).  The total ⟨u²⟩ is 3U.  Constants: CODATA via scipy.constants.
    """
    hbar, k, m = mpmath.mpf(sc.hbar), mpmath.mpf(sc.k), mpmath.mpf(mass) * mpmath.mpf(sc.atomic_mass)
    theta = mpmath.mpf(theta)
    if t_over_theta == 0:
        u = 3 * hbar ** 2 / (4 * m * k * theta)
    else:
        t = theta * mpmath.mpf(t_over_theta)
        x = theta / t
        phi = mpmath.quad(lambda s: s / mpmath.expm1(s), [0, x]) / x
        u = 3 * hbar ** 2 * t / (m * k * theta ** 2) * (phi + x / 4)
    return float(3 * u * mpmath.mpf(10) ** 20)


RATIOS = [0.0, 0.1, 0.5, 1.0, 3.0]


@pytest.mark.parametrize("ratio", RATIOS)
def test_debye_msd_analytic_spectrum_against_willis_pryor(ratio):
    # Willis and Pryor (1975) eq. 4.66 via mpmath; tolerance 1e-5 as the issue asks.
    got = mean_square_displacement(debye_spectrum(THETA), [ratio * THETA], masses={"X": MASS})["X"]["msd"][0]
    assert got == pytest.approx(willis_pryor_msd(ratio), rel=1e-5)


@pytest.mark.parametrize("low_frequency", ["auto", "off"])
def test_debye_msd_tabulated_file_against_willis_pryor(low_frequency):
    # Same reference; a tabulated Debye DOS read from text goes through load_dos and the grid sums.
    dos = load_dos(dos_text(*debye_table(THETA, points=2001)), low_frequency=low_frequency)
    t = np.array(RATIOS) * THETA
    got = mean_square_displacement(dos, t, masses={"X": MASS})["X"]["msd"]
    want = [willis_pryor_msd(r) for r in RATIOS]
    np.testing.assert_allclose(got, want, rtol=1e-5)


def test_high_temperature_classical_limit():
    # Classical limit ⟨u²⟩ → 3 k_B T ⟨1/ω²⟩ / m (equipartition; Willis and Pryor 1975 §4.3).
    # For the Debye DOS ⟨1/ω²⟩ = 3/ω_D² (elementary integral), so the limit is 9 k_B T/(m ω_D²).
    # At T = 5θ the first quantum correction ħ²/(4 m k_B T) (from coth y = 1/y + y/3 - …,
    # Abramowitz & Stegun 4.5.67) is 1.1e-3 of ⟨u²⟩: the bare limit is checked to 1e-4 at 30θ,
    # and at 5θ with the first correction added (to 1e-5).
    m = MASS * sc.atomic_mass
    omega_d = sc.k * THETA / sc.hbar
    d = debye_spectrum(THETA)
    for ratio, with_correction, tol in [(30.0, False, 1e-4), (5.0, True, 1e-5)]:
        t = ratio * THETA
        limit = 9 * sc.k * t / (m * omega_d ** 2) * 1e20
        if with_correction:
            limit += sc.hbar ** 2 / (4 * m * sc.k * t) * 1e20
        r = mean_square_displacement(d, [t], masses={"X": MASS})["X"]
        assert r["msd"][0] == pytest.approx(limit, rel=tol)
        assert r["classical"][0] == pytest.approx(9 * sc.k * t / (m * omega_d ** 2) * 1e20, rel=1e-12)
    # ...and the bare limit is NOT met to 1e-4 at 5θ (the check can fail).
    r5 = mean_square_displacement(d, [5 * THETA], masses={"X": MASS})["X"]
    assert abs(r5["msd"][0] / r5["classical"][0] - 1) > 1e-3


def test_einstein_spectrum_zero_point_and_hot():
    # One Einstein oscillator per direction: ⟨u²⟩ = 3ħ/(2 m ω) coth(ħω/2k_BT)
    # (Willis and Pryor 1975 eq. 4.23; textbook harmonic oscillator).
    nu0 = 4.0
    dos = peak_dos(nu0, width_thz=0.002)
    m = MASS * sc.atomic_mass
    omega = 2 * np.pi * nu0 * 1e12
    t = np.array([0.0, 100.0, 1000.0])
    x = sc.h * nu0 * 1e12 / (sc.k * np.where(t > 0, t, 1.0))
    coth = np.where(t > 0, 1.0 / np.tanh(x / 2), 1.0)
    want = 3 * sc.hbar / (2 * m * omega) * coth * 1e20
    got = mean_square_displacement(dos, t, masses={"X": MASS})["X"]["msd"]
    np.testing.assert_allclose(got, want, rtol=1e-5)


def test_theta_m_recovers_theta_of_a_debye_crystal():
    # θ_M inverts Willis and Pryor's formula (mpmath reference above): θ_M = θ at every T.
    t = np.array(RATIOS) * THETA
    u = np.array([willis_pryor_msd(r) for r in RATIOS])
    np.testing.assert_allclose(debye_waller_temperature(u, t, MASS), THETA, rtol=1e-8)


def test_bose_first_moment_against_mpmath():
    # Independent quadrature with mpmath of ∫_0^X y/(eʸ-1) dy, both branches of ours.
    for x in [1e-4, 0.2, 0.49, 0.51, 2.0, 30.0]:
        ref = float(mpmath.quad(lambda y: y / mpmath.expm1(y), [0, x]))
        assert float(bose_first_moment(np.array([x]))[0]) == pytest.approx(ref, rel=1e-13)


def _two_species_text(theta_a=250.0, theta_b=480.0, points=3001):
    """Invented test spectrum: species A and B each a Debye partial (3 modes) of its own θ."""
    nu_b = theta_b / (sc.h * 1e12 / sc.k)
    nu = np.linspace(0.0, nu_b, points)
    ga = np.where(nu <= theta_a / (sc.h * 1e12 / sc.k), 9 * nu ** 2 / (theta_a / (sc.h * 1e12 / sc.k)) ** 3, 0.0)
    gb = 9 * nu ** 2 / nu_b ** 3
    return dos_text(nu, ga + gb, ga, gb, header="frequency_THz total Mg O")


def test_partials_per_species_against_willis_pryor():
    # Two Debye partials of θ_A = 250 K and θ_B = 480 K: each species must follow Willis and
    # Pryor's formula with its own θ and its own mass (Mg and O masses from periodictable).
    import periodictable
    dos = load_dos(_two_species_text(), atoms=2)
    t = np.array([0.0, 100.0, 300.0])
    res = mean_square_displacement(dos, t, formula="MgO")
    for name, theta in [("Mg", 250.0), ("O", 480.0)]:
        mass = periodictable.elements.symbol(name).mass
        want = [willis_pryor_msd(tt / theta, theta, mass) for tt in t]
        np.testing.assert_allclose(res[name]["msd"], want, rtol=2e-4)


def test_mass_weighted_mean_without_partials():
    # Harmonic sum rule (Maradudin et al. 1971, ch. 4): Σ_s n_s m_s ⟨u_s²⟩ = (ħ/2) ∫ g/ω coth,
    # so the total DOS alone gives the mass-weighted mean; compared with the per-species result.
    text = _two_species_text()
    with_partials = mean_square_displacement(load_dos(text, atoms=2), [0.0, 300.0], formula="MgO")
    total_only_text = "\n".join(" ".join(line.split()[:2]) for line in text.splitlines()) + "\n"
    mean = mean_square_displacement(load_dos(total_only_text, atoms=2), [0.0, 300.0], formula="MgO")
    assert list(mean) == [ALL_ATOMS]
    m = {k: v["mass_amu"] for k, v in with_partials.items()}
    weighted = sum(m[k] * with_partials[k]["msd"] for k in m) / sum(m.values())
    np.testing.assert_allclose(mean[ALL_ATOMS]["msd"], weighted, rtol=1e-6)


def test_b_factor_and_uiso_convention():
    # Convention (Willis and Pryor 1975 §1.4; common practice): U_iso = ⟨u²⟩/3, B = 8π² U_iso.
    df = displacement_table(debye_spectrum(THETA), [0.0, 298.15], masses={"X": MASS})
    u = df["mean_square_displacement_A2"].to_numpy()
    np.testing.assert_allclose(df["isotropic_displacement_A2"], u / 3, rtol=1e-14)
    np.testing.assert_allclose(df["debye_waller_b_A2"], 8 * np.pi ** 2 * u / 3, rtol=1e-14)
    assert u[0] == pytest.approx(willis_pryor_msd(0.0), rel=1e-6)


def test_resampling_does_not_move_the_result():
    # A heuristic (automatic ν² window) must not jump when the input is merely resampled.
    a = load_dos(dos_text(*debye_table(THETA, points=2001)))
    b = load_dos(dos_text(*debye_table(THETA, points=1337)))
    ua = mean_square_displacement(a, [0.0, 300.0], masses={"X": MASS})["X"]["msd"]
    ub = mean_square_displacement(b, [0.0, 300.0], masses={"X": MASS})["X"]["msd"]
    np.testing.assert_allclose(ua, ub, rtol=1e-5)


def test_window_sensitivity_of_a_smeared_spectrum_is_reported():
    # A smeared ν² spectrum (offset C = 0.3·A·σ² added): refits with moved windows must be tried
    # and the change stays small for a clean acoustic region.
    nu, g = debye_table(THETA, points=3001)
    dos = load_dos(dos_text(nu, g + 9 / nu[-1] ** 3 * 0.01))
    sens = window_sensitivity(dos, [0.0, 300.0], masses={"X": MASS})
    assert sens["windows_THz"] and sens["note"] is None
    assert 0 <= sens["per_species"]["X"] < 0.01


def test_invented_species_needs_a_mass():
    from thermo.errors import OptionError
    nu, g = debye_table(THETA, points=101)
    text = dos_text(nu, g, g, header="frequency_THz total Ly")
    with pytest.raises(OptionError, match="give its mass"):
        mean_square_displacement(load_dos(text, low_frequency="off"), [300.0])


def test_summary_reports_room_temperature_and_lindemann():
    s = displacement_summary(debye_spectrum(THETA), masses={"X": MASS}, distance_a=0.5)
    assert s["species"]["X"]["theta_m_298K_K"] == pytest.approx(THETA, rel=1e-8)
    assert any("Lindemann" in w for w in s["warnings"])
    quiet = displacement_summary(debye_spectrum(THETA), masses={"X": MASS}, distance_a=5.0)
    assert not any("Lindemann" in w for w in quiet["warnings"])


def test_mass_for_an_unknown_column_is_refused():
    from thermo.errors import OptionError
    dos = load_dos(_two_species_text(), atoms=2)
    with pytest.raises(OptionError, match="not a partial-DOS column"):
        mean_square_displacement(dos, [300.0], masses={"Mq": 24.0})


def test_formula_counts_and_isotope_override():
    # ⟨u²⟩ of a harmonic species scales as 1/m at fixed spectrum in the classical limit
    # (equipartition, Willis and Pryor 1975 §4.3); an isotope mass given for O changes only O.
    dos = load_dos(_two_species_text(), atoms=2)
    plain = mean_square_displacement(dos, [2000.0], formula="MgO")
    heavy = mean_square_displacement(dos, [2000.0], formula="MgO", masses={"O": 18.0})
    assert plain["Mg"]["msd"][0] == heavy["Mg"]["msd"][0]
    ratio = heavy["O"]["classical"][0] / plain["O"]["classical"][0]
    assert ratio == pytest.approx(plain["O"]["mass_amu"] / 18.0, rel=1e-12)
    assert plain["Mg"]["atoms"] == 1.0 and plain["O"]["atoms"] == 1.0


def test_one_species_with_two_atoms_per_formula_unit():
    # Two identical atoms per formula unit (6 modes, both Debye): each follows Willis and Pryor.
    dos = load_dos(dos_text(*debye_table(THETA, atoms=2)), atoms=2)
    r = mean_square_displacement(dos, [0.0, 300.0], masses={"X": MASS})["X"]
    np.testing.assert_allclose(r["msd"], [willis_pryor_msd(0.0), willis_pryor_msd(300.0 / THETA)], rtol=1e-5)
    same = mean_square_displacement(dos, [0.0, 300.0], formula="Si2")["Si"]
    assert same["atoms"] == 2.0


def test_displacements_in_blocks_of_temperatures_equal_one_pass_and_refuse_over_budget(monkeypatch):
    # issue 26: a 10⁶-row DOS at 10⁶ temperatures asked for a 6.8 TiB array; now a block of temperatures at a
    # time (the same numbers) and a one-line refusal past the pair budget
    import thermo.vibration.species as species
    from thermo.errors import OptionError
    dos = load_dos(dos_text(*debye_table(THETA, points=301)), low_frequency="off")
    t = np.linspace(0.0, 900.0, 41)
    one = mean_square_displacement(dos, t, masses={"X": MASS})["X"]["msd"]
    monkeypatch.setattr(species, "BLOCK", 3 * 300)                     # three temperatures a block
    blocks = mean_square_displacement(dos, t, masses={"X": MASS})["X"]["msd"]
    np.testing.assert_allclose(blocks, one, rtol=1e-14, atol=0)
    monkeypatch.setattr(species, "MAX_PAIRS", 300 * 40)
    with pytest.raises(OptionError, match=r"at most 1\.2e\+04 are computed.*MAX_PAIRS"):
        mean_square_displacement(dos, t, masses={"X": MASS})
