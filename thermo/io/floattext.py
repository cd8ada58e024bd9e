r"""Floats rounded to significant digits, and their CSV text, for whole arrays at once.

:func:`rounded_floats` gives ``float(f"{v:.{digits}g}")`` of every value and
:func:`rounded_csv_rows` the CSV rows Python's ``repr`` writes of those
rounded values — the same text, without a Python call per number.

Method
------
For a normal value :math:`v` with decimal exponent :math:`e=\lfloor\log_{10}|v|\rfloor`
and :math:`p=e-d+1` (``d`` digits), :math:`m=\mathrm{rint}(|v|\,10^{-p})` is the
mantissa Python's correctly rounded formatting gives [1]_, unless the quotient
lies within 1e-6 of a half (a tie, or one the rounding of the quotient may have
moved) or :math:`m` has not ``d`` digits (:math:`e` off by one near a power of
ten): those values, and non-finite ones and every :math:`|p|>22`, are formatted
one by one as before.  For :math:`|p|\le 22` both :math:`m` and :math:`10^{|p|}`
are exact doubles, so the IEEE product or quotient is the correctly rounded
:math:`m\cdot10^{p}` — the double ``float()`` reads from the text.  The shortest
text that reads back as that double (``repr``, [2]_) has the digits of :math:`m`
without its trailing zeros: two decimals of at most 9 digits never share a
double (more digits: one by one).  Python writes it positional for a decimal exponent from −4 to 15 and
as ``d.ddde±XX`` otherwise.

References
----------
.. [1] IEEE Std 754-2019, §5.12 (conversion between binary and decimal character sequences).
.. [2] D. M. Gay, "Correctly rounded binary-decimal and decimal-binary conversions",
   AT&T Bell Laboratories Numerical Analysis Manuscript 90-10 (1990).
"""

from __future__ import annotations

import numpy as np

#: Rows formatted per block (memory stays within a few tens of MB).
BLOCK_ROWS = 100_000
#: Exponents of ten whose double is exact.
_EXACT_POWER = 22
_TIE = 1e-6
_POWERS = 10.0 ** np.arange(_EXACT_POWER + 1)      # exact doubles
_ZERO, _DOT, _E, _PLUS, _MINUS, _COMMA, _NL, _QUOTE = (ord(c) for c in "0.e+-,\n\"")
#: Most digits of the fast path (the quotient's rounding, below 1.2e-7 for 10^9, stays inside the tie margin).
FAST_DIGITS = 9


def _mantissas(values, digits):
    """(ok, negative, m, p) per value: ``ok`` where the fast path holds (see the module notes)."""
    v = np.asarray(values, dtype=float)
    a = np.abs(v)
    ok = np.isfinite(v) & (a >= np.finfo(float).tiny)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        e = np.floor(np.log10(np.where(ok, a, 1.0))).astype(np.int64)
        p = e - (digits - 1)
        ok &= np.abs(p) <= _EXACT_POWER
        p = np.where(ok, p, 0)
        scale = _POWERS[np.abs(p)]
        q = np.where(p >= 0, a / scale, a * scale)
        m = np.rint(q)
        ok &= np.abs(q - np.floor(q) - 0.5) > _TIE
        ok &= (q >= 10.0 ** (digits - 1)) & (m < 10.0 ** digits)     # e off by one: one by one
        ok &= digits <= FAST_DIGITS
    return ok, np.signbit(v), np.where(ok, m, 0.0).astype(np.int64), p


def rounded_floats(values, digits):
    """``float(f"{v:.{digits}g}")`` of every value, as an array of the same shape.

    Parameters
    ----------
    values : array_like of float
        Any floats (NaN, infinities, signed zeros, subnormals included).
    digits : int
        Significant digits, 1 to 17.

    Returns
    -------
    numpy.ndarray
        The rounded values, bit for bit those of Python's formatting.

    Examples
    --------
    >>> rounded_floats([1 / 3, -2.0e-300, float("nan")], 4).tolist()
    [0.3333, -2e-300, nan]
    """
    v = np.asarray(values, dtype=float)
    ok, negative, m, p = _mantissas(v.ravel(), digits)
    scale = _POWERS[np.abs(p)]
    out = np.where(p >= 0, m * scale, m / scale)
    out = np.where(negative, -out, out)
    flat = v.ravel()
    kept = ~ok & ((flat == 0.0) | np.isnan(flat))         # zeros keep their sign, NaN stays NaN
    out[kept] = flat[kept]
    for i in np.flatnonzero(~ok & ~kept):
        out[i] = float(f"{flat[i]:.{digits}g}")
    return out.reshape(v.shape)


