"""Thermodynamic tables for many DOS files at once, on several processes or any executor.

:func:`run_batch` writes one table per input file (the same content as the
``table`` command: :func:`thermo.tables.tabulate` with its provenance) and an
index ``index.csv`` with one row per input: status, atoms, imaginary share,
cautions and the one-line error of a file that failed.  A bad file never stops
the others.  Existing outputs are never replaced unless ``force`` is set, and
an output is never written onto one of the inputs.  The files run on a local
process pool or on any :class:`concurrent.futures.Executor`, e.g. a Dask
cluster's (:mod:`thermo.parallel`).
"""

from __future__ import annotations

import csv
import dataclasses
import fnmatch
import glob
import io
import os
import sys
from pathlib import Path

from .errors import ModeheatError, OptionError
from .parallel import run_jobs
from .preparation.options import ReadingOptions

#: Name of the index file written in the output directory.
INDEX_NAME = "index.csv"
#: Columns of the index file, in order.
INDEX_COLUMNS = ("input", "status", "output", "atoms", "negative_mode_fraction",
                 "heat_capacity_v_298K_J_per_mol_K", "heat_capacity_v_298K_error_J_per_mol_K",
                 "entropy_298K_J_per_mol_K", "entropy_298K_error_J_per_mol_K",
                 "low_frequency_debye_temperature_K", "estimated_relative_error", "warnings", "error")
INDEX_TEMPERATURE = 298.15    #: C_v and S of each file in the index at this temperature [K], per mole of formula units
#: File name patterns taken from a directory by default (known DOS file kinds).
KNOWN_PATTERNS = ("*.dat", "*.txt", "*.csv", "*.tsv", "*.dos", "*.xlsx")


@dataclasses.dataclass(frozen=True)
class BatchOptions:
    """How to read each file and what table to write.

    Attributes
    ----------
    temperatures : tuple of float
        Temperatures [K] of every table.
    reading : ReadingOptions or dict, optional
        Reading options for every file (:mod:`thermo.preparation.options`),
        including the sheet of ``.xlsx`` files and the formula (for
        ``per='gram'``).  They are carried to each file as the ``fallback``
        of :func:`~thermo.preparation.loading.load_dos`: a unit a file states
        itself, and an atom count its integral gives, win; a warning in the
        index says so.
    per : {'formula', 'atom', 'gram'}
        Basis of the tables (see :func:`thermo.tables.tabulate`).
    fmt : {'csv', 'json', 'xlsx'}
        Table format.
    force : bool
        Replace existing output files.
    digits : int, optional
        Significant digits of the written numbers (None: full precision).
    per_file : tuple of (str, ReadingOptions), optional
        Options for single files (a file list, :func:`file_list`): keyed by
        the resolved path, given for that file (they win over what the file
        states), with ``reading`` below them as the fallback.
    """

    temperatures: tuple
    reading: ReadingOptions | None = None
    per: str = "formula"
    fmt: str = "csv"
    force: bool = False
    digits: int | None = None
    per_file: tuple = ()

    def __post_init__(self):
        reading = self.reading
        if not isinstance(reading, ReadingOptions):
            object.__setattr__(self, "reading", ReadingOptions.from_mapping(reading))


def _wanted(name, patterns):
    return any(fnmatch.fnmatch(name.lower(), p.lower()) for p in patterns)


