"""clausewise: flexural strength of flanged concrete beams under interchangeable standards.

An aid to a licensed engineer: the adopted edition, local amendments and the
engineer of record govern.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

__version__ = "0.1.0"

if TYPE_CHECKING:
    from collections.abc import Sequence

    from clausewise.provisions import Assessment, Beam, Edition
    from clausewise.provisions.design import Design


def editions() -> list[Edition]:
    """Every installed edition (layered over its bases), sorted by id."""
    from clausewise.provisions import default_registry

    return default_registry().editions()


def assess(beam: Beam, edition: str | Edition, **options: Any) -> Assessment:
    """Assess one beam under one edition; see :func:`clausewise.provisions.assess`."""
    from clausewise.provisions import assess as _assess

    return _assess(beam, edition, **options)


def design(beam: Beam, edition: str | Edition, **options: Any) -> Design:
    """The least steel ``edition`` requires for ``beam`` and the bars that fit, pass and an
    engineer would place (within 15 % of the lightest passing mass: fewest layers, then
    fewest bars), with the search's bracket and the chosen bars' full assessment; see
    :func:`clausewise.provisions.design.design`."""
    from clausewise.provisions.design import design as _design

    return _design(beam, edition, **options)


def design_many(beams: Sequence[Beam], edition: str | Edition, **options: Any) -> list[Design]:
    """Design a schedule of beams under one edition through the array path (no per-beam
    audit unless ``audit=True``)."""
    from clausewise.provisions.design import design_many as _design_many

    return _design_many(beams, edition, **options)


__all__ = ["__version__", "assess", "design", "design_many", "editions"]
