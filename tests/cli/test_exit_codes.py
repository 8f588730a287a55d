"""Exit codes mean one thing each, are documented in ``wbledger --help``, and a reader that
closes the pipe early ends the command quietly (issue 13 item 8).

The codes live in one place, :class:`ledger.errors.ExitCode`; ``ledger.cli.common.translate``
is the one place an exception becomes a code. 70 is ``EX_SOFTWARE`` of the BSD ``sysexits.h``
convention; 130 and 141 are what a shell reports for a program ended by SIGINT and SIGPIPE
(128 + the signal number) (common practice).
"""

from __future__ import annotations

import errno
import os
import subprocess
import sys
from pathlib import Path

import pytest
from typer.testing import CliRunner

from ledger.cli import app
from ledger.errors import EXIT_CODE_HELP, ExitCode
from ledger.files import output_error

REPO = Path(__file__).resolve().parents[2]


def _words(text: str) -> str:
    return " ".join(text.split())


def test_the_codes_are_distinct_and_each_is_documented():
    assert len({int(c) for c in ExitCode}) == len(ExitCode)
    for code in ExitCode:
        assert f" {int(code)} " in f" {EXIT_CODE_HELP} ", code


def test_help_shows_the_exit_codes():
    res = CliRunner().invoke(app, ["--help"])
    assert res.exit_code == 0
    assert _words(EXIT_CODE_HELP) in _words(res.stdout)


@pytest.fixture
def broken_service(monkeypatch, tmp_path):
    """``type list`` on a fresh database, with the service it calls replaced by ``raise``."""
    import ledger.services.types as types_service

    monkeypatch.setenv("WBLEDGER_DB", f"sqlite:///{tmp_path / 'l.sqlite3'}")
    monkeypatch.delenv("WBLEDGER_DEBUG", raising=False)
    assert CliRunner().invoke(app, ["init"]).exit_code == 0

    def use(exc: BaseException) -> None:
        def list_types(*_args, **_kwargs):
            raise exc

        monkeypatch.setattr(types_service, "list_types", list_types)

    return use


def test_an_internal_error_is_one_line_with_code_70(broken_service):
    broken_service(RuntimeError("something unforeseen\nsecond line"))
    res = CliRunner().invoke(app, ["type", "list"], catch_exceptions=False)
    assert (res.exit_code, res.stdout) == (ExitCode.INTERNAL, "")
    assert res.stderr == ("Error: internal error (RuntimeError: something unforeseen). This is a "
                          "bug in wbledger: please report it with the command you ran and the "
                          "traceback that WBLEDGER_DEBUG=1 shows\n")


def test_wbledger_debug_shows_the_traceback(broken_service, monkeypatch):
    broken_service(RuntimeError("something unforeseen"))
    monkeypatch.setenv("WBLEDGER_DEBUG", "1")
    with pytest.raises(RuntimeError, match="something unforeseen"):
        CliRunner().invoke(app, ["type", "list"], catch_exceptions=False)


def test_an_interrupt_is_one_line_with_code_130(broken_service):
    broken_service(KeyboardInterrupt())
    res = CliRunner().invoke(app, ["type", "list"], catch_exceptions=False)
    assert (res.exit_code, res.stderr) == (
        ExitCode.INTERRUPTED, "Error: interrupted; an unfinished transaction was rolled back\n")


def _closed_pipe_run(tmp_path, *args: str) -> tuple[int, str]:
    """Run ``wbledger ARGS`` with stdout a pipe whose reader has already gone (``| head``
    after its line: closing first makes the case the same every run)."""
    read, write = os.pipe()
    os.close(read)
    env = {**os.environ, "PYTHONPATH": str(REPO), "WBLEDGER_DB": f"sqlite:///{tmp_path}/l.db"}
    env.pop("WBLEDGER_DEBUG", None)
    try:
        proc = subprocess.run([sys.executable, "-m", "ledger", *args], stdout=write,
                              stderr=subprocess.PIPE, text=True, env=env, timeout=120)
    finally:
        os.close(write)
    return proc.returncode, proc.stderr


@pytest.mark.parametrize("args", [["--help"], ["type", "list"], ["type", "list", "--json"]],
                         ids=" ".join)
def test_a_closed_pipe_ends_quietly(tmp_path, args):
    """Was exit 1 (rich's and typer's own handling: the code of "out of limits") or an
    "Exception ignored … BrokenPipeError" message; now nothing on stderr and 141, never 0."""
    code, err = _closed_pipe_run(tmp_path, "init")
    assert (code, err) == (ExitCode.PIPE_CLOSED, "")  # init prints a line too
    assert _closed_pipe_run(tmp_path, *args) == (ExitCode.PIPE_CLOSED, "")


@pytest.mark.parametrize("number, code", [
    (errno.ENOSPC, ExitCode.ENVIRONMENT), (errno.EACCES, ExitCode.ENVIRONMENT),
    (errno.EROFS, ExitCode.ENVIRONMENT), (errno.ENOENT, ExitCode.BAD_INPUT),
    (errno.EISDIR, ExitCode.BAD_INPUT)])
def test_a_file_that_cannot_be_written_is_the_environment_unless_the_name_is_wrong(number,
                                                                                   code):
    """Issue 13 item 8: a full disk, a read-only file system or a refused permission is exit 4
    (they were exit 2, as if the user had typed something wrong); a missing folder stays 2.
    (Tests run as root, for whom file modes do not count, so the errors are made here.)"""
    exc = OSError(number, os.strerror(number))
    err = output_error("/out/sheet.pdf", "--pdf", exc)
    assert err.exit_code == code
    assert str(err) == f"--pdf = '/out/sheet.pdf': a file that can be written " \
                       f"({os.strerror(number)})"
