"""Sections as width profiles measured from the compression face, plus steel layers.

A profile is a stack of strips of constant width. Flange over web is a T or L
beam in sagging; the web over the flange is the same beam in hogging (or an
inverted T in sagging). For bending about a horizontal axis an L beam with the
same total flange width is the same profile as a T, so both share a builder.

``Section`` is the checked, single-member object a person builds;
``SectionArrays`` is what the solver works on: the same data as arrays over
many sections with the same number of strips and layers.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import InitVar, dataclass
from numbers import Real

import numpy as np
from numpy.typing import ArrayLike, NDArray

from clausewise.core.errors import SectionError
from clausewise.core.laws import SteelLaw, law_size, stack_laws, take_laws

Array = NDArray[np.float64]


@dataclass(frozen=True)
class Strip:
    """A band of constant ``width`` and ``thickness`` (mm); ``label`` names its role."""

    thickness: float
    width: float
    label: str


@dataclass(frozen=True)
class SteelLayer:
    """Bars lumped at one depth: ``area`` (mm²) at ``depth`` (mm) from the compression face."""

    area: float
    depth: float
    law: SteelLaw


def _positive(name: str, value: float, quantity: str = "length in mm") -> float:
    if isinstance(value, bool) or not isinstance(value, Real) or not math.isfinite(value) \
            or value <= 0:
        raise SectionError(f"{name} must be a positive finite {quantity}, got {value!r}")
    return float(value)


def flanged_profile(flange_width: ArrayLike, web_width: ArrayLike, flange_depth: ArrayLike,
                    depth: ArrayLike, *, flange_in_compression: bool
                    ) -> tuple[list[ArrayLike], list[ArrayLike], tuple[str, ...]]:
    """Thicknesses, widths and labels of a flanged profile, top (compression face) down.

    Works on floats and on arrays alike, so the single and batch builders agree.
    """
    web_depth = np.asarray(depth) - np.asarray(flange_depth)
    if flange_in_compression:
        return [flange_depth, web_depth], [flange_width, web_width], ("flange", "web")
    return [web_depth, flange_depth], [web_width, flange_width], ("web", "flange")


@dataclass(frozen=True)
class Section:
    """One member's section: strips from the compression face down, and steel layers."""

    strips: tuple[Strip, ...]
    layers: tuple[SteelLayer, ...]

    def __post_init__(self) -> None:
        if not self.strips:
            raise SectionError("a section needs at least one strip")
        for i, strip in enumerate(self.strips):
            _positive(f"strip {i} ({strip.label}) thickness", strip.thickness)
            _positive(f"strip {i} ({strip.label}) width", strip.width)
        if not self.layers:
            raise SectionError("a section needs at least one steel layer")
        h = self.depth
        for i, layer in enumerate(self.layers):
            _positive(f"steel layer {i} area", layer.area, "area in mm²")
            _positive(f"steel layer {i} depth", layer.depth)
            if layer.depth >= h:
                raise SectionError(
                    f"steel layer {i} at depth {layer.depth:g} mm lies outside the section "
                    f"depth h = {h:g} mm"
                )

    @property
    def depth(self) -> float:
        return float(sum(s.thickness for s in self.strips))

    # --- builders -------------------------------------------------------------
    @classmethod
    def rectangle(cls, width: float, depth: float, layers: Sequence[SteelLayer]) -> Section:
        _positive("width", width)
        _positive("depth h", depth)
        return cls((Strip(depth, width, "web"),), tuple(layers))

    @classmethod
    def flanged(cls, flange_width: float, web_width: float, flange_depth: float, depth: float,
                layers: Sequence[SteelLayer], *, flange_in_compression: bool = True) -> Section:
        """A T or L section (``flange_width`` is the total effective width)."""
        for name, value in (("flange width bf", flange_width), ("web width bw", web_width),
                            ("flange depth hf", flange_depth), ("depth h", depth)):
            _positive(name, value)
        if flange_depth >= depth:
            raise SectionError(
                f"flange depth hf = {flange_depth:g} mm must be less than the depth "
                f"h = {depth:g} mm"
            )
        if web_width > flange_width:
            raise SectionError(
                f"web width bw = {web_width:g} mm must not exceed the flange width "
                f"bf = {flange_width:g} mm"
            )
        thicknesses, widths, labels = flanged_profile(
            flange_width, web_width, flange_depth, depth,
            flange_in_compression=flange_in_compression)
        strips = tuple(Strip(float(t), float(w), lab)  # type: ignore[arg-type]
                       for t, w, lab in zip(thicknesses, widths, labels, strict=True))
        return cls(strips, tuple(layers))

    tee = flanged
    ell = flanged

    @classmethod
    def hogging(cls, flange_width: float, web_width: float, flange_depth: float, depth: float,
                layers: Sequence[SteelLayer]) -> Section:
        """A T or L beam over a support: the web is in compression, the flange in tension.
        Layer depths are measured from the bottom (compression) face."""
        return cls.flanged(flange_width, web_width, flange_depth, depth, layers,
                           flange_in_compression=False)

    def to_arrays(self) -> SectionArrays:
        return SectionArrays.stack([self])


