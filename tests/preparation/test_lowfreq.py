"""Low-frequency ν² treatment: the T³ law from smeared and binned spectra.

Reference: the Debye T³ law C_v = (12π⁴/5) R (T/θ)³ (P. Debye, Ann. Phys. 344,
789 (1912)); R from CODATA via scipy.constants.  Smearing a ν² spectrum by a
Gaussian of width σ gives A(ν² + σ²) away from ν = 0 (exact convolution of a
parabola, common-practice fact), which is what the treatment must undo.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy import constants as sc
from scipy.special import erf

from tests.spectra import K_PER_THZ, dos_text
from thermo import OptionError, load_dos, tabulate
from thermo.preparation.lowfreq import reduced_dos

THETA = 400.0
NU_D = THETA / K_PER_THZ


def smeared_debye(sigma=0.1, step=0.02, start=0.0):
    """Debye DOS (3 modes) convolved with a Gaussian of width sigma [THz]."""
    nu = np.arange(start, NU_D + 5 * sigma, step)
    fine = np.linspace(0.0, NU_D, 20001)
    g = 9 * fine ** 2 / NU_D ** 3
    w = np.gradient(fine)
    kern = np.exp(-0.5 * ((nu[:, None] - fine[None, :]) / sigma) ** 2) / (sigma * np.sqrt(2 * np.pi))
    return nu, kern @ (g * w)


def t_cubed_law(t):
    return 12 * np.pi ** 4 / 5 * sc.R * (t / THETA) ** 3


LOW_T = np.linspace(THETA / 400, THETA / 80, 9)


def test_smeared_debye_recovers_t_cubed_law_within_5_percent():
    # Reference: Debye T³ law (closed form); the target: within 5 % at θ/400–θ/80.
    dos = load_dos(dos_text(*smeared_debye()), atoms=1)
    cv = tabulate(dos, LOW_T).heat_capacity_v_J_per_mol_K.to_numpy()
    assert np.max(np.abs(cv / t_cubed_law(LOW_T) - 1)) < 0.05


def test_without_treatment_the_smeared_dos_breaks_the_t_cubed_law():
    # Contrast (shows the check above can fail): the spurious weight near ν = 0
    # makes C_v far too large at the lowest temperatures.
    dos = load_dos(dos_text(*smeared_debye()), atoms=1, low_frequency="off")
    cv = tabulate(dos, LOW_T).heat_capacity_v_J_per_mol_K.to_numpy()
    assert cv[0] / t_cubed_law(LOW_T[0]) > 1.5


def test_smeared_tail_below_zero_is_reported_as_imaginary_and_t3_still_holds():
    # A smeared spectrum written from negative frequencies carries a small
    # negative-frequency tail: warned about, dropped, T³ law still recovered.
    dos = load_dos(dos_text(*smeared_debye(start=-0.5)), atoms=1)
    assert any("imaginary" in w for w in dos.warnings)
    assert 0 < dos.source["negative_mode_fraction"] < 0.01
    cv = tabulate(dos, LOW_T).heat_capacity_v_J_per_mol_K.to_numpy()
    assert np.max(np.abs(cv / t_cubed_law(LOW_T) - 1)) < 0.05


def test_binned_debye_histogram_recovers_t_cubed_law():
    # Bin averages of ν² over bins of width Δ are A(ν_c² + Δ²/12) (exact), the
    # binning artefact the fitted offset absorbs.
    edges = np.linspace(0.0, NU_D, 301)
    centres = 0.5 * (edges[1:] + edges[:-1])
    counts = 3 * (edges[1:] ** 3 - edges[:-1] ** 3) / NU_D ** 3 / np.diff(edges)
    dos = load_dos(dos_text(centres, counts), atoms=1)
    cv = tabulate(dos, LOW_T).heat_capacity_v_J_per_mol_K.to_numpy()
    assert np.max(np.abs(cv / t_cubed_law(LOW_T) - 1)) < 0.02


def test_clean_nu2_dos_comes_through_unchanged():
    # A clean Debye spectrum must be left as it is: fitted A = 9/ν_D³ (exact
    # for g = 9ν²/ν_D³) and no offset; low-frequency θ_D equals θ.
    nu = np.linspace(0.0, NU_D, 801)
    dos = load_dos(dos_text(nu, 9 * nu ** 2 / NU_D ** 3))
    fit = dos.low_frequency
    assert fit.coefficient == pytest.approx(9 / NU_D ** 3, rel=1e-6)  # trapezoid normalisation: O(Δ²)
    assert abs(fit.offset) < 1e-9
    assert dos.low_frequency_debye_temperature_k() == pytest.approx(THETA, rel=1e-6)
    # tabulated part (1 - W) g plus the analytic share W·Aν² is the Debye DOS again
    nu_t = dos.frequency_thz
    treated = dos.dos + fit.taper(nu_t) * fit.form(nu_t)
    assert np.allclose(treated, 9 * nu_t ** 2 / NU_D ** 3, rtol=1e-6)


def test_manual_window_and_off_switch():
    nu, g = smeared_debye()
    manual = load_dos(dos_text(nu, g), atoms=1, low_frequency=(0.5, 1.5))
    assert manual.low_frequency.window_thz == (0.5, 1.5) and not manual.low_frequency.automatic
    assert manual.low_frequency_debye_temperature_k() == pytest.approx(THETA, rel=0.02)
    off = load_dos(dos_text(nu, g), atoms=1, low_frequency="off")
    assert off.low_frequency is None
    with pytest.raises(OptionError, match="window"):
        load_dos(dos_text(nu, g), atoms=1, low_frequency="2:1")


@pytest.mark.parametrize("centre, width", [(6.0, 0.3), (6.0, 1.0), (4.0, 2.0), (6.0, 3.0)])
def test_peak_without_acoustic_region_switches_treatment_off_with_a_caution(centre, width):
    # The flank of a Gaussian is not ν²-like; a fitted offset would have to be
    # many times Aν² to mimic it, which the fit refuses.
    nu = np.linspace(0.0, 12.0, 1201)
    g = np.exp(-0.5 * ((nu - centre) / width) ** 2)
    dos = load_dos(dos_text(nu, g), atoms=1)
    assert dos.low_frequency is None
    assert any("T³ law is not enforced" in w for w in dos.warnings)


def test_reduced_dos_is_flat_for_debye():
    nu = np.linspace(0.0, NU_D, 101)
    f, r = reduced_dos(nu, 9 * nu ** 2 / NU_D ** 3)
    assert f[0] > 0 and np.allclose(r, 9 / NU_D ** 3)
