"""Figure p19: the phase comparison of two 11-volume phases on a 1,000 T × 20 p grid (invented spring crystals)."""

from __future__ import annotations

import numpy as np

from .quasiharmonic import volume_set
from .timing import median_seconds

P19_TEMPERATURES = np.linspace(1.0, 1000.0, 1000)
P19_PRESSURES = np.linspace(0.0, 9.5, 20)


def phases():
    """Two invented phases: the p8 spring crystal and a softer, larger copy 25 meV/atom higher."""
    from thermo.phases import Phase
    from thermo.quasiharmonic import make_volume_set
    soft = [(v * 1.04, e + 0.025, dos) for v, e, dos in volume_set(gamma=1.9)]
    stiff = volume_set(gamma=1.7)
    soft = [(v, e, _scaled(dos, 0.85)) for v, e, dos in soft]
    return Phase("stiff", make_volume_set(stiff)), Phase("soft", make_volume_set(soft))


def _scaled(dos, factor):
    """The same spectrum with every frequency times ``factor`` (modes kept)."""
    from thermo import load_dos
    from . import cases
    return load_dos(cases.as_text(dos.input_frequency_thz * factor, dos.input_dos / factor))


def p19(repeat=3):
    """Median time of :func:`thermo.phases.compare_phases` (DOS loaded; without and with the error estimate) [s]."""
    from thermo.phases import compare_phases
    pair = phases()

    def run(errors):
        return compare_phases(pair, P19_TEMPERATURES, pressures_gpa=P19_PRESSURES, errors=errors, boundary=True)
    import time
    found = run(False)
    seconds = median_seconds(lambda: run(False), repeat)
    start = time.process_time()
    run(False)
    cpu = time.process_time() - start
    with_errors = median_seconds(lambda: run(True), 1)
    return {"p19_phases_s": seconds,
            "p19_case": f"2 phases x 11 volumes, {P19_TEMPERATURES.size} temperatures x {P19_PRESSURES.size} pressures, "
                        f"2000-point spring-crystal DOS, boundary included, {len(found.transitions)} transitions "
                        "at the root of the cubic through ΔG and ΔS of the grid, one batched Newton step on the exact ΔG; "
                        "loading excluded",
            "contrast": {"p19_cpu_s": cpu,
                         "p19_cpu_note": "processor time of one run of this process (the wall time above includes "
                                         "waiting for the cores on a shared machine)",
                         "p19_errors_s": with_errors,
                         "p19_errors_note": "the same with every row's error estimate (harmonic error of each "
                                            "volume, three equations of state and leave-one-out at every pressure)"}}
