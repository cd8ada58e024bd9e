"""p17: a 16³ mode list (12,288 rows, the invented demo crystal) to a 1,000-temperature table [ms]."""

from __future__ import annotations

import numpy as np

from .scaling import UNIT, _text
from .timing import median_ratio, median_seconds


def p17(repeat=7):
    """Time of ``tabulate`` over a loaded 16³ mode list at 1,000 temperatures [ms], and the load [ms]."""
    from sample_dos.generate_modes import mode_list_text
    from thermo import load_dos, tabulate
    text = mode_list_text(16)
    dos = load_dos(text)
    t = np.linspace(1.0, 1000.0, 1000)
    table_s = median_seconds(lambda: tabulate(dos, t), repeat)
    load_s = median_seconds(lambda: load_dos(text), max(3, repeat // 2))
    same_size = load_dos(_text(12_288), **UNIT)
    ratio, _, _ = median_ratio(lambda: tabulate(dos, t), lambda: tabulate(same_size, t), repeat)
    return {"p17_modelist_table_ms": 1e3 * table_s,
            "contrast": {"p17_modelist_load_ms": 1e3 * load_s,
                         "p17_ratio_to_12288_row_dos_table": ratio,
                         "p17_modes": int(dos.modes.frequency_thz.size)},
            "p17_case": f"springium 16³ Γ-centred mode list with q and cell volume ({len(text.splitlines()) - 4} rows); "
                        f"1-1000 K in 1,000 steps; median of {repeat}"}
