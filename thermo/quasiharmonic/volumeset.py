"""A volume set: static lattice energies and phonon DOS at several volumes.

The manifest is a plain delimited table (comma, semicolon, tab or blanks;
``#``, ``!`` or ``%`` comment lines), one row per volume, with a header naming
the columns ``volume_A3`` (Å³ per formula unit), one energy column
``energy_eV``, ``energy_Ry``, ``energy_Ha`` or ``energy_kJ_per_mol`` (static
lattice energy per formula unit) and ``dos_file`` (path relative to the
manifest).  Each DOS goes through :func:`thermo.preparation.load_dos` with the
same options as a single table.
"""

from __future__ import annotations

import hashlib
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
from scipy import constants as sc

from ..errors import DosInputError, OptionError
from ..io.readers import COMMENT_CHARS
from ..preparation.loading import load_dos
from ..preparation.options import ReadingOptions, as_record

#: eV per unit of each accepted energy column.
ENERGY_COLUMNS = {
    "energy_eV": 1.0,
    "energy_Ry": sc.physical_constants["Rydberg constant times hc in eV"][0],
    "energy_Ha": sc.physical_constants["Hartree energy in eV"][0],
    "energy_kJ_per_mol": sc.kilo / (sc.N_A * sc.electron_volt),
}
#: Fewest volumes an equation-of-state fit is attempted with.
MIN_VOLUMES = 5
#: Accepted volume per formula unit [Å³] and largest ratio of the largest to the smallest volume.
VOLUME_LIMITS_A3, MAX_VOLUME_RATIO = (1e-2, 1e6), 10.0
#: Largest magnitude of a static energy per formula unit [eV] (all-electron totals of heavy atoms stay far below).
MAX_ENERGY_EV = 1e8


@dataclass(frozen=True)
class VolumeSet:
    """Volumes, static energies and DOS of one solid, sorted by volume.

    Attributes
    ----------
    volumes_a3 : numpy.ndarray, shape (K,)
        Volume per formula unit [Å³], ascending.
    energies_ev : numpy.ndarray, shape (K,)
        Static lattice energy per formula unit [eV].
    doses : tuple of PhononDOS
        The prepared DOS at each volume.
    names : tuple of str
        DOS file names (for messages and provenance).
    source : dict
        ``name`` and ``sha256`` of the manifest (empty for a list input).
    electronic : tuple of ElectronicDOS
        The electronic DOS at each volume (metals), or empty: no electronic term.
    """

    volumes_a3: np.ndarray
    energies_ev: np.ndarray
    doses: tuple
    names: tuple
    source: dict = field(default_factory=dict)
    electronic: tuple = ()

    @property
    def atoms(self) -> int:
        """Atoms per formula unit (the same at every volume)."""
        return self.doses[0].atoms


def check_volumes(volumes, energies, names):
    """Refuse a volume set whose volumes or static energies cannot be fitted (before any DOS is read).

    Parameters
    ----------
    volumes, energies : numpy.ndarray, shape (K,)
        Volumes [Å³] in increasing order and static energies [eV].
    names : sequence of str
        Names of the rows, for messages.

    Raises
    ------
    OptionError
        One line: too few volumes, a non-positive, repeated or out-of-range
        volume, too wide a span, an energy not finite or too large.

    Examples
    --------
    >>> check_volumes(np.array([1.0, 2, 3, 4, 50]), np.zeros(5), list("abcde"))
    Traceback (most recent call last):
    ...
    thermo.errors.OptionError: the volumes span a factor 50 (1-50 Å³); a quasi-harmonic volume set spans per cent to tens of per cent (at most a factor 10)
    """
    v, e = np.asarray(volumes, dtype=float), np.asarray(energies, dtype=float)
    if v.size < MIN_VOLUMES:
        raise OptionError(f"the volume set has {v.size} volumes; an equation-of-state fit needs "
                          f"at least {MIN_VOLUMES}")
    if not np.all(np.isfinite(v)) or np.any(v <= 0):
        raise OptionError("volumes must be positive numbers in Å³")
    if np.any(np.diff(v) <= 1e-9 * v[1:]):
        k = int(np.argmax(np.diff(v) <= 1e-9 * v[1:]))
        raise OptionError(f"volume {v[k]:g} Å³ appears twice ({names[k]}, {names[k + 1]})")
    lo, hi = VOLUME_LIMITS_A3
    outside = np.flatnonzero((v < lo) | (v > hi))
    if outside.size:
        k = int(outside[0])
        raise OptionError(f"volume {v[k]:g} Å³ ({names[k]}) is outside {lo:g}-{hi:g} Å³ per formula unit")
    if v[-1] / v[0] > MAX_VOLUME_RATIO:
        raise OptionError(f"the volumes span a factor {v[-1] / v[0]:.3g} ({v[0]:g}-{v[-1]:g} Å³); a quasi-harmonic "
                          f"volume set spans per cent to tens of per cent (at most a factor {MAX_VOLUME_RATIO:g})")
    if not np.all(np.isfinite(e)) or np.any(np.abs(e) > MAX_ENERGY_EV):
        k = int(np.flatnonzero(~(np.abs(e) <= MAX_ENERGY_EV))[0])
        raise OptionError(f"static energy {e[k]:g} eV ({names[k]}) must be a finite number within "
                          f"±{MAX_ENERGY_EV:g} eV per formula unit")


