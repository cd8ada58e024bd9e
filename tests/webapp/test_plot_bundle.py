"""The plotting library served to the browser: the cartesian bundle, and its fall-back.

The figures are built by the installed plotly package; the browser draws them
with the bundled plotly.js cartesian file, which must be the same plotly.js
release (the version plotly states for its own bundle,
``plotly.offline.get_plotlyjs_version``).
"""

import logging

from plotly.offline import get_plotlyjs_version

from webapp import shell


def test_bundled_cartesian_plotly_js_is_the_release_plotly_was_built_with():
    assert shell.plot_bundle_version() == get_plotlyjs_version()
    assert shell.assets_ignore() == ""
    # the licence travels with the file
    with open(shell.PLOT_BUNDLE.replace("plotly-cartesian.min.js", "plotly.js-LICENSE.txt"), encoding="utf-8") as f:
        assert "MIT" in f.read()


def test_a_mismatched_bundle_is_left_out_with_a_warning(caplog, tmp_path):
    with caplog.at_level(logging.WARNING):
        pattern = shell.assets_ignore("0.0.1")
    assert pattern and __import__("re").search(pattern, "plotly-cartesian.min.js")
    assert "serving plotly's full bundle" in caplog.text and "0.0.1" in caplog.text
    # a file without a version header states none
    other = tmp_path / "x.js"
    other.write_text("var Plotly = {};")
    assert shell.plot_bundle_version(str(other)) == ""
