"""Database campaigns: many materials (volume sets or DOS files) to one merged coefficient file, in one run.

:func:`run_campaign` is the batch of the quasi-harmonic step and of the
polynomial fits: every input is processed on a local process pool or any
:class:`concurrent.futures.Executor` (a Dask cluster's, see
:mod:`thermo.parallel`), a bad input fails alone (its reason in the index),
and the fits of all the others go into one merged file with the provenance of
every input (:mod:`.merged`).  Per input (:mod:`.jobs`):

* ``kind='quasiharmonic'``: a manifest → :func:`thermo.quasiharmonic.quasiharmonic_table`
  written as ``<stem>.<fmt>`` with its provenance; with a ``form``, the
  polynomial fitted to its C_p and S (:func:`thermo.polynomials.source_from_table`,
  :func:`thermo.polynomials.fit_polynomial`);
* ``kind='polynomial'``: a DOS → the polynomial of its harmonic C_p
  (:func:`thermo.polynomials.harmonic_source`).

The harmonic-table batch is :func:`thermo.batch.run_batch`.
"""

from __future__ import annotations

from pathlib import Path

from ..errors import OptionError
from .jobs import CAMPAIGN_INDEX_COLUMNS, KINDS, CampaignOptions, campaign_job, failed
from .merged import COEFFICIENT_FORMATS, COEFFICIENTS_STEM, merged_record, write_merged

__all__ = ["CAMPAIGN_INDEX_COLUMNS", "COEFFICIENT_FORMATS", "KINDS", "MANIFEST_PATTERNS", "CampaignOptions",
           "campaign_job", "merged_record", "run_campaign"]

#: File name patterns taken from a directory for quasi-harmonic campaigns (manifests).
MANIFEST_PATTERNS = ("*.csv",)


def _lost(job, reason):
    source, _target = job
    return failed(source, f"{source}: the worker stopped before finishing ({reason})")


def _check(options, coefficients):
    from ..io.writers import EXPORT_FORMATS
    from ..polynomials.fitting import check_range
    from ..tables import check_temperatures

    if options.kind not in KINDS:
        raise OptionError(f"unknown campaign kind {options.kind!r}; choose {', '.join(KINDS)}")
    if options.kind == "polynomial" and options.form is None:
        raise OptionError("a polynomial campaign needs a form (shomate, nasa7 or sgte)")
    if options.form is not None:
        check_range(options.fit_range, options.form)
    if coefficients not in COEFFICIENT_FORMATS:
        raise OptionError(f"unknown coefficient format {coefficients!r}; choose {', '.join(COEFFICIENT_FORMATS)}")
    if options.kind == "quasiharmonic":
        if options.fmt not in EXPORT_FORMATS:
            raise OptionError(f"unknown format {options.fmt!r}; choose {', '.join(EXPORT_FORMATS)}")
        t = check_temperatures(options.temperatures)
        lo, hi = options.fit_range
        if options.form is not None and not (t.min() <= lo and t.max() >= hi):
            raise OptionError(f"the temperatures ({t.min():g}-{t.max():g} K) must cover the fit range "
                              f"{lo:g}-{hi:g} K")


def run_campaign(inputs, outdir, options, workers=None, progress=True, pattern=None, executor=None,
                 coefficients="json"):
    """Process every manifest or DOS file, write the index and one merged coefficient file.

    Parameters
    ----------
    inputs : iterable of str or path-like
        Files, directories or glob patterns (see :func:`thermo.batch.expand_inputs`).
    outdir : str or path-like
        Output directory (created when missing).
    options : CampaignOptions
        What to compute.
    workers : int, optional
        Local worker processes (default ``os.cpu_count()``; 1: this process).
    progress : bool
        Progress bar on stderr when it is a terminal.
    pattern : str or sequence of str, optional
        Names taken from directories (default: :data:`MANIFEST_PATTERNS` for
        manifests, :data:`thermo.batch.KNOWN_PATTERNS` for DOS files).
    executor : concurrent.futures.Executor, optional
        Where the inputs run instead of the local pool (see :func:`thermo.parallel.run_jobs`).
    coefficients : {'json', 'csv'}
        Format of the merged file ``coefficients.<format>`` (written when
        ``options.form`` is set).

    Returns
    -------
    list of dict
        Job results in input order: ``row`` (index row), ``entry`` (the fit
        record or None) and ``inputs`` (provenance entries).

    Raises
    ------
    OptionError
        Bad options or existing outputs without ``options.force``; nothing is
        written then.
    """
    from ..batch import INDEX_NAME, KNOWN_PATTERNS, check_targets, expand_inputs, output_names, progress_bar
    from ..batch import write_index
    from ..parallel import run_jobs

    _check(options, coefficients)
    out = Path(outdir)
    if out.exists() and not out.is_dir():
        raise OptionError(f"output {out} exists and is not a directory")
    if pattern is None:
        pattern = MANIFEST_PATTERNS if options.kind == "quasiharmonic" else KNOWN_PATTERNS
    sources = expand_inputs(inputs, exclude_dir=out, pattern=pattern)
    merged = out / f"{COEFFICIENTS_STEM}.{coefficients}"
    # distinct names (the stems of the tables; for DOS files only the names of the merged entries)
    fmt = options.fmt if options.kind == "quasiharmonic" else "name"
    targets = [str(out / n) for n in output_names(sources, fmt, out, reserved=(merged.name,))]
    written = targets if options.kind == "quasiharmonic" else []
    check_targets(written + ([merged] if options.form else []), out / INDEX_NAME, options.force)
    out.mkdir(parents=True, exist_ok=True)
    bar = progress_bar(len(sources), progress)
    try:
        results = run_jobs(campaign_job, list(zip(sources, targets)), (options,), executor=executor,
                           workers=workers, lost=_lost, done=None if bar is None else bar.update)
    finally:
        if bar is not None:
            bar.close()
    if options.form is not None:
        write_merged(results, options, out, coefficients)
    write_index([r["row"] for r in results], out / INDEX_NAME, force=options.force, columns=CAMPAIGN_INDEX_COLUMNS)
    return results
