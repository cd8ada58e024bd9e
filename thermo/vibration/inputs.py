"""Text options of the displacement tools: species masses, species lists, neighbour distance.

Shared by the command line and the dashboard so both read them the same way.
"""

from __future__ import annotations

from ..errors import OptionError
from .lindemann import nearest_neighbour_distance


def parse_masses(text):
    """Species masses from ``"A=12.4, B=88.6"`` [u].

    Parameters
    ----------
    text : str or None
        Comma-separated ``SPECIES=MASS`` items, masses in u (empty: none).

    Returns
    -------
    dict of str to float

    Raises
    ------
    OptionError
        If an item is not ``SPECIES=MASS`` with a mass > 0.

    Examples
    --------
    >>> parse_masses("Ly=12.4, Hv=88.6")
    {'Ly': 12.4, 'Hv': 88.6}
    """
    out = {}
    for item in filter(None, (s.strip() for s in str(text or "").split(","))):
        name, sep, value = item.partition("=")
        try:
            mass = float(value)
        except ValueError:
            mass = float("nan")
        if not sep or not name.strip() or not mass > 0:
            raise OptionError(f"mass {item!r} must read SPECIES=MASS with the mass in u > 0")
        out[name.strip()] = mass
    return out


def parse_species(text):
    """Partial-DOS column names from ``"A,B"``; None when empty.

    Examples
    --------
    >>> parse_species(" Mg, O "), parse_species("")
    (['Mg', 'O'], None)
    """
    names = [c.strip() for c in str(text or "").split(",") if c.strip()]
    return names or None


def parse_distance(distance=None, lattice=None):
    """Nearest-neighbour distance [Å] from a distance or ``"TYPE:A"`` (e.g. ``fcc:3.61``).

    Parameters
    ----------
    distance : float, optional
        d [Å], > 0.
    lattice : str, optional
        Lattice and parameter a [Å] (see :func:`.lindemann.nearest_neighbour_distance`).

    Returns
    -------
    float or None
        d [Å], None when neither is given.

    Examples
    --------
    >>> round(parse_distance(lattice="bcc:2.0"), 6)
    1.732051
    """
    if distance is not None:
        if not float(distance) > 0:
            raise OptionError("the nearest-neighbour distance must be > 0 Å")
        return float(distance)
    if lattice:
        kind, _, a = str(lattice).partition(":")
        try:
            a_value = float(a)
        except ValueError:
            raise OptionError(f"lattice {lattice!r} must read TYPE:A, e.g. fcc:3.61") from None
        return nearest_neighbour_distance(kind, a_value)
    return None
