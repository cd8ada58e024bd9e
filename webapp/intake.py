"""What enters a workspace is checked first: uploaded files (decoded, size-limited, loaded) and option changes."""

from __future__ import annotations

import base64
import binascii
import hashlib

from thermo.errors import ModeheatError, OptionError
from thermo.formula import formula_unit
from thermo.preparation.loading import load_dos
from thermo.preparation.options import FIELDS, ReadingOptions

from . import budget, cache, session
from .reporting import attempt, one_line

#: Default per-file upload limit [MB].
DEFAULT_MAX_UPLOAD_MB = 20.0
#: Files at the full upload limit one request may carry: a callback request
#: holds the tab's whole workspace (every dataset's content) besides new files.
REQUEST_FILES = 4
#: Room for the rest of a callback request (ids, options, figures) [bytes].
REQUEST_OVERHEAD_BYTES = 2_000_000


def request_limit(max_upload_bytes: int) -> int:
    """Largest request body [bytes] the server reads, from the per-file upload limit [bytes].

    Base64 turns 3 bytes into 4 characters, so a request may carry
    :data:`REQUEST_FILES` files at the limit plus :data:`REQUEST_OVERHEAD_BYTES`.
    """
    return int(REQUEST_FILES * 4 * -(-int(max_upload_bytes) // 3) + REQUEST_OVERHEAD_BYTES)


class UploadRefused(ModeheatError):
    """An upload that never reached :mod:`thermo` (size limit, bad encoding)."""


def upload_limit() -> int:
    """Per-file upload limit [bytes] of the running server (its settings, never the browser's)."""
    return int(budget.setting("MODEHEAT_MAX_UPLOAD_BYTES"))


def decoded_size(contents) -> int:
    """Bytes [bytes] a base64 data URL decodes to, from its length alone."""
    data = str(contents or "").partition(",")[2]
    return len(data) * 3 // 4 - data[-2:].count("=")


def decode_upload(contents: str, name: str, max_bytes: int | None = None) -> bytes:
    """Bytes of a ``dcc.Upload`` data URL (``data:<type>;base64,<data>``).

    The decoded size is checked from the length of the base64 text before
    anything is decoded, against ``max_bytes`` [bytes] when given and always
    against the server's upload limit (:func:`upload_limit`).
    """
    head, sep, data = str(contents or "").partition(",")
    if not sep or ";base64" not in head:
        raise UploadRefused(f"{name}: the upload did not arrive as a base64 data URL")
    limit = upload_limit()
    max_bytes = limit if max_bytes is None else min(int(max_bytes), limit)
    size = len(data) * 3 // 4 - data[-2:].count("=")
    if size > max_bytes:
        raise UploadRefused(f"{name}: the file is {size / 1e6:.1f} MB; "
                            f"the upload limit is {max_bytes / 1e6:g} MB")
    try:
        return base64.b64decode(data, validate=True)
    except binascii.Error:
        raise UploadRefused(f"{name}: the upload is not valid base64") from None


#: Words of a refusal -> the reading option that fixes it (shown after the message).
_FIXES = (
    ("frequency unit is not stated", "choose the Frequency unit under Reading options"),
    ("give the number of atoms", "type the Atoms per formula unit under Reading options"),
    ("policy is to refuse", "choose another Imaginary modes option"),
    ("sheet", "type the Sheet under Reading options"),
)


def fix_hint(message: str) -> str:
    """The reading option that would fix a refused file, or ``""``.

    Examples
    --------
    >>> fix_hint("a.dat: the frequency unit is not stated in the file")
    'choose the Frequency unit under Reading options'
    """
    return next((fix for words, fix in _FIXES if words in str(message)), "")


def _checked_dataset(workspace, contents, name, max_bytes, options=None):
    """A new dataset of an upload, read with the page's options carried as a fallback.

    What the file states itself (its unit, the atom count of its integral)
    wins over the carried options, which may have been set for another file
    (:func:`thermo.load_dos` ``fallback``); the dataset keeps only the options
    that were used for it, so a re-read gives the same spectrum.
    """
    with budget.holding(decoded_size(contents), name):
        return _read_upload(workspace, contents, name, max_bytes, options)


def _read_upload(workspace, contents, name, max_bytes, options):
    raw = decode_upload(contents, name, max_bytes)
    if len(raw) > max_bytes:
        raise UploadRefused(f"{name}: the file is {len(raw) / 1e6:.1f} MB; "
                            f"the upload limit is {max_bytes / 1e6:g} MB")
    sha = hashlib.sha256(raw).hexdigest()
    same = next((d for d in workspace.get("datasets", []) if d.get("sha256") == sha), None)
    if same is not None:      # the same bytes again: the dataset there is selected, never a copy "name (2)"
        return same, [f"{name} is already loaded as {same['name']}; selected it"]
    name = session.unique_name(workspace, name)
    carried = ReadingOptions.from_mapping(
        {k: v for k, v in {**session.DEFAULT_OPTIONS, **(options or {})}.items() if k in FIELDS})
    dos = load_dos(raw, name=name, fallback=carried)
    own = carried.replaced(freq_unit=None if dos.source.get("stated_unit") else dos.source["freq_unit"],
                           atoms=None if dos.source.get("atoms_inferred") else dos.atoms)
    dataset = session.new_dataset(name, raw, own.as_dict())
    cache.load(dataset, loaded=dos)
    notes = []
    if carried.freq_unit and dos.source.get("stated_unit") not in (None, carried.freq_unit):
        notes.append(f"{name}: read in {dos.source['stated_unit']}, the unit its header states (the chosen "
                     f"{carried.freq_unit} applies to files that state none)")
    return dataset, notes


def add_uploads(workspace, contents_list, names, max_bytes, options=None, refused=None):
    """Add uploaded files that load; report the others.

    Each file is checked with :func:`thermo.load_dos` under ``options`` (the
    page's reading options; default options when None) before it enters the
    workspace, so a bad file never replaces the active dataset.  The last
    good file becomes active.  A file that arrived but that :mod:`thermo`
    refused is appended to ``refused`` (``{"name", "contents"}``) when a list
    is given, so that it can be read again with other options; its message
    names the option that would fix it.

    Returns
    -------
    workspace : dict
        A new workspace (the input is not modified).
    messages : list of (str, str)
        ``("error" | "info", one-line text)`` for each file.
    """
    ws = {"datasets": list((workspace or {}).get("datasets", [])),
          "active": (workspace or {}).get("active")}
    messages = []
    for contents, name in zip(contents_list or [], names or []):
        result, error = attempt(_checked_dataset, ws, contents, name, max_bytes, options)
        if error:
            hint = fix_hint(error)
            if refused is not None and not error.startswith(f"{name}: the upload") and "upload limit" not in error:
                refused.append({"name": name, "contents": contents})
                hint = (hint + ", then press Read again") if hint else ""
            messages.append(("error", error + (f" — {hint}" if hint else "")))
            continue
        dataset, notes = result
        if session.find(ws, dataset["id"]) is not None:
            ws = session.activated(ws, dataset["id"])
        else:
            ws = session.with_dataset(ws, dataset)
            notes = [f"loaded {dataset['name']}"] + notes
        messages += [("info", note) for note in notes]
    return ws, messages


def with_options(workspace, dataset_id, options):
    """Workspace with new load options for one dataset, if they load.

    Returns ``(workspace, error)``; on error the workspace is unchanged.
    """
    old = session.find(workspace, dataset_id)
    if old is None:
        return workspace, "no dataset is selected"
    candidate = {**old, "options": {**session.options_of(old), **options}}
    try:
        cache.load(candidate)
        if candidate["options"].get("formula"):
            formula_unit(candidate["options"]["formula"])
    except ModeheatError as exc:  # keep the previous options
        return workspace, one_line(exc)
    return session.replaced(workspace, candidate), None


def electronic_options(fields):
    """Keyword arguments of :func:`thermo.electronic.load_electronic_dos` from the Electronic page's fields
    as typed (``unit``, ``fermi``, ``spin``, ``formula_units``; blanks and defaults: not given).

    Examples
    --------
    >>> electronic_options({"unit": "file", "fermi": " 5.2 ", "spin": "auto", "formula_units": 2})
    {'energy_unit': None, 'fermi_energy_ev': 5.2, 'spin': None, 'formula_units': 2.0}
    """
    fields = fields or {}
    text = str(fields.get("fermi") or "").strip()
    try:
        fermi = float(text) if text else None
    except ValueError:
        raise OptionError(f"the Fermi energy {text!r} is not a number of eV") from None
    unit, spin, count = fields.get("unit"), fields.get("spin"), fields.get("formula_units")
    return {"energy_unit": None if unit in (None, "file") else unit, "fermi_energy_ev": fermi,
            "spin": None if spin in (None, "auto") else spin,
            "formula_units": None if count in (None, "") else float(count)}


def electronic_dos(stored, max_bytes=None):
    """The :class:`thermo.electronic.ElectronicDOS` of the ``mh-electronic`` store entry (name, data URL,
    the reading fields), cached by content and options; the Electronic and Calorimetry pages share it.

    Raises the :mod:`thermo` errors of :func:`thermo.electronic.load_electronic_dos` (and a refused upload).
    """
    from thermo.electronic import load_electronic_dos

    options = electronic_options(stored.get("fields"))
    with budget.holding(decoded_size(stored["contents"]), stored["name"]):
        raw = decode_upload(stored["contents"], stored["name"], max_bytes)
        key = ("electronic", hashlib.sha256(raw).hexdigest(), stored["name"], tuple(sorted(options.items())))
        return cache.result(key, lambda: load_electronic_dos(raw, name=stored["name"], **options))
