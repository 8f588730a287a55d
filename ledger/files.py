"""Files the user names for output (``--pdf``, ``--svg``, ``--csv``, ``-o``): checked up front.

A command that writes a file is asked to check the path with :func:`check_output_path` before
it computes or saves anything, so that a typing mistake in a folder name costs nothing and
leaves the database as it was. :func:`write_output_text` and :func:`output_error` turn an
``OSError`` that still happens while writing into an :class:`~ledger.errors.InputError` naming
the option and the path.
"""

from __future__ import annotations

import os
from pathlib import Path

from ledger.errors import InputError

__all__ = ["check_output_path", "output_error", "write_output_text"]


def check_output_path(path: str | os.PathLike, field: str) -> Path:
    """Refuse an output path that cannot be written: a folder, or in a folder that is missing.

    Parameters
    ----------
    path : str or os.PathLike
        The file to be written (it may exist; it is replaced).
    field : str
        The option that named it, e.g. ``"--pdf"``.

    Returns
    -------
    pathlib.Path
        ``path``.

    Raises
    ------
    InputError
        The path is a folder, its folder does not exist or is not a folder, or it may not be
        written.

    Examples
    --------
    >>> check_output_path("/no/such/folder/sheet.pdf", "--pdf")
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --pdf = '/no/such/folder/sheet.pdf': a file in an existing folder; '/no/such/folder' does not exist
    """
    p = Path(path)
    text = str(p)
    if p.is_dir():
        raise InputError(field, text, "a file name, not a folder")
    parent = p.parent if str(p.parent) else Path(".")
    if not parent.exists():
        raise InputError(field, text, f"a file in an existing folder; {str(parent)!r} does "
                         "not exist")
    if not parent.is_dir():
        raise InputError(field, text, f"a file in a folder; {str(parent)!r} is not a folder")
    if not os.access(parent, os.W_OK) or (p.exists() and not os.access(p, os.W_OK)):
        raise InputError(field, text, "a file that can be written (permission denied)")
    return p


def output_error(path: str | os.PathLike, field: str, exc: OSError) -> InputError:
    """The :class:`InputError` for ``exc``, raised while writing ``path`` given by ``field``."""
    reason = exc.strerror or exc.__class__.__name__
    return InputError(field, str(path), f"a file that can be written ({reason})")


def write_output_text(path: str | os.PathLike, text: str, field: str) -> Path:
    """Write ``text`` (UTF-8) to ``path``; an ``OSError`` becomes an :class:`InputError`."""
    p = Path(path)
    try:
        p.write_text(text, encoding="utf-8")
    except OSError as exc:
        raise output_error(p, field, exc) from None
    return p
