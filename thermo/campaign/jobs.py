"""One input of a campaign: a quasi-harmonic manifest or a DOS, to a table and polynomial coefficients.

Each job never raises: it returns a :class:`JobResult`-shaped dict with the
index row (status ``ok`` or ``failed`` with a one-line reason), the
coefficient entry for the merged file (or None) and the provenance entries of
every file it read.  Jobs run in worker processes or on a cluster, so they
take and return plain, picklable data.
"""

from __future__ import annotations

import dataclasses
from pathlib import Path

import numpy as np

from ..errors import ModeheatError
from ..preparation.options import ReadingOptions

#: Campaign kinds: a volume set per input, or a DOS per input.
KINDS = ("quasiharmonic", "polynomial")
#: Columns of a campaign's ``index.csv``, in order.
CAMPAIGN_INDEX_COLUMNS = ("input", "status", "output", "volumes", "atoms", "cp_fit_max_relative_error",
                          "warnings", "error")


@dataclasses.dataclass(frozen=True)
class CampaignOptions:
    """What to compute for every input of a campaign.

    Attributes
    ----------
    kind : {'quasiharmonic', 'polynomial'}
        Inputs are manifests of volume sets (a quasi-harmonic table each) or
        DOS files (a harmonic polynomial fit each).
    temperatures : tuple of float
        Temperatures [K] of the quasi-harmonic tables (should include
        298.15 K and cover the fit range when ``form`` is set).
    reading : ReadingOptions or dict, optional
        Reading options of every DOS (:mod:`thermo.preparation.options`):
        for a manifest those of every DOS it lists, as the ``quasiharmonic``
        command; for DOS files carried to each as the fallback of
        :func:`~thermo.preparation.loading.load_dos`, as ``batch`` does.
    pressure_gpa : float
        Pressure [GPa] of the quasi-harmonic step.
    eos : {'birch-murnaghan', 'vinet'}
        Equation of state fitted to F(V) at each temperature.
    form : {'shomate', 'nasa7', 'sgte'} or None
        Polynomial form fitted to each result; None: no fit (quasi-harmonic
        tables only).
    fit_range : (float, float)
        Fit range [K].
    mid : float, optional
        Common midpoint of two ranges [K] (see :func:`thermo.polynomials.fit_polynomial`).
    formation_enthalpy : float
        Δ_fH°(298.15 K) [kJ/mol] given to every fit.
    phase : str
        Phase label of every fit.
    fmt : {'csv', 'json', 'xlsx'}
        Format of the quasi-harmonic tables.
    digits : int, optional
        Significant digits of the written tables.
    force : bool
        Replace existing outputs.
    """

    kind: str
    temperatures: tuple = ()
    reading: ReadingOptions | None = None
    pressure_gpa: float = 0.0
    eos: str = "birch-murnaghan"
    form: str | None = "shomate"
    fit_range: tuple = (298.15, 1500.0)
    mid: float | None = None
    formation_enthalpy: float = 0.0
    phase: str = "cr"
    fmt: str = "csv"
    digits: int | None = None
    force: bool = False

    def __post_init__(self):
        if not isinstance(self.reading, ReadingOptions):
            object.__setattr__(self, "reading", ReadingOptions.from_mapping(self.reading))


def _one_line(text):
    return " ".join(str(text).split())


def blank_row(source):
    """Index row of an input before (or without) a result."""
    return {"input": source, "status": "failed", "output": "", "volumes": "", "atoms": "",
            "cp_fit_max_relative_error": "", "warnings": "", "error": ""}


def failed(source, message):
    """The job result of an input that gave nothing."""
    return {"row": dict(blank_row(source), error=_one_line(message)), "entry": None, "inputs": []}


def _fit(source_data, options, label):
    from ..polynomials import fit_polynomial
    return fit_polynomial(source_data, options.form, options.fit_range, t_mid=options.mid,
                          formation_enthalpy=options.formation_enthalpy, phase=options.phase, name=label)


def _entry(source, target, fit, inputs):
    record = fit.to_dict()
    return {"input": source, "name": Path(target).stem, **record, "inputs": inputs}


