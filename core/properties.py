"""Gross and cracked-transformed section properties, exact over the strips.

Depths are from the compression face; the tension face is the opposite face.
All functions accept ``SectionArrays`` and return arrays of shape (N,).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from clausewise.core.section import SectionArrays

Array = NDArray[np.float64]


@dataclass(frozen=True)
class GrossProperties:
    """Concrete-only gross properties (steel neglected, as is usual for cracking)."""

    area: Array
    centroid: Array  # depth of the centroid from the compression face
    second_moment: Array  # about the centroidal axis
    depth: Array

    @property
    def modulus_compression_face(self) -> Array:
        return self.second_moment / self.centroid

    @property
    def modulus_tension_face(self) -> Array:
        return self.second_moment / (self.depth - self.centroid)


def gross_properties(sec: SectionArrays) -> GrossProperties:
    top, bottom, w = sec.edges[:, :-1], sec.edges[:, 1:], sec.widths
    area = np.sum(w * (bottom - top), axis=1)
    first = np.sum(w * (bottom**2 - top**2) / 2.0, axis=1)
    second_top = np.sum(w * (bottom**3 - top**3) / 3.0, axis=1)
    centroid = first / area
    return GrossProperties(area, centroid, second_top - area * centroid**2, sec.edges[:, -1])


def cracking_moment(sec: SectionArrays, flexural_tensile_strength: ArrayLike) -> Array:
    """Moment (N·mm) that brings the tension face of the gross section to ``fr`` (MPa)."""
    return np.asarray(flexural_tensile_strength) * gross_properties(sec).modulus_tension_face


@dataclass(frozen=True)
class CrackedProperties:
    """Elastic cracked-transformed section: concrete in tension ignored."""

    neutral_axis: Array
    second_moment: Array


def _concrete_moments(sec: SectionArrays, x: Array) -> tuple[Array, Array]:
    """First and second moments, about depth ``x``, of the concrete above ``x``."""
    top = np.minimum(sec.edges[:, :-1], x[:, None])
    bottom = np.minimum(sec.edges[:, 1:], x[:, None])
    u_top, u_bottom = x[:, None] - top, x[:, None] - bottom
    w = sec.widths
    return (np.sum(w * (u_top**2 - u_bottom**2) / 2.0, axis=1),
            np.sum(w * (u_top**3 - u_bottom**3) / 3.0, axis=1))


def cracked_properties(sec: SectionArrays, modular_ratio: ArrayLike) -> CrackedProperties:
    """Neutral axis and second moment of the cracked transformed section.

    Bars above the neutral axis count as ``(n - 1) As`` (they displace concrete),
    bars below as ``n As``. The neutral axis is found by bisection on the
    transformed first moment, which increases monotonically with depth.
    """
    n = np.asarray(modular_ratio, dtype=float)
    n_col = n[:, None] if n.ndim == 1 else n

    def weights(x: Array) -> Array:
        return np.where(sec.depths < x[:, None], n_col - 1.0, n_col) * sec.areas

    def first_moment(x: Array) -> Array:
        concrete, _ = _concrete_moments(sec, x)
        return concrete + np.sum(weights(x) * (x[:, None] - sec.depths), axis=1)

    lo = np.zeros(sec.size)
    hi = sec.edges[:, -1].copy()
    for _ in range(80):
        mid = 0.5 * (lo + hi)
        below = first_moment(mid) < 0
        lo, hi = np.where(below, mid, lo), np.where(below, hi, mid)
    x = 0.5 * (lo + hi)
    _, concrete_second = _concrete_moments(sec, x)
    steel_second = np.sum(weights(x) * (sec.depths - x[:, None]) ** 2, axis=1)
    return CrackedProperties(x, concrete_second + steel_second)
