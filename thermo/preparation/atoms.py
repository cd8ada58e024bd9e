"""Normalisation of a phonon DOS to 3n modes per formula unit."""

from __future__ import annotations

import numpy as np

from ..errors import DosInputError, OptionError

#: Relative distance to 3n within which the atom count is inferred.
INFER_TOLERANCE = 0.02
#: Most atoms per formula unit accepted, given or inferred (large cells of
#: complex crystals hold a few thousand atoms).
MAX_ATOMS = 10_000


def modes_text(count: float) -> str:
    """``"1 mode"``, ``"2.5 modes"``: a mode count with its noun in the right number.

    Examples
    --------
    >>> modes_text(1.0), modes_text(5.97)
    ('1 mode', '5.97 modes')
    """
    shown = f"{count:.6g}"
    return f"{shown} mode" if shown in ("1", "-1") else f"{shown} modes"


def resolve_atoms(raw_integral: float, atoms=None, source: str | None = None):
    r"""Atoms per formula unit, given or inferred from the DOS integral.

    Parameters
    ----------
    raw_integral : float
        Integral of the DOS as read (all frequencies) [modes].
    atoms : int, optional
        Atoms per formula unit; inferred when None.
    source : str, optional
        File name for messages.

    Returns
    -------
    atoms : int
        Atoms per formula unit n.
    inferred : bool
        True when n was inferred.

    Raises
    ------
    OptionError
        If ``atoms`` is not a whole number from 1 to :data:`MAX_ATOMS`.
    DosInputError
        If ``atoms`` is None and the integral is not within 2 % of 3n, or
        would give more than :data:`MAX_ATOMS` atoms.

    Notes
    -----
    A DOS normalised per formula unit integrates to :math:`3n` (3 branches
    per atom); :math:`n` is inferred when
    :math:`|I - 3n| \le 0.02 \cdot 3n` for a whole :math:`n \ge 1`.

    References
    ----------
    .. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Saunders,
       1976), ch. 22–23.

    Examples
    --------
    >>> resolve_atoms(5.97)
    (2, True)
    """
    if atoms is not None:
        try:
            n = int(atoms)
        except (TypeError, ValueError):
            raise OptionError(f"atoms per formula unit must be a whole number, not {atoms!r}") from None
        except OverflowError:
            n = MAX_ATOMS + 1
        if n <= MAX_ATOMS and (n != float(atoms) or n < 1):
            raise OptionError(f"atoms per formula unit must be a whole number >= 1, not {atoms!r}")
        if n > MAX_ATOMS:
            raise OptionError(f"atoms per formula unit must be at most {MAX_ATOMS:,}, not {atoms!r}")
        return n, False
    if not np.isfinite(raw_integral):
        raise DosInputError("the DOS integral is not finite; give the number of atoms per formula unit", source)
    if raw_integral > 3 * MAX_ATOMS * (1 + INFER_TOLERANCE):
        raise DosInputError(f"the DOS integrates to {raw_integral:.6g} modes, more than 3 x {MAX_ATOMS:,} "
                            "atoms; give the number of atoms per formula unit", source)
    n = int(np.rint(raw_integral / 3.0))
    if n >= 1 and abs(raw_integral - 3 * n) <= INFER_TOLERANCE * 3 * n:
        return n, True
    raise DosInputError(
        f"the DOS integrates to {modes_text(raw_integral)}, not 3n for a whole n; "
        "give the number of atoms per formula unit", source)
