"""The engine and the services import without Qt, so the command line never needs a display."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

REPO = Path(__file__).resolve().parents[2]

NAMED = (
    "import sys; import curator.core.suggest, curator.services.workspace, "
    "curator.services.suggestions; "
    "bad = sorted(m for m in sys.modules if m.startswith('PySide6')); "
    "assert not bad, bad"
)

EVERY_MODULE = """
import importlib, pkgutil, sys
import curator.core, curator.services
names = []
for package in (curator.core, curator.services):
    for info in pkgutil.walk_packages(package.__path__, package.__name__ + "."):
        importlib.import_module(info.name)
        names.append(info.name)
bad = sorted(m for m in sys.modules if m.startswith(("PySide6", "shiboken6")))
assert not bad, bad
print(len(names))
"""


def run(code: str) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, timeout=120,
        cwd=REPO, check=False,
    )


def test_suggesting_imports_no_pyside6():
    done = run(NAMED)
    assert done.returncode == 0, done.stderr


def test_no_core_or_services_module_imports_pyside6():
    done = run(EVERY_MODULE)
    assert done.returncode == 0, done.stderr
    assert int(done.stdout.strip()) >= 10
