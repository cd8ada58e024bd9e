"""A quasi-harmonic Debye solid with constant Grüneisen parameter, built from published forms.

Static energy: third-order Birch–Murnaghan E(V) (Birch, Phys. Rev. 71, 809 (1947)).
Vibrations: Debye model (Debye, Ann. Phys. 344, 789 (1912)) with
θ(V) = θ₀ (V₀/V)^γ, so γ = -d ln θ / d ln V is constant; Debye function
D₃(x) = 3/x³ ∫₀ˣ t³/(eᵗ-1) dt evaluated by mpmath quadrature.  The
reference V(T), α, B_T and C_p come from a direct numerical minimisation of
this F(V,T) in mpmath (root of ∂F/∂V, derivatives by mpmath.diff), not
from modeheat.  The parameters are invented for the test.
"""

from __future__ import annotations

import mpmath as mp
import numpy as np
from scipy import constants as sc

from tests.spectra import debye_table, dos_text
from thermo.preparation.loading import load_dos

#: invented parameters: V₀ [Å³], B₀ [GPa], B₀', θ₀ [K], γ
V0, B0_GPA, B0_PRIME, THETA0, GAMMA = 20.0, 100.0, 4.5, 400.0, 1.6
GPA = sc.electron_volt / sc.angstrom ** 3 / sc.giga      # GPa per eV/Å³ (CODATA via scipy.constants)
KB_EV = sc.k / sc.electron_volt                           # k_B [eV/K] (CODATA)
VOLUMES = np.linspace(0.96 * V0, 1.06 * V0, 11)

mp.mp.dps = 30
_V0, _B0, _BP, _KB = mp.mpf(V0), mp.mpf(B0_GPA) / mp.mpf(GPA), mp.mpf(B0_PRIME), mp.mpf(KB_EV)


def theta(v):
    return THETA0 * (V0 / v) ** GAMMA


def static_energy(v):
    """BM3 energy [eV] (mpmath)."""
    u = (_V0 / v) ** (mp.mpf(2) / 3)
    return 9 * _V0 * _B0 / 16 * ((u - 1) ** 3 * _BP + (u - 1) ** 2 * (6 - 4 * u))


def debye_d3(x):
    return 3 / x ** 3 * mp.quad(lambda s: s ** 3 / mp.expm1(s), [0, x])


def helmholtz(v, t):
    """F(V,T) [eV] per atom: E(V) + 9kθ/8 + kT[3 ln(1-e^{-θ/T}) - D₃(θ/T)] (Debye 1912)."""
    th = mp.mpf(THETA0) * (_V0 / v) ** mp.mpf(GAMMA)
    x = th / t
    return static_energy(v) + _KB * (9 * th / 8 + t * (3 * mp.log(-mp.expm1(-x)) - debye_d3(x)))


def reference(t, extra=None):
    """V [Å³], α [1/K], B_T [GPa], C_p, C_v [eV/K] from minimising F(V,T) at p = 0.

    ``extra(v, t)`` [eV] (mpmath) is added to F, e.g. an electronic free energy."""
    t = mp.mpf(t)

    def free(w, s):
        return helmholtz(w, s) + (extra(w, s) if extra is not None else 0)
    fv = lambda v: mp.diff(lambda w: free(w, t), v)
    v = mp.findroot(fv, mp.mpf(V0) * 1.01)
    f_vv = mp.diff(lambda w: free(w, t), v, 2)
    f_vt = mp.diff(lambda w, s: free(w, s), (v, t), (1, 1))
    f_tt = mp.diff(lambda s: free(v, s), t, 2)
    dv_dt = -f_vt / f_vv
    cv = -t * f_tt
    cp = cv + t * f_vt ** 2 / f_vv          # -T d²G/dT² along V(T)
    return {"V": float(v), "alpha": float(dv_dt / v), "B": float(v * f_vv * GPA),
            "cp": float(cp), "cv": float(cv)}


def volume_entries(points=2001):
    """(V, E, PhononDOS) at the sampled volumes, each DOS read through load_dos."""
    out = []
    for v in VOLUMES:
        dos = load_dos(dos_text(*debye_table(theta(v), 1, points)), name=f"debye_{v:.3f}.dat")
        out.append((float(v), float(static_energy(mp.mpf(v))), dos))
    return out
