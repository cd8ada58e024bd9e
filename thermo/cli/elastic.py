"""``modeheat elastic``: Debye temperature from elastic constants or sound velocities (JSON)."""

from __future__ import annotations

from .options import add_dos_option, add_report_output_options, check_output_target, emit_report, load_from_args


def register(sub):
    p = sub.add_parser("elastic", help="θ_D from cubic elastic constants or sound velocities (Anderson, VRH)")
    p.add_argument("--c11", type=float, metavar="GPA", help="elastic constant C11 in GPa")
    p.add_argument("--c12", type=float, metavar="GPA", help="elastic constant C12 in GPa")
    p.add_argument("--c44", type=float, metavar="GPA", help="elastic constant C44 in GPa")
    p.add_argument("--vl", type=float, metavar="M/S", help="longitudinal sound velocity in m/s (instead of C_ij)")
    p.add_argument("--vt", type=float, metavar="M/S", help="transverse sound velocity in m/s")
    p.add_argument("--density", type=float, required=True, metavar="G/CM3", help="density in g/cm³")
    p.add_argument("--molar-mass", type=float, metavar="G/MOL",
                   help="molar mass of the formula unit (instead of --formula; needs --atoms)")
    add_dos_option(p, "DOS whose low-frequency θ_D is compared", formula_help="molar mass and atom count",
                   atoms_default="from --formula; needed with --molar-mass")
    add_report_output_options(p)
    p.set_defaults(func=run)


def run(args) -> int:
    from ..errors import OptionError
    from ..formula import formula_unit
    from ..vibration.elastic import compare_debye_temperatures, elastic_debye_temperature
    check_output_target(args)
    if args.formula:
        mass, atoms = formula_unit(args.formula)
    elif args.molar_mass is not None and args.atoms is not None:
        mass, atoms = args.molar_mass, args.atoms
    else:
        raise OptionError("give --formula, or --molar-mass and --atoms")
    result = elastic_debye_temperature(args.density, mass, atoms, c11=args.c11, c12=args.c12, c44=args.c44,
                                       v_l=args.vl, v_t=args.vt)
    record = {"method": "Anderson (1963), Voigt–Reuss–Hill average" if args.c11 is not None
              else "Anderson (1963), from sound velocities",
              "formula": args.formula, "molar_mass_g_per_mol": mass, "atoms": atoms,
              "density_g_per_cm3": args.density}
    record.update({("elastic_theta_K" if k == "theta_K" else
                    k if k.endswith("_per_s") else f"{k}_GPa"): v for k, v in result.items()})
    if args.dos:
        dos = load_from_args(args, args.dos)
        record["comparison"] = compare_debye_temperatures(result["theta_K"],
                                                          dos.low_frequency_debye_temperature_k())
    record["caution"] = ("θ_D from elastic data tests the acoustic branches only; elastic constants "
                         "measured at room temperature give a lower θ_D than 0 K values")
    return emit_report(args, None, record, ensure_ascii=False)
