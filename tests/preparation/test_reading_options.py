"""The one reading-options record: defaults written once, "not given" is None, layers merge in order.

External references: the Debye entropy by mpmath (tests/spectra.py: P. Debye, Ann. Phys. 39, 789
(1912)) and the speed of light c = 299 792 458 m/s (exact, SI) for the cm⁻¹ ↔ THz factor.  The
spectra are invented test data.
"""

from __future__ import annotations

import argparse

import pytest

from tests.spectra import debye_entropy, debye_table, dos_text
from thermo import load_dos, tabulate
from thermo.cli.main import build_parser
from thermo.errors import DosInputError, OptionError
from thermo.preparation.options import DEFAULT_VALUES, DEFAULTS, FIELDS, ReadingOptions, merged
from thermo.workspace.store import DEFAULT_SETTINGS, settings_of
from webapp import session

CM_PER_THZ = 1e12 / 2.99792458e10      # c exact (SI)


def _s298(dos):
    return float(tabulate(dos, [298.15])["entropy_J_per_mol_K"].iloc[0])


def test_not_given_is_none_and_the_defaults_are_written_once():
    assert ReadingOptions().as_dict() == dict.fromkeys(FIELDS)
    assert DEFAULTS.as_dict() == DEFAULT_VALUES and ReadingOptions().resolved() == DEFAULTS
    # the store and the dashboard keep the same defaults (a blank formula is their stored form, and an
    # unsaid histogram choice is left out, as in settings stored before it existed)
    stored = {**DEFAULT_VALUES, "formula": ""}
    del stored["histogram"]
    assert DEFAULT_SETTINGS == session.DEFAULT_OPTIONS == stored


@pytest.mark.parametrize("command", ["table", "summary", "models", "displacements", "polynomial", "batch",
                                     "quasiharmonic"])
def test_every_command_leaves_unsaid_options_unset(command):
    args = build_parser().parse_args([command, "in.dat"] + (["--output", "o"] if command == "batch" else []))
    assert ReadingOptions.from_args(args) == ReadingOptions()


@pytest.mark.parametrize("command", ["calorimetry", "elastic"])
def test_every_dos_option_takes_the_whole_record(command):
    head = ["calorimetry", "m.csv"] if command == "calorimetry" else ["elastic", "--density", "3"]
    args = build_parser().parse_args(head + ["--dos", "ws:x", "--negative", "drop", "--low-frequency", "auto",
                                            "--sheet", "2", "--freq-unit", "cm-1", "--atoms", "2",
                                            "--formula", "MgO"])
    assert ReadingOptions.from_args(args) == ReadingOptions("cm-1", 2, "drop", "auto", "MgO", "2")


def test_an_option_equal_to_the_default_still_wins_over_a_stored_one():
    stored = ReadingOptions.from_mapping({"negative": "refuse", "low_frequency": "off", "freq_unit": "meV",
                                          "formula": ""})
    given = ReadingOptions(negative="drop", low_frequency="auto")
    chosen = given.over(stored).resolved()
    assert (chosen.negative, chosen.low_frequency, chosen.freq_unit, chosen.formula) == ("drop", "auto", "meV", None)
    assert merged(None, {"atoms": 3}, ReadingOptions(atoms=1)).atoms == 3


def test_values_are_checked_and_written_canonically():
    r = ReadingOptions(freq_unit="1/cm", negative="keep-count", low_frequency=(0.2, 0.6), formula=" Mg O ",
                       sheet=" data ", histogram="yes")
    assert r.as_dict() == {"freq_unit": "cm-1", "atoms": None, "negative": "drop-unscaled",
                           "low_frequency": "0.2:0.6", "formula": "Mg O", "sheet": "data", "histogram": True}
    assert ReadingOptions.from_mapping(r.as_dict()) == r          # a stored record reads back the same
    assert ReadingOptions(atoms="2").atoms == 2
    for bad in ({"atoms": 0}, {"atoms": 2.5}, {"negative": "keep"}, {"low_frequency": "0.6:0.2"},
                {"freq_unit": "furlong"}, {"colour": "red"}, {"histogram": "maybe"}):
        with pytest.raises(OptionError) as info:
            ReadingOptions.from_mapping(bad)
        assert "\n" not in str(info.value)


def test_the_store_keeps_the_record_in_its_older_form():
    # settings written before the record existed compare equal to the same settings now
    old = {"freq_unit": None, "atoms": None, "negative": "drop", "low_frequency": "auto", "formula": "",
           "sheet": None}
    assert settings_of({}) == old and settings_of({"low_frequency": [0.2, 0.6]})["low_frequency"] == "0.2:0.6"


def test_a_carried_unit_yields_to_the_unit_the_file_states():
    # the θ = 300 K spectrum written in cm-1 with its unit in the header; "meV" carried from another file
    nu, g = debye_table(300.0, points=801)
    stated = dos_text(nu * CM_PER_THZ, g / CM_PER_THZ, header="omega(cm^-1) dos")
    dos = load_dos(stated, fallback={"freq_unit": "meV", "atoms": 2})
    assert dos.source["freq_unit"] == "cm-1" and dos.atoms == 1
    assert _s298(dos) == pytest.approx(debye_entropy(300.0, 298.15), rel=1e-3)
    assert not any("meV" in w for w in dos.warnings)
    # a file that states no unit takes the carried one; a unit given for this very file overrides, with a warning
    bare = dos_text(nu * CM_PER_THZ, g / CM_PER_THZ, header="x y")
    assert load_dos(bare, fallback={"freq_unit": "cm-1"}).source["freq_unit"] == "cm-1"
    forced = load_dos(stated, freq_unit="THz", fallback={"freq_unit": "meV"})
    assert forced.source["freq_unit"] == "THz" and any("states cm-1" in w for w in forced.warnings)
    with pytest.raises(DosInputError, match="frequency unit is not stated"):
        load_dos(bare, fallback={"atoms": 1})


def test_a_carried_atom_count_is_used_only_where_the_integral_gives_none():
    nu, g = debye_table(300.0, points=801)
    assert load_dos(dos_text(nu, 0.37 * g, header="THz g"), fallback={"atoms": 2}).atoms == 2
    assert load_dos(dos_text(nu, 2 * g, header="THz g"), fallback={"atoms": 5}).atoms == 2


def test_the_options_used_travel_with_the_spectrum():
    nu, g = debye_table(300.0, points=401)
    dos = load_dos(dos_text(nu, g, header="x y"), options=ReadingOptions(freq_unit="THz", formula="Cu"),
                   low_frequency="off")
    used = ReadingOptions.of(dos)
    assert used == ReadingOptions("THz", 1, "drop", "off", "Cu", None)
    again = load_dos(dos_text(nu, g, header="x y"), options=used)
    assert _s298(again) == _s298(dos)


def test_parsed_namespace_without_reading_flags_is_all_unset():
    assert ReadingOptions.from_args(argparse.Namespace(file="x")) == ReadingOptions()


def test_the_provenance_lists_each_inputs_reading_options():
    from thermo.provenance import dos_input
    nu, g = debye_table(300.0, points=401)
    dos = load_dos(dos_text(nu, g, header="x y"), freq_unit="THz", low_frequency="off",
                   options=ReadingOptions(formula="Cu"))
    options = dos_input(dos)["options"]
    assert options == {"frequency_unit": "THz", "atoms": 1, "atoms_inferred": True, "negative": "drop",
                       "low_frequency": "off", "formula": "Cu"}
