"""Material laws for the ultimate limit state, written once for floats and arrays.

Sign convention throughout the core: strain and stress are positive in
shortening (compression). Strain at depth ``y`` below the compression face is
``eps_cu * (c - y) / c`` with the extreme fibre at the ultimate strain.

Every parameter may be a float or a numpy array that broadcasts against the
batch (shape ``(N,)``). Concrete-law methods receive ``c`` of shape ``(N,)`` and
depths or strip edges of shape ``(k, N)``, the sections along the last axis: a
parameter of shape ``(N,)`` then broadcasts as it is, and each strip or layer is a
contiguous row (numpy spends several times longer per number on rows of a few).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, fields
from typing import Any, Protocol, TypeVar

import numpy as np
from numpy.typing import ArrayLike, NDArray

from clausewise.core.errors import SectionError

Array = NDArray[np.float64]
_Law = TypeVar("_Law")


def _number(value: ArrayLike) -> Any:
    """A law parameter to compute with: a plain float as it is (the same arithmetic as a
    0-d array, without its cost), anything else as a float array."""
    if type(value) is float or type(value) is int:
        return float(value)
    return np.asarray(value, dtype=float)


def _clip(value: ArrayLike, low: ArrayLike, high: ArrayLike) -> Array:
    """``np.clip``, the same result: as two ufuncs on the small arrays of a single section
    (``np.clip`` costs more to call), as ``np.clip`` (one pass) on a batch."""
    if np.size(value) > 256:
        return np.clip(value, low, high)
    return np.minimum(np.maximum(value, low), high)


def _require_positive(law: object, *names: str) -> None:
    for name in names:
        raw = getattr(law, name)
        if type(raw) is float and math.isfinite(raw) and raw > 0:  # one section: no numpy
            continue
        value = np.asarray(raw, dtype=float)
        if not np.all(np.isfinite(value)) or np.any(value <= 0):
            raise SectionError(
                f"{type(law).__name__}.{name} must be positive and finite, got {value.tolist()}"
            )


class ConcreteLaw(Protocol):
    """What the solver needs of a concrete law."""

    @property
    def ultimate_strain(self) -> ArrayLike: ...

    def zone_depth(self, c: Array) -> Array:
        """Depth below the compression face over which the concrete is stressed."""
        ...

    def strip_resultants(self, c: Array, top: Array, bottom: Array) -> tuple[Array, Array]:
        """Force per unit width of each strip (edges ``top``, ``bottom`` of shape (k, N)),
        and its first moment about the compression face."""
        ...

    def stress_at(self, c: Array, y: Array) -> Array:
        """Concrete stress at depths ``y`` of shape (m, N) (for the concrete displaced by
        bars)."""
        ...


@dataclass(frozen=True)
class RectangularBlock:
    """Uniform stress ``stress`` over a depth ``depth_factor * c``.

    ``stress`` is the block intensity already multiplied out (0.85 f'c, η fcd,
    α1 φc f'c ...): the core does not know which standard produced it.
    """

    stress: ArrayLike
    depth_factor: ArrayLike
    ultimate_strain: ArrayLike

    def __post_init__(self) -> None:
        _require_positive(self, "stress", "depth_factor", "ultimate_strain")
        if np.any(np.asarray(self.depth_factor, dtype=float) > 1.0):
            raise SectionError(f"RectangularBlock.depth_factor must not exceed 1, got "
                               f"{np.asarray(self.depth_factor).tolist()}")

    def zone_depth(self, c: Array) -> Array:
        return np.asarray(self.depth_factor) * c

    def strip_resultants(self, c: Array, top: Array, bottom: Array) -> tuple[Array, Array]:
        a = self.zone_depth(c)
        lo = _clip(top, 0.0, a)
        hi = _clip(bottom, 0.0, a)
        stress = np.asarray(self.stress, dtype=float)
        return stress * (hi - lo), stress * 0.5 * (hi * hi - lo * lo)

    def stress_at(self, c: Array, y: Array) -> Array:
        return np.where(y < self.zone_depth(c), np.asarray(self.stress, dtype=float), 0.0)

    def stress_steps(self, depths: Array) -> Array:
        """Neutral-axis depths at which the block edge reaches each depth: there the
        concrete displaced by a bar switches on, and net compression steps down."""
        return depths / np.asarray(self.depth_factor, dtype=float)


@dataclass(frozen=True)
class ParabolaRectangle:
    """Parabola ``peak_stress * (1 - (1 - eps/strain_at_peak)**exponent)`` up to the peak
    strain, constant beyond it to the ultimate strain; integrated in closed form."""

    peak_stress: ArrayLike
    strain_at_peak: ArrayLike
    ultimate_strain: ArrayLike
    exponent: ArrayLike = 2.0

    def __post_init__(self) -> None:
        _require_positive(self, "peak_stress", "strain_at_peak", "ultimate_strain", "exponent")
        if np.any(np.asarray(self.strain_at_peak) > np.asarray(self.ultimate_strain)):
            raise SectionError("ParabolaRectangle.strain_at_peak must not exceed ultimate_strain")

    def zone_depth(self, c: Array) -> Array:
        return np.asarray(c, dtype=float)

    def _split(self, c: Array) -> tuple[Array, Array]:
        """Depth where the parabola starts, and the parabola's height."""
        ratio = np.asarray(self.strain_at_peak) / np.asarray(self.ultimate_strain)
        return c * (1.0 - ratio), c * ratio

    def strip_resultants(self, c: Array, top: Array, bottom: Array) -> tuple[Array, Array]:
        y_r, length = self._split(c)
        cc = np.asarray(c, dtype=float)
        fcd = np.asarray(self.peak_stress, dtype=float)
        n = np.asarray(self.exponent, dtype=float)
        lo = _clip(top, 0.0, y_r)
        hi = _clip(bottom, 0.0, y_r)
        force = fcd * (hi - lo)
        moment = fcd * 0.5 * (hi * hi - lo * lo)
        tp = (_clip(top, y_r, cc) - y_r) / length
        tq = (_clip(bottom, y_r, cc) - y_r) / length
        linear = tq - tp
        p1 = (tq ** (n + 1) - tp ** (n + 1)) / (n + 1)
        p2 = (tq ** (n + 2) - tp ** (n + 2)) / (n + 2)
        force = force + fcd * length * (linear - p1)
        moment = moment + fcd * length * (
            y_r * (linear - p1) + length * (0.5 * (tq * tq - tp * tp) - p2)
        )
        return force, moment

    def stress_at(self, c: Array, y: Array) -> Array:
        cc = np.asarray(c, dtype=float)
        eps = np.asarray(self.ultimate_strain, dtype=float) * (cc - y) / cc
        ratio = _clip(eps / np.asarray(self.strain_at_peak, dtype=float), 0.0, 1.0)
        return np.asarray(self.peak_stress, dtype=float) * (
            1.0 - (1.0 - ratio) ** np.asarray(self.exponent, dtype=float))


class SteelLaw(Protocol):
    """What the solver needs of a steel law: the same law in tension and compression."""

    @property
    def yield_strain(self) -> ArrayLike: ...

    @property
    def strain_limit(self) -> ArrayLike: ...

    def stress(self, strain: Array) -> Array: ...


@dataclass(frozen=True)
class ElasticPlastic:
    """Elastic to ``yield_stress``, then a horizontal plateau (no strain limit by default)."""

    modulus: ArrayLike
    yield_stress: ArrayLike
    strain_limit: ArrayLike = np.inf

    def __post_init__(self) -> None:
        _require_positive(self, "modulus", "yield_stress")

    @property
    def yield_strain(self) -> ArrayLike:
        return np.asarray(self.yield_stress) / np.asarray(self.modulus)

    def stress(self, strain: Array) -> Array:
        fy = np.asarray(self.yield_stress)
        return _clip(np.asarray(self.modulus) * strain, -fy, fy)


@dataclass(frozen=True)
class BilinearHardening:
    """Elastic to ``yield_stress``, then an inclined branch of slope ``hardening_modulus``
    up to ``strain_limit``. Beyond the limit the branch is continued only so that
    the solver stays monotone; the response flags any layer past the limit."""

    modulus: ArrayLike
    yield_stress: ArrayLike
    hardening_modulus: ArrayLike
    strain_limit: ArrayLike

    def __post_init__(self) -> None:
        _require_positive(self, "modulus", "yield_stress", "strain_limit")
        if np.any(np.asarray(self.hardening_modulus) < 0):
            raise SectionError("BilinearHardening.hardening_modulus must not be negative")

    @property
    def yield_strain(self) -> ArrayLike:
        return np.asarray(self.yield_stress) / np.asarray(self.modulus)

    def stress(self, strain: Array) -> Array:
        magnitude = np.abs(strain)
        eps_y = self.yield_strain
        elastic = np.asarray(self.modulus) * magnitude
        plastic = np.asarray(self.yield_stress) + np.asarray(self.hardening_modulus) * (
            magnitude - eps_y
        )
        return np.sign(strain) * np.where(magnitude <= eps_y, elastic, plastic)


@dataclass(frozen=True)
class PiecewiseLinear:
    """A design curve through ``points`` (strain, stress), starting at the origin and
    flat after the last point. ``yield_strain`` defaults to the last point's strain."""

    points: tuple[tuple[ArrayLike, ArrayLike], ...]
    strain_limit: ArrayLike = np.inf
    knee_strain: ArrayLike | None = None

    def __post_init__(self) -> None:
        if not self.points:
            raise SectionError("PiecewiseLinear needs at least one (strain, stress) point")
        previous = np.asarray(0.0)
        for strain, stress in self.points:
            s = np.asarray(strain, dtype=float)
            if np.any(s <= previous) or np.any(np.asarray(stress, dtype=float) < 0):
                raise SectionError(
                    "PiecewiseLinear points must have increasing positive strains "
                    "and non-negative stresses"
                )
            previous = s

    @property
    def yield_strain(self) -> ArrayLike:
        return self.points[-1][0] if self.knee_strain is None else self.knee_strain

    def stress(self, strain: Array) -> Array:
        magnitude = np.abs(strain)
        strains = [0.0] + [_number(p[0]) for p in self.points]
        stresses = [0.0] + [_number(p[1]) for p in self.points]
        result = np.broadcast_to(stresses[-1], np.shape(magnitude)).astype(float)
        for i in range(len(strains) - 1, 0, -1):
            e0, e1, s0, s1 = strains[i - 1], strains[i], stresses[i - 1], stresses[i]
            on_segment = s0 + (s1 - s0) * (magnitude - e0) / (e1 - e0)
            result = np.where(magnitude <= e1, on_segment, result)
        return np.sign(strain) * result


def stack_laws(laws: list[_Law]) -> _Law:
    """One law of the same type whose parameters are arrays over the given laws,
    so that many sections can be solved together."""
    kind = type(laws[0])
    if any(type(law) is not kind for law in laws):
        raise SectionError("laws stacked into one batch must all be of the same type")

    def stacked(values: list[Any]) -> Any:
        if isinstance(values[0], tuple):
            return tuple(stacked([v[i] for v in values]) for i in range(len(values[0])))
        if values[0] is None:
            return None
        return np.array([np.asarray(v, dtype=float) for v in values])

    return kind(**{f.name: stacked([getattr(law, f.name) for law in laws])
                   for f in fields(kind)})  # type: ignore[arg-type]


_PARAMETER_NAMES: dict[type, tuple[str, ...]] = {}


def _parameter_names(kind: type) -> tuple[str, ...]:
    """A law type's parameters (``dataclasses.fields`` is slow to ask on every solve)."""
    names = _PARAMETER_NAMES.get(kind)
    if names is None:
        names = _PARAMETER_NAMES[kind] = tuple(f.name for f in fields(kind))
    return names


def law_size(law: Any) -> int:
    """How many sections a law's parameters describe (1 when none is an array)."""

    def sizes(value: Any) -> list[int]:
        if isinstance(value, tuple):
            return [s for v in value for s in sizes(v)]
        if isinstance(value, np.ndarray) and value.ndim >= 1:
            return [value.shape[0]]
        return []

    found = {s for name in _parameter_names(type(law)) for s in sizes(getattr(law, name))}
    found.discard(1)
    if len(found) > 1:
        raise SectionError(f"{type(law).__name__} has parameter arrays of different lengths "
                           f"{sorted(found)}")
    return found.pop() if found else 1


def take_laws(laws: tuple[_Law, ...], rows: NDArray[np.int_], size: int
              ) -> tuple[_Law, ...]:
    """Each of ``laws`` restricted to the given rows (:func:`take_rows`); a law shared by
    several layers stays one shared law."""
    taken: dict[int, _Law] = {}
    for law in laws:
        if id(law) not in taken:
            taken[id(law)] = take_rows(law, rows, size)
    return tuple(taken[id(law)] for law in laws)


def take_rows(law: _Law, rows: NDArray[np.int_], size: int) -> _Law:
    """The same law restricted to the given rows of a batch of ``size`` sections
    (parameters that do not vary by row are kept as they are)."""

    def taken(value: Any) -> Any:
        if isinstance(value, tuple):
            return tuple(taken(v) for v in value)
        if isinstance(value, np.ndarray) and value.ndim >= 1 and value.shape[0] == size:
            return value[rows]
        return value

    names = _parameter_names(type(law))
    if not any(isinstance(getattr(law, name), np.ndarray | tuple) for name in names):
        return law
    subset = object.__new__(type(law))  # the rows of a checked law need no new checks
    for name in names:
        object.__setattr__(subset, name, taken(getattr(law, name)))
    return subset


class _Unjoinable(Exception):
    """Parameters of laws that cannot stand side by side in one law."""


def joined_laws(laws: Sequence[_Law], sizes: Sequence[int]) -> _Law | None:
    """One law for batches side by side (``sizes[i]`` sections under ``laws[i]``): row by
    row the same parameters, so the same numbers. None where the laws differ in type or in
    the make of their parameters, or are not the core's own (a plugin's law may hold more
    than parameters)."""
    kind = type(laws[0])
    if kind not in _JOINABLE or any(type(law) is not kind for law in laws):
        return None

    def join(values: list[Any]) -> Any:
        first = values[0]
        if isinstance(first, tuple):
            if any(not isinstance(v, tuple) or len(v) != len(first) for v in values):
                raise _Unjoinable
            return tuple(join([v[i] for v in values]) for i in range(len(first)))
        if not isinstance(first, np.ndarray) and all(
                not isinstance(v, np.ndarray) and v == first for v in values):
            return first  # one value for every row, as it is
        parts = []
        for value, size in zip(values, sizes, strict=True):
            array = np.asarray(value, dtype=float)
            if array.ndim == 0:
                array = np.full(size, float(array))
            elif array.shape != (size,):
                raise _Unjoinable
            parts.append(array)
        return np.concatenate(parts)

    whole = object.__new__(kind)  # checked laws side by side need no new checks
    try:
        for name in _parameter_names(kind):
            object.__setattr__(whole, name, join([getattr(law, name) for law in laws]))
    except _Unjoinable:
        return None
    return whole


_JOINABLE = (RectangularBlock, ParabolaRectangle, ElasticPlastic, BilinearHardening,
             PiecewiseLinear)

