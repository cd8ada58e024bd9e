"""``modeheat polynomial``: Shomate, NASA 7-term or SGTE coefficients fitted to a DOS or a C_p table."""

from __future__ import annotations

import sys
from pathlib import Path

from .options import (add_input_options, add_report_output_options, check_output_target, report_digits,
                      write_text_output)


def register(sub):
    p = sub.add_parser("polynomial", help="Shomate, NASA 7-term or SGTE polynomial coefficients fitted to the "
                                          "harmonic C_p of a DOS (or to a (T, C_p) table), with fit errors")
    add_input_options(p, formula_help="needed for yaml: the species composition")
    p.add_argument("--cp-table", action="store_true",
                   help="the file is a (T, C_p) table (columns temperature_K, heat_capacity_p_J_per_mol_K, "
                        "optional entropy_J_per_mol_K; CSV or a modeheat JSON export) instead of a DOS")
    p.add_argument("--entropy-298", type=float, metavar="S",
                   help="S(298.15 K) in J/(mol K) for a --cp-table without an entropy column")
    add_fit_options(p)
    p.add_argument("--format", default="json", choices=["json", "csv", "yaml"],
                   help="json (default), csv (one row per coefficient) or yaml (Cantera species block)")
    add_report_output_options(p)
    p.set_defaults(func=run)


def add_fit_options(parser, form_default="shomate", form_help="polynomial form (default shomate)"):
    """Add ``--form``, ``--range``, ``--mid``, ``--formation-enthalpy`` and ``--phase`` (also used by ``batch``)."""
    parser.add_argument("--form", default=form_default, choices=["shomate", "nasa7", "sgte"], help=form_help)
    parser.add_argument("--range", default="298.15:1500", metavar="LO:HI",
                        help="fit range in K (default 298.15:1500)")
    parser.add_argument("--mid", type=float, metavar="T",
                        help="common midpoint of two ranges in K: nasa7 always has two (default: geometric mean "
                             "of the range, to 10 K); shomate and sgte get two ranges only with --mid")
    parser.add_argument("--formation-enthalpy", type=float, default=0.0, metavar="KJ_PER_MOL",
                        help="enthalpy of formation at 298.15 K in kJ/mol (default 0: an element in its "
                             "reference state)")
    parser.add_argument("--phase", default="cr", metavar="LABEL", help="phase label, e.g. cr, alpha (default cr)")


def load_source(args, t_range):
    """The heat-capacity source named by the parsed options and its ``inputs`` entry for the provenance."""
    from ..polynomials import harmonic_source, source_from_table
    from ..provenance import dos_input, input_record
    from .options import load_from_args

    if args.cp_table:
        from ..io.readback import read_exported_csv, read_exported_json
        reader = read_exported_json if str(args.file).lower().endswith(".json") else read_exported_csv
        table, _ = reader(args.file)
        entry = input_record(args.file, data=args.file, options={"entropy_298_J_per_mol_K": args.entropy_298},
                             role="heat-capacity table")
        return source_from_table(table, entropy_298=args.entropy_298,
                                 label=f"C_p table {Path(args.file).name}"), entry
    dos = load_from_args(args)
    return harmonic_source(dos, *t_range), dos_input(dos)


def run(args) -> int:
    from ..errors import OptionError
    from ..polynomials.cantera_yaml import polynomial_export, species_name
    from ..polynomials import fit_polynomial
    from ..polynomials.fitting import check_range
    from .models import parse_fit_range

    t_range = check_range(parse_fit_range(args.range), args.form)
    if args.format == "yaml" and args.form == "sgte":
        raise OptionError("Cantera's YAML schema has no sgte model; use --format json or csv for sgte")
    if args.format == "yaml" and not args.formula:
        raise OptionError("yaml output needs --formula (the species composition, e.g. MgO)")
    check_output_target(args)
    source, entry = load_source(args, t_range)
    name = species_name(args.formula, args.phase) if args.formula else None
    fit = fit_polynomial(source, args.form, t_range, t_mid=args.mid, formation_enthalpy=args.formation_enthalpy,
                         phase=args.phase, name=name)
    text = polynomial_export(fit, args.format, args.formula, fit.provenance([entry], args.formula),
                             digits=report_digits(args))
    for note in fit.warnings:
        print(f"warning: {note}", file=sys.stderr)
    if args.output:
        write_text_output(args, text)
    else:
        sys.stdout.write(text)
    return 0