def make_volume_set(entries, source=None):
    """A checked :class:`VolumeSet` from (volume [Å³], energy [eV], PhononDOS[, name[, ElectronicDOS]]) tuples.

    An electronic DOS (per formula unit) adds the electronic free energy F_el(V,T) to the surface; it is
    given for every volume or for none.

    Raises
    ------
    OptionError
        Fewer than :data:`MIN_VOLUMES` volumes, repeated or non-positive
        volumes, volumes outside :data:`VOLUME_LIMITS_A3` or spanning more than
        :data:`MAX_VOLUME_RATIO`, energies not finite or beyond
        :data:`MAX_ENERGY_EV`, or DOS with different atom counts.

    Examples
    --------
    >>> make_volume_set([])
    Traceback (most recent call last):
    ...
    thermo.errors.OptionError: the volume set has 0 volumes; an equation-of-state fit needs at least 5
    """
    rows = sorted(entries, key=lambda r: float(r[0]))
    v = np.array([float(r[0]) for r in rows])
    e = np.array([float(r[1]) for r in rows])
    doses = tuple(r[2] for r in rows)
    names = tuple(str(r[3]) if len(r) > 3 else str(d.source.get("name") or f"volume {x:g}")
                  for r, d, x in zip(rows, doses, v))
    check_volumes(v, e, names)
    atoms = {d.atoms for d in doses}
    if len(atoms) != 1:
        raise OptionError("the DOS files disagree on the atoms per formula unit: "
                          + ", ".join(f"{n}: {d.atoms}" for n, d in zip(names, doses)))
    electronic = tuple(r[4] if len(r) > 4 else None for r in rows)
    given = [x is not None for x in electronic]
    if any(given) and not all(given):
        missing = next(n for n, g in zip(names, given) if not g)
        raise OptionError(f"an electronic DOS is given for some volumes but not for {missing}; give one for "
                          "every volume or for none")
    return VolumeSet(v, e, doses, names, dict(source or {}), electronic if all(given) else ())


def _split(row, delimiter):
    if delimiter is None:
        return row.split()
    return [c.strip().strip("\"'").strip() for c in row.rstrip().split(delimiter)]


def parse_manifest(text, name="<manifest>"):
    r"""Rows of a manifest as (line, volume [Å³], energy [eV], dos_file, electronic_dos_file or None).

    The column ``electronic_dos_file`` is optional (metals: the electronic DOS at that volume).

    Raises
    ------
    DosInputError
        Missing header columns, cells that are not numbers (with line and
        column), or no rows.

    Examples
    --------
    >>> parse_manifest("volume_A3,energy_Ry,dos_file\n20.0,-1.0,v20.dat\n")[0][1:3]
    (20.0, -13.60569312299)
    """
    lines = [(i + 1, raw) for i, raw in enumerate(str(text).splitlines())
             if raw.strip() and not raw.lstrip().startswith(COMMENT_CHARS)]
    if not lines:
        raise DosInputError("the manifest is empty", name)
    head_line, head = lines[0]
    delimiter = next((d for d in (";", ",", "\t") if d in head), None)
    header = _split(head, delimiter)
    missing = [c for c in ("volume_A3", "dos_file") if c not in header]
    energy = [c for c in header if c in ENERGY_COLUMNS]
    if missing or len(energy) != 1:
        need = ", ".join(missing + ([] if len(energy) == 1 else ["one of " + "/".join(ENERGY_COLUMNS)]))
        raise DosInputError(f"the manifest header needs the columns {need}", name, head_line)
    iv, ie, idos = header.index("volume_A3"), header.index(energy[0]), header.index("dos_file")
    iel = header.index("electronic_dos_file") if "electronic_dos_file" in header else None
    rows = []
    for number, raw in lines[1:]:
        cells = _split(raw, delimiter)
        if len(cells) < len(header):
            raise DosInputError(f"{len(cells)} cells, the header has {len(header)}", name, number)
        values = []
        for index in (iv, ie):
            try:
                values.append(float(cells[index]))
            except ValueError:
                raise DosInputError(f"{header[index]} is {cells[index]!r}, expected a number",
                                    name, number, index + 1) from None
        electronic = cells[iel] if iel is not None and cells[iel] else None
        rows.append((number, values[0], values[1] * ENERGY_COLUMNS[energy[0]], cells[idos], electronic))
    if not rows:
        raise DosInputError("the manifest lists no volumes", name)
    return rows