def expand_inputs(patterns, exclude_dir=None, pattern=None, skipped=None):
    """Input files named by paths, directories and glob patterns.

    Parameters
    ----------
    patterns : iterable of str or path-like
        A file, a directory (its visible regular files matching ``pattern``,
        not recursive) or a glob pattern (``**`` recurses).
    exclude_dir : path-like, optional
        Files inside this directory found through another directory or a
        pattern are skipped (the output directory, so that ``data/**`` does
        not read the tables of ``data/tables``).
    pattern : str or sequence of str, optional
        File name patterns taken from a directory (case-insensitive);
        default :data:`KNOWN_PATTERNS`.
    skipped : list, optional
        Receives the files of a directory left out by ``pattern``.

    Returns
    -------
    list of str
        Files in the order given, each directory's and pattern's sorted by
        name, without repeats.

    Raises
    ------
    OptionError
        When a pattern matches nothing or no file is found at all.

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as tmp:
    ...     for name in ("b.dat", "a.dat", ".hidden"):
    ...         _ = (Path(tmp) / name).write_text("x")
    ...     [Path(p).name for p in expand_inputs([tmp])]
    ['a.dat', 'b.dat']
    """
    skip = Path(exclude_dir).resolve() if exclude_dir is not None else None
    wanted = KNOWN_PATTERNS if pattern is None else ((pattern,) if isinstance(pattern, str) else tuple(pattern))
    found, seen = [], set()
    for item in patterns:
        text = os.fspath(item)
        path = Path(text)
        if path.is_file():
            matches = [path]
        elif path.is_dir():
            files = sorted(p for p in path.iterdir() if p.is_file() and not p.name.startswith("."))
            matches = [p for p in files if _wanted(p.name, wanted)]
            if skipped is not None:
                skipped.extend(str(p) for p in files if not _wanted(p.name, wanted))
        else:
            matches = sorted(Path(p) for p in glob.glob(text, recursive=True) if Path(p).is_file())
        if skip is not None and not path.is_file() and path.resolve() != skip:
            matches = [p for p in matches if skip not in p.resolve().parents]
        if not matches:
            kinds = f" (taking {', '.join(wanted)}; choose others with a pattern)" if path.is_dir() else ""
            raise OptionError(f"no input files match {text!r}{kinds}")
        for match in matches:
            key = match.resolve()
            if key not in seen:
                seen.add(key)
                found.append(str(match))
    if not found:
        raise OptionError("no input files given")
    return found


def output_names(inputs, fmt, outdir, reserved=()):
    """A distinct output file name for each input: ``<stem>.<fmt>``.

    A stem met before, a name that would land on an input file, or the name
    of the index (:data:`INDEX_NAME`, any letter case) or of another file of
    the run (``reserved``) gets ``-2``, ``-3``, ... appended.

    Examples
    --------
    >>> output_names(["a/x.dat", "b/x.dat", "y.txt", "index.dat"], "csv", "out")
    ['x.csv', 'x-2.csv', 'y.csv', 'index-2.csv']
    """
    out = Path(outdir).resolve()
    inputs_resolved = {Path(p).resolve() for p in inputs}
    taken, names = {INDEX_NAME.lower(), *(r.lower() for r in reserved)}, []   # never the index's name
    for source in inputs:
        stem = Path(source).stem or "table"
        name, count = f"{stem}.{fmt}", 1
        while name.lower() in taken or (out / name) in inputs_resolved:
            count += 1
            name = f"{stem}-{count}.{fmt}"
        taken.add(name.lower())
        names.append(name)
    return names


def _blank_row(source):
    return {"input": source, "status": "failed", "output": "", "atoms": "",
            "negative_mode_fraction": "", "warnings": "", "error": ""}


def _one_line(text):
    return " ".join(str(text).split())


def _key_numbers(dos, info, room_breakdown=None):
    """C_v and S at 298.15 K with their estimated errors, the low-frequency θ_D and the table's worst error."""
    from .accuracy.rows import harmonic_row_errors
    from .columns import column_name
    from .tables import tabulate
    room = tabulate(dos, [INDEX_TEMPERATURE]).iloc[0]
    err = harmonic_row_errors(dos, [INDEX_TEMPERATURE], breakdown=room_breakdown)
    return {"heat_capacity_v_298K_J_per_mol_K": float(room[column_name("heat_capacity_v")]),
            "heat_capacity_v_298K_error_J_per_mol_K": float(err["heat_capacity_v"][0]),
            "entropy_298K_J_per_mol_K": float(room[column_name("entropy")]),
            "entropy_298K_error_J_per_mol_K": float(err["entropy"][0]),
            "low_frequency_debye_temperature_K": dos.low_frequency_debye_temperature_k(),
            "estimated_relative_error": info.get("estimated_relative_error")}


