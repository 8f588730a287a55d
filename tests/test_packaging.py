"""The wheel ships the migrations: `pip install .` into a new venv, then `wbledger init` works."""

from __future__ import annotations

import os
import subprocess
import sys
import venv
import zipfile
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[1]


@pytest.mark.slow
def test_wheel_install_runs_migrations(tmp_path):
    wheel_dir = tmp_path / "wheels"
    built = subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", "-v",
                            "-w", str(wheel_dir), str(REPO)],
                           check=True, cwd=tmp_path, capture_output=True, text=True)
    # issue 13 item 20: the metadata uses no deprecated form (such as a license table) and
    # every folder shipped is a declared package, so setuptools has nothing to warn about.
    warned = [line for line in (built.stdout + built.stderr).splitlines()
              if "deprecat" in line.lower() or "BuildBackendWarning" in line]
    assert warned == []
    (wheel,) = wheel_dir.glob("wbledger-*.whl")
    names = set(zipfile.ZipFile(wheel).namelist())
    assert "ledger/_migrations/env.py" in names
    assert "ledger/_migrations/script.py.mako" in names
    assert any(n.startswith("ledger/_migrations/versions/0001_") for n in names)
    assert "ledger/rules/us-federal-interstate.toml" in names
    assert "ledger/_demo_fleet/kv-p4.toml" in names
    assert "ledger/_demo_fleet/plans/kva-101-local.toml" in names
    assert not any(n.startswith("tests/") for n in names)

    env_dir = tmp_path / "venv"
    venv.EnvBuilder(with_pip=True).create(env_dir)
    py = env_dir / "bin" / "python"
    subprocess.run([str(py), "-m", "pip", "install", "--quiet", str(wheel)], check=True)
    db = tmp_path / "fresh.sqlite3"
    env = {**os.environ, "HOME": str(tmp_path / "home"), "WBLEDGER_DB": f"sqlite:///{db}"}
    # Run outside the checkout so that nothing but the installed wheel can be imported.
    out = subprocess.run([str(env_dir / "bin" / "wbledger"), "init"], env=env, cwd=tmp_path,
                         capture_output=True, text=True)
    assert out.returncode == 0, out.stderr
    assert "Schema empty -> " in out.stdout
    where = subprocess.run([str(py), "-c",
                            "import ledger.store.db as d; print(d.migrations_dir())"],
                           env=env, cwd=tmp_path, capture_output=True, text=True, check=True)
    assert str(env_dir) in where.stdout
    status = subprocess.run([str(env_dir / "bin" / "wbledger"), "db", "status", "--json"],
                            env=env, cwd=tmp_path, capture_output=True, text=True)
    assert status.returncode == 0, status.stderr
    assert '"up_to_date": true' in status.stdout
    # The whole main job from the installed wheel alone: the demo's own database, sheets, PDF.
    demo = subprocess.run([str(env_dir / "bin" / "wbledger"), "demo", "--out", "demo"],
                          env={**env, "WBLEDGER_DB": ""}, cwd=tmp_path, capture_output=True,
                          text=True)
    assert demo.returncode == 0, demo.stderr[-2000:]
    # The fleet comes from the wheel, copied into the demo's folder for short paths.
    assert (tmp_path / "demo" / "fleet" / "plans" / "kva-101-local.toml").is_file()
    assert "demo/fleet/plans/kva-101-local.toml" in demo.stdout
    assert (tmp_path / "demo" / "kva-101-local.pdf").read_bytes().startswith(b"%PDF")
    assert "CAUTION" in demo.stdout
