"""The unit and atom count of one input from the layers of options (shared by DOS files and mode lists).

Layers, highest first: an option for this file, what the file states, an
option carried from elsewhere (see :mod:`thermo.preparation.options`).
"""

from __future__ import annotations

from ..errors import DosInputError
from ..units import FREQUENCY_UNITS
from .atoms import resolve_atoms


def _mention_note(mentions):
    if not mentions:
        return ""
    where = "; ".join(f"line {line} mentions {unit}" for line, unit in mentions[:3])
    return f" ({where}, but not as the frequency unit)"


def chosen_unit(explicit, stated, carried, source, mentions=()):
    """The unit used and its note: an option for this file > the file's own statement > a carried option.

    Examples
    --------
    >>> chosen_unit(None, "meV", "THz", "x.dat")
    ('meV', None)
    """
    if explicit is not None:
        note = None
        if stated is not None and stated != explicit:
            note = f"the file states {stated} but {explicit} was chosen; using {explicit}"
        return explicit, note
    if stated is not None:
        return stated, None
    if carried is not None:
        return carried, None
    raise DosInputError("the frequency unit is not stated in the file" + _mention_note(mentions)
                        + "; set the frequency unit option to one of " + ", ".join(FREQUENCY_UNITS), source)


def chosen_atoms(raw_integral, explicit, carried, src):
    """(n, inferred): given for this file > the integral's own count > a carried count.

    The result is the same as a load with the count used given for this file
    (or none, when inferred), so a caller may keep those options for the file.

    Examples
    --------
    >>> chosen_atoms(6.0, None, None, "x.dat")
    (2, True)
    """
    if explicit is not None or carried is None:
        return resolve_atoms(raw_integral, explicit, src)
    try:
        return resolve_atoms(raw_integral, None, src)
    except DosInputError:
        return resolve_atoms(raw_integral, carried, src)
