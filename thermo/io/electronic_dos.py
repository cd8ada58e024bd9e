r"""Read an electronic DOS table (text, CSV or .xlsx): energies, DOS columns, energy unit, Fermi energy.

The table goes through :func:`thermo.io.readers.read_table` (encodings,
separators, ``.xlsx`` sheets, size limits and one-line errors are the same as
for a phonon DOS); this module only interprets what is specific to electrons:

* column 1 is the energy, by default relative to the Fermi level; the unit
  (eV, meV, Ry or Ha) comes from the first header cell (``E-E_F (eV)``,
  ``energy_eV``), a commented header row, or an explicit statement
  (``# energy unit: eV``, ``# energies in Ry``), never from a mere mention;
* absolute energies carry a statement ``# Fermi energy: 5.21 eV`` (also
  ``Fermi level = …``, ``E_F = …``; the unit defaults to the energy unit);
* further columns are DOS in states per energy unit (per cell of the
  calculation); names from the header row or a commented header row.

Physics (spin sums, electron counts, the Fermi level in a gap) lives in
:mod:`thermo.electronic.dos`.

Examples
--------
>>> t = read_electronic_table("# Fermi energy: 2.0 eV\nE (eV) total\n1.0 0.5\n3.0 0.7\n")
>>> t.energy_unit, t.fermi_energy, t.fermi_unit, t.names
('eV', 2.0, 'eV', ['E (eV)', 'total'])
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

import numpy as np

from ..errors import DosInputError, ModeheatError
from ..units import canonical_energy_unit
from .readers import COMMENT_CHARS, read_table
from .unit_statements import HEADER_CELL

_UNIT_WORD = r"(meV|eV|Ry|Ha|[Hh]artree|[Rr]ydberg)"
_UNIT_IN_CELL = re.compile(r"(?<![A-Za-z])" + _UNIT_WORD + r"(?![A-Za-z])")
_NUMBER = r"[+-]?(?:\d+\.?\d*|\.\d+)(?:[eEdD][+-]?\d+)?"
_FERMI = re.compile(r"(?:fermi\s*(?:energy|level)|(?<![a-z])e[_ ]?f(?:ermi)?(?![a-z]))\s*(?:[:=]|\bis\b|\bat\b)\s*"
                    r"(?P<value>" + _NUMBER + r")\s*(?P<unit>[A-Za-z]+)?", re.IGNORECASE)
_ENERGY_STATEMENT = re.compile(r"\b(?:energy|energies)(?:\s+(?:axis|column))?(?:\s+units?)?\s*(?:[:=]|\bin\b|[(\[])"
                               r"\s*" + _UNIT_WORD + r"(?![A-Za-z])|\bunits?\s*(?:of\s+(?:the\s+)?energ(?:y|ies)\s*)?"
                               r"[:=]\s*" + _UNIT_WORD + r"(?![A-Za-z])", re.IGNORECASE)

_ENERGY_CELL = re.compile(r"(?:e(?![a-z])|energ|e\s*-\s*e_?f|.*(?<![A-Za-z])" + _UNIT_WORD + r"(?![A-Za-z]))", re.I)


@dataclass(frozen=True)
class ElectronicTable:
    """Numbers of an electronic DOS file before any physical check.

    Attributes
    ----------
    energies : numpy.ndarray, shape (K,)
        Column 1 [file unit].
    columns : numpy.ndarray, shape (K, C)
        DOS columns [states per file unit], C ≥ 1.
    names : list of str
        Names of all columns (energy first), from a header row, a commented
        header row, or ``"energy"``, ``"total"``, ``"column 3"``, ….
    named : bool
        True when the names come from a header (plain or commented).
    energy_unit : str or None
        Unit stated for the energies (eV, meV, Ry, Ha), else None.
    fermi_energy : float or None
        Stated Fermi energy [``fermi_unit``], else None.
    fermi_unit : str or None
        Unit of the stated Fermi energy.
    source, sha256, line_numbers, comments, sheet
        As :class:`thermo.io.readers.RawTable`.
    """

    energies: np.ndarray
    columns: np.ndarray
    names: list
    named: bool
    energy_unit: str | None
    fermi_energy: float | None
    fermi_unit: str | None
    source: str
    sha256: str
    line_numbers: list = field(default_factory=list)
    comments: list = field(default_factory=list)
    sheet: str | None = None


def read_electronic_table(source, name=None, sheet=None) -> ElectronicTable:
    r"""Read an electronic DOS table from a path, raw bytes or text.

    Parameters
    ----------
    source : str, pathlib.Path or bytes
        As :func:`thermo.io.readers.read_table`.
    name : str, optional
        Display name for messages.
    sheet : str or int, optional
        Worksheet of an ``.xlsx`` workbook.

    Returns
    -------
    ElectronicTable

    Raises
    ------
    DosInputError
        Unreadable or malformed input, two different Fermi energies, or a
        Fermi energy in a unit that is not an energy; one line naming file
        and line.

    References
    ----------
    .. [1] Y. Shafranovich, "Common Format and MIME Type for Comma-Separated
       Values (CSV) Files", RFC 4180 (IETF, 2005).

    Examples
    --------
    >>> t = read_electronic_table("# energy unit: Ry\n-0.1 3.0 1.0\n0.1 4.0 2.0\n")
    >>> t.energy_unit, t.names, t.columns.shape
    ('Ry', ['energy', 'total', 'column 3'], (2, 2))
    """
    raw = read_table(source, name=name, sheet=sheet)
    width = raw.data.shape[1]
    comment_rows = _comment_rows(raw)
    names, named = raw.names, raw.names[0] != "frequency" or raw.names[1] != "total"
    commented = None if named else _commented_header(comment_rows, width)
    if commented is not None:
        names, named = commented, True
    if not named:
        names = ["energy"] + list(raw.names[1:])
    fermi, fermi_unit, fermi_index = _fermi_statement(comment_rows, raw.source)
    unit = _header_unit(names[0]) if named else None
    if unit is None:
        unit = _stated_unit([(n, t) for n, t in comment_rows if n != fermi_index])
    if fermi is not None and fermi_unit is None:
        fermi_unit = unit
    return ElectronicTable(energies=raw.data[:, 0].copy(), columns=raw.data[:, 1:].copy(), names=list(names),
                           named=named, energy_unit=unit, fermi_energy=fermi, fermi_unit=fermi_unit,
                           source=raw.source, sha256=raw.sha256,
                           line_numbers=list(raw.line_numbers), comments=list(raw.comments), sheet=raw.sheet)


def _comment_rows(raw):
    """(index, text without the comment mark) of the comments, in file order."""
    return [(k, text.lstrip("".join(COMMENT_CHARS)).strip()) for k, text in enumerate(raw.comments)]


def _commented_header(comments, width):
    """Names from the last comment that looks like a header row: one cell per column, the first naming
    an energy (``E``, ``energy``, ``E-E_F`` …) or an energy unit."""
    for _, body in reversed(comments):
        cells = HEADER_CELL.findall(body)
        if (len(cells) == width and _ENERGY_CELL.match(cells[0]) and not _FERMI.search(body)
                and not _ENERGY_STATEMENT.search(body)):
            return [" ".join(c.split()) for c in cells]
    return None


def _header_unit(cell):
    found = {canonical_energy_unit(m) for m in _UNIT_IN_CELL.findall(str(cell))}
    return found.pop() if len(found) == 1 else None


def _stated_unit(comments):
    found = set()
    for _, body in comments:
        cells = HEADER_CELL.findall(body)
        if cells and _header_unit(cells[0]) and not re.fullmatch(_NUMBER, cells[0]):   # commented header
            found.add(_header_unit(cells[0]))
            continue
        for m in _ENERGY_STATEMENT.finditer(body):
            found.add(canonical_energy_unit(next(g for g in m.groups() if g)))
    return found.pop() if len(found) == 1 else None


def _fermi_statement(comments, source):
    found = []
    for index, (_, body) in enumerate(comments):
        for m in _FERMI.finditer(body):
            value = float(m.group("value").replace("d", "e").replace("D", "e"))
            unit = m.group("unit")
            if unit:
                try:
                    unit = canonical_energy_unit(unit)
                except ModeheatError:
                    raise DosInputError(f"the Fermi energy is given in {unit!r}; state it in eV, meV, Ry or Ha",
                                        source) from None
            found.append((value, unit, comments[index][0]))
    if not found:
        return None, None, None
    if len({(v, u) for v, u, _ in found}) > 1:
        raise DosInputError("the file states two different Fermi energies: "
                            + ", ".join(f"{v:g} {u or ''}".strip() for v, u, _ in found), source)
    return found[0]