def process_file(source, target, options):
    """Load one DOS file, tabulate it and write its table; never raises.

    Parameters
    ----------
    source, target : str
        Input and output file.
    options : BatchOptions
        Reading and table options.

    Returns
    -------
    dict
        Index row (keys :data:`INDEX_COLUMNS`); ``status`` is ``ok`` or
        ``failed`` with the one-line reason in ``error``.
    """
    from .accuracy.reuse import breakdown_with_row
    from .preparation.loading import load_dos
    from .tables import provenance, tabulate
    from .io.writers import write_table

    row = _blank_row(source)
    try:
        own = dict(options.per_file).get(str(Path(source).resolve()))
        dos = load_dos(Path(source), name=Path(source).name, options=own, fallback=options.reading)
        row.update(atoms=dos.atoms, negative_mode_fraction=dos.source.get("negative_mode_fraction", ""),
                   warnings=" | ".join(_one_line(w) for w in list(dos.warnings) + carried_notes(dos, options.reading)))
        formula = ReadingOptions.of(dos).formula
        table = tabulate(dos, options.temperatures, per=options.per, formula=formula)
        breakdown, at_room = breakdown_with_row(dos, options.temperatures, INDEX_TEMPERATURE)   # once per file
        info = provenance(dos, options.temperatures, per=options.per, formula=formula, breakdown=breakdown)
        write_table(table, info, options.fmt, target, overwrite=options.force, digits=options.digits)
        row.update(status="ok", output=Path(target).name, **_key_numbers(dos, info, at_room))
    except ModeheatError as exc:
        row["error"] = _one_line(exc)
    except OSError as exc:
        row["error"] = _one_line(f"{source}: {exc.strerror or exc}")
    except Exception as exc:  # noqa: BLE001 - one bad file must not stop the batch
        row["error"] = _one_line(f"{source}: unexpected {type(exc).__name__}: {exc}")
    return row


def file_list(path):
    r"""The files of a file list and the reading options of each (``batch --file-list``).

    Parameters
    ----------
    path : str or path-like
        CSV with a ``file`` column and any reading-option columns
        (:func:`thermo.io.filelist.read_file_list`).

    Returns
    -------
    files : list of str
        The files, in list order, relative paths taken from the list's folder.
    per_file : tuple of (str, ReadingOptions)
        For :attr:`BatchOptions.per_file`.

    Raises
    ------
    DosInputError, OptionError
        A bad list, or a bad value (with its line), or a missing file.

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as tmp:
    ...     _ = (Path(tmp) / "a.dat").write_text("x")
    ...     _ = (Path(tmp) / "list.csv").write_text("file,freq_unit\na.dat,cm-1\n")
    ...     files, per_file = file_list(Path(tmp) / "list.csv")
    ...     per_file[0][1].freq_unit
    'cm-1'
    """
    from .io.filelist import read_file_list
    from .preparation.options import FIELDS
    files, per_file = [], []
    for line, target, values in read_file_list(path, FIELDS):
        try:
            options = ReadingOptions.from_mapping(values)
        except OptionError as exc:
            raise OptionError(f"{path} line {line}: {exc}") from None
        if not target.is_file():
            raise OptionError(f"{path} line {line}: no such file {target}")
        files.append(str(target))
        per_file.append((str(target.resolve()), options))
    return files, tuple(per_file)


def carried_notes(dos, carried):
    """Warnings for options carried to many files that one file overrode with its own statement.

    Examples
    --------
    >>> from types import SimpleNamespace
    >>> dos = SimpleNamespace(atoms=2, source={"freq_unit": "cm-1", "stated_unit": "cm-1"})
    >>> carried_notes(dos, ReadingOptions(freq_unit="meV", atoms=1))[0]
    'read in cm-1 as the file states; --freq-unit meV applies to files that state no unit'
    """
    notes = []
    if carried is None:
        return notes
    stated = dos.source.get("stated_unit")
    if carried.freq_unit and stated and stated != carried.freq_unit:
        notes.append(f"read in {stated} as the file states; --freq-unit {carried.freq_unit} applies to files "
                     "that state no unit")
    if carried.atoms and dos.atoms != carried.atoms:
        notes.append(f"{dos.atoms} atoms per formula unit from the DOS integral; --atoms {carried.atoms} applies "
                     "to files whose integral gives no whole number")
    return notes


def check_targets(targets, index_path, force):
    """Refuse to start when an output exists and ``force`` is not set.

    Raises
    ------
    OptionError
        Naming the first existing file and how many exist.
    """
    if force:
        return
    existing = [p for p in list(targets) + [index_path] if Path(p).exists()]
    if existing:
        more = f" and {len(existing) - 1} more" if len(existing) > 1 else ""
        raise OptionError(f"{existing[0]}{more} already exist; refusing to overwrite "
                          "(choose another output directory, or --force to replace them)")


