"""Benchmark of modeheat: ``python -m bench --json`` (see ``python -m bench --help``).

Every figure is measured in one run on one machine.  Times are medians of
repeated runs, and wherever a ratio exists the figure is a ratio against a
reference measured in the same run (the machines are shared and noisy).
"""
