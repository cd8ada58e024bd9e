"""No injection through labels into the Cantera YAML block: labels checked, values quoted strictly, the block
read back before it is offered.  Reference reader: Cantera 3.2 (https://cantera.org), an independent library.
Fits are of invented Shomate coefficients (demo values, not a material)."""

from __future__ import annotations

import pytest

from thermo.errors import OptionError
from thermo.polynomials import FitRange, PolynomialFit
from thermo.polynomials.cantera_yaml import cantera_yaml, polynomial_export, reloaded, species_name

COEFFICIENTS = dict(zip("ABCDEFGH", [30.0, 2.0, -0.5, 0.1, -0.2, -10.0, 60.0, 0.0]))


def _fit(phase="cr", source="x.dat"):
    return PolynomialFit("shomate", (FitRange(298.15, 1000.0, COEFFICIENTS),), phase=phase, source=source)


@pytest.mark.parametrize("phase", ["cr)\n  composition: {U: 235}", "cr #c", "cr: x", "a" * 65, "β"])
def test_a_label_outside_the_allowed_characters_is_refused(phase):
    with pytest.raises(OptionError, match="letters, digits"):
        species_name("Cu", phase)
    with pytest.raises(OptionError, match="letters, digits"):
        cantera_yaml(_fit(phase=phase), "Cu")


def test_allowed_label_loads_in_cantera_as_written():
    ct = pytest.importorskip("cantera")
    text = cantera_yaml(_fit(phase="hp-2+(b)_x"), "Cu")
    species = ct.Species.list_from_yaml(text, section="species")
    assert [s.name for s in species] == ["Cu(hp-2+(b)_x)"]
    assert species[0].composition == {"Cu": 1.0}


@pytest.mark.parametrize("source", ["a\nspecies:\n- name: X\n  composition: {U: 235}", "b\u2028composition: x",
                                    "c\x85d", "e\r# f"])
def test_names_in_comments_and_provenance_cannot_end_the_comment(source):
    ct = pytest.importorskip("cantera")
    fit = _fit(source=source)
    prov = {"tool": "modeheat", "inputs": [{"name": source}]}
    text = polynomial_export(fit, "yaml", "Cu", prov)
    species = ct.Species.list_from_yaml(text, section="species")
    assert [(s.name, s.composition) for s in species] == [("Cu(cr)", {"Cu": 1.0})]
    assert reloaded(text)["name"] == "Cu(cr)"


def test_reloading_finds_a_smuggled_line():
    text = cantera_yaml(_fit(), "Cu")
    assert reloaded(text)["composition"] == {"Cu": 1}
    with pytest.raises(Exception, match="unexpected line"):
        reloaded(text.replace("  thermo:", "  composition2: 1\n  thermo:").replace("composition2", "extra key"))
