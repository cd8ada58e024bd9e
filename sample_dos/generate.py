"""Generate the invented demo DOS files of modeheat.

Everything here is made up for demonstration: imaginary elements with
made-up masses held together by made-up central springs (ball-and-spring
lattice dynamics).  Nothing describes a real material.  Run
``python sample_dos/generate.py`` to rewrite the files (deterministic).

Files
-----
- ``springium_fcc.dat``   monatomic face-centred cubic crystal, THz, spaces.
- ``lightheavy_rocksalt.tsv`` two-atom rock-salt crystal (light "Ly" and heavy
  "Hv"), meV, tab separated, with species-projected columns.
- ``lightheavy_soft.dat`` the same with a negative (unstable) second-neighbour
  spring on the heavy atoms: part of the spectrum is imaginary (negative).
- ``springium_md.csv``    a noisy molecular-dynamics-like spectrum of the fcc
  crystal (velocity autocorrelation style broadening), cm⁻¹, comma separated.
"""

from __future__ import annotations

import itertools
import pathlib

import numpy as np
from scipy import constants as sc

HERE = pathlib.Path(__file__).resolve().parent
_AMU = sc.atomic_mass


def _fcc_vectors(scale):
    """The 12 vectors (±1, ±1, 0)·scale and permutations."""
    out = set()
    for perm in set(itertools.permutations((1, 1, 0))):
        for signs in itertools.product((1, -1), repeat=3):
            out.add(tuple(s * p for s, p in zip(signs, perm)))
    return np.array(sorted(out), float) * scale


def _axis_vectors(scale):
    return np.array([[1, 0, 0], [-1, 0, 0], [0, 1, 0], [0, -1, 0], [0, 0, 1], [0, 0, -1]], float) * scale


def _kmesh(n, lattice=1.0):
    """Monkhorst–Pack style mesh of the fcc reciprocal cell (fractional offset ½)."""
    a1, a2, a3 = np.array([[0, 1, 1], [1, 0, 1], [1, 1, 0]], float) * lattice / 2
    cell = np.array([a1, a2, a3])
    recip = 2 * np.pi * np.linalg.inv(cell).T
    f = (np.arange(n) + 0.5) / n
    frac = np.array(np.meshgrid(f, f, f, indexing="ij")).reshape(3, -1).T
    return frac @ recip


def _frequencies(kpts, masses, bonds):
    """Phonon frequencies [THz] (negative for imaginary) and atom weights.

    ``bonds``: list of (atom a, atom b, displacement vector d from a to b, spring [N/m]).
    """
    nat = len(masses)
    dyn = np.zeros((len(kpts), 3 * nat, 3 * nat), complex)
    for a, b, d, spring in bonds:
        e = d / np.linalg.norm(d)
        block = spring * np.outer(e, e) / _AMU
        dyn[:, 3 * a:3 * a + 3, 3 * a:3 * a + 3] += block / masses[a]
        phase = np.exp(1j * kpts @ d)[:, None, None]
        dyn[:, 3 * a:3 * a + 3, 3 * b:3 * b + 3] -= phase * block / np.sqrt(masses[a] * masses[b])
    w2, vec = np.linalg.eigh(dyn)
    nu = np.sign(w2) * np.sqrt(np.abs(w2)) / (2 * np.pi) / 1e12
    weights = np.stack([np.sum(np.abs(vec[:, 3 * a:3 * a + 3, :]) ** 2, axis=1) for a in range(nat)], axis=-1)
    return nu.ravel(), weights.reshape(-1, nat)


def _smear(freqs, weights, grid, sigma):
    """Gaussian-smeared DOS on ``grid`` (states per unit of ``grid``), per cell."""
    out = np.zeros((grid.size, weights.shape[1]))
    norm = 1.0 / (sigma * np.sqrt(2 * np.pi)) / (freqs.size / (3 * weights.shape[1]))
    for start in range(0, freqs.size, 4000):
        f = freqs[start:start + 4000]
        g = np.exp(-0.5 * ((grid[:, None] - f[None, :]) / sigma) ** 2) * norm
        out += g @ weights[start:start + 4000]
    return out


