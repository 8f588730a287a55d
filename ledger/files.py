"""Every file wbledger writes: private modes, atomic replacement, no writing through links.

Outputs the user names (``--pdf``, ``--svg``, ``--csv``, ``-o``) are checked up front with
:func:`check_output_path`, before anything is computed or saved, so that a typing mistake in a
folder name costs nothing and leaves the database as it was. They are then written by
:func:`write_output` (or :func:`replacing`, for a writer that wants a file object): into a new
temporary file in the target's folder, flushed to disk, and renamed over the target in one
step. A kill or a full disk halfway leaves the previous file whole and no temporary file behind,
and a reader never sees half a loading sheet.

Files and folders wbledger creates are private to the user whatever the umask: files 0600
(:data:`FILE_MODE`), folders 0700 (:data:`FOLDER_MODE`). A loading sheet, a ledger export or the
database holds names, masses and where a vehicle flies; nobody else on the machine needs to read
them. A file or folder that already exists keeps the mode its owner gave it, except an output
that is replaced, which is a new file.

A target that is a symbolic link, or exists and is not a regular file (a named pipe, a device, a
socket), is refused with one line naming the option and the path: writing through a link would
put the sheet wherever the link points, perhaps over another file.
"""

from __future__ import annotations

import contextlib
import os
import secrets
import stat
from collections.abc import Iterator
from pathlib import Path
from typing import BinaryIO

from ledger.errors import InputError

__all__ = [
    "FILE_MODE",
    "FOLDER_MODE",
    "check_output_path",
    "create_private_file",
    "make_private_folder",
    "output_error",
    "replacing",
    "write_new",
    "write_output",
]

FILE_MODE = 0o600
FOLDER_MODE = 0o700

_O_NOFOLLOW = getattr(os, "O_NOFOLLOW", 0)
_O_BINARY = getattr(os, "O_BINARY", 0)
_SPECIAL = ((stat.S_ISFIFO, "a named pipe (FIFO)"), (stat.S_ISCHR, "a character device"),
            (stat.S_ISBLK, "a block device"), (stat.S_ISSOCK, "a socket"))


def _refuse_target(p: Path, field: str) -> None:
    """Refuse a target that is a link, a folder, a special file, or a file that may not be
    written. Nothing there is fine: the folder's own problems are for the caller or the write."""
    try:
        st = p.lstat()
    except OSError:  # nothing there, or a parent that is not a folder: the write will say so
        return
    text = str(p)
    if stat.S_ISLNK(st.st_mode):
        raise InputError(field, text, "a file name, not a symbolic link",
                         hint="wbledger does not write through links; name the file itself")
    if stat.S_ISDIR(st.st_mode):
        raise InputError(field, text, "a file name, not a folder")
    for test, what in _SPECIAL:
        if test(st.st_mode):
            raise InputError(field, text, f"a regular file or a new file name, not {what}")
    # The file is replaced, not written in place, so only its folder needs to be writable; a
    # file its owner made read-only is still respected.
    if not os.access(p, os.W_OK):
        raise InputError(field, text, "a file that can be written (permission denied)")


def check_output_path(path: str | os.PathLike, field: str) -> Path:
    """Refuse an output path that cannot or must not be written.

    Parameters
    ----------
    path : str or os.PathLike
        The file to be written (it may exist; it is replaced by a new file).
    field : str
        The option that named it, e.g. ``"--pdf"``.

    Returns
    -------
    pathlib.Path
        ``path``.

    Raises
    ------
    InputError
        The path is a symbolic link (to anything, or dangling), a folder, or another kind of
        file that is not a regular one (named pipe, device, socket); its folder does not exist
        or is not a folder; or it (or its folder) may not be written.

    Examples
    --------
    >>> check_output_path("/no/such/folder/sheet.pdf", "--pdf")
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --pdf = '/no/such/folder/sheet.pdf': a file in an existing folder; '/no/such/folder' does not exist
    """
    p = Path(path)
    text = str(p)
    _refuse_target(p, field)
    parent = p.parent if str(p.parent) else Path(".")
    if not parent.exists():
        raise InputError(field, text, f"a file in an existing folder; {str(parent)!r} does "
                         "not exist")
    if not parent.is_dir():
        raise InputError(field, text, f"a file in a folder; {str(parent)!r} is not a folder")
    if not os.access(parent, os.W_OK):
        raise InputError(field, text, "a file that can be written (permission denied)")
    return p


def output_error(path: str | os.PathLike, field: str, exc: OSError) -> InputError:
    """The :class:`InputError` for ``exc``, raised while writing ``path`` given by ``field``."""
    reason = exc.strerror or exc.__class__.__name__
    return InputError(field, str(path), f"a file that can be written ({reason})")


