"""The Makefile's installs (issue 13 item 20): `make demo` installs the runtime with the
optional compiled kernel and not the test extras; `make test` and `make bench` install the test
extras. Read from `make -n` (nothing is run)."""

from __future__ import annotations

import re
import shutil
import subprocess
import tomllib
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[1]
MAKE = shutil.which("make")


def _installs(target: str, venv: Path) -> list[str]:
    out = subprocess.run([MAKE, "-n", target, f"VENV={venv}"], cwd=REPO, capture_output=True,
                         text=True, check=True).stdout
    return re.findall(r"pip install --quiet -e '(\.[^']*)'", out)


@pytest.mark.skipif(MAKE is None, reason="make is not installed")
def test_demo_installs_the_runtime_and_test_installs_the_test_extras(tmp_path):
    assert _installs("demo", tmp_path / "venv") == [".[fast]"]
    assert _installs("test", tmp_path / "venv") == [".[test]"]
    assert _installs("bench", tmp_path / "venv") == [".[test]"]


@pytest.mark.skipif(MAKE is None, reason="make is not installed")
def test_each_install_has_its_own_stamp(tmp_path):
    venv = tmp_path / "venv"
    venv.mkdir()
    (venv / ".installed-runtime").touch()  # the runtime is there: the demo installs nothing
    assert _installs("demo", venv) == []
    assert _installs("test", venv) == [".[test]"]  # but the test extras are not


def test_project_metadata_uses_no_deprecated_form():
    meta = tomllib.loads((REPO / "pyproject.toml").read_text(encoding="utf-8"))
    assert meta["project"]["license"] == "MIT"  # an SPDX expression, not a table
    assert meta["build-system"]["requires"] == ["setuptools>=77"]
    extras = meta["project"]["optional-dependencies"]
    assert "fast" in extras and not set(extras["test"]) <= set(meta["project"]["dependencies"])
