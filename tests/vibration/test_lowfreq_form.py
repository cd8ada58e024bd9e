"""⟨u²⟩ with the fitted low-frequency form A ν²(1+bν²+cν⁴), its taper and the refits, against mpmath.

References: the harmonic ⟨u²⟩ = ħ/(2m) ∫ g(ω)/ω coth(ħω/2k_BT) dω (Willis and Pryor, Thermal Vibrations
in Crystallography, CUP 1975, eq. 4.48), evaluated by independent high-precision quadrature (mpmath)
of the spectrum's own definition; constants CODATA via scipy.constants.  The spectra are invented.
"""

from __future__ import annotations

import mpmath
import numpy as np
import pytest
from scipy import constants as sc

from tests.spectra import dos_text
from thermo.preparation.loading import load_dos
from thermo.spectrum import LowFrequencyFit, PhononDOS
from thermo.vibration.debye_waller import analytic_displacement_integral
from thermo.vibration.displacements import mean_square_displacement, window_sensitivity

MASS = 47.0   # u (test value)
mpmath.mp.dps = 30


def _coth(nu_thz, t):
    """coth(hν/2k_BT) in mpmath (1 at T = 0)."""
    if t == 0:
        return mpmath.mpf(1)
    return mpmath.coth(mpmath.mpf(sc.h) * nu_thz * mpmath.mpf(10) ** 12 / (2 * mpmath.mpf(sc.k) * t))


def _step(nu, lo, top):
    """Share of the form in the blend: 1 - s²(3 - 2s), s = (ν - ν_a)/(ν_m - ν_a) (lowfreq docstring)."""
    s = (nu - lo) / (top - lo)
    return 1 - s * s * (3 - 2 * s)


FIT = LowFrequencyFit(0.05, 0.6, (0.6, 2.4), curvature=-0.3, quartic=0.05, blend_top_thz=1.2)


def _form_integral(fit, weight):
    """mpmath ∫ W(ν) A ν²(1+bν²+cν⁴) weight(ν) dν over [0, ν_c] and the tapered [ν_c, ν_m]."""
    a, b, c = (mpmath.mpf(v) for v in (fit.coefficient, fit.curvature, fit.quartic))
    lo, top = mpmath.mpf(fit.cutoff_thz), mpmath.mpf(fit.blend_top_thz)

    def form(nu):
        return a * nu ** 2 * (1 + b * nu ** 2 + c * nu ** 4)
    return (mpmath.quad(lambda v: form(v) * weight(v), [0, lo])
            + mpmath.quad(lambda v: _step(v, lo, top) * form(v) * weight(v), [lo, top]))


@pytest.mark.parametrize("t", [0.0, 2.0, 20.0, 300.0, 3000.0])
def test_analytic_part_with_curvature_and_taper_against_mpmath(t):
    # Closed form (Bose moments J_1, J_3, J_5) below ν_c plus Gauss–Legendre on the taper, against
    # mpmath quadrature of the same integrand; b and c are large so that dropping them would fail.
    want = float(_form_integral(FIT, lambda v: _coth(v, t) / v))
    got = float(analytic_displacement_integral(FIT, [t])[0])
    assert got == pytest.approx(want, rel=1e-10)
    pure = LowFrequencyFit(0.05, 0.6, (0.6, 2.4), blend_top_thz=1.2)
    assert abs(float(analytic_displacement_integral(pure, [t])[0]) / want - 1) > 1e-3


def test_classical_limit_and_mode_count_of_the_analytic_part_against_mpmath():
    # An empty table above the taper: the classical ⟨u²⟩ = k_BT/m ∫ g/ω² and the mode count come
    # from the analytic part alone (equipartition, Willis and Pryor 1975 §4.3).
    dos = PhononDOS(np.array([1.2, 2.0]), np.zeros(2), atoms=1, low_frequency=FIT)
    t = 500.0
    r = mean_square_displacement(dos, [t], masses={"X": MASS})["X"]
    modes = float(_form_integral(FIT, lambda v: 1))
    inverse_square = float(_form_integral(FIT, lambda v: 1 / v ** 2))
    # one atom per formula unit (n = 1, one species given by its mass)
    classical = sc.k * t * inverse_square / (MASS * sc.atomic_mass * (2e12 * np.pi) ** 2) * 1e20
    assert r["modes_found"] == pytest.approx(modes, rel=1e-12)
    assert r["classical"][0] == pytest.approx(classical, rel=1e-12)


