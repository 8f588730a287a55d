"""ledger.files.read_input_text: a regular file of bounded size, UTF-8, refused in one line."""

from __future__ import annotations

import os
import socket

import pytest

from ledger.errors import InputError, PlanError
from ledger.files import HISTORY_LIMIT, INPUT_LIMIT, SIZE_CAP, parse_size, read_input_text

KiB, MiB = 1024, 1024 * 1024


def read(path, **kw):
    kw.setdefault("field", "plan file")
    kw.setdefault("what", "a plan file (TOML)")
    return read_input_text(path, **kw)


def refused(path, **kw) -> str:
    with pytest.raises(InputError) as info:
        read(path, **kw)
    assert "\n" not in str(info.value)
    return str(info.value)


def test_stated_limits():
    # The README states these; import-history of 100,000 entries (bench/bench_ledger.py) is
    # about 27 MiB as CSV and 65 MiB as JSON, well inside the history limit.
    assert (INPUT_LIMIT, HISTORY_LIMIT, SIZE_CAP) == (MiB, 256 * MiB, 4 * 1024 * MiB)


def test_a_file_of_exactly_the_limit_is_read_one_byte_more_is_not(tmp_path):
    f = tmp_path / "p.toml"
    f.write_bytes(b"a" * 100)
    assert read(f, limit=100) == "a" * 100
    f.write_bytes(b"a" * 101)
    assert refused(f, limit=100) == (
        f"plan file = '{f}': a plan file (TOML) of at most 100 bytes; this one has 101 bytes. "
        "Give --max-size to raise the limit (e.g. --max-size 1KiB)")
    f.write_bytes(b"a" * (3 * MiB + 1))
    assert refused(f, option=None).endswith("of at most 1 MiB; this one has 3,145,729 bytes")


@pytest.mark.parametrize("path, kind", [("/dev/zero", "character device"),
                                        ("/dev/null", "character device")])
def test_devices_are_refused_before_reading(path, kind):
    if not os.path.exists(path):
        pytest.skip(f"no {path} here")
    assert refused(path) == f"plan file = '{path}': a regular file, not a {kind}"


def test_a_fifo_is_refused_without_waiting_for_a_writer(tmp_path):
    fifo = tmp_path / "plan.toml"
    os.mkfifo(fifo)
    assert refused(fifo) == f"plan file = '{fifo}': a regular file, not a FIFO (named pipe)"


def test_a_socket_is_refused(tmp_path):
    path = tmp_path / "s"
    with socket.socket(socket.AF_UNIX) as s:
        s.bind(str(path))
        assert refused(path) == f"plan file = '{path}': a regular file, not a socket"


def test_folder_missing_unreadable_and_not_utf8(tmp_path):
    assert refused(tmp_path) == f"plan file = '{tmp_path}': a plan file (TOML), not a folder"
    assert refused(tmp_path / "none") == f"plan file = '{tmp_path / 'none'}': no such file"
    bad = tmp_path / "bad.toml"
    bad.write_bytes(b"ok\n\xff")
    assert refused(bad) == (f"plan file = '{bad}': not UTF-8 text (byte 3); save the file as "
                            "UTF-8")
    if os.geteuid() != 0:  # root reads any file
        locked = tmp_path / "locked.toml"
        locked.write_text("x")
        locked.chmod(0)
        assert refused(locked) == (f"plan file = '{locked}': a file that can be read "
                                   "(Permission denied)")


def test_the_error_class_and_line_ends(tmp_path):
    f = tmp_path / "p.toml"
    with pytest.raises(PlanError):
        read(f, error=PlanError)
    f.write_bytes(b"a\r\nb\rc\n")
    assert read(f) == "a\nb\nc\n"  # as Python's text files read them


def test_a_symlink_to_a_regular_file_is_read(tmp_path):
    target = tmp_path / "t.toml"
    target.write_text("x = 1\n")
    link = tmp_path / "l.toml"
    link.symlink_to(target)
    assert read(link) == "x = 1\n"


@pytest.mark.parametrize("text, size", [("1", 1), ("4096", 4096), ("2MiB", 2 * MiB),
                                        (" 300 KiB ", 300 * KiB), ("4GiB", 4 * 1024 * MiB),
                                        ("10 B", 10)])
def test_parse_size(text, size):
    assert parse_size(text) == size


@pytest.mark.parametrize("text, allowed", [
    ("2 MB", "a size in bytes, KiB, MiB or GiB, e.g. 2MiB"),
    ("-1", "a size in bytes, KiB, MiB or GiB, e.g. 2MiB"),
    ("1.5MiB", "a size in bytes, KiB, MiB or GiB, e.g. 2MiB"),
    ("0", "a size from 1 byte to 4 GiB"),
    ("4097MiB", "a size from 1 byte to 4 GiB"),
    ("9" * 40, "a size from 1 byte to 4 GiB"),
])
def test_parse_size_refuses(text, allowed):
    with pytest.raises(InputError) as info:
        parse_size(text)
    assert str(info.value) == f"--max-size = {text!r}: {allowed}"