def _quasiharmonic(source, target, options):
    from ..io.writers import write_table
    from ..polynomials import source_from_table
    from ..quasiharmonic import quasiharmonic_table, read_manifest
    from ..quasiharmonic.report import quasiharmonic_provenance

    volume_set = read_manifest(Path(source), options=options.reading, name=Path(source).name)
    t = np.asarray(options.temperatures, dtype=float)
    table = quasiharmonic_table(volume_set, t, pressure_gpa=options.pressure_gpa, eos=options.eos)
    info = quasiharmonic_provenance(volume_set, table, t)
    write_table(table, info, options.fmt, target, overwrite=options.force, digits=options.digits)
    row = dict(blank_row(source), output=Path(target).name, volumes=int(volume_set.volumes_a3.size),
               atoms=volume_set.doses[0].atoms, warnings=" | ".join(_one_line(w) for w in info["warnings"]))
    entry = None
    if options.form is not None:
        lo, hi = options.fit_range
        inside = (table["temperature_K"] >= lo) & (table["temperature_K"] <= hi)
        outside = table["outside_volume_range"].to_numpy(bool) & inside.to_numpy(bool)
        if outside.any():
            first = float(table["temperature_K"][outside].min())
            raise ModeheatError(f"the equilibrium volume leaves the volume set at {first:g} K, inside the fit "
                                f"range {lo:g}-{hi:g} K; narrow the range or add larger volumes")
        fit = _fit(source_from_table(table[inside.to_numpy(bool)], label=f"quasi-harmonic {Path(source).name}"),
                   options, Path(target).stem)
        entry = _entry(source, target, fit, info["inputs"])
        row["cp_fit_max_relative_error"] = fit.errors["heat_capacity_p"]["max_relative"]
        if fit.warnings:
            row["warnings"] = " | ".join(filter(None, [row["warnings"]] + [_one_line(w) for w in fit.warnings]))
    return {"row": dict(row, status="ok"), "entry": entry, "inputs": info["inputs"]}


def _polynomial(source, target, options):
    from ..polynomials import harmonic_source
    from ..preparation.loading import load_dos
    from ..provenance import dos_input

    dos = load_dos(Path(source), name=Path(source).name, fallback=options.reading)
    fit = _fit(harmonic_source(dos, *options.fit_range), options, Path(target).stem)
    inputs = [dos_input(dos)]
    from ..batch import carried_notes
    notes = [_one_line(w) for w in list(dos.warnings) + carried_notes(dos, options.reading) + list(fit.warnings)]
    row = dict(blank_row(source), status="ok", atoms=dos.atoms, warnings=" | ".join(notes),
               cp_fit_max_relative_error=fit.errors["heat_capacity_p"]["max_relative"])
    return {"row": row, "entry": _entry(source, target, fit, inputs), "inputs": inputs}


def campaign_job(source, target, options):
    """Process one input of a campaign; never raises.

    Parameters
    ----------
    source : str
        Manifest (``kind='quasiharmonic'``) or DOS file (``'polynomial'``).
    target : str
        Table file written for a manifest; for a DOS only its stem is used
        (the distinct name of the entry).
    options : CampaignOptions

    Returns
    -------
    dict
        ``row`` (index row, keys :data:`CAMPAIGN_INDEX_COLUMNS`), ``entry``
        (coefficient record for the merged file, or None) and ``inputs``
        (provenance entries of every file read, each with its SHA-256).
    """
    try:
        if options.kind == "quasiharmonic":
            return _quasiharmonic(source, target, options)
        return _polynomial(source, target, options)
    except ModeheatError as exc:      # a message that does not name the file gets its path first
        text = _one_line(exc)
        return failed(source, text if Path(source).name in text else f"{source}: {text}")
    except OSError as exc:
        return failed(source, f"{source}: {exc.strerror or exc}")
    except Exception as exc:  # noqa: BLE001 - one bad input must not stop the campaign
        return failed(source, f"{source}: unexpected {type(exc).__name__}: {exc}")
