"""Spring-model test crystals with exactly known thermodynamics (invented for testing only).

Two cubic Bravais crystals, one atom per cell, with central springs to the
first and second neighbour shells. The force constants, masses and lattice
constants are made up for these tests (not the demo 'springium'):

* ``BCC`` — a = 3.10 Å, 58.0 amu, springs 15.0 N/m (8 first neighbours) and
  6.5 N/m (6 second neighbours); θ_D(T→0) ≈ 250 K.
* ``FCC`` — a = 3.75 Å, 36.0 amu, springs 12.5 N/m (12 first neighbours) and
  1.4 N/m (6 second neighbours).

What the module gives:

* eigenfrequencies of the dynamical matrix on n³ Monkhorst–Pack or
  Γ-centred meshes (q Cartesian in 1/Å with 2π: phase exp(i q·r), folded to
  the shortest image), as mode lists (``weight frequency_THz qx_per_A …``);
* DOS files from a mesh: Gaussian smearing (σ in THz) or a histogram
  (bin width in THz, written in THz or meV);
* the exact reference C_v, S, U, F per mole of atoms (:func:`reference`),
  exact to ~1e-6 relative over 1–1000 K (checked in tests/test_crystal.py).

How the reference is exact
--------------------------
Every thermodynamic function is a Brillouin-zone average of a sum over the
three branches. The zone is split with a smooth (C^∞) partition of unity
w(|q|) that is 1 inside r₁ and 0 outside r₂ < the inscribed radius of the
zone:

* w·f is integrated in spherical coordinates around Γ (composite
  Gauss–Legendre in |q| on geometrically shrinking intervals down to
  ~4e-6 r₂, Gauss–Legendre in cos θ and φ over one octant: the crystals are
  cubic). This resolves the long-wave region at any temperature, so the
  T → 0 limit is the Debye T³ law with the direction-averaged 1/c³ of the
  long-wave dynamical matrix (Ashcroft & Mermin 1976, ch. 22–23) — a test
  checks that limit against :func:`debye_temperature`;
* (1−w)·f is smooth and periodic, so a Monkhorst–Pack mesh sum of it
  converges faster than any power of the mesh spacing (trapezoid rule for
  smooth periodic functions, Trefethen & Weideman 2014).

Both parts become one list of (frequency, weight) nodes, cached per crystal;
a table is a weighted Planck sum over them.

References
----------
N. W. Ashcroft and N. D. Mermin, *Solid State Physics* (Saunders, 1976),
ch. 22 (dynamical matrix of a Bravais lattice with pair springs) and ch. 23
(low-temperature specific heat, T³ law with the averaged inverse cube of the
sound speeds). H. J. Monkhorst and J. D. Pack, Phys. Rev. B 13, 5188 (1976).
L. N. Trefethen and J. A. C. Weideman, SIAM Rev. 56, 385 (2014).
Constants: CODATA via ``scipy.constants``.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass

import numpy as np
from scipy import constants as sc

#: h/k_B [K/THz] and h·N_A [J/mol per THz] (CODATA via scipy.constants).
K_PER_THZ = sc.h * 1e12 / sc.k
J_PER_MOL_PER_THZ = sc.h * 1e12 * sc.N_A
#: meV per THz (CODATA via scipy.constants).
MEV_PER_THZ = sc.h * 1e12 / sc.e * 1e3


@dataclass(frozen=True)
class SpringCrystal:
    """Cubic Bravais crystal, one atom per cell, central first- and second-neighbour springs.

    Attributes
    ----------
    name : str
    lattice : {'bcc', 'fcc'}
    a_A : float
        Cubic lattice constant [Å].
    mass_amu : float
        Atomic mass [u].
    springs_N_per_m : tuple of float
        Spring constants of the first and second neighbour shells [N/m].
    """

    name: str
    lattice: str
    a_A: float
    mass_amu: float
    springs_N_per_m: tuple

    @property
    def primitive(self):
        """Primitive vectors as rows [Å]."""
        h = self.a_A / 2
        if self.lattice == "bcc":
            return h * np.array([[-1.0, 1, 1], [1, -1, 1], [1, 1, -1]])
        return h * np.array([[0.0, 1, 1], [1, 0, 1], [1, 1, 0]])

    @property
    def reciprocal(self):
        """Reciprocal vectors as rows [1/Å], 2π included (a_i·b_j = 2π δ_ij)."""
        return 2 * np.pi * np.linalg.inv(self.primitive).T

    @property
    def cell_volume_A3(self):
        """Primitive cell volume [Å³]."""
        return abs(float(np.linalg.det(self.primitive)))

    @property
    def inscribed_radius(self):
        """Radius of the sphere inscribed in the Brillouin zone [1/Å]: half the shortest G."""
        g = _lattice_points(self.reciprocal, 2)
        return 0.5 * float(np.min(np.linalg.norm(g[np.any(g != 0, axis=1)], axis=1)))

    def neighbours(self):
        """(bond vectors [Å], spring constants [N/m]) of both shells, ±r both listed."""
        r = _lattice_points(self.primitive, 3)
        d = np.round(np.linalg.norm(r, axis=1), 9)
        shells = np.unique(d[d > 0])[:2]
        keep = np.isin(d, shells)
        k = np.where(d[keep] == shells[0], *self.springs_N_per_m)
        return r[keep], k

    def dynamical_matrix(self, q):
        """D(q) [(rad/s)²], shape (..., 3, 3), for q [1/Å] of shape (..., 3).

        Notes
        -----
        D_ab(q) = (1/M) Σ_r k_r r̂_a r̂_b (1 − cos q·r) (Ashcroft & Mermin 1976, ch. 22).
        """
        r, k = self.neighbours()
        unit = r / np.linalg.norm(r, axis=1)[:, None]
        outer = (k / (self.mass_amu * sc.atomic_mass))[:, None, None] * unit[:, :, None] * unit[:, None, :]
        phase = 1.0 - np.cos(np.einsum("...a,na->...n", np.asarray(q, float), r))
        return np.einsum("...n,nab->...ab", phase, outer)

    def frequencies(self, q):
        """Frequencies [THz], shape (..., 3), ascending, of the modes at q [1/Å]."""
        w2 = np.linalg.eigvalsh(self.dynamical_matrix(q))
        return np.sqrt(np.clip(w2, 0.0, None)) / (2 * np.pi * 1e12)

    def sound_velocities(self, directions):
        """Sound velocities [m/s], shape (..., 3), along unit ``directions`` (long-wave D(q)/q²)."""
        r, k = self.neighbours()
        unit = r / np.linalg.norm(r, axis=1)[:, None]
        outer = (k / (self.mass_amu * sc.atomic_mass))[:, None, None] * unit[:, :, None] * unit[:, None, :]
        proj = (np.asarray(directions, float) @ (r * 1e-10).T) ** 2 / 2
        return np.sqrt(np.linalg.eigvalsh(np.einsum("...n,nab->...ab", proj, outer)))

    def debye_temperature(self, order=48):
        """Low-temperature Debye temperature [K] from the direction-averaged 1/c³.

        Notes
        -----
        3/c_D³ = Σ_j ⟨c_j⁻³⟩ over directions; θ_D = ħ c_D (6π² /V_cell)^{1/3} / k_B,
        so that C_v → (12π⁴/5) R (T/θ_D)³ per mole of atoms (Ashcroft & Mermin 1976, ch. 23).
        """
        n, w = _octant_directions(order)
        inv_c3 = np.sum(w[:, None] * self.sound_velocities(n) ** -3.0)
        c_d = (3.0 / inv_c3) ** (1 / 3)
        return sc.hbar * c_d * (6 * np.pi ** 2 / (self.cell_volume_A3 * 1e-30)) ** (1 / 3) / sc.k


BCC = SpringCrystal("test-bcc", "bcc", 3.10, 58.0, (15.0, 6.5))
FCC = SpringCrystal("test-fcc", "fcc", 3.75, 36.0, (12.5, 1.4))


def _lattice_points(rows, span):
    n = np.arange(-span, span + 1)
    ijk = np.stack(np.meshgrid(n, n, n, indexing="ij"), -1).reshape(-1, 3)
    return ijk @ rows


def _octant_directions(order):
    """Unit vectors and weights (sum 1) of a Gauss–Legendre product rule on one octant."""
    mu, wm = np.polynomial.legendre.leggauss(order)
    mu, wm = (mu + 1) / 2, wm / 2                     # cos θ on [0, 1]
    phi, wp = np.polynomial.legendre.leggauss(order)
    phi, wp = (phi + 1) * np.pi / 4, wp * np.pi / 4   # φ on [0, π/2]
    m, p = np.meshgrid(mu, phi, indexing="ij")
    s = np.sqrt(1 - m ** 2)
    n = np.stack([s * np.cos(p), s * np.sin(p), m], -1).reshape(-1, 3)
    return n, (wm[:, None] * wp[None, :]).ravel() / (np.pi / 2)


# ----------------------------------------------------------------------------- meshes

def mesh(crystal, n, gamma=False):
    """q-points [1/Å] of an n³ mesh, folded to the shortest image, and their weights (sum 1).

    ``gamma=False``: Monkhorst–Pack points (2i − n − 1)/(2n); ``gamma=True``: Γ-centred i/n.
    """
    i = np.arange(n)
    f = i / n if gamma else (2 * (i + 1) - n - 1) / (2 * n)
    f = f - np.round(f)
    frac = np.stack(np.meshgrid(f, f, f, indexing="ij"), -1).reshape(-1, 3)
    q = frac @ crystal.reciprocal
    images = q[:, None, :] + _lattice_points(crystal.reciprocal, 1)[None]
    q = images[np.arange(len(q)), np.argmin(np.linalg.norm(images, axis=2), axis=1)]
    return q, np.full(len(q), 1.0 / len(q))


@functools.lru_cache(maxsize=16)
def mesh_modes(crystal, n, gamma=False):
    """(q [1/Å] (N, 3), weights (N,), frequencies [THz] (N, 3)) of an n³ mesh (cached)."""
    q, w = mesh(crystal, n, gamma)
    return q, w, crystal.frequencies(q)


def mode_list_text(crystal, n, gamma=False, with_q=True):
    """A mode-list file: ``# cell volume`` statement, header, one row per mode (q-point weight)."""
    q, w, nu = mesh_modes(crystal, n, gamma)
    lines = [f"# test crystal {crystal.name} (invented springs), {n}^3 "
             f"{'Gamma-centred' if gamma else 'Monkhorst-Pack'} mesh",
             f"# cell volume: {crystal.cell_volume_A3:.12g} A^3",
             "weight frequency_THz" + (" qx_per_A qy_per_A qz_per_A" if with_q else "")]
    for qi, wi, nui in zip(q, w, nu):
        tail = " " + " ".join(repr(float(v)) for v in qi) if with_q else ""
        lines.extend(f"{float(wi)!r} {float(v)!r}{tail}" for v in nui)
    return "\n".join(lines) + "\n"


