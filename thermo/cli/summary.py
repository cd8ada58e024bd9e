"""``modeheat summary``: key numbers of one DOS file as JSON."""

from __future__ import annotations

from ..temperatures import parse_temperatures
from .options import add_input_options, add_report_output_options, check_output_target, emit_report, load_from_args, report_warnings


def register(sub):
    p = sub.add_parser("summary", help="key numbers of a DOS (atoms, imaginary share, ZPE, θ_D ...) as JSON")
    add_input_options(p)
    p.add_argument("--temperatures", default="0:1500:5,298.15", metavar="SPEC",
                   help="temperatures [K] over which the estimated_relative_error is taken (the other "
                        "numbers are at 298.15 K or temperature-free); START:STOP:STEP and/or a comma "
                        "list (default 0:1500:5,298.15)")
    add_report_output_options(p)
    p.set_defaults(func=run)


def summarize(dos, temperatures):
    """The summary record of a DOS (JSON-able)."""
    from ..columns import column_name
    from ..tables import provenance, tabulate
    info = provenance(dos, temperatures)
    source = info["inputs"][0]
    at_room = tabulate(dos, [298.15]).iloc[0]
    return {
        "input": source["name"], "frequency_unit": source["options"]["frequency_unit"],
        "atoms": dos.atoms, "atoms_inferred": source["options"]["atoms_inferred"],
        "raw_integral": info["raw_integral"], "scale_factor": info["scale_factor"],
        "negative_mode_fraction": info["negative_mode_fraction"],
        "negative_policy": source["options"]["negative"],
        "zero_point_energy_kJ_per_mol": info["zero_point_energy_kJ_per_mol"],
        "low_frequency": info["low_frequency"],
        "low_frequency_window_THz": info["low_frequency_window_THz"],
        "low_frequency_debye_temperature_K": info["low_frequency_debye_temperature_K"],
        "heat_capacity_v_298K_J_per_mol_K": float(at_room[column_name("heat_capacity_v")]),
        "entropy_298K_J_per_mol_K": float(at_room[column_name("entropy")]),
        "low_frequency_fit": info["low_frequency_fit"],
        "estimated_relative_error": info["estimated_relative_error"],
        "error_breakdown": info["error_breakdown"],
        "max_frequency_THz": float(dos.frequency_thz[dos.dos > 0].max()),
        "warnings": info["warnings"],
    }


def run(args) -> int:
    temperatures = parse_temperatures(args.temperatures)
    check_output_target(args)
    dos = load_from_args(args)
    report_warnings(dos)
    return emit_report(args, None, summarize(dos, temperatures), allow_nan=True)