NU_TOP = 8.0   # THz, top of the invented curved acoustic band g ∝ ν²(1 - ν²/ν_top²)
NORM = NU_TOP ** 3 * (1 / 3 - 1 / 5)


def _curved_text(points=2001):
    nu = np.linspace(0.0, NU_TOP, points)
    return dos_text(nu, 3 * nu ** 2 * (1 - (nu / NU_TOP) ** 2) / NORM)


def _curved_reference(t):
    """mpmath ⟨u²⟩ [Å²] of the curved band (3 modes, one atom of MASS)."""
    top = mpmath.mpf(NU_TOP)
    integral = mpmath.quad(lambda v: 3 * v * (1 - (v / top) ** 2) / NORM * _coth(v, t), [0, 1, top])
    return float(mpmath.mpf(sc.hbar) / (2 * MASS * mpmath.mpf(sc.atomic_mass)) * integral
                 / (2 * mpmath.pi * mpmath.mpf(10) ** 12) * mpmath.mpf(10) ** 20)


def test_curved_acoustic_file_against_mpmath():
    # Read from text through load_dos: fitted form + blend + table reproduce the exact spectrum's ⟨u²⟩
    # (the trapezoid error of the table at 2001 rows is ~1e-7; 1e-6 leaves room).
    dos = load_dos(_curved_text())
    assert dos.low_frequency is not None and dos.low_frequency.curvature < 0
    t = [0.0, 10.0, 50.0, 300.0, 1000.0]
    r = mean_square_displacement(dos, t, masses={"X": MASS})["X"]
    np.testing.assert_allclose(r["msd"], [_curved_reference(x) for x in t], rtol=1e-6)
    assert r["modes_found"] == pytest.approx(3.0, rel=1e-12)


def test_window_sensitivity_refits_automatic_and_manual_windows():
    # Automatic window: refitted at WINDOW_MODES × 0.5 and × 2 (other windows than the base one);
    # a window given by hand: its ends moved, each window tried is the moved one.
    auto = load_dos(_curved_text())
    s = window_sensitivity(auto, [0.0, 300.0], masses={"X": MASS})
    assert len(s["windows_THz"]) == 2 and "mode count" in s["varied"] and s["note"] is None
    assert all(w != list(auto.low_frequency.window_thz) for w in s["windows_THz"])
    assert 0 <= s["per_species"]["X"] < 1e-4        # clean ν² region: the refits agree
    manual = load_dos(_curved_text(), low_frequency="0.4:1.6")
    m = window_sensitivity(manual, [0.0, 300.0], masses={"X": MASS}, moves=((0.7, 1.0), (1.0, 1.4)))
    np.testing.assert_allclose(m["windows_THz"], [[0.28, 1.6], [0.4, 2.24]], rtol=1e-12)
    assert "ends are moved" in m["varied"]


def test_partials_without_stored_shares_against_willis_pryor():
    # A DOS whose fit carries no species_shares (built by hand) gets them from the fit window of its
    # input columns; each species still follows Willis and Pryor eq. 4.66 (mpmath, test_displacements).
    import dataclasses
    import periodictable
    from tests.vibration.test_displacements import _two_species_text, willis_pryor_msd
    loaded = load_dos(_two_species_text(), atoms=2)
    bare = dataclasses.replace(loaded, low_frequency=dataclasses.replace(loaded.low_frequency, species_shares={}))
    t = np.array([0.0, 100.0, 300.0])
    res = mean_square_displacement(bare, t, formula="MgO")
    for name, theta in [("Mg", 250.0), ("O", 480.0)]:
        mass = periodictable.elements.symbol(name).mass
        want = [willis_pryor_msd(tt / theta, theta, mass) for tt in t]
        np.testing.assert_allclose(res[name]["msd"], want, rtol=2e-4)   # as the stored-shares test
