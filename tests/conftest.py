"""Shared fixtures: the built-in editions, a registry of their own for a test, an edition
with some parameters changed, and a beam of an invented floor that tests vary."""

from __future__ import annotations

import tomllib
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pytest

from clausewise.provisions import (
    Actions,
    Beam,
    Bending,
    Clause,
    Continuity,
    Edition,
    EditionInfo,
    FloorLayout,
    Layer,
    Parameter,
    Registry,
    Shape,
    hookimpl,
)

ROOT = Path(__file__).resolve().parents[1]
BUILT_IN_EDITIONS = tuple(tomllib.loads((ROOT / "pyproject.toml").read_text())
                          ["project"]["entry-points"]["clausewise.editions"])


def pytest_generate_tests(metafunc: pytest.Metafunc) -> None:
    """A test that takes ``built_in_edition`` runs once for each edition clausewise ships."""
    if "built_in_edition" in metafunc.fixturenames:
        metafunc.parametrize("built_in_edition", BUILT_IN_EDITIONS)


@pytest.fixture
def built_in_editions() -> tuple[str, ...]:
    return BUILT_IN_EDITIONS


class Override:
    """A local edition over ``base`` that changes only some parameters (for one test)."""

    def __init__(self, edition_id: str, base: str, parameters: list[Parameter]) -> None:
        self.info = EditionInfo(edition_id, "test override", 2024, extends=base)
        self.changed = tuple(parameters)

    @hookimpl
    def edition_info(self) -> EditionInfo:
        return self.info

    @hookimpl
    def edition_parameters(self) -> list[Parameter]:
        return list(self.changed)


def fresh_registry() -> Registry:
    reg = Registry()
    reg.load_entry_points()
    return reg


@pytest.fixture
def edition_with() -> Callable[..., Edition]:
    """``edition_with(base, **values)``: ``base`` with the named parameters set, as a test's
    own local edition (``name``, default ``xx-test``) on a registry of its own, or on
    ``registry`` where given."""

    def make(base: str, *, registry: Registry | None = None, name: str = "xx-test",
             **values: Any) -> Edition:
        clause = Clause("T.1", "choice made for the test", name)
        reg = registry or fresh_registry()
        reg.register(Override(name, base, [Parameter(n, v, clause) for n, v in values.items()]),
                     name=name)
        return reg.edition(name)

    return make


@pytest.fixture
def floor_tee() -> Callable[..., Beam]:
    """``floor_tee(**changes)``: beam G4 of an invented office floor, a T in sagging, 300 x
    600 mm web under a 150 mm slab, 8 m interior span, 32 MPa concrete, 500 MPa steel,
    4 x 25 mm bars at 540 mm; no actions unless given."""

    def make(**changes: Any) -> Beam:
        fields: dict[str, Any] = dict(
            id="G4", shape=Shape.TEE, bending=Bending.SAGGING, web_width=300.0, depth=600.0,
            concrete_strength=32.0, yield_strength=500.0,
            tension=(Layer(area=1963.5, depth=540.0),), flange_thickness=150.0,
            layout=FloorLayout(span=8000.0, continuity=Continuity.INTERIOR,
                               clear_left=2700.0, clear_right=2700.0),
            actions=Actions())
        fields.update(changes)
        return Beam(**fields)

    return make