def gaussian_dos(crystal, n, sigma_thz, gamma=False, step_thz=None, start_thz=0.0):
    """(ν [THz], g [states/THz per atom]) of an n³ mesh, Gaussian-smeared with σ (normalised to 3)."""
    _, w, nu = mesh_modes(crystal, n, gamma)
    step = step_thz or sigma_thz / 4
    grid = np.arange(start_thz, nu.max() + 5 * sigma_thz, step)
    modes, weights = nu.ravel(), np.repeat(w, 3)
    g = np.zeros_like(grid)
    for lo in range(0, len(modes), 4096):
        d = (grid[:, None] - modes[None, lo:lo + 4096]) / sigma_thz
        g += np.exp(-0.5 * d ** 2) @ weights[lo:lo + 4096]
    return grid, g / (sigma_thz * np.sqrt(2 * np.pi))


def histogram_dos(crystal, n, bin_thz, gamma=False):
    """(bin centres [THz], g [states/THz per atom]) of an n³ mesh: mode weight per bin / bin width."""
    _, w, nu = mesh_modes(crystal, n, gamma)
    edges = np.arange(0.0, nu.max() + bin_thz, bin_thz)
    counts, _ = np.histogram(nu.ravel(), bins=edges, weights=np.repeat(w, 3))
    return (edges[:-1] + edges[1:]) / 2, counts / bin_thz


