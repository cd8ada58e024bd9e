"""Dashboard figures p5 (browser upload to drawn plots) and p6 (callback time)."""

from __future__ import annotations


def p5():
    return {"p5_upload_to_plot_s": None, "p5_note": "not yet measured"}


def p6():
    return {"p6_callback_median_s": None, "p6_note": "not yet measured"}