def read_manifest(source, files=None, freq_unit=None, atoms=None, negative=None,
                  low_frequency=None, name=None, resolve=None, electronic_options=None, options=None):
    r"""Read a manifest and every DOS it lists.

    Parameters
    ----------
    source : str, pathlib.Path or bytes
        Manifest path, or its content (bytes, or text holding a newline).
    files : dict of str to bytes, optional
        DOS files by name (uploads); ``dos_file`` is matched by its file
        name.  Without it, paths are relative to the manifest's folder.
    freq_unit, atoms, negative, low_frequency, options
        As :func:`thermo.preparation.load_dos`, applied to every DOS
        (``options``: the reading-options record; the keywords win over it).
    name : str, optional
        Display name of the manifest.
    resolve : callable, optional
        ``resolve(reference) -> (bytes, settings)`` for ``dos_file`` entries of
        the form ``ws:NAME`` (datasets of a workspace; the command line passes
        one).  Such a DOS is read with its stored reading options under the
        ones given here (a given option wins), as ``table ws:NAME`` reads it.
    electronic_options : dict, optional
        Keyword arguments of :func:`thermo.electronic.load_electronic_dos` for the
        files of the optional ``electronic_dos_file`` column (energy unit, Fermi
        energy, spin, formula units).

    Returns
    -------
    VolumeSet

    Raises
    ------
    DosInputError
        Unreadable manifest or DOS (one line naming the file and line).
    OptionError
        Fewer than 5 volumes, repeated volumes, inconsistent atoms.

    Examples
    --------
    >>> nu = np.linspace(0.0, 6.0, 301)
    >>> dos = "frequency_THz total\n" + "\n".join(f"{a} {9 * a * a / 216}" for a in nu)
    >>> rows = "\n".join(f"{19 + k},{0.01 * (k - 2) ** 2},v{k}.dat" for k in range(5))
    >>> vs = read_manifest("volume_A3,energy_eV,dos_file\n" + rows + "\n",
    ...                    files={f"v{k}.dat": dos.encode() for k in range(5)})
    >>> vs.volumes_a3.tolist(), vs.atoms
    ([19.0, 20.0, 21.0, 22.0, 23.0], 1)
    """
    if isinstance(source, bytes):
        raw, folder, shown = source, None, name or "<manifest>"
    elif isinstance(source, str) and "\n" in source:
        raw, folder, shown = source.encode("utf-8"), None, name or "<manifest>"
    else:
        path = Path(source)
        if not path.is_file():
            raise DosInputError("no such manifest file", str(path))
        raw, folder, shown = path.read_bytes(), path.parent, name or path.name
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise DosInputError("the manifest is not UTF-8 text", shown) from None
    uploads = {Path(k).name: v for k, v in (files or {}).items()}
    rows = sorted(parse_manifest(text, shown), key=lambda r: r[1])
    check_volumes(np.array([r[1] for r in rows]), np.array([r[2] for r in rows]),
                  [f"line {r[0]}" for r in rows])        # refuse before reading any DOS
    given = ReadingOptions(freq_unit=freq_unit, atoms=atoms, negative=negative, low_frequency=low_frequency).over(
        as_record(options))
    entries = []
    for line, volume, energy, dos_file, electronic_file in rows:
        content, label = _content(dos_file, "dos_file", line, shown, folder, uploads if files is not None else None,
                                  resolve)
        reading = given
        if isinstance(content, tuple):                  # a workspace dataset: (bytes, stored settings)
            content, kept = content
            reading = given.over(ReadingOptions.from_mapping(kept))
        dos = load_dos(content, name=label, options=reading)
        entry = (volume, energy, dos, label)
        if electronic_file is not None:
            from ..electronic import load_electronic_dos
            content, label = _content(electronic_file, "electronic_dos_file", line, shown, folder,
                                      uploads if files is not None else None, resolve)
            entry += (load_electronic_dos(content, name=label, **dict(electronic_options or {})),)
        entries.append(entry)
    return make_volume_set(entries, {"name": shown, "sha256": hashlib.sha256(raw).hexdigest()})


def _content(reference, column, line, shown, folder, uploads, resolve):
    """(content or path, label) of a file named in the manifest: a workspace dataset, an upload or a path."""
    if str(reference).startswith("ws:"):
        if resolve is None:
            raise DosInputError(f"{column} {reference!r} names a workspace dataset, but no workspace is open",
                                shown, line)
        return resolve(reference), reference
    if uploads is not None:
        if Path(reference).name not in uploads:
            raise DosInputError(f"{column} {reference!r} was not uploaded with the manifest", shown, line)
        return uploads[Path(reference).name], Path(reference).name
    target = (folder or Path.cwd()) / reference
    if not target.is_file():
        raise DosInputError(f"{column} {reference!r} not found (looked in {target.parent})", shown, line)
    return target, reference
