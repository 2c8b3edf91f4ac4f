"""The one-way doors between the rooms, read from the source's imports (ast).

core imports nothing of the project; provisions imports core only; plugins import
provisions only; the application imports provisions (and core only through it);
nothing imports a plugin. The ACI family module ``clausewise.plugins.aci318`` is
shared by the three ACI entry points and is itself no entry point, so the
family's own modules may import it; no module imports an entry-point module.
"""

from __future__ import annotations

import ast
import tomllib
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
ROOMS = {"core": "clausewise.core", "provisions": "clausewise.provisions",
         "plugins": "clausewise.plugins", "api": "clausewise"}
FAMILY_MODULES = {"clausewise.plugins.aci318"}


def _entry_point_modules() -> set[str]:
    project = tomllib.loads((ROOT / "pyproject.toml").read_text())
    targets = project["project"]["entry-points"]["clausewise.editions"].values()
    local = tomllib.loads((ROOT / "fixtures/local-editions/pyproject.toml").read_text())
    targets = [*targets, *local["project"]["entry-points"]["clausewise.editions"].values()]
    return {target.split(":")[0] for target in targets}


def _imports(path: Path) -> set[str]:
    found: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(), str(path))):
        if isinstance(node, ast.Import):
            found |= {alias.name for alias in node.names}
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            found.add(node.module)
            found |= {f"{node.module}.{alias.name}" for alias in node.names}
    return {name for name in found if name.split(".")[0] in {"clausewise", "core",
                                                             "provisions", "plugins"}}


def _room(name: str) -> str:
    for room in ("clausewise.core", "clausewise.provisions", "clausewise.plugins"):
        if name == room or name.startswith(room + "."):
            return room
    return "clausewise"


ALLOWED = {
    "clausewise.core": {"clausewise.core"},
    "clausewise.provisions": {"clausewise.core", "clausewise.provisions"},
    "clausewise.plugins": {"clausewise.provisions", "clausewise.plugins"},
    "clausewise": {"clausewise", "clausewise.provisions"},
}


def _sources() -> list[tuple[str, Path]]:
    found = [(ROOMS[folder], path) for folder in ROOMS
             for path in sorted((ROOT / folder).rglob("*.py"))]
    found += [("clausewise.plugins", path)
              for path in sorted((ROOT / "fixtures/local-editions").rglob("*.py"))]
    return found


def _violations(room: str, path: Path) -> list[str]:
    entry_points = _entry_point_modules()
    found = []
    for name in sorted(_imports(path)):
        if name.split(".")[0] != "clausewise":
            found.append(f"{path}: bare import {name!r}")
            continue
        if name == "clausewise":
            if room != "clausewise":
                found.append(f"{path} ({room}) imports the application package")
            continue
        target = _room(name)
        if target not in ALLOWED[room]:
            found.append(f"{path} ({room}) imports {name} ({target})")
        elif target == "clausewise.plugins" and name != "clausewise.plugins":
            module = name if name in FAMILY_MODULES or name in entry_points \
                else name.rpartition(".")[0]
            if module not in FAMILY_MODULES:
                found.append(f"{path} imports the plugin module {module}")
    return found


@pytest.mark.parametrize(("room", "path"), _sources(),
                         ids=[str(p.relative_to(ROOT)) for _, p in _sources()])
def test_imports_respect_the_rooms(room: str, path: Path) -> None:
    assert _violations(room, path) == []


@pytest.mark.parametrize(("room", "line"), [
    ("clausewise.plugins", "from clausewise.plugins.en1992_1_1_2004 import zero_moment_distance"),
    ("clausewise.plugins", "from clausewise.core.section import Profile"),
    ("clausewise.core", "from clausewise.provisions import Beam"),
    ("clausewise.provisions", "from clausewise.results import record"),
    ("clausewise.provisions", "from clausewise import __version__"),
    ("clausewise", "import clausewise.plugins.is456_2000"),
    ("clausewise", "from clausewise.core import solve"),
])
def test_the_rule_refuses_a_door_opened_the_wrong_way(room: str, line: str,
                                                      tmp_path: Path) -> None:
    bad = tmp_path / "bad.py"
    bad.write_text(line + "\n")
    assert _violations(room, bad)
