"""An edition imports only ``clausewise.provisions`` itself (the author's surface), never
its modules, so every helper an edition needs is exported there; the ACI family module is
shared by the three ACI entry points."""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

import clausewise.provisions as provisions

PLUGINS = sorted((Path(__file__).resolve().parents[1] / "plugins").glob("*.py"))
ALLOWED = {"clausewise.provisions", "clausewise.plugins.aci318"}


def _project_imports(path: Path) -> set[str]:
    found = set()
    for node in ast.walk(ast.parse(path.read_text(), str(path))):
        if isinstance(node, ast.ImportFrom) and node.module:
            found.add(node.module)
        elif isinstance(node, ast.Import):
            found |= {alias.name for alias in node.names}
    return {name for name in found if name.startswith("clausewise")}


@pytest.mark.parametrize("path", PLUGINS, ids=lambda p: p.name)
def test_an_edition_imports_only_the_provisions_package(path):
    assert _project_imports(path) <= ALLOWED


def test_every_exported_name_resolves():
    for name in provisions.__all__:
        assert getattr(provisions, name) is not None, name