def _private_opener(path: str, flags: int) -> int:
    """``open(..., opener=)`` that creates the file 0600 and makes sure of it.

    ``os.open``'s mode is filtered by the umask; a new file is ours, so ``fchmod`` sets the
    exact mode (a umask of 0o277 would otherwise leave it read-only)."""
    fd = os.open(path, flags | _O_NOFOLLOW, FILE_MODE)
    if hasattr(os, "fchmod"):  # POSIX; elsewhere the mode bits mean little
        try:
            os.fchmod(fd, FILE_MODE)
        except BaseException:
            os.close(fd)
            raise
    return fd


def _fsync_folder(folder: Path) -> None:
    """Make a rename in ``folder`` durable; some file systems cannot open a folder for this."""
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


@contextlib.contextmanager
def replacing(path: str | os.PathLike, field: str) -> Iterator[BinaryIO]:
    """Write a new version of ``path`` in one step: a context manager yielding a binary file.

    The file is a new temporary file beside ``path`` (same folder, so the rename cannot cross
    file systems), created with O_CREAT|O_EXCL and mode 0600. On a clean exit it is flushed,
    ``fsync``-ed and renamed over ``path`` with :func:`os.replace`; on any error (the body's
    too) it is removed and ``path`` is left as it was. Its ``name`` is the temporary path, for
    a writer that must open the file itself (SQLite's backup).

    Raises
    ------
    InputError
        ``path`` is a symbolic link, a folder, not a regular file or not writable (as in
        :func:`check_output_path`), or an ``OSError`` happened while writing (the message
        names ``field`` and ``path``).

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as folder:
    ...     target = Path(folder) / "out.txt"
    ...     with replacing(target, "-o") as fh:
    ...         _ = fh.write(b"new")
    ...     print(target.read_bytes(), oct(target.stat().st_mode & 0o777))
    b'new' 0o600
    """
    target = Path(path)
    _refuse_target(target, field)
    folder = target.parent if str(target.parent) else Path(".")
    tmp = folder / f".{target.name}.{secrets.token_hex(6)}.tmp"
    try:
        fh = open(tmp, "xb", opener=_private_opener)  # noqa: SIM115 - closed below
    except OSError as exc:
        raise output_error(target, field, exc) from None
    try:
        with fh:
            yield fh  # type: ignore[misc]
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, target)
    except BaseException as exc:
        with contextlib.suppress(OSError):
            os.unlink(tmp)
        if isinstance(exc, OSError):
            raise output_error(target, field, exc) from None
        raise
    _fsync_folder(folder)


def write_output(path: str | os.PathLike, data: bytes | str, field: str) -> Path:
    """Write ``data`` (``str`` as UTF-8) to ``path`` through :func:`replacing`.

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as folder:
    ...     print(write_output(Path(folder) / "out.csv", "a,b", "-o").read_text("utf-8"))
    a,b
    """
    payload = data.encode("utf-8") if isinstance(data, str) else data
    with replacing(path, field) as fh:
        fh.write(payload)
    return Path(path)


def write_new(path: str | os.PathLike, data: bytes, field: str) -> Path:
    """Write ``data`` to a *new* file ``path`` with mode 0600; an existing file (or link) is
    never replaced (keys). An ``OSError`` becomes an :class:`InputError` naming ``field``."""
    p = Path(path)
    try:
        fd = _private_opener(os.fspath(p), os.O_WRONLY | os.O_CREAT | os.O_EXCL | _O_BINARY)
    except FileExistsError:
        raise InputError(field, str(p), "a new file; it exists already and is never "
                         "overwritten") from None
    except OSError as exc:
        raise output_error(p, field, exc) from None
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
    except BaseException:
        p.unlink(missing_ok=True)
        raise
    return p


def create_private_file(path: str | os.PathLike) -> bool:
    """Create ``path`` empty with mode 0600 if nothing is there; ``True`` if it was created.

    An existing file, or anything else already at ``path``, is left alone, mode and all. An
    ``OSError`` (a missing or read-only folder) propagates.
    """
    try:
        fd = _private_opener(os.fspath(path), os.O_WRONLY | os.O_CREAT | os.O_EXCL | _O_BINARY)
    except FileExistsError:
        return False
    os.close(fd)
    return True


def make_private_folder(path: str | os.PathLike) -> Path:
    """Create ``path`` and any missing parents with mode 0700; existing ones are left alone.

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as folder:
    ...     made = make_private_folder(Path(folder) / "a" / "b")
    ...     print(oct(made.stat().st_mode & 0o777), oct(made.parent.stat().st_mode & 0o777))
    0o700 0o700
    """
    p = Path(path)
    missing = []
    walk = p
    while not walk.exists() and walk != walk.parent:
        missing.append(walk)
        walk = walk.parent
    for folder in reversed(missing):
        try:
            os.mkdir(folder, FOLDER_MODE)
        except FileExistsError:  # made meanwhile by someone else: theirs, keep its mode
            continue
        os.chmod(folder, FOLDER_MODE)  # the umask filtered mkdir's mode; this folder is ours
    if not p.is_dir():
        raise NotADirectoryError(f"not a folder: {p}")
    return p
