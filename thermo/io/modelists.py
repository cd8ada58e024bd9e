"""Mode lists: a table of the modes of a q-point mesh, one row per mode (format only, no physics).

A mode list is read by :func:`thermo.io.readers.read_table` like a DOS (text,
CSV, ``.xlsx``, encodings, limits) and recognised by a header cell named
``weight``.  Its columns, by name (any order, case ignored):

* ``weight`` — the q-point weight of the mode (any normalisation);
* the frequency, its unit in the name as for a DOS (``frequency_THz``,
  ``frequency_cm-1``, ``nu (meV)``) or in a unit line;
* optionally ``qx_per_A qy_per_A qz_per_A`` — the Cartesian wave vector
  [1/Å], 2π included (phase :math:`e^{i\\mathbf q\\cdot\\mathbf r}`);
* any other column: a species projection (the mode's weight on it, 0…1).

A statement line ``# cell volume: 11.81 A^3`` (``Å^3``, ``Å³``, ``bohr^3``)
gives the cell volume.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

import numpy as np
from scipy import constants as sc

from ..errors import DosInputError
from ..units import guess_unit_from_text
from .unit_statements import frequency_unit

#: Header cell that marks a mode list.
WEIGHT_NAME = "weight"
#: Header cells of the wave vector [1/Å].
Q_NAMES = ("qx_per_a", "qy_per_a", "qz_per_a")
#: Å³ per unit of a cell-volume statement (CODATA Bohr radius via scipy.constants).
VOLUME_UNITS = {"a^3": 1.0, "å^3": 1.0, "å³": 1.0, "a3": 1.0, "angstrom^3": 1.0, "ang^3": 1.0,
                "bohr^3": (sc.physical_constants["Bohr radius"][0] / sc.angstrom) ** 3}
_VOLUME = re.compile(r"cell\s+volume\s*[:=]\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(\S+)?", re.I)
#: Fewest modes accepted in a list.
MIN_MODES = 3


@dataclass(frozen=True)
class RawModeList:
    """The columns of a mode list before any physics.

    Attributes
    ----------
    weight, frequency : numpy.ndarray, shape (N,)
        Weights [any normalisation] and frequencies [``unit``].
    unit : str or None
        Frequency unit the header or a unit line states.
    q_per_a : numpy.ndarray, shape (N, 3) or None
        Cartesian wave vectors [1/Å].
    projections : dict of str to numpy.ndarray
        Species projections [1].
    cell_volume_a3 : float or None
        Cell volume stated [Å³].
    line_numbers : tuple of int
        File line of each row.
    frequency_name : str
        Header of the frequency column.
    """

    weight: np.ndarray
    frequency: np.ndarray
    unit: str | None
    q_per_a: np.ndarray | None = None
    projections: dict = field(default_factory=dict)
    cell_volume_a3: float | None = None
    line_numbers: tuple = ()
    frequency_name: str = "frequency"


def is_mode_list(raw) -> bool:
    """Whether a :class:`~thermo.io.readers.RawTable` is a mode list (a ``weight`` column).

    Examples
    --------
    >>> from thermo.io.readers import read_table
    >>> is_mode_list(read_table("weight frequency_THz\\n1 2\\n1 3\\n"))
    True
    """
    return any(name.strip().lower() == WEIGHT_NAME for name in raw.names)


def cell_volume(comments, source=None):
    """Cell volume [Å³] from a ``# cell volume: V UNIT`` line, or None.

    Examples
    --------
    >>> cell_volume(["# cell volume: 11.81 A^3"])
    11.81
    """
    for text in comments:
        match = _VOLUME.search(text)
        if not match:
            continue
        unit = (match.group(2) or "").lower()
        if unit not in VOLUME_UNITS:
            raise DosInputError(f"cell volume unit {match.group(2) or 'missing'!r} not known; write "
                                "'# cell volume: 11.81 A^3' (A^3, Å^3 or bohr^3)", source)
        value = float(match.group(1)) * VOLUME_UNITS[unit]
        if not (np.isfinite(value) and value > 0):
            raise DosInputError(f"cell volume {match.group(1)} must be > 0", source)
        return value
    return None


def mode_list_columns(raw) -> RawModeList:
    """Pick the columns of a mode list by name and check them row by row.

    Raises
    ------
    DosInputError
        No frequency column, an incomplete wave vector, a weight <= 0, a
        projection outside 0…1, too few rows; one line with file line and column.

    Examples
    --------
    >>> from thermo.io.readers import read_table
    >>> m = mode_list_columns(read_table("# cell volume: 11.81 A^3\\nweight frequency_THz\\n1 2\\n1 3\\n1 4\\n"))
    >>> m.unit, m.cell_volume_a3, m.frequency.tolist()
    ('THz', 11.81, [2.0, 3.0, 4.0])
    """
    names = [n.strip().lower() for n in raw.names]
    src, lines = raw.source, tuple(raw.line_numbers) or tuple(range(1, len(raw.data) + 1))
    data = np.asarray(raw.data, dtype=float)
    w_col = names.index(WEIGHT_NAME)
    q_cols = [names.index(q) if q in names else None for q in Q_NAMES]
    if any(c is None for c in q_cols) and any(c is not None for c in q_cols):
        raise DosInputError("a wave vector needs all three columns " + ", ".join(n.replace("_a", "_A") for n in Q_NAMES),
                            src)
    used = {w_col} | {c for c in q_cols if c is not None}
    freq = [k for k, n in enumerate(names) if k not in used and (n.startswith("freq") or n.startswith("nu")
                                                                  or guess_unit_from_text(raw.names[k]))]
    if not freq:
        raise DosInputError("a mode list (a 'weight' column) needs a frequency column, e.g. 'frequency_THz'", src)
    f_col = freq[0]
    unit, _mentions = frequency_unit(raw.names[f_col], [(0, c) for c in raw.comments], 2)
    weight, frequency = data[:, w_col], data[:, f_col]
    bad = np.flatnonzero(~(weight > 0))
    if bad.size:
        i = int(bad[0])
        raise DosInputError(f"weight {float(weight[i]):g} must be > 0", src, lines[i], w_col + 1)
    if len(data) < MIN_MODES:
        raise DosInputError(f"only {len(data)} modes; at least {MIN_MODES} are needed", src)
    projections = {}
    for k, name in enumerate(raw.names):
        if k in used or k == f_col:
            continue
        col = data[:, k]
        off = np.flatnonzero(~((col >= -1e-6) & (col <= 1.0 + 1e-6)))
        if off.size:
            i = int(off[0])
            raise DosInputError(f"projection {float(col[i]):g} on {name!r} must lie between 0 and 1", src, lines[i], k + 1)
        projections[name] = np.clip(col, 0.0, 1.0)
    q = None if q_cols[0] is None else data[:, q_cols]
    return RawModeList(weight=weight, frequency=frequency, unit=unit, q_per_a=q, projections=projections,
                       cell_volume_a3=cell_volume(raw.comments, src), line_numbers=lines,
                       frequency_name=raw.names[f_col])
