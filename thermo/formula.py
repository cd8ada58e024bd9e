"""Chemical formulas: molar mass and atom count of a formula unit."""

from __future__ import annotations

from .errors import OptionError


def formula_unit(formula: str):
    r"""Molar mass and number of atoms of a chemical formula unit.

    Parameters
    ----------
    formula : str
        Formula such as ``"MgO"``, ``"Al2O3"`` or ``"Si"``.

    Returns
    -------
    molar_mass : float
        Molar mass [g/mol] from IUPAC standard atomic weights.
    atoms : int
        Atoms per formula unit [1].

    Raises
    ------
    OptionError
        If the formula cannot be parsed or has no atoms.

    Notes
    -----
    :math:`M = \sum_i n_i A_r(i)` in g/mol.

    References
    ----------
    .. [1] T. Prohaska et al., "Standard atomic weights of the elements 2021
       (IUPAC Technical Report)", Pure Appl. Chem. 94, 573-600 (2022), via
       the ``periodictable`` package.

    Examples
    --------
    >>> m, n = formula_unit("MgO")
    >>> round(m, 2), n
    (40.3, 2)
    """
    import periodictable

    text = str(formula or "").strip()
    if not text:
        raise OptionError("a chemical formula is needed for values per gram")
    try:
        parsed = periodictable.formula(text)
        mass = float(parsed.mass)
        count = sum(parsed.atoms.values())
    except Exception as exc:  # periodictable raises several types
        raise OptionError(f"cannot read chemical formula {text!r}: {str(exc).splitlines()[0]}") from None
    if count <= 0 or not mass > 0:
        raise OptionError(f"chemical formula {text!r} has no atoms")
    if abs(count - round(count)) > 1e-9:
        raise OptionError(f"chemical formula {text!r} has a fractional atom count {count:g}")
    return mass, int(round(count))
