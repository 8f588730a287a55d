"""The README's example sessions are what the commands print today (issue 13: examples
regenerated, not hand-edited). `python tools/readme_session.py` rewrites them."""

from __future__ import annotations

import importlib.util
import shutil
from pathlib import Path

import pytest

TOOL = Path(__file__).resolve().parents[1] / "tools" / "readme_session.py"


def _tool():
    spec = importlib.util.spec_from_file_location("readme_session", TOOL)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_the_tool_finds_commands_with_their_continuation_lines():
    block = '$ a --x 1 \\\n    --y 2\nout 1\n$ b "q; \\\n    r"\nout 2\n'
    assert _tool().commands(block) == ['$ a --x 1 \\\n    --y 2', '$ b "q; \\\n    r"']


@pytest.mark.skipif(shutil.which("sqlite3") is None,
                    reason="the example session runs the sqlite3 shell")
def test_readme_sessions_are_current():
    tool = _tool()
    text = tool.README.read_text(encoding="utf-8")
    assert tool.BLOCK.search(text), "the README has no session block"
    assert tool.regenerate(text) == text, "README sessions are stale: run tools/readme_session.py"
