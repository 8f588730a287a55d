"""Files the user names: the ones wbledger reads, and the ones it writes.

Input (type files, plans, rule sets, histories) is read by :func:`read_input_text` alone: a
regular file only (a folder, a FIFO or a device such as ``/dev/zero`` is refused before a byte
is read), at most a stated number of bytes (:data:`INPUT_LIMIT`, :data:`HISTORY_LIMIT`; a
command's ``--max-size`` raises it, parsed by :func:`parse_size`), UTF-8 text. Every refusal is
one :class:`~ledger.errors.InputError` naming the option or argument and the path.

Output (``--pdf``, ``--svg``, ``--csv``, ``-o``) is checked up front: a command that writes a
file is asked to check the path with :func:`check_output_path` before it computes or saves
anything, so that a typing mistake in a folder name costs nothing and leaves the database as it
was. :func:`write_output_text` and :func:`output_error` turn an ``OSError`` that still happens
while writing into an :class:`~ledger.errors.InputError` naming the option and the path.

Both live here because both are the edge between wbledger and the user's file system; this
module imports only :mod:`ledger.errors`, so the type-file parser and the command line can use
it without loading anything heavy.
"""

from __future__ import annotations

import os
import re
import stat
from pathlib import Path

from ledger.errors import InputError

__all__ = [
    "HISTORY_LIMIT",
    "INPUT_LIMIT",
    "MAX_SIZE_OPTION",
    "SIZE_CAP",
    "check_output_path",
    "format_size",
    "output_error",
    "parse_size",
    "read_input_text",
    "write_output_text",
]

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
