"""Shared fixtures: paths to the demo recipes and a CLI runner that returns (code, out, err)."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
RECIPES = ROOT / "recipes"


@pytest.fixture
def demo_recipes() -> list[Path]:
    paths = sorted(RECIPES.glob("*.toml"))
    assert paths, "the demo recipes are missing"
    return paths


def run_cli(*args: str, cwd: Path | None = None) -> subprocess.CompletedProcess:
    """Run ``python -m chamberchk`` in a subprocess, as a user would from a shell."""
    return subprocess.run([sys.executable, "-m", "chamberchk", *map(str, args)],
                          capture_output=True, text=True, cwd=cwd, timeout=300)


@pytest.fixture
def cli(capsys):
    """Run the CLI in-process (fast) and return an object like CompletedProcess."""
    from chamberchk.cli import main

    def _run(*args: str) -> subprocess.CompletedProcess:
        capsys.readouterr()
        try:
            main([str(a) for a in args])
            code = 0
        except SystemExit as exc:
            code = exc.code if isinstance(exc.code, int) else (0 if exc.code is None else 1)
        captured = capsys.readouterr()
        return subprocess.CompletedProcess(args, code, captured.out, captured.err)
    return _run


@pytest.fixture
def write_recipe(tmp_path):
    """Write TOML text to a file in tmp_path and return its path."""
    def _write(text: str, name: str = "recipe.toml") -> Path:
        path = tmp_path / name
        path.write_text(text, encoding="utf-8")
        return path
    return _write
