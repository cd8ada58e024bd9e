"""Page details a practitioner relies on: θ names, temperature messages, 298.15 K in the preview,
plots that do not magnify noise, scientific tick labels.

298.15 K is the standard reference temperature of thermochemical tables (IUPAC; common practice).
Spectra are invented test data.
"""

import base64

import numpy as np
import pytest

from thermo import load_dos
from thermo.models import theta_definitions
from webapp import intake, session
from webapp.figures import reduced_figure, reduced_range
from webapp.labels import theta_label
from webapp.pages import models, thermodynamics

NU = np.linspace(0, 6, 241)
TEXT = "# frequency (THz) dos\n" + "\n".join(f"{a} {9 * a * a / 216}" for a in NU) + "\n"


@pytest.fixture
def ws():
    url = "data:text/plain;base64," + base64.b64encode(TEXT.encode()).decode()
    return intake.add_uploads(session.empty_workspace(), [url], ["debye.dat"], 10 ** 6)[0]


def test_theta_labels_are_human_and_distinct():
    keys = [t["key"] for t in theta_definitions(load_dos(TEXT))]
    labels = [theta_label(k) for k in keys]
    assert len(set(labels)) == len(labels) == len(keys)
    assert all("_K" not in lab and "theta" not in lab for lab in labels)
    assert theta_label("einstein_theta_entropy_K") == "θ_E (entropy match)"
    assert theta_label("debye_theta_moment_m2_K") == "θ_D (moment n = −2)"
    assert theta_label("debye_theta_fit_K") == "θ_D (C_v fit)"


def test_models_table_shows_labels_and_keeps_json_keys(ws):
    d = session.active(ws)
    table = models.theta_table(d)
    text = str(table)
    assert "θ_D (moment n = −2)" in text and "debye theta moment m2" not in text
    options = models.theta_options(d, "debye")
    assert options[0]["value"].startswith("debye_theta_") and options[0]["label"].startswith("θ_D (")


@pytest.mark.parametrize("t_min, t_max, step, words", [
    (0, -5, 5, "highest temperature -5 K is below 0 K"),
    (100, 50, 5, "highest temperature 50 K is below the lowest 100 K"),
    (0, 100, 0, "step must be > 0 K"),
    (None, 100, 5, "lowest temperature is missing"),
])
def test_bad_temperature_range_gives_a_message_not_empty_plots(ws, t_min, t_max, step, words):
    out = thermodynamics.draw(ws, t_min, t_max, step, "formula", [])
    assert words in str(out[-1])


def test_preview_includes_the_standard_temperature(ws):
    out = thermodynamics.draw(ws, 0, 1000, 10, "formula", [])
    assert "298.15" in str(out[5])
    assert 298.15 not in np.arange(0.0, 1001.0, 10.0)


def test_reduced_plot_does_not_zoom_into_noise(ws):
    from webapp import cache
    dos = cache.load(session.active(ws))
    lo, hi = reduced_figure(dos).layout.yaxis.range
    a = dos.low_frequency.coefficient
    assert lo <= 0.8 * a and hi >= 1.2 * a        # flat g/ν² stays flat on screen
    rng = reduced_range(a * (1 + 1e-6 * np.random.default_rng(1).standard_normal(50)), a)
    assert rng[1] - rng[0] >= 0.4 * a


def test_low_temperature_axis_uses_scientific_notation(ws):
    d = session.active(ws)
    figs = models.figures(d, np.arange(0.0, 301.0, 10.0), "formula", None, None, 0, "heat_capacity_v")
    assert figs[2].layout.yaxis.exponentformat == "e"
