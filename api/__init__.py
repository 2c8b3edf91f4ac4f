"""clausewise: flexural strength of flanged concrete beams under interchangeable standards.

An aid to a licensed engineer: the adopted edition, local amendments and the
engineer of record govern.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

__version__ = "0.1.0"

if TYPE_CHECKING:
    from clausewise.provisions import Assessment, Beam, Edition


def editions() -> list[Edition]:
    """Every installed edition (layered over its bases), sorted by id."""
    from clausewise.provisions import default_registry

    return default_registry().editions()


def assess(beam: Beam, edition: str | Edition, **options: Any) -> Assessment:
    """Assess one beam under one edition; see :func:`clausewise.provisions.assess`."""
    from clausewise.provisions import assess as _assess

    return _assess(beam, edition, **options)


__all__ = ["__version__", "assess", "editions"]
