"""Inert output: spreadsheet formula neutralising (OWASP), text without terminal controls, safe file writes.

Spreadsheet programs evaluate a cell that starts with ``=``, ``+``, ``-``,
``@``, tab or carriage return as a formula; text from users (names, headers,
labels) therefore gets a leading ``'`` in CSV and is stored as a text cell in
``.xlsx`` [1].  Files are opened with ``O_NOFOLLOW`` so a symbolic link placed
where an output goes is never written through [2]; a file replaced in place is
written to a fresh, exclusively created temporary file beside it and renamed.
Text from users shown on a terminal or in a label has its control characters
(C0, DEL, C1: ANSI escape sequences) and bidirectional overrides written as
visible escapes [3].

References
----------
.. [1] OWASP Foundation, "CSV Injection",
   https://owasp.org/www-community/attacks/CSV_Injection (accessed 2026).
.. [2] IEEE Std 1003.1-2017 (POSIX), ``open()`` with ``O_CREAT | O_EXCL``;
   Linux ``open(2)``, ``O_NOFOLLOW``.
.. [3] ECMA-48, *Control Functions for Coded Character Sets*, 5th ed. (1991);
   Unicode Standard Annex #9, *Unicode Bidirectional Algorithm* (explicit
   formatting characters U+061C, U+200E/F, U+202A-U+202E, U+2066-U+2069).

Examples
--------
>>> neutralised_cell("@SUM(A1)"), restored_cell("'@SUM(A1)")
("'@SUM(A1)", '@SUM(A1)')
"""

from __future__ import annotations

import errno
import json
import os
import re
from pathlib import Path

from ..errors import OptionError

#: Characters that make a spreadsheet read a cell as a formula (OWASP).
FORMULA_PREFIXES = ("=", "+", "-", "@", "\t", "\r")
#: Characters never shown raw: C0 controls, DEL, C1 controls, bidirectional formatting characters.
CONTROL_CHARACTERS = re.compile("[\x00-\x1f\x7f-\x9f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]")
# A cell separator (comma; semicolon in some locales) that would start a cell like a formula.
_RISKY_SPLIT = re.compile(r"[,;](?=[ ]*[=+\-@\t\r])")


def neutralised_cell(value):
    """A CSV cell value that no spreadsheet evaluates (OWASP CSV-injection guidance).

    Text starting with one of :data:`FORMULA_PREFIXES` gets a leading ``'``;
    numbers and other text are returned unchanged.

    Examples
    --------
    >>> neutralised_cell("=HYPERLINK(1)"), neutralised_cell("-x"), neutralised_cell(-1.5), neutralised_cell("Si")
    ("'=HYPERLINK(1)", "'-x", -1.5, 'Si')
    """
    if isinstance(value, str) and value.startswith(FORMULA_PREFIXES):
        return "'" + value
    return value


def inert_text(text) -> str:
    r"""``text`` with every control character and bidirectional override written as a visible escape.

    An ANSI escape sequence in a dataset name can no longer move the cursor,
    recolour or clear a terminal, and a right-to-left override can no longer
    reverse what follows it (ECMA-48; Unicode UAX #9).

    Examples
    --------
    >>> inert_text("a\x1b[2Jb\u202ecba")
    'a\\x1b[2Jb\\u202ecba'
    """
    def escaped(match):
        code = ord(match.group())
        return f"\\x{code:02x}" if code < 0x100 else f"\\u{code:04x}"
    return CONTROL_CHARACTERS.sub(escaped, str(text))


def restored_cell(value):
    """Inverse of :func:`neutralised_cell` for cells read back."""
    if isinstance(value, str) and value.startswith("'") and value[1:].startswith(FORMULA_PREFIXES):
        return value[1:]
    return value


def inert_json(value) -> str:
    """JSON text of ``value`` whose strings hold no ``,``/``;`` before a formula character (escaped).

    Structural commas remain, always followed by a blank and a JSON token, so
    no spreadsheet cell split off at them starts with a formula character.
    """
    if isinstance(value, str):
        return _RISKY_SPLIT.sub(lambda m: f"\\u{ord(m.group()):04x}", json.dumps(value, ensure_ascii=False))
    if isinstance(value, dict):
        return "{" + ", ".join(f"{inert_json(str(k))}: {inert_json(v)}" for k, v in value.items()) + "}"
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(inert_json(v) for v in value) + "]"
    return json.dumps(value, ensure_ascii=False)


def append_inert(sheet, values):
    """Append a row; text is stored as text cells, never as formulas."""
    from openpyxl.cell.cell import ILLEGAL_CHARACTERS_RE

    sheet.append([ILLEGAL_CHARACTERS_RE.sub("\ufffd", v) if isinstance(v, str) else v for v in values])
    for cell, value in zip(sheet[sheet.max_row], values):
        if isinstance(value, str):
            cell.data_type = "s"


def write_file(path, content: bytes, overwrite: bool = False) -> Path:
    """Write bytes to a file, never through a symbolic link.

    Without ``overwrite`` the file must not exist (exclusive create); with it
    an existing regular file is replaced, but a symbolic link in its place is
    refused (``O_NOFOLLOW``), so nothing outside the intended folder is
    written.

    Raises
    ------
    OptionError
        Existing file without ``overwrite``, a symbolic link, or a path that
        cannot be written.
    """
    target = Path(path)
    flags = os.O_WRONLY | os.O_CREAT | getattr(os, "O_NOFOLLOW", 0) | getattr(os, "O_BINARY", 0)
    flags |= os.O_TRUNC if overwrite else os.O_EXCL
    if target.is_symlink():
        raise OptionError(f"{target} is a symbolic link; not written through it "
                          "(remove the link or choose another name)")
    try:
        fd = os.open(target, flags, 0o666)
        with os.fdopen(fd, "wb") as handle:
            handle.write(content)
    except FileExistsError:
        raise OptionError(
            f"refusing to overwrite existing file {target}; choose another name "
            "or allow overwriting") from None
    except OSError as exc:
        if exc.errno == errno.ELOOP:
            raise OptionError(f"{target} is a symbolic link; not written through it") from None
        raise OptionError(f"cannot write {target}: {exc.strerror or exc}") from None
    return target


def replace_file(path, content: bytes, overwrite: bool = False) -> Path:
    """Write bytes to ``path`` whole or not at all, never through a symbolic link.

    The bytes go to a fresh temporary file created exclusively (``O_EXCL``, a
    random name) in the target's folder, which is then renamed onto ``path``;
    on any error the temporary file is removed.  A name planted beside the
    target (``path.part`` as a symbolic link) is never opened.  Without
    ``overwrite`` an existing ``path`` (or a symbolic link there) is refused.

    Raises
    ------
    OptionError
        Existing file without ``overwrite``, or a folder that cannot be written.
    """
    import tempfile

    target = Path(path)
    if not overwrite and (target.exists() or target.is_symlink()):
        raise OptionError(f"refusing to overwrite existing file {target}; use --force to replace it")
    try:
        fd, temporary = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=target.parent)
    except OSError as exc:
        raise OptionError(f"cannot write {target}: {exc.strerror or exc}") from None
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(content)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(temporary, target)           # renames onto a link, never writes through it
    except BaseException as exc:
        try:
            os.unlink(temporary)
        except OSError:
            pass
        if isinstance(exc, OSError):
            raise OptionError(f"cannot write {target}: {exc.strerror or exc}") from None
        raise
    return target
