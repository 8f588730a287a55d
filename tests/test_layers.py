"""The layers import only downwards (DEVELOPERS.md, "The layers").

Each top-level part of ``ledger`` may import the parts listed for it here and nothing else of
ours. A module that needs something from a layer above its own is in the wrong place: move the
work to a service, or the shared thing down to a layer both may import.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1] / "ledger"

#: The foundation: every layer may import these.
BASE = {"errors", "units", "bounds", "files", "caution"}

#: What each part may import besides itself and BASE.
ALLOWED: dict[str, set[str]] = {
    "errors": set(),
    "caution": set(),
    "units": {"errors"},
    "bounds": {"errors"},
    "files": {"errors"},
    "core": set(),
    "rules": {"core"},
    "typedata": {"core", "rules"},
    "loadsheet": {"core", "typedata", "rules"},
    "analysis": {"core", "typedata", "rules", "loadsheet"},
    "store": {"core", "typedata", "rules"},
    "report": {"core", "loadsheet", "analysis", "rules"},
    "services": {"core", "typedata", "rules", "loadsheet", "analysis", "store", "report"},
    "cli": {"services", "report"},
    # The package's entry points and the test helpers shared with the suite.
    "__main__": {"cli"},
    "testing": {"core", "typedata", "rules", "store"},
    "_migrations": set(),
}

#: Imports that break the layers today and are being moved (issue 12). Empty when it is done.
KNOWN: set[tuple[str, str]] = set()


def _part(module: str) -> str | None:
    parts = module.split(".")
    if parts[0] != "ledger":
        return None
    return parts[1] if len(parts) > 1 else "ledger"


def _module_name(path: Path) -> str:
    rel = path.relative_to(ROOT.parent).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__":
        parts = parts[:-1]
    return ".".join(parts)


def _imports(path: Path) -> set[str]:
    """Every ``ledger…`` module ``path`` imports, at the top or inside a function."""
    name = _module_name(path)
    package = name.split(".") if path.name == "__init__.py" else name.split(".")[:-1]
    found: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            found.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package[: len(package) - (node.level - 1)]
                module = ".".join(base + ([node.module] if node.module else []))
            else:
                module = node.module or ""
            if module == "ledger":
                found.update(f"ledger.{alias.name}" for alias in node.names)
            else:
                found.add(module)
    return found


def permitted(part: str, other: str | None) -> bool:
    """Whether part ``part`` of ledger may import part ``other``."""
    if other in (None, part, "ledger"):
        return True
    if part == "core":  # the pure core: nothing of ours but the error hierarchy
        return other == "errors"
    if part in BASE:
        return other in ALLOWED[part]
    return other in BASE or other in ALLOWED[part]


def violations() -> set[tuple[str, str]]:
    """(importing module, imported module) pairs that go against :data:`ALLOWED`."""
    bad = set()
    for path in sorted(ROOT.rglob("*.py")):
        source = _module_name(path)
        part = _part(source)
        assert part is not None
        if part == "ledger":
            continue
        assert part in ALLOWED, f"{source}: add its part {part!r} to ALLOWED"
        bad.update((source, target) for target in _imports(path)
                   if not permitted(part, _part(target)))
    return bad


def test_layers_import_only_downwards():
    found = violations()
    new = sorted(found - KNOWN)
    assert not new, "imports against the layers:\n" + "\n".join(f"  {a} -> {b}" for a, b in new)


def test_known_violations_are_still_there():
    # A mended violation leaves KNOWN, so the list only shrinks.
    gone = sorted(KNOWN - violations())
    assert not gone, "mended, remove from KNOWN:\n" + "\n".join(f"  {a} -> {b}" for a, b in gone)


@pytest.mark.parametrize("source,target,expected", [
    ("ledger.store.sheets", "ledger.loadsheet.build", False),
    ("ledger.loadsheet.build", "ledger.report.caution", False),
    ("ledger.cli.sheets", "ledger.store.db", False),
    ("ledger.cli.sheets", "ledger.services.sheets", True),
    ("ledger.core.envelope", "ledger.units", False),
    ("ledger.core.envelope", "ledger.errors", True),
    ("ledger.loadsheet.build", "ledger.caution", True),
])
def test_the_rule_itself(source, target, expected):
    assert permitted(_part(source), _part(target)) is expected
