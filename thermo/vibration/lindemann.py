"""Lindemann ratio √⟨u²⟩/d: a harmonic-validity caution.

When the rms displacement reaches about a tenth of the nearest-neighbour
distance, crystals melt (Lindemann's criterion); well before that the
harmonic and quasi-harmonic results lose meaning.  The threshold 0.1 is
common practice, not a law; rely on validated data near melting.

References
----------
.. [1] F. A. Lindemann, "Über die Berechnung molekularer
   Eigenfrequenzen", Phys. Z. 11, 609-612 (1910).
"""

from __future__ import annotations

import numpy as np

from ..columns import column_name
from ..errors import OptionError

#: Ratio above which the caution is shown (common practice).
LINDEMANN_THRESHOLD = 0.1

#: Nearest-neighbour distance / lattice parameter a of common cubic (and ideal hcp) lattices.
NEIGHBOUR_FACTORS = {
    "sc": 1.0, "bcc": np.sqrt(3.0) / 2.0, "fcc": 1.0 / np.sqrt(2.0), "hcp": 1.0,
    "rocksalt": 0.5, "cscl": np.sqrt(3.0) / 2.0, "diamond": np.sqrt(3.0) / 4.0,
    "zincblende": np.sqrt(3.0) / 4.0,
}


def nearest_neighbour_distance(lattice, a_angstrom):
    r"""Nearest-neighbour distance d of a lattice with parameter a [Å].

    Parameters
    ----------
    lattice : str
        One of :data:`NEIGHBOUR_FACTORS` (``fcc``, ``bcc``, ``rocksalt``, ...;
        ``hcp`` assumes the ideal c/a).
    a_angstrom : float
        Lattice parameter a [Å] (cubic cell edge; hcp basal a).

    Returns
    -------
    float
        d [Å].

    Notes
    -----
    fcc :math:`a/\sqrt2`, bcc :math:`a\sqrt3/2`, rock salt :math:`a/2`,
    diamond :math:`a\sqrt3/4` (elementary solid geometry).

    References
    ----------
    .. [1] C. Kittel, *Introduction to Solid State Physics*, 8th ed. (Wiley,
       2005), ch. 1, Table 2.

    Examples
    --------
    >>> round(nearest_neighbour_distance("fcc", 4.0), 6)
    2.828427
    """
    key = str(lattice).strip().lower()
    if key not in NEIGHBOUR_FACTORS:
        raise OptionError(f"unknown lattice {lattice!r}; choose one of {', '.join(NEIGHBOUR_FACTORS)}")
    a = float(a_angstrom)
    if not a > 0:
        raise OptionError("the lattice parameter must be > 0 Å")
    return float(NEIGHBOUR_FACTORS[key] * a)


def lindemann_ratio(msd_a2, distance_a):
    r""":math:`\sqrt{\langle u^2\rangle}/d` [1].

    Parameters
    ----------
    msd_a2 : array_like
        Total mean-square displacement [Å²].
    distance_a : float
        Nearest-neighbour distance d [Å], > 0.

    Returns
    -------
    numpy.ndarray
        The ratio [1].

    References
    ----------
    Lindemann (1910).

    Examples
    --------
    >>> float(lindemann_ratio(0.04, 2.0))
    0.1
    """
    d = float(distance_a)
    if not d > 0:
        raise OptionError("the nearest-neighbour distance must be > 0 Å")
    return np.sqrt(np.asarray(msd_a2, dtype=float)) / d


def lindemann_warnings(table, threshold=LINDEMANN_THRESHOLD):
    """One caution per species whose Lindemann ratio exceeds ``threshold``.

    Parameters
    ----------
    table : pandas.DataFrame
        A displacement table (:func:`.displacements.displacement_table`);
        without a ``lindemann_ratio`` column there is nothing to say.
    threshold : float
        Ratio shown as the limit [1] (0.1, common practice).

    Returns
    -------
    list of str

    Examples
    --------
    >>> import pandas as pd
    >>> df = pd.DataFrame({"species": ["X", "X"], "temperature_K": [100.0, 900.0],
    ...                    "lindemann_ratio": [0.05, 0.12]})
    >>> lindemann_warnings(df)[0][:40]
    'X: Lindemann ratio √⟨u²⟩/d reaches 0.12 '
    """
    ratio_col = column_name("lindemann_ratio")
    if ratio_col not in table.columns:
        return []
    notes = []
    for name, rows in table.groupby(column_name("species"), sort=False):
        over = rows[rows[ratio_col] > threshold]
        if len(over):
            t0 = float(over[column_name("temperature")].iloc[0])
            notes.append(f"{name}: Lindemann ratio √⟨u²⟩/d reaches {float(rows[ratio_col].max()):.2g} "
                         f"(above {threshold:g} from {t0:g} K); near melting the harmonic results are not "
                         "meaningful; use validated data")
    return notes
