"""``modeheat quasiharmonic``: V(T), α, B_T, C_p, G from DOS at several volumes (a manifest)."""

from __future__ import annotations

import sys

from .electronic import add_electronic_reading_options, electronic_options
from .options import add_input_options, add_table_options, add_temperature_option, emit_table, output_plan
from .reading import reading_from_args

#: 0 to 1000 K every 10 K plus the standard 298.15 K (common practice in thermochemical tables).
_DEFAULT_TEMPERATURES = "0:1000:10,298.15"


def register(sub):
    p = sub.add_parser("quasiharmonic",
                       help="quasi-harmonic V(T), thermal expansion, B_T, C_p, G from DOS at several volumes")
    add_input_options(p)
    add_temperature_option(p, default=_DEFAULT_TEMPERATURES)
    for action in p._actions:   # the positional is the manifest here; same reading options for every DOS
        if action.dest == "file":
            action.metavar = "MANIFEST"
            action.help = ("volume set: CSV with volume_A3, energy_eV (or energy_Ry/energy_Ha/"
                           "energy_kJ_per_mol) and dos_file (relative to the manifest, or ws:NAME for a dataset of the workspace), one row per volume; "
                           "optional electronic_dos_file (metals: the electronic DOS at that volume adds F_el(V,T))")
        if action.dest == "temperatures":
            action.help = ("START:STOP:STEP in K (STOP included), a comma list, or both mixed "
                           f"(default {_DEFAULT_TEMPERATURES}: 0 to 1000 K every 10 K plus the standard 298.15 K)")
    add_step_options(p)
    p.add_argument("--errors", action="store_true",
                   help="add the estimated error of V, alpha, B_T, C_p, C_v, S, H, G and gamma as "
                        "<quantity>_error_<unit> columns (harmonic error of every volume, spread of the three "
                        "equations of state, leave-one-volume-out, distance beyond the sampled volumes)")
    p.add_argument("--imaginary-tolerance", type=float, default=None, metavar="SHARE",
                   help="list volumes whose imaginary-mode share exceeds this fraction (default 0.01)")
    add_table_options(p, "write here (default: stdout for csv/json)")
    add_electronic_reading_options(p)
    p.set_defaults(func=run)


def add_step_options(parser):
    """Add ``--pressure`` and ``--eos`` (the quasi-harmonic step; also ``batch --kind quasiharmonic``)."""
    parser.add_argument("--pressure", type=float, default=0.0, metavar="GPa", help="pressure p in GPa (default 0)")
    parser.add_argument("--eos", default="birch-murnaghan", choices=["birch-murnaghan", "vinet", "spline"],
                        help="equation of state fitted to F(V) at each temperature: birch-murnaghan (default), "
                             "vinet, or spline (a cubic spline through every volume, no assumed form)")


def run(args) -> int:
    from ..errors import OptionError
    from ..preparation.imaginary import UNSTABLE_SHARE
    from ..quasiharmonic import quasiharmonic_table, read_manifest
    from ..quasiharmonic.report import quasiharmonic_provenance
    from ..temperatures import parse_temperatures

    temperatures = parse_temperatures(args.temperatures)
    tolerance = UNSTABLE_SHARE if args.imaginary_tolerance is None else args.imaginary_tolerance
    if not 0 <= tolerance < 1:
        raise OptionError(f"--imaginary-tolerance must be a fraction in [0, 1), got {tolerance:g}")
    plan = output_plan(args)
    volume_set = read_manifest(args.file, options=reading_from_args(args), resolve=_workspace_resolver(args),
                               electronic_options=electronic_options(args))
    table = quasiharmonic_table(volume_set, temperatures, pressure_gpa=args.pressure, eos=args.eos,
                                per=args.per, formula=args.formula, imaginary_tolerance=tolerance,
                                errors=args.errors)
    info = quasiharmonic_provenance(volume_set, table, temperatures)
    for note in info["warnings"]:
        print(f"warning: {note}", file=sys.stderr)
    residual = table.attrs["diagnostics"]["max_fit_residual_meV"]
    print(f"note: {args.eos} fit to F(V) over {volume_set.volumes_a3.size} volumes, largest rms residual "
          f"{residual:.3g} meV per formula unit (column eos_fit_residual_meV)", file=sys.stderr)
    return emit_table(table, info, args, plan)


def _workspace_resolver(args):
    """``ws:NAME`` entries of the manifest: ``(bytes, stored settings)`` from the workspace (opened on first use)."""
    from .workspace import REFERENCE_PREFIX, open_space
    opened = {}

    def resolve(reference):
        if "space" not in opened:
            opened["space"] = open_space(args)
        space = opened["space"]
        dataset = space.get(str(reference)[len(REFERENCE_PREFIX):])
        return space.content(dataset), dataset.settings
    return resolve
