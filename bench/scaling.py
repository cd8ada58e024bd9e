"""Issue-30 figures: cost as the work grows, and what a table's provenance costs.

(The calorimetry run of issue 30 is figure P9's ``p9_run_41_points_s``, :mod:`bench.calorimetry`.)

p14  provenance of one table (its error breakdown reused) ÷ the table itself (P1 case), interleaved;
     the breakdown's one-time cost ÷ the table beside it.
p15  a 10⁶-row DOS: load (read, validate, prepare) and a 10⁴-temperature table [s].
p16  a 10³-row DOS at 10⁴ temperatures [s].
scaling  ``tabulate`` time over rows 10³…10⁶ × temperatures 10…10⁴ (each the first table of its DOS, the
         once-per-DOS preparation included; and ``load_dos`` per row count),
         with the fitted exponent (log-log slope) of each axis: the least-squares slope along the
         axis at the largest value of the other (1 = linear; n·log n reads a little above 1).

The spectra are the invented spring crystal of :mod:`bench.cases`.
"""

from __future__ import annotations

import numpy as np

from . import cases
from .timing import best_seconds, median_ratio, median_seconds

ROWS = (1_000, 10_000, 100_000, 1_000_000)
TEMPERATURE_COUNTS = (10, 100, 1_000, 10_000)


def _text(points):
    """The spring crystal as ``points`` plain data rows (no header; the unit is given with :data:`UNIT`)."""
    nu, g = cases.spring_crystal(points)
    return "\n".join(np.char.add(np.char.add(np.char.mod("%.9g", nu), " "), np.char.mod("%.9g", g)).tolist()) + "\n"


#: Reading options of the texts of :func:`_text`.
UNIT = {"freq_unit": "THz"}


def _temperatures(count):
    return np.linspace(1.0, 1500.0, count)


def p14(repeat=7):
    """Provenance of a 5,000-point × 1,000-temperature table ÷ the table (median of interleaved ratios).

    The breakdown and its digest are computed once per DOS and temperatures and reused
    (``thermo.accuracy.reuse``), as after the table's first provenance, page or row-error call; the
    breakdown's one-time cost (on a fresh copy of the DOS) is reported beside.
    """
    from thermo import load_dos, tabulate
    from thermo.accuracy.breakdown import error_breakdown
    from thermo.tables import provenance
    dos = load_dos(_text(5000), **UNIT)
    t = np.linspace(1.0, 1000.0, 1000)
    provenance(dos, t)
    ratio, prov_s, table_s = median_ratio(lambda: provenance(dos, t), lambda: tabulate(dos, t), repeat)
    # a fresh copy: the breakdown keeps its re-prepared spectra on the DOS (thermo.accuracy.rebuild)
    once, once_s, _ = median_ratio(lambda: error_breakdown(fresh(dos), t), lambda: tabulate(dos, t),
                                   max(3, repeat // 2))
    return {"p14_provenance_ratio": ratio,
            "contrast": {"p14_provenance_s": prov_s, "p14_table_s": table_s,
                         "p14_breakdown_once_ratio_to_table": once, "p14_breakdown_once_s": once_s},
            "p14_case": "spring crystal, 5,000 points, 1-1000 K in 1,000 steps; provenance reuses the table's error "
                        "breakdown (two half grids, two alternative windows, fit error), computed once per DOS "
                        "and temperatures: its one-time cost is p14_breakdown_once_ratio_to_table"}


def fresh(dos):
    """A copy of ``dos`` (and of its ν² fit) without what a table keeps on them (the sums' preparation, the
    fit's closed form, error breakdowns): timing ``tabulate(fresh(dos), t)`` includes the once-per-DOS work."""
    from dataclasses import replace
    fit = dos.low_frequency
    return replace(dos, low_frequency=None if fit is None else replace(fit))


def p15_p16(repeat=3):
    """10⁶-row load, 10⁶ rows × 10⁴ temperatures, 10³ rows × 10⁴ temperatures [s].

    The tables are the first of their DOS (the preparation kept on it included); the same table again on
    the prepared DOS is reported beside.
    """
    from thermo import load_dos, tabulate
    from thermo.io.readers import read_table
    text = _text(1_000_000)
    load_s = median_seconds(lambda: load_dos(text, **UNIT), repeat)
    read_s = median_seconds(lambda: read_table(text), repeat)
    big = load_dos(text, **UNIT)
    t = _temperatures(10_000)
    big_s = median_seconds(lambda: tabulate(fresh(big), t), repeat)
    big_again_s = median_seconds(lambda: tabulate(big, t), repeat)
    small = load_dos(_text(1_000), **UNIT)
    small_s = median_seconds(lambda: tabulate(fresh(small), t), max(repeat, 5))
    return {"p15_load_1e6_rows_s": load_s, "p15_table_1e6_rows_1e4_T_s": big_s, "p16_table_1e3_rows_1e4_T_s": small_s,
            "contrast": {"p15_read_table_1e6_rows_s": read_s, "p15_prepare_1e6_rows_s": load_s - read_s,
                         "p15_table_again_on_the_prepared_dos_s": big_again_s},
            "p15_case": f"spring crystal text, 10⁶ rows (read + validate + prepare); tables 1-1500 K, the first of "
                        f"their DOS (its once-per-DOS preparation included), median of {repeat}"}


def slope(x, y):
    """Least-squares slope of ln y over ln x [1].

    Examples
    --------
    >>> round(slope([1, 10, 100], [2, 20, 200]), 6)
    1.0
    """
    return float(np.polyfit(np.log(x), np.log(y), 1)[0])


def scaling(quick=False):
    """``tabulate`` [s] on a grid of row counts × temperature counts, ``load_dos`` [s] per row count, slopes."""
    from thermo import load_dos, tabulate
    rows = ROWS[:3] if quick else ROWS
    counts = TEMPERATURE_COUNTS[:3] if quick else TEMPERATURE_COUNTS
    repeat = 2 if quick else 5
    table, loads = {}, {}
    for n in rows:
        text = _text(n)
        loads[n] = best_seconds(lambda: load_dos(text, **UNIT), repeat)
        dos = load_dos(text, **UNIT)
        for m in counts:
            t = _temperatures(m)
            table[(n, m)] = best_seconds(lambda: tabulate(fresh(dos), t), repeat if n * m < 10 ** 9 else 1)
    along_rows = slope(rows, [table[(n, counts[-1])] for n in rows])
    along_t = slope(counts, [table[(rows[-1], m)] for m in counts])
    lines = ["rows \\ T " + "".join(f"{m:>10d}" for m in counts) + f"{'load':>10s}"]
    lines += [f"{n:>9d} " + "".join(f"{1e3 * table[(n, m)]:>9.2f} " for m in counts) + f"{1e3 * loads[n]:>9.1f}"
              for n in rows]
    lines.append(f"(ms, least of {repeat}; exponent along rows at {counts[-1]} T: {along_rows:.2f}, along T at "
                 f"{rows[-1]} rows: {along_t:.2f}, load along rows: {slope(rows, list(loads.values())):.2f})")
    return {"scaling_exponent_rows": along_rows, "scaling_exponent_temperatures": along_t,
            "scaling_exponent_load_rows": slope(rows, list(loads.values())),
            "scaling_table": "\n".join(lines),
            "contrast": {"scaling_ms": {f"{n}x{m}": round(1e3 * v, 3) for (n, m), v in table.items()},
                         "scaling_load_ms": {str(n): round(1e3 * v, 2) for n, v in loads.items()}}}
