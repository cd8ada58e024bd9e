"""Generate the invented electronic DOS demo file of modeheat.

INVENTED data for demonstration only: the imaginary metal "springium" of the
other demo files gets a made-up electronic structure -- a free-electron-like
band g = a·√(E − E_b) starting 8.5 eV below the Fermi level, a broad made-up
"d-like" band 1.6 eV below E_F, and a narrow made-up peak 0.12 eV above E_F
(so that C_el/T visibly departs from γ at a few hundred kelvin).  Both spins
summed, per formula unit (one atom), energies relative to E_F on a 5 meV grid.
Its band γ, about 0.8 mJ/(mol K²), lies below the γ = 1.1 mJ/(mol K²) made up for
the measured demo (``generate_calorimetry.py``), as a made-up electron–phonon
enhancement λ ≈ 0.4 would make it.
The two made-up parts are written as projected columns.  Nothing describes a
real material.  Run ``python sample_dos/electronic/generate_electronic.py``
to rewrite ``springium_edos.dat`` (deterministic; a folder of its own so that
the dashboard does not offer it as a phonon DOS).
"""

from __future__ import annotations

import math
import pathlib

import numpy as np

HERE = pathlib.Path(__file__).resolve().parent

BAND_A, BAND_BOTTOM = 0.065, -8.5                    # states/eV^(3/2), eV
D_STATES, D_CENTRE, D_WIDTH = 6.0, -1.6, 0.55        # the made-up broad band: states, eV, eV (Gaussian σ)
PEAK_STATES, PEAK_CENTRE, PEAK_WIDTH = 0.1, 0.12, 0.06


def _gauss(e, states, centre, width):
    return states / (width * math.sqrt(2 * math.pi)) * np.exp(-0.5 * ((e - centre) / width) ** 2)


def main():
    e = np.round(np.arange(-10.0, 8.0 + 1e-9, 0.005), 6)
    band = BAND_A * np.sqrt(np.clip(e - BAND_BOTTOM, 0.0, None))
    d_like = _gauss(e, D_STATES, D_CENTRE, D_WIDTH) + _gauss(e, PEAK_STATES, PEAK_CENTRE, PEAK_WIDTH)
    lines = ["# modeheat demo data - INVENTED: electronic DOS of the imaginary metal 'springium'",
             "# free-electron-like band from -8.5 eV plus made-up d-like states (a broad band at -1.6 eV and a",
             "# narrow peak at +0.12 eV); both spins, per formula unit; energies relative to the Fermi level",
             "E-E_F (eV)\ttotal (states/eV)\tband-like\td-like"]
    lines += [f"{a:.3f}\t{b + c:.6e}\t{b:.6e}\t{c:.6e}" for a, b, c in zip(e, band, d_like)]
    (HERE / "springium_edos.dat").write_text("\n".join(lines) + "\n", encoding="utf-8")


if __name__ == "__main__":
    main()
