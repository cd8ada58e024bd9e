"""How far a table can be trusted: the numerical and the low-frequency parts of its error.

:mod:`.breakdown` (:func:`~.breakdown.error_breakdown`, per quantity and temperature);
:mod:`.reuse` (:func:`~.reuse.table_breakdown`, the same computed once per DOS and temperatures).
"""
