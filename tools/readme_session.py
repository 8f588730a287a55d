"""Run the README's example sessions again and write their output back (or check it).

The README shows real sessions: each fenced block right after a ``<!-- session -->`` line is a
list of shell commands (lines starting ``$ ``; a line ending in a backslash goes on) with their
output. This script runs every such block, in order, in one fresh temporary folder with its own
database, the ``wbledger`` of this interpreter's environment first on ``PATH`` and an 80-column
terminal, and replaces each command's output with what it printed now. The temporary folder's
path is written as ``/tmp/readme`` so that the text does not change from run to run.

    python tools/readme_session.py            # rewrite README.md
    python tools/readme_session.py --check    # exit 1 and show the difference if it is stale
"""

from __future__ import annotations

import difflib
import os
import re
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
README = ROOT / "README.md"
MARK = "<!-- session -->"
SHOWN_TMP = "/tmp/readme"
BLOCK = re.compile(re.escape(MARK) + r"\n```\n(.*?)```", re.S)


def commands(block: str) -> list[str]:
    """The commands of one block, each with its continuation lines, output dropped."""
    found: list[str] = []
    lines = block.splitlines()
    i = 0
    while i < len(lines):
        if lines[i].startswith("$ "):
            command = [lines[i]]
            while command[-1].endswith("\\") and i + 1 < len(lines):
                i += 1
                command.append(lines[i])
            found.append("\n".join(command))
        i += 1
    return found


def run_block(block: str, folder: Path, env: dict[str, str]) -> str:
    """The block again: each command followed by what it prints now (stdout and stderr)."""
    out: list[str] = []
    for command in commands(block):
        shell = command[2:].replace(SHOWN_TMP, str(folder))
        out.append(command)
        exported = re.fullmatch(r"export (\w+)=(\S+)", shell)
        if exported:  # each command runs in a shell of its own: keep the variable for the next
            env[exported.group(1)] = exported.group(2)
            continue
        done = subprocess.run(["bash", "-c", shell], cwd=ROOT, env=env, text=True,
                              stdout=subprocess.PIPE, stderr=subprocess.STDOUT, timeout=120)
        printed = done.stdout.replace(str(folder), SHOWN_TMP)
        out.extend(line.rstrip() for line in printed.rstrip("\n").splitlines())
    return "\n".join(out) + "\n"


def regenerate(text: str) -> str:
    """README text with every session block run again."""
    with tempfile.TemporaryDirectory(prefix="readme-") as tmp:
        folder = Path(tmp)
        env = {
            "PATH": f"{Path(sys.executable).parent}{os.pathsep}{os.environ.get('PATH', '')}",
            "HOME": str(folder), "COLUMNS": "80", "LINES": "50", "TERM": "dumb",
            "NO_COLOR": "1", "LC_ALL": "C.UTF-8", "TZ": "UTC",
        }
        if "PYTHONPATH" in os.environ:  # a checkout run without installing it
            env["PYTHONPATH"] = os.environ["PYTHONPATH"]

        def again(match: re.Match[str]) -> str:
            return f"{MARK}\n```\n{run_block(match.group(1), folder, env)}```"

        return BLOCK.sub(again, text)


def main(argv: list[str]) -> int:
    text = README.read_text(encoding="utf-8")
    if not BLOCK.search(text):
        print(f"README.md has no block after {MARK}", file=sys.stderr)
        return 2
    new = regenerate(text)
    if "--check" in argv:
        if new == text:
            return 0
        sys.stdout.writelines(difflib.unified_diff(
            text.splitlines(keepends=True), new.splitlines(keepends=True),
            "README.md", "README.md (run now)"))
        return 1
    README.write_text(new, encoding="utf-8")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
