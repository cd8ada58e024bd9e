"""A quasi-harmonic Debye solid with constant Grüneisen parameter, built from published forms.

Static energy: third-order Birch–Murnaghan E(V) (Birch, Phys. Rev. 71, 809 (1947)), or a Morse
function of the lattice parameter a = V^(1/3) (Morse, Phys. Rev. 34, 57 (1929); used for E(a) of
solids e.g. by Moruzzi, Janak and Schwarz, Phys. Rev. B 37, 790 (1988) — from memory), which none
of modeheat's equations of state reproduces exactly.
Vibrations: Debye model (Debye, Ann. Phys. 344, 789 (1912)) with θ(V) = θ₀ (V₀/V)^γ, so
γ = -d ln θ / d ln V is constant.  Debye function D₃(x) = 3/x³ ∫₀ˣ t³/(eᵗ-1) dt in closed form
with polylogarithms (Abramowitz & Stegun 27.1; the integral as π⁴/15 minus the tail
Σ_k Li_k(e^{-x}) terms), checked against mpmath quadrature in test_debye_solid.py.
The reference V(T), α, B_T and C_p come from a direct numerical minimisation of this F(V,T) in
mpmath (root of ∂F/∂V, derivatives by mpmath.diff), not from modeheat.  Parameters are invented.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import mpmath as mp
import numpy as np
from scipy import constants as sc

from tests.spectra import debye_table, dos_text
from thermo.preparation.loading import load_dos

#: invented parameters: V₀ [Å³], B₀ [GPa], B₀', θ₀ [K], γ
V0, B0_GPA, B0_PRIME, THETA0, GAMMA = 20.0, 100.0, 4.5, 400.0, 1.6
GPA = sc.electron_volt / sc.angstrom ** 3 / sc.giga      # GPa per eV/Å³ (CODATA via scipy.constants)
KB_EV = sc.k / sc.electron_volt                           # k_B [eV/K] (CODATA)
R_PER_KB_EV = sc.N_A * sc.electron_volt                   # J/(mol K) per eV/K (CODATA)
VOLUMES = np.linspace(0.96 * V0, 1.06 * V0, 11)

mp.mp.dps = 30
_KB = mp.mpf(KB_EV)


def debye_d3(x):
    """D₃(x) by quadrature (mpmath), the definition."""
    return 3 / x ** 3 * mp.quad(lambda s: s ** 3 / mp.expm1(s), [0, x])


def debye_d3_closed(x):
    r"""D₃(x) from ∫₀ˣ t³/(eᵗ-1) dt = π⁴/15 + x³ln(1-e^{-x}) - 3x²Li₂(e^{-x}) - 6x Li₃(e^{-x}) - 6Li₄(e^{-x})."""
    q = mp.exp(-x)
    integral = (mp.pi ** 4 / 15 + x ** 3 * mp.log(-mp.expm1(-x)) - 3 * x ** 2 * mp.polylog(2, q)
                - 6 * x * mp.polylog(3, q) - 6 * mp.polylog(4, q))
    return 3 / x ** 3 * integral


@dataclass(frozen=True)
class Solid:
    """One invented Debye solid: static energy form, γ and θ₀ (per atom, one atom per formula unit)."""

    gamma: float = GAMMA
    static: str = "birch-murnaghan"
    theta0: float = THETA0

    def theta(self, v):
        return self.theta0 * (V0 / v) ** self.gamma

    def static_energy(self, v):
        """E(V) [eV] (mpmath): B₀ = 100 GPa at V₀ for both forms."""
        v0, b0 = mp.mpf(V0), mp.mpf(B0_GPA) / mp.mpf(GPA)
        if self.static == "morse":
            # E = D[(1 - e^{-k(a-a0)})² - 1], a = V^(1/3); B₀ = 2Dk²/(9a₀) at the minimum
            a0, ka = v0 ** (mp.mpf(1) / 3), mp.mpf(3)
            k = ka / a0
            depth = b0 * 9 * a0 / (2 * k ** 2)
            return depth * ((1 - mp.exp(-k * (mp.mpf(v) ** (mp.mpf(1) / 3) - a0))) ** 2 - 1)
        u = (v0 / v) ** (mp.mpf(2) / 3)
        return 9 * v0 * b0 / 16 * ((u - 1) ** 3 * B0_PRIME + (u - 1) ** 2 * (6 - 4 * u))

    def helmholtz(self, v, t):
        """F(V,T) [eV]: E(V) + 9kθ/8 + kT[3 ln(1-e^{-θ/T}) - D₃(θ/T)] (Debye 1912)."""
        th = mp.mpf(self.theta0) * (mp.mpf(V0) / v) ** mp.mpf(self.gamma)
        x = th / t
        return self.static_energy(v) + mp.mpf(KB_EV) * (9 * th / 8 + t * (3 * mp.log(-mp.expm1(-x))
                                                                          - debye_d3_closed(x)))

    @lru_cache(maxsize=None)
    def reference(self, t):
        """V [Å³], α [1/K], B_T [GPa], C_p, C_v [eV/K] from minimising F(V,T) at p = 0 (T > 0)."""
        return self.reference_with(t)

    def reference_with(self, t, extra=None):
        """As :meth:`reference` (plus G = F(V,T) [eV] at p = 0), with ``extra(v, t)`` [eV] (mpmath) added to F, e.g. an electronic free energy."""
        t = mp.mpf(t)

        def f(w, s):
            return self.helmholtz(w, s) + (extra(w, s) if extra is not None else 0)
        v = mp.findroot(lambda w: mp.diff(lambda u: f(u, t), w), mp.mpf(V0) * 1.01)
        f_vv = mp.diff(lambda w: f(w, t), v, 2)
        f_vt = mp.diff(lambda w, s: f(w, s), (v, t), (1, 1))
        f_tt = mp.diff(lambda s: f(v, s), t, 2)
        cv = -t * f_tt
        cp = cv + t * f_vt ** 2 / f_vv          # -T d²G/dT² along V(T)
        return {"V": float(v), "alpha": float(-f_vt / f_vv / v), "B": float(v * f_vv * GPA),
                "cp": float(cp), "cv": float(cv), "G": float(f(v, t))}

    def references(self, temperatures):
        """Reference arrays at ``temperatures``: V [Å³], α [1/K], B [GPa], C_p, C_v [J/(mol K)], G [kJ/mol]."""
        rows = [self.reference(float(t)) for t in temperatures]
        out = {k: np.array([r[k] for r in rows]) for k in ("V", "alpha", "B")}
        out.update(cp=np.array([r["cp"] for r in rows]) * R_PER_KB_EV, cv=np.array([r["cv"] for r in rows]) * R_PER_KB_EV,
                   G=np.array([r["G"] for r in rows]) * R_PER_KB_EV / 1e3, gamma=np.full(len(rows), self.gamma))
        return out

    def entries(self, volumes=VOLUMES, points=2001):
        """(V, E, PhononDOS) at ``volumes``, each DOS read through load_dos."""
        return [(float(v), float(self.static_energy(mp.mpf(v))),
                 load_dos(dos_text(*debye_table(self.theta(v), 1, points)), name=f"debye_{v:.3f}.dat"))
                for v in volumes]


DEFAULT = Solid()


def theta(v):
    return DEFAULT.theta(v)


def static_energy(v):
    """BM3 energy [eV] (mpmath)."""
    return DEFAULT.static_energy(v)


def helmholtz(v, t):
    return DEFAULT.helmholtz(v, t)


def reference(t, extra=None):
    """V [Å³], α [1/K], B_T [GPa], C_p, C_v [eV/K] of the default solid at p = 0.

    ``extra(v, t)`` [eV] (mpmath) is added to F, e.g. an electronic free energy."""
    return DEFAULT.reference(float(t)) if extra is None else DEFAULT.reference_with(float(t), extra)


def volume_entries(points=2001):
    """(V, E, PhononDOS) of the default solid at :data:`VOLUMES`."""
    return DEFAULT.entries(VOLUMES, points)