def dos_text(frequency_thz, g_per_thz, unit="THz", comment=""):
    """DOS file body in THz or meV (density per the same unit); full precision."""
    scale = {"THz": 1.0, "meV": MEV_PER_THZ}[unit]
    head = f"# {comment}\n" if comment else ""
    rows = "\n".join(f"{float(f)!r} {float(g)!r}" for f, g in zip(frequency_thz * scale, g_per_thz / scale))
    return f"{head}frequency_{unit} total\n{rows}\n"


# ------------------------------------------------------------------------- reference

def _smooth_step(t):
    """C^∞ step: 0 for t ≤ 0, 1 for t ≥ 1."""
    t = np.clip(t, 0.0, 1.0)
    a = np.where(t > 0, np.exp(-1 / np.where(t > 0, t, 1)), 0.0)
    b = np.where(t < 1, np.exp(-1 / np.where(t < 1, 1 - t, 1)), 0.0)
    return a / (a + b)


@functools.lru_cache(maxsize=8)
def reference_nodes(crystal, mesh_n=24, radial=8, octaves=18, angular=8):
    """(frequencies [THz], weights) whose weighted sums are zone averages (Σ weights = 3).

    The sphere part (spherical Gauss–Legendre around Γ) carries w(|q|), the
    mesh part (Monkhorst–Pack ``mesh_n``³) carries 1 − w(|q|); see the module notes.
    """
    r_in = crystal.inscribed_radius
    r1, r2 = 0.15 * r_in, 0.95 * r_in
    weight_in = lambda q: 1.0 - _smooth_step((q - r1) / (r2 - r1))   # noqa: E731
    x, wx = np.polynomial.legendre.leggauss(radial)
    radii, wr = [], []
    for k in range(octaves):                        # [r2/2^(k+1), r2/2^k]
        lo, hi = r2 / 2 ** (k + 1), r2 / 2 ** k
        radii.append(lo + (x + 1) * (hi - lo) / 2)
        wr.append(wx * (hi - lo) / 2)
    radii, wr = np.concatenate(radii), np.concatenate(wr)
    n, wn = _octant_directions(angular)
    q = radii[:, None, None] * n[None, :, :]
    zone = (2 * np.pi) ** 3 / crystal.cell_volume_A3
    w_sphere = (4 * np.pi * radii ** 2 * wr * weight_in(radii) / zone)[:, None] * wn[None, :]
    nu_sphere = crystal.frequencies(q.reshape(-1, 3))
    qm, wm, nu_mesh = mesh_modes(crystal, mesh_n)
    w_mesh = wm * (1.0 - weight_in(np.linalg.norm(qm, axis=1)))
    keep = w_mesh > 0
    nu = np.concatenate([nu_sphere.ravel(), nu_mesh[keep].ravel()])
    w = np.concatenate([np.repeat(w_sphere.ravel(), 3), np.repeat(w_mesh[keep], 3)])
    keep = (w > 0) & (nu > 0)
    return nu[keep], w[keep]