@dataclass(frozen=True)
class SectionArrays:
    """Many sections with the same strip and layer count, as arrays.

    ``edges`` (N, k+1) are strip boundaries from the compression face, ``widths``
    (N, k), ``areas`` and ``depths`` (N, m); ``steel`` holds one law per layer
    column, with parameters that are floats or arrays of shape (N,).
    """

    edges: Array
    widths: Array
    areas: Array
    depths: Array
    steel: tuple[SteelLaw, ...]
    labels: tuple[str, ...]
    validate: InitVar[bool] = True

    def __post_init__(self, validate: bool) -> None:
        n, k = self.widths.shape
        if self.edges.shape != (n, k + 1):
            raise SectionError("edges must have one more column than widths")
        if self.areas.shape != self.depths.shape or self.areas.shape[0] != n:
            raise SectionError("areas and depths must both have shape (N, layers)")
        if len(self.steel) != self.areas.shape[1] or len(self.labels) != k:
            raise SectionError("one steel law per layer and one label per strip are needed")
        if not validate:  # rows taken from a checked batch (``take``)
            return
        for j, law in enumerate(self.steel):
            if any(law is other for other in self.steel[:j]):  # a shared law: checked once
                continue
            if law_size(law) not in (1, n):
                raise SectionError(f"steel law of layer {j} has parameters for {law_size(law)} "
                                   f"sections but the batch has {n}")
        bad = ~(np.all(np.isfinite(self.widths) & (self.widths > 0), axis=1)
                & np.all(np.diff(self.edges, axis=1) > 0, axis=1)
                & np.all(np.isfinite(self.areas) & (self.areas > 0), axis=1)
                & np.all((self.depths > 0) & (self.depths < self.edges[:, -1:]), axis=1))
        if np.any(bad):
            rows = np.flatnonzero(bad)
            raise SectionError(
                f"{rows.size} section(s) have non-positive dimensions or steel outside the "
                f"depth (first at row {rows[0]})"
            )

    @property
    def size(self) -> int:
        return int(self.widths.shape[0])

    def take(self, rows: NDArray[np.int_]) -> SectionArrays:
        """The sections at the given row indices, as a smaller batch."""
        return SectionArrays(self.edges[rows], self.widths[rows], self.areas[rows],
                             self.depths[rows], take_laws(self.steel, rows, self.size),
                             self.labels, validate=False)

    @classmethod
    def from_profile(cls, thicknesses: Sequence[ArrayLike], widths: Sequence[ArrayLike],
                     labels: tuple[str, ...], areas: Sequence[ArrayLike],
                     depths: Sequence[ArrayLike], steel: Sequence[SteelLaw]) -> SectionArrays:
        """Build from per-strip and per-layer columns (floats or arrays of shape (N,))."""
        n = max([np.size(v) for v in (*thicknesses, *widths, *areas, *depths)]
                + [law_size(law) for law in {id(law): law for law in steel}.values()])

        def table(values: Sequence[ArrayLike]) -> Array:
            """Columns from floats or arrays of shape (N,) (assignment broadcasts)."""
            out = np.empty((n, len(values)))
            for j, v in enumerate(values):
                out[:, j] = v
            return out

        edges = np.zeros((n, len(thicknesses) + 1))
        np.cumsum(table(thicknesses), axis=1, out=edges[:, 1:])
        return cls(edges=edges, widths=table(widths), areas=table(areas), depths=table(depths),
                   steel=tuple(steel), labels=labels)

    @classmethod
    def stack(cls, sections: Sequence[Section]) -> SectionArrays:
        first = sections[0]
        k, m = len(first.strips), len(first.layers)
        if any(len(s.strips) != k or len(s.layers) != m for s in sections):
            raise SectionError("sections stacked into one batch need the same strip and "
                               "layer counts")
        labels = tuple(s.label for s in first.strips)
        if any(tuple(s.label for s in section.strips) != labels for section in sections):
            raise SectionError("sections stacked into one batch need the same strip labels "
                               "(do not mix sagging and hogging sections in one batch)")
        return cls.from_profile(
            thicknesses=[np.array([s.strips[i].thickness for s in sections]) for i in range(k)],
            widths=[np.array([s.strips[i].width for s in sections]) for i in range(k)],
            labels=labels,
            areas=[np.array([s.layers[j].area for s in sections]) for j in range(m)],
            depths=[np.array([s.layers[j].depth for s in sections]) for j in range(m)],
            steel=[stack_laws([s.layers[j].law for s in sections]) if len(sections) > 1
                   else first.layers[j].law for j in range(m)],
        )
