"""``modeheat calorimetry``: fit measured C_p(T), third-law entropy, comparison with a DOS."""

from __future__ import annotations

import sys

from .electronic import add_electronic_reading_options, load_electronic_from_args
from .options import add_dos_option, add_report_output_options, check_output_target, emit_report, load_from_args, report_digits


def register(sub):
    p = sub.add_parser("calorimetry", help="fit a model to measured C_p(T) (lattice + γT + dilation) with "
                                           "uncertainties; third-law entropy S°(298.15 K) from data and model")
    p.add_argument("measured", metavar="MEASURED",
                   help="measured heat capacity: columns T [K], C_p, optional standard uncertainty "
                        "(text, CSV or .xlsx)")
    add_dos_option(p, "phonon DOS for the lattice part and the S comparison",
                   formula_help="for C_p in J/(g K) and the atom count", atoms_default="from --dos, else from "
                                                                                 "--formula, else 1")
    p.add_argument("--cp-unit", metavar="UNIT",
                   help="C_p unit: J/(mol K), J/(g K), cal/(mol K), mJ/(mol K) (default: from the header)")
    p.add_argument("--model", metavar="TERMS",
                   help="terms joined by '+': debye or dos; electronic; nernst-lindemann or dilation-values "
                        "(default debye+nernst-lindemann, dos+nernst-lindemann with --dos; γT only for a metal)")
    p.add_argument("--metal", action="store_true",
                   help="the sample is a metal: fit the electronic term γT (default: an insulator, γ = 0; "
                        "--electronic EDOS declares a metal too)")
    p.add_argument("--fix", action="append", default=[], metavar="NAME=VALUE[±U]",
                   help="hold a parameter, optionally with its standard uncertainty (propagated): theta_D [K], "
                        "scale, gamma [J/(mol K²)] (adds γT), A [mol/J]; repeatable")
    p.add_argument("--range", metavar="LO:HI", help="fit range in K (default all points)")
    p.add_argument("--dilation-values", metavar="PATH",
                   help="table of T [K] and C_p - C_v [J/(mol K)] for the dilation-values term")
    p.add_argument("--low-t-max", type=float, metavar="K",
                   help="upper temperature of the C/T = γ + βT² analysis (default θ_D/30)")
    p.add_argument("--electronic", metavar="EDOS",
                   help="electronic DOS of the same formula unit (metals): its band γ = (π²/3)k_B²g(E_F) is reported "
                        "beside the fitted γ, with their ratio 1 + λ (see 'modeheat electronic' for the format)")
    add_electronic_reading_options(p)
    p.add_argument("--format", default="json", choices=["json", "csv", "xlsx"],
                   help="json: fit, entropies, notes (default); csv/xlsx: residual and third-law table")
    add_report_output_options(p, "write here (default stdout; needed for xlsx)")
    p.set_defaults(func=run)


def build_model(args, dos, fixed=None):
    """The :class:`HeatCapacityModel` the options describe (γT with ``--metal``, ``--electronic`` or a held γ)."""
    from ..calorimetry.models import HeatCapacityModel
    from ..calorimetry.report import parse_model
    from ..errors import OptionError
    metal = (bool(getattr(args, "metal", False)) or bool(getattr(args, "electronic", None))
             or "gamma_J_per_mol_K2" in (fixed or {}))
    terms = parse_model(args.model, dos is not None, metal)
    atoms = args.atoms or (dos.atoms if dos is not None else None)
    if atoms is None and args.formula:
        from ..formula import formula_unit
        atoms = formula_unit(args.formula)[1]
    if atoms is None:
        atoms = 1
        print("warning: atoms per formula unit not given; assumed 1 (use --atoms)", file=sys.stderr)
    table = None
    if terms["dilation"] == "values":
        if not args.dilation_values:
            raise OptionError("the dilation-values term needs --dilation-values PATH")
        from ..io.readers import read_table
        raw = read_table(args.dilation_values)
        table = (raw.data[:, 0], raw.data[:, 1])
    if terms["lattice"] == "dos" and dos is None:
        raise OptionError("the dos lattice term needs --dos DOS")
    return HeatCapacityModel(atoms=int(atoms), dos=dos if terms["lattice"] == "dos" else None,
                             dilation_table=table, **terms)


def run(args) -> int:
    from ..calorimetry import parse_fixed, read_heat_capacity
    from ..calorimetry.export import calorimetry_export
    from ..errors import OptionError
    from ..io.writers import export_table, write_table
    from .models import parse_fit_range

    check_output_target(args)
    if args.format == "xlsx" and not args.output:
        raise OptionError("xlsx output needs --output PATH")
    measured = read_heat_capacity(args.measured, cp_unit=args.cp_unit, formula=args.formula)
    dos = None
    if args.dos:
        dos = load_from_args(args, args.dos)
        for note in dos.warnings:
            print(f"warning: {args.dos}: {note}", file=sys.stderr)
    fixed = parse_fixed(args.fix)
    model = build_model(args, dos, fixed)
    fit_range = parse_fit_range(args.range) if args.range else None
    edos = load_electronic_from_args(args, args.electronic) if args.electronic else None
    record, result, notes = calorimetry_export(
        measured, model, fixed, fit_range, args.low_t_max, edos, args.electronic, args.format,
        **calorimetry_settings(args, dos))
    for note in notes:
        print(f"note: {note}", file=sys.stderr)
    if args.format == "json":
        return emit_report(args, record, result)
    if args.output:
        write_table(result, record, args.format, args.output, overwrite=args.force, digits=report_digits(args))
        print(f"wrote {args.output}", file=sys.stderr)
        return 0
    sys.stdout.write(export_table(result, record, args.format, digits=report_digits(args)).decode("utf-8"))
    return 0


def calorimetry_settings(args, dos):
    """Keywords of :func:`thermo.calorimetry.export.calorimetry_provenance` from the command line."""
    return {"cp_unit": args.cp_unit, "formula": args.formula, "dos": dos, "dos_label": args.dos,
            "dilation_values": args.dilation_values,
            "settings": {"model": args.model, "metal": bool(getattr(args, "metal", False)), "fixed": list(args.fix),
                         "fit_range_K": args.range, "low_t_max_K": args.low_t_max, "atoms": args.atoms}}


def calorimetry_provenance(args, measured, dos, notes, edos=None):
    """The provenance record of a calorimetry result from the command line's options (see
    :func:`thermo.calorimetry.export.calorimetry_provenance`)."""
    from ..calorimetry.export import calorimetry_provenance as record
    return record(measured, edos=edos, notes=notes, **calorimetry_settings(args, dos))
