"""Bytes of a text table to str: UTF-8 (with or without BOM) and UTF-16 (with BOM, or ASCII saved as UTF-16).

References
----------
.. [1] The Unicode Consortium, *The Unicode Standard*, Version 15.0 (2022),
   §2.5 (encoding forms) and §23.8 (byte order mark).
"""

from __future__ import annotations

from ..errors import DosInputError

_UTF16_BOMS = (b"\xff\xfe", b"\xfe\xff")


def _utf16_guess(raw: bytes):
    """``"utf-16-le"``/``"utf-16-be"`` for ASCII text saved as UTF-16 without BOM, else None."""
    if len(raw) < 4 or len(raw) % 2 or b"\x00" not in raw:     # ASCII as UTF-16: every other byte is NUL
        return None
    even, odd = raw[0::2], raw[1::2]
    if even.count(0) == 0 and odd.count(0) >= 0.9 * len(odd):
        return "utf-16-le"
    if odd.count(0) == 0 and even.count(0) >= 0.9 * len(even):
        return "utf-16-be"
    return None


def decode_text(raw: bytes, display: str) -> str:
    r"""Text of a table file; a NUL left after decoding means binary content.

    Raises
    ------
    DosInputError
        Binary content, broken UTF-16, or bytes that are not UTF-8 (one line,
        with the offset).

    Examples
    --------
    >>> decode_text("0.5 1\n".encode("utf-16"), "t.dat")
    '0.5 1\n'
    """
    encoding = "utf-16" if raw.startswith(_UTF16_BOMS) else _utf16_guess(raw)
    if encoding:
        try:
            text = raw.decode(encoding)
        except UnicodeDecodeError as exc:
            raise DosInputError(f"broken UTF-16 text (offset {exc.start}); save the file as UTF-8",
                                display) from None
        nul = text.find("\x00")
        if nul >= 0:
            raise DosInputError("binary content (NUL character); expected a text table",
                                display, text.count("\n", 0, nul) + 1)
        return text
    nul = raw.find(b"\x00")
    if nul >= 0:
        raise DosInputError("binary content (NUL byte); expected a text table",
                            display, raw.count(b"\n", 0, nul) + 1)
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = raw.count(b"\n", 0, exc.start) + 1
        raise DosInputError(
            f"not UTF-8 text (byte 0x{raw[exc.start]:02X} at offset {exc.start}); "
            "save the file as UTF-8", display, line) from None
