"""Figure p8: the quasi-harmonic step, 11 volumes × 1,000 temperatures (invented spring crystal)."""

from __future__ import annotations

import numpy as np

from . import cases
from .timing import median_ratio, median_seconds

P8_VOLUMES, P8_TEMPERATURES = 11, np.linspace(1.0, 1000.0, 1000)


def volume_set(points=2000, volumes=P8_VOLUMES, gamma=1.7):
    """The spring crystal at ``volumes`` volumes: frequencies scaled by (V₀/V)^γ, invented BM3 static energy."""
    from thermo import load_dos
    from thermo.quasiharmonic import birch_murnaghan_energy
    nu, g = cases.spring_crystal(points)
    entries = []
    for v in np.linspace(0.95, 1.08, volumes) * 20.0:
        scale = (20.0 / v) ** gamma
        dos = load_dos(cases.as_text(nu * scale, g / scale))
        entries.append((float(v), float(birch_murnaghan_energy(v, -5.0, 20.0, 0.6, 4.5)), dos))
    return entries


def p8(repeat=7):
    """Median time of :func:`thermo.quasiharmonic.quasiharmonic_table` (DOS already loaded) [s]."""
    from thermo.quasiharmonic import make_volume_set, quasiharmonic_table
    vs = make_volume_set(volume_set())
    seconds = median_seconds(lambda: quasiharmonic_table(vs, P8_TEMPERATURES), repeat)
    vinet = median_seconds(lambda: quasiharmonic_table(vs, P8_TEMPERATURES, eos="vinet"), max(1, repeat // 3))
    ratio, with_errors, _ = median_ratio(lambda: quasiharmonic_table(vs, P8_TEMPERATURES, errors=True),
                                         lambda: quasiharmonic_table(vs, P8_TEMPERATURES), max(3, repeat // 2))
    return {"p8_quasiharmonic_s": seconds,
            "p8_case": f"{P8_VOLUMES} volumes x {P8_TEMPERATURES.size} temperatures, 2000-point spring-crystal "
                       "DOS, Birch-Murnaghan, loading excluded",
            "contrast": {"p8_vinet_s": vinet, "p8_errors_s": with_errors,
                         "p8_errors_cost_ratio": ratio,
                         "p8_errors_note": "errors=True over errors=False, one run, interleaved: the harmonic error "
                                           "estimate of every volume, the three equations of state and 11 "
                                           "leave-one-out refits"}}
