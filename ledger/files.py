"""Files the user names: the ones wbledger reads (bounded), and every file it writes.

Input (type files, plans, rule sets, histories) is read by :func:`read_input_text` alone: a
regular file only (a folder, a FIFO or a device such as ``/dev/zero`` is refused before a byte
is read), at most a stated number of bytes (:data:`INPUT_LIMIT`, :data:`HISTORY_LIMIT`; a
command's ``--max-size`` raises it, parsed by :func:`parse_size`), UTF-8 text. Every refusal is
one :class:`~ledger.errors.InputError` naming the option or argument and the path.

Output: private modes, atomic replacement, no writing through links.

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
import errno
import os
import re
import secrets
import stat
from collections.abc import Iterator
from pathlib import Path
from typing import BinaryIO

from ledger.errors import InputError, UnwritableFileError

__all__ = [
    "FILE_MODE",
    "FOLDER_MODE",
    "HISTORY_LIMIT",
    "INPUT_LIMIT",
    "MAX_SIZE_OPTION",
    "SIZE_CAP",
    "check_output_path",
    "format_size",
    "parse_size",
    "read_input_text",
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


# --- reading ------------------------------------------------------------------------------

KiB, MiB, GiB = 1024, 1024**2, 1024**3
#: Largest type file, plan or rule set read unless the command is given ``--max-size``.
INPUT_LIMIT = 1 * MiB
#: Largest history file ``import-history`` reads unless given ``--max-size``: an export of
#: the 100,000 entries of ``bench/bench_ledger.py`` is about 27 MiB as CSV and 65 MiB as JSON.
HISTORY_LIMIT = 256 * MiB
#: The most ``--max-size`` may allow: the whole file is held in memory while it is checked.
SIZE_CAP = 4 * GiB
#: The option that raises the limit, named in the error that refuses a file too large.
MAX_SIZE_OPTION = "--max-size"

_SIZE_RE = re.compile(r"^\s*(\d+)\s*(B|KiB|MiB|GiB)?\s*$")
_SIZE_UNITS = {None: 1, "B": 1, "KiB": KiB, "MiB": MiB, "GiB": GiB}


def format_size(n: int) -> str:
    """A byte count as the README and the messages state limits: ``1 MiB``, ``1,500 bytes``.

    Examples
    --------
    >>> format_size(1048576), format_size(256 * 1024**2), format_size(1536)
    ('1 MiB', '256 MiB', '1,536 bytes')
    """
    for unit, size in (("GiB", GiB), ("MiB", MiB), ("KiB", KiB)):
        if n >= size and n % size == 0:
            return f"{n // size} {unit}"
    return f"{n:,} bytes"


def parse_size(text: str, field: str = MAX_SIZE_OPTION) -> int:
    """A size in bytes from ``text``: a whole number, optionally with B, KiB, MiB or GiB.

    Raises
    ------
    InputError
        Not such a size, or not from 1 byte to :data:`SIZE_CAP`.

    Examples
    --------
    >>> parse_size("2MiB"), parse_size("300 KiB"), parse_size("4096")
    (2097152, 307200, 4096)
    >>> parse_size("2 MB")
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: --max-size = '2 MB': a size in bytes, KiB, MiB or GiB, e.g. 2MiB
    """
    m = _SIZE_RE.match(text)
    if m is None:
        raise InputError(field, text, "a size in bytes, KiB, MiB or GiB, e.g. 2MiB")
    digits, unit = m.groups()
    if len(digits) > 15 or not 1 <= int(digits) * _SIZE_UNITS[unit] <= SIZE_CAP:
        raise InputError(field, text, f"a size from 1 byte to {format_size(SIZE_CAP)}")
    return int(digits) * _SIZE_UNITS[unit]


_KINDS = ((stat.S_ISFIFO, "FIFO (named pipe)"), (stat.S_ISCHR, "character device"),
          (stat.S_ISBLK, "block device"), (stat.S_ISSOCK, "socket"))


def read_input_text(path: str | os.PathLike, *, field: str, what: str, limit: int = INPUT_LIMIT,
                    option: str | None = MAX_SIZE_OPTION,
                    error: type[InputError] = InputError) -> str:
    """The text of a file the user named, read as a regular file of at most ``limit`` bytes.

    The file is opened without blocking (so a FIFO with no writer cannot hang the command) and
    checked to be a regular file before anything is read; then at most ``limit + 1`` bytes are
    read, so that neither a file that grows while it is read nor a device can exhaust memory.
    Line ends are read as Python's text files read them (``\\r\\n`` and ``\\r`` become
    ``\\n``).

    Parameters
    ----------
    path : str or os.PathLike
        The file, as the user gave it (named so in the message).
    field : str
        The option or argument that named it (``"plan file"``, ``"FILE"``, ``"--plan"``).
    what : str
        What it should be, for the messages: ``"a plan file (TOML)"``.
    limit : int
        The largest size accepted, in bytes.
    option : str or None
        The option that raises ``limit`` (named in the refusal of a file too large), or None.
    error : type
        The :class:`InputError` subclass to raise (``PlanError`` for plans, ...).

    Raises
    ------
    InputError (or ``error``)
        No such file; a folder, FIFO, device or socket; a file larger than ``limit``; a file
        that cannot be read; text that is not UTF-8.

    Examples
    --------
    >>> read_input_text("/dev/zero", field="plan file", what="a plan file (TOML)")
    Traceback (most recent call last):
    ...
    ledger.errors.InputError: plan file = '/dev/zero': a regular file, not a character device
    """
    name = os.fspath(path)
    flags = os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_NOCTTY", 0)
    try:
        fd = os.open(name, flags)
    except FileNotFoundError:
        raise error(field, name, "no such file") from None
    except IsADirectoryError:
        raise error(field, name, f"{what}, not a folder") from None
    except OSError as exc:  # permission denied, a name too long, a socket
        kind = _special(name)
        if kind is not None:
            raise error(field, name, f"a regular file, not a {kind}") from None
        raise error(field, name, f"a file that can be read ({exc.strerror})") from None
    try:
        st = os.fstat(fd)
        if stat.S_ISDIR(st.st_mode):
            raise error(field, name, f"{what}, not a folder")
        if not stat.S_ISREG(st.st_mode):
            kind = _kind_of(st.st_mode) or "special file"
            raise error(field, name, f"a regular file, not a {kind}")
        data = b""
        if st.st_size <= limit:
            with os.fdopen(fd, "rb", closefd=False) as fh:
                data = fh.read(limit + 1)
    except OSError as exc:
        raise error(field, name, f"a file that can be read ({exc.strerror})") from None
    finally:
        os.close(fd)
    if st.st_size > limit or len(data) > limit:  # the second: it grew while it was read
        has = f"{st.st_size:,}" if st.st_size > limit else f"more than {limit:,}"
        raise error(field, name, f"{what} of at most {format_size(limit)}; this one has "
                    f"{has} bytes",
                    hint=f"Give {option} to raise the limit (e.g. {option} "
                         f"{_round_up(max(st.st_size, limit + 1))})" if option else None)
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise error(field, name, f"not UTF-8 text (byte {exc.start}); save the file as "
                    "UTF-8") from None
    if "\r" in text:
        text = text.replace("\r\n", "\n").replace("\r", "\n")
    return text


def _kind_of(mode: int) -> str | None:
    """"FIFO (named pipe)", "character device", ... for such a file mode, else None."""
    return next((kind for test, kind in _KINDS if test(mode)), None)


def _special(name: str) -> str | None:
    """What ``name`` is when it is a FIFO, a device or a socket (one that could not be
    opened: a socket cannot)."""
    try:
        return _kind_of(os.stat(name).st_mode)
    except OSError:
        return None


def _round_up(size: int) -> str:
    """``size`` rounded up to whole MiB (whole KiB below 1 MiB), written as ``--max-size``
    takes it, for a hint."""
    unit, name = (MiB, "MiB") if size > MiB else (KiB, "KiB")
    return f"{-(-size // unit)}{name}"


# --- writing ------------------------------------------------------------------------------

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
        raise UnwritableFileError(field, text, "a file that can be written (permission denied)")


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
        raise UnwritableFileError(field, text, "a file that can be written (permission denied)")
    return p


#: ``OSError`` numbers that say the name given is wrong (bad input, exit 2); any other failure
#: to write (permission, read-only file system, full disk) is the environment's (exit 4).
_BAD_NAME_ERRNOS = frozenset({errno.ENOENT, errno.ENOTDIR, errno.EISDIR, errno.ENAMETOOLONG,
                              errno.ELOOP, errno.EEXIST, errno.EINVAL})


def output_error(path: str | os.PathLike, field: str, exc: OSError) -> InputError:
    """The :class:`InputError` for ``exc``, raised while writing ``path`` given by ``field``
    (an :class:`UnwritableFileError` when the name is fine but the file cannot be written)."""
    reason = exc.strerror or exc.__class__.__name__
    cls = InputError if exc.errno in _BAD_NAME_ERRNOS else UnwritableFileError
    return cls(field, str(path), f"a file that can be written ({reason})")


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