def _cell_texts(block, digits):
    """(lengths, writer) of the cells of a 2-D block: the length of each cell's text, and a function that
    writes them into a byte buffer at given starts."""
    flat = block.ravel()
    ok, negative, m, p = _mantissas(flat, digits)
    # the mantissa without its trailing zeros: n significant digits, decimal exponent E of the first one
    n = np.full(m.shape, digits, dtype=np.int64)
    stripped = m.copy()
    for _ in range(digits - 1):
        zero = ok & (stripped % 10 == 0) & (n > 1)
        stripped = np.where(zero, stripped // 10, stripped)
        n -= zero
    big = np.int64(10) ** (n - 1)
    exp = p + digits - 1
    positional = (exp >= -4) & (exp < 16)
    sign = negative.astype(np.int64)
    whole = positional & (exp >= 0)
    length = np.where(whole, np.where(n <= exp + 1, exp + 3, n + 1), 0)
    length = np.where(positional & (exp < 0), 1 - exp + n, length)
    e_digits = np.where(np.abs(exp) >= 100, 3, 2)
    length = np.where(positional, length, n + (n > 1) + 2 + e_digits) + sign
    nan = np.isnan(flat)
    zero = flat == 0.0
    length = np.where(ok, length, 0)
    length = np.where(zero, 3 + sign, length)
    others = np.flatnonzero(~ok & ~nan & ~zero)
    texts = {int(i): repr(float(f"{flat[i]:.{digits}g}")) for i in others}
    for i, text in texts.items():
        length[i] = len(text)

    def write(buffer, start):
        s = start + sign
        at = np.flatnonzero(ok)
        neg = np.flatnonzero(negative & (ok | zero))
        buffer[start[neg]] = _MINUS
        sz = s[zero]
        buffer[sz + 1] = _DOT                              # "0.0": the zeros are the buffer's fill
        so, no, eo, mo, bo = s[at], n[at], exp[at], stripped[at], big[at]
        po, wo = positional[at], whole[at]
        for k in range(digits):          # digit k (0 first) of each number, at its place in the text
            has = k < no
            d = (mo // np.maximum(bo // np.int64(10) ** k, 1)) % 10
            where = np.where(wo, so + k + (k > eo), np.where(po, so + 1 - eo + k, so + k + (k > 0)))
            buffer[where[has]] = _ZERO + d[has]
        dot = np.where(wo, so + eo + 1, so + 1)
        has_dot = po | (no > 1)
        buffer[dot[has_dot]] = _DOT
        sci = np.flatnonzero(~po)
        if sci.size:
            at_e = so[sci] + no[sci] + (no[sci] > 1)
            buffer[at_e] = _E
            buffer[at_e + 1] = np.where(eo[sci] < 0, _MINUS, _PLUS)
            ae = np.abs(eo[sci])
            width = np.where(ae >= 100, 3, 2)
            end = at_e + 2 + width
            buffer[end - 1] = _ZERO + ae % 10
            buffer[end - 2] = _ZERO + (ae // 10) % 10
            three = width == 3
            buffer[(end - 3)[three]] = _ZERO + (ae[three] // 100) % 10
        for i, text in texts.items():
            buffer[start[i]:start[i] + len(text)] = np.frombuffer(text.encode("ascii"), dtype=np.uint8)

    return length, write


def rounded_csv_rows(block, digits):
    """CSV rows of a float block rounded to ``digits`` significant digits, as ``repr`` writes the rounded values.

    Parameters
    ----------
    block : numpy.ndarray, shape (M, C)
        Floats (NaN written as an empty cell).
    digits : int
        Significant digits, 1 to 17.

    Returns
    -------
    str
        ``M`` lines ending in ``\\n``, cells separated by commas; a line whose
        only cell is empty is written ``""`` (not a blank line).

    Examples
    --------
    >>> rounded_csv_rows(np.array([[0.0, 1 / 3], [300.0, float("nan")], [-1.25e-7, 2e16]]), 8)
    '0.0,0.33333333\\n300.0,\\n-1.25e-07,2e+16\\n'
    """
    block = np.asarray(block, dtype=float)
    rows, cols = block.shape
    if digits > FAST_DIGITS:
        lines = [",".join(["" if v != v else repr(float(f"{v:.{digits}g}")) for v in row]) for row in block.tolist()]
        return "".join((line or '""') + "\n" for line in lines)
    parts = []
    for first in range(0, rows, BLOCK_ROWS):
        part = block[first:first + BLOCK_ROWS]
        length, write = _cell_texts(part, digits)
        nan = np.isnan(part.ravel())
        if cols == 1:
            length = np.where(nan, 2, length)             # '""': not a blank line
        cell = length + 1                                 # and its comma or line end
        start = np.concatenate([[0], np.cumsum(cell)[:-1]])
        buffer = np.full(int(cell.sum()), _ZERO, dtype=np.uint8)
        write(buffer, start)
        buffer[start + cell - 1] = np.where(np.arange(cell.size) % cols == cols - 1, _NL, _COMMA)
        if cols == 1:
            quoted = start[nan]
            buffer[quoted] = _QUOTE
            buffer[quoted + 1] = _QUOTE
        parts.append(buffer.tobytes().decode("ascii"))
    return "".join(parts)