def write_index(rows, path, force=False, columns=INDEX_COLUMNS):
    """Write the index rows as CSV (columns :data:`INDEX_COLUMNS` unless ``columns`` says otherwise).

    Text cells that a spreadsheet would read as a formula get a leading
    ``'`` (:func:`thermo.io.writers.neutralised_cell`); a symbolic link in
    place of the index is never followed.

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as tmp:
    ...     p = write_index([_blank_row("a.dat")], Path(tmp) / INDEX_NAME)
    ...     p.read_text().splitlines()[0].split(",") == list(INDEX_COLUMNS) and INDEX_COLUMNS[:2]
    ('input', 'status')
    """
    from .io.writers import neutralised_cell, write_file

    buffer = io.StringIO()
    writer = csv.DictWriter(buffer, fieldnames=columns, lineterminator="\n")
    writer.writeheader()
    for row in rows:   # file names and messages may start like a formula: neutralised (OWASP)
        writer.writerow({k: neutralised_cell(row.get(k, "")) for k in columns})
    target = Path(path)
    write_file(target, buffer.getvalue().encode("utf-8"), overwrite=force)
    return target


def progress_bar(total, enabled):
    """A tqdm bar on stderr when it is a terminal and ``enabled``, else None."""
    if not (enabled and sys.stderr.isatty()):
        return None
    from tqdm import tqdm     # a runtime requirement: a missing install fails loudly
    return tqdm(total=total, file=sys.stderr, unit="file", desc="tables")


def _lost(job, reason):
    source, _target = job
    return dict(_blank_row(source), error=f"{source}: the worker stopped before finishing ({reason})")


def run_batch(inputs, outdir, options, workers=None, progress=True, pattern=None, executor=None):
    r"""Write a table for every input file and an index of the outcomes.

    Parameters
    ----------
    inputs : iterable of str or path-like
        Files, directories or glob patterns (see :func:`expand_inputs`).
    outdir : str or path-like
        Output directory (created when missing).
    options : BatchOptions
        Reading and table options.
    workers : int, optional
        Worker processes of the local pool (default: ``os.cpu_count()``); 1
        runs in this process.  With ``executor``, only sizes the chunks.
    progress : bool
        Show a progress bar on stderr when it is a terminal.
    pattern : str or sequence of str, optional
        File name patterns taken from directories (default :data:`KNOWN_PATTERNS`).
    executor : concurrent.futures.Executor, optional
        Where the files are processed instead of a local process pool: any
        executor, e.g. a Dask distributed client's ``Client.get_executor()``
        (its workers must reach the input and output paths).  The caller
        keeps it open and closes it.  The tables do not depend on it.

    Returns
    -------
    list of dict
        One index row per input, in input order (keys :data:`INDEX_COLUMNS`),
        then one ``status = skipped`` row per directory file left out by the
        pattern.

    Raises
    ------
    OptionError
        No inputs, bad options, or existing outputs without ``options.force``;
        nothing is written then.

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as tmp:
    ...     good = Path(tmp) / "good.dat"
    ...     _ = good.write_text("# frequency unit: THz\n" + "\n".join(f"{v/10} {0.072 * (v/10)**2}" for v in range(51)))
    ...     _ = (Path(tmp) / "bad.dat").write_text("not a spectrum\n")
    ...     rows = run_batch([tmp], Path(tmp) / "out", BatchOptions(temperatures=(300.0,)), workers=1)
    ...     [(Path(r["input"]).name, r["status"]) for r in rows]
    [('bad.dat', 'failed'), ('good.dat', 'ok')]
    """
    from .tables import check_temperatures
    from .io.writers import EXPORT_FORMATS

    if options.fmt not in EXPORT_FORMATS:
        raise OptionError(f"unknown format {options.fmt!r}; choose {', '.join(EXPORT_FORMATS)}")
    check_temperatures(options.temperatures)
    if options.per == "gram" and not any(o.formula for _, o in options.per_file):   # else checked per file
        from .formula import formula_unit
        formula_unit(options.reading.formula)
    out = Path(outdir)
    if out.exists() and not out.is_dir():
        raise OptionError(f"output {out} exists and is not a directory")
    skipped = []
    sources = expand_inputs(inputs, exclude_dir=out, pattern=pattern, skipped=skipped)
    targets = [str(out / name) for name in output_names(sources, options.fmt, out)]
    check_targets(targets, out / INDEX_NAME, options.force)
    out.mkdir(parents=True, exist_ok=True)

    jobs = list(zip(sources, targets))
    bar = progress_bar(len(jobs), progress)
    try:
        rows = run_jobs(process_file, jobs, (options,), executor=executor, workers=workers, lost=_lost,
                        done=None if bar is None else bar.update)
    finally:
        if bar is not None:
            bar.close()
    rows += [dict(_blank_row(p), status="skipped", error="not a known DOS file kind (see the pattern option)")
             for p in skipped if Path(p).resolve() != (out / INDEX_NAME).resolve()]
    write_index(rows, out / INDEX_NAME, force=options.force)
    return rows