def planck_sums(frequency_thz, weights, temperatures):
    """Σ w·c(x), Σ w·s(x), Σ w·x/(eˣ−1), Σ w·ln(1−e⁻ˣ) (x = hν/k_BT > 0) and Σ w·ν/2 [THz].

    Terms with x > 80 (below 1e-31 of a mode) are skipped.
    """
    t = np.atleast_1d(np.asarray(temperatures, float))
    order = np.argsort(frequency_thz)
    nu, w = np.asarray(frequency_thz, float)[order], np.asarray(weights, float)[order]
    out = {k: np.empty(len(t)) for k in ("c", "u", "l")}
    for i, ti in enumerate(t):
        m = np.searchsorted(nu, 80.0 * ti / K_PER_THZ)
        x = K_PER_THZ * nu[:m] / ti
        e = np.exp(-x)
        one = -np.expm1(-x)                       # 1 − e⁻ˣ without cancellation
        u = x * e / one
        wm = w[:m]                                # plain sums: no BLAS threads on a loaded machine
        out["c"][i], out["u"][i], out["l"][i] = (np.sum(wm * u * x / one), np.sum(wm * u),
                                                 np.sum(wm * np.log(one)))
    out["s"] = out["u"] - out["l"]
    out["zero_point_thz"] = float(np.sum(w * nu)) / 2
    return out


def reference(crystal, temperatures):
    """Exact harmonic C_v, S [J/(mol K)], U, F [kJ/mol] per mole of atoms (U, F with zero-point energy).

    Notes
    -----
    C_v = R⟨Σ_j c(x)⟩, S = R⟨Σ_j [x/(eˣ−1) − ln(1−e⁻ˣ)]⟩, U = E₀ + RT⟨Σ_j x/(eˣ−1)⟩,
    F = E₀ + RT⟨Σ_j ln(1−e⁻ˣ)⟩, E₀ = N_A h⟨Σ_j ν/2⟩; ⟨⟩ the zone average
    (same definitions as thermo.tables.tabulate).

    Examples
    --------
    >>> r = reference(BCC, [1000.0])
    >>> round(float(r["heat_capacity_v"][0]) / (3 * sc.R), 3)
    0.997
    """
    t = np.atleast_1d(np.asarray(temperatures, float))
    s = planck_sums(*reference_nodes(crystal), t)
    e0 = J_PER_MOL_PER_THZ * s["zero_point_thz"] / 1e3
    return {"temperature": t, "heat_capacity_v": sc.R * s["c"], "entropy": sc.R * s["s"],
            "internal_energy": e0 + sc.R * t * s["u"] / 1e3,
            "helmholtz_energy": e0 + sc.R * t * s["l"] / 1e3, "zero_point_kJ_per_mol": e0}


def mesh_table(crystal, n, temperatures, gamma=False):
    """The same quantities as :func:`reference` from the plain n³ mesh sum (for comparison)."""
    _, w, nu = mesh_modes(crystal, n, gamma)
    t = np.atleast_1d(np.asarray(temperatures, float))
    good = nu.ravel() > 0
    s = planck_sums(nu.ravel()[good], np.repeat(w, 3)[good], t)
    e0 = J_PER_MOL_PER_THZ * s["zero_point_thz"] / 1e3
    return {"temperature": t, "heat_capacity_v": sc.R * s["c"], "entropy": sc.R * s["s"],
            "internal_energy": e0 + sc.R * t * s["u"] / 1e3,
            "helmholtz_energy": e0 + sc.R * t * s["l"] / 1e3}