def _write(name, header_lines, columns, delimiter, fmt="%.6g"):
    body = "\n".join(delimiter.join(fmt % v for v in row) for row in np.column_stack(columns))
    (HERE / name).write_text("\n".join(header_lines) + "\n" + body + "\n", encoding="utf-8")


def springium():
    """Monatomic fcc 'springium' (47.1 amu; springs 11.8 and 2.1 N/m)."""
    bonds = [(0, 0, d, 11.8) for d in _fcc_vectors(0.5)] + [(0, 0, d, 2.1) for d in _axis_vectors(1.0)]
    return _frequencies(_kmesh(32), np.array([47.1]), bonds)


def rocksalt(heavy_second_spring):
    """Rock-salt crystal of light 'Ly' (12.4 amu) and heavy 'Hv' (88.6 amu)."""
    bonds = []
    for d in _axis_vectors(0.5):
        bonds += [(0, 1, d, 16.5), (1, 0, d, 16.5)]
    for d in _fcc_vectors(0.5):
        bonds += [(0, 0, d, 1.9), (1, 1, d, heavy_second_spring)]
    return _frequencies(_kmesh(16), np.array([12.4, 88.6]), bonds)


def main():
    nu, w = springium()
    grid = np.linspace(0.0, 1.08 * nu.max(), 401)
    dos = _smear(nu, w, grid, 0.12)[:, 0]
    _write("springium_fcc.dat", [
        "# modeheat demo data - INVENTED: monatomic fcc 'springium' (47.1 amu), ball-and-spring model",
        "# made-up springs 11.8 N/m (first neighbours) and 2.1 N/m (second); 32^3 k-mesh, 0.12 THz Gaussian smearing",
        "# states per THz per atom; columns: frequency (THz), total DOS",
        "frequency_THz total"], [grid, dos], " ")

    md_grid_cm = np.linspace(0.0, 1.15 * nu.max() * 33.35641, 600)
    md = _smear(nu * 33.35641, w, md_grid_cm, 9.0)[:, 0]
    rng = np.random.default_rng(20261202)
    md = np.clip(md * (1 + 0.04 * rng.standard_normal(md.size)), 0, None)
    _write("springium_md.csv", [
        "# modeheat demo data - INVENTED: noisy MD-like spectrum of the 'springium' model",
        "# broadened 9 cm-1 with 4 % multiplicative noise (seed 20261202); arbitrary normalisation",
        "frequency (cm-1),vdos"], [md_grid_cm, md], ",")

    for name, spring, note in [("lightheavy_rocksalt.tsv", 3.2, "stable"),
                               ("lightheavy_soft.dat", -1.6, "UNSTABLE: softened heavy-heavy spring -1.6 N/m")]:
        nu2, w2 = rocksalt(spring)
        top = np.abs(nu2).max() * 1.08
        low = min(0.0, 1.1 * nu2.min())
        grid = np.linspace(low, top, 500)
        parts = _smear(nu2, w2, grid, 0.1)
        to_mev = sc.h * 1e12 / (sc.milli * sc.electron_volt)
        if name.endswith(".tsv"):
            _write(name, [
                "# modeheat demo data - INVENTED: rock-salt crystal of light 'Ly' (12.4 amu) and heavy 'Hv' (88.6 amu)",
                f"# made-up springs Ly-Hv 16.5 N/m, Ly-Ly 1.9 N/m, Hv-Hv {spring} N/m; {note}; 16^3 k-mesh",
                "# states per meV per formula unit (LyHv, 2 atoms); Gaussian smearing 0.41 meV",
                "energy_meV\ttotal\tLy\tHv"],
                [grid * to_mev, parts.sum(axis=1) / to_mev, parts[:, 0] / to_mev, parts[:, 1] / to_mev], "\t")
        else:
            _write(name, [
                "# modeheat demo data - INVENTED: rock-salt 'LyHv' with a soft heavy-atom spring",
                f"# made-up springs Ly-Hv 16.5 N/m, Ly-Ly 1.9 N/m, Hv-Hv {spring} N/m; {note}",
                "# negative frequencies stand for imaginary modes; states per THz per formula unit",
                "frequency_THz total Ly Hv"], [grid, parts.sum(axis=1), parts[:, 0], parts[:, 1]], " ")


if __name__ == "__main__":
    main()
