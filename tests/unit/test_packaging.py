"""The package layout: every folder with an __init__.py is a package that `pip install .` ships
(pyproject.toml lists each one), and the engine's subpackages import only the layers below them."""

from __future__ import annotations

import ast
import tomllib
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
FOLDERS = {"engine": "ladle.engine", "tui": "ladle.tui", "systems": "ladle.systems"}

# Each engine subpackage and the subpackages it may import (the layering of DEVELOPERS.md).
LAYERS = {
    "models": set(),
    "files": {"models"},
    "minimize": {"models"},
    "diagrams": {"models", "minimize"},
    "solidify": {"models", "minimize", "diagrams"},
    "checking": {"models", "files", "minimize", "diagrams", "solidify"},
    "fitting": {"models", "files", "minimize", "diagrams", "solidify", "checking"},
}


def _packages_on_disk() -> set[str]:
    found = set()
    for folder, name in FOLDERS.items():
        for init in (ROOT / folder).rglob("__init__.py"):
            rel = init.parent.relative_to(ROOT / folder).parts
            found.add(".".join((name, *rel)))
    return found


def test_pyproject_lists_every_package():
    config = tomllib.loads((ROOT / "pyproject.toml").read_text())
    listed = set(config["tool"]["setuptools"]["packages"])
    assert _packages_on_disk() == listed


def test_engine_layers_import_only_those_below():
    for sub, allowed in LAYERS.items():
        for path in (ROOT / "engine" / sub).rglob("*.py"):
            for node in ast.walk(ast.parse(path.read_text())):
                if isinstance(node, ast.ImportFrom) and node.level == 2 and node.module:
                    target = node.module.split(".")[0]
                    if target in LAYERS:
                        assert target in allowed, f"{path.relative_to(ROOT)} imports {target}"


def test_wheel_holds_every_tracked_package_file(tmp_path):
    """`pip install .` installs the wheel: every tracked source and data file of the three package
    folders must be inside it (the stylesheet and the demo list were once left out)."""
    import subprocess
    import sys
    import zipfile

    subprocess.run([sys.executable, "-m", "pip", "wheel", "-q", "--no-deps", str(ROOT), "-w", str(tmp_path)],
                   check=True, capture_output=True, timeout=300)
    (wheel,) = tmp_path.glob("*.whl")
    names = set(zipfile.ZipFile(wheel).namelist())
    tracked = subprocess.run(["git", "ls-files", *FOLDERS], cwd=ROOT, capture_output=True, text=True,
                             check=True).stdout.split()
    shipped = [f for f in tracked if f.endswith((".py", ".toml", ".tcss", ".csv"))]
    assert len(shipped) > 50
    missing = [f for f in shipped if "ladle/" + f not in names]
    assert not missing
