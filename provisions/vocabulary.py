"""The rule vocabulary editions speak: every number carries where it comes from.

Values may be floats (one audited beam) or numpy arrays (a batch of beams of the
same shape); every class and helper here works unchanged on both.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from enum import StrEnum
from functools import cached_property, reduce
from typing import Any

import numpy as np
from numpy.typing import ArrayLike

Value = Any  # a float, or a numpy array over a batch of beams


@dataclass(frozen=True)
class Clause:
    """Where a value comes from: a clause reference, our own short title, and the
    edition (or file) that supplied it."""

    ref: str
    title: str
    edition: str = ""

    def __str__(self) -> str:
        where = f"{self.edition} " if self.edition else ""
        return f"{where}{self.ref} ({self.title})"


@dataclass(frozen=True)
class Factor:
    """One derived value with its symbol, clause and a one-line basis."""

    symbol: str
    value: Value
    clause: Clause
    basis: str = ""
    unit: str = ""


@dataclass(frozen=True)
class Parameter:
    """A named, overridable value of an edition (a nationally determined parameter,
    a firm's preferred limit). ``bounds`` (numbers) or ``choices`` (words) are the
    values a parameter file may set it to."""

    name: str
    value: float | str
    clause: Clause
    description: str = ""
    bounds: tuple[float, float] | None = None
    unit: str = ""
    choices: tuple[str, ...] | None = None


@dataclass(frozen=True)
class Candidate:
    """One contender of an envelope. ``label`` is the rule in words and symbols, the same
    for every beam ("bw + 8hf on each side"); ``basis`` may carry this beam's numbers."""

    label: str
    value: Value
    clause: Clause
    basis: str = ""


class Bound(StrEnum):
    SMALLEST = "smallest"
    LARGEST = "largest"


@dataclass(frozen=True)
class Envelope:
    """Several candidates of which the smallest (or largest) governs.

    ``governing`` is the index of the governing candidate (an int array over a
    batch); ``value`` its value.
    """

    name: str
    symbol: str
    bound: Bound
    candidates: tuple[Candidate, ...]
    unit: str = ""
    governing: Any = field(init=False)
    value: Value = field(init=False)

    def __post_init__(self) -> None:
        if not self.candidates:
            raise ValueError(f"envelope {self.name!r} needs at least one candidate")
        values = [c.value for c in self.candidates]
        if all(type(v) is float or type(v) is int for v in values):  # one beam, no numpy
            index = _pick(values, self.bound)
            object.__setattr__(self, "governing", index)
            object.__setattr__(self, "value", float(values[index]))
            return
        stack = np.empty((len(values), *np.broadcast_shapes(*map(np.shape, values))))
        for i, v in enumerate(values):
            stack[i] = v  # one value for all beams, or one per beam
        index = (np.argmin if self.bound is Bound.SMALLEST else np.argmax)(stack, axis=0)
        value = (np.min if self.bound is Bound.SMALLEST else np.max)(stack, axis=0)
        object.__setattr__(self, "governing", index if index.ndim else int(index))
        object.__setattr__(self, "value", value if value.ndim else float(value))

    @classmethod
    def smallest(cls, name: str, symbol: str, candidates: Sequence[Candidate],
                 unit: str = "") -> Envelope:
        return cls(name, symbol, Bound.SMALLEST, tuple(candidates), unit)

    @classmethod
    def largest(cls, name: str, symbol: str, candidates: Sequence[Candidate],
                unit: str = "") -> Envelope:
        return cls(name, symbol, Bound.LARGEST, tuple(candidates), unit)

    @property
    def governing_candidate(self) -> Candidate:
        """The governing candidate of a single beam."""
        return self.candidates[int(self.governing)]

    def excess(self, candidate: Candidate) -> Value:
        """How far a candidate lies beyond the governing value (0 for the governing one)."""
        return np.abs(np.asarray(candidate.value, float) - self.value)


def _pick(values: list[float], bound: Bound) -> int:
    """``np.argmin`` (or ``argmax``) of plain numbers: the first NaN, else the first
    smallest (largest)."""
    nan = next((i for i, v in enumerate(values) if v != v), None)
    if nan is not None:
        return nan
    key = values.__getitem__
    return min(range(len(values)), key=key) if bound is Bound.SMALLEST else \
        max(range(len(values)), key=key)


class Sense(StrEnum):
    AT_MOST = "at most"
    AT_LEAST = "at least"


@dataclass(frozen=True)
class Check:
    """A verification ``value`` at most (or at least) ``limit``.

    Utilisation is value/limit for an upper bound and limit/value for a lower
    bound, so in both senses a utilisation above 1 fails.
    """

    name: str
    value: Value
    limit: Value
    sense: Sense
    clause: Clause
    symbol: str = ""
    unit: str = ""
    note: str = ""

    @cached_property
    def utilisation(self) -> Value:
        if np.ndim(self.value) == 0 and np.ndim(self.limit) == 0:
            return _utilisation(float(self.value), float(self.limit), self.sense)
        value = np.asarray(self.value, float)
        limit = np.asarray(self.limit, float)
        # the ratio, then the rare cases of _utilisation fixed where they occur
        numerator, denominator = (value, limit) if self.sense is Sense.AT_MOST else (limit,
                                                                                     value)
        with np.errstate(divide="ignore", invalid="ignore"):
            u = np.asarray(numerator / denominator, float)
        bad_denominator = ~(denominator > 0)
        if bad_denominator.any():
            u = np.where(bad_denominator, np.where(numerator > 0, np.inf, 0.0), u)
        undefined = np.isnan(value) | np.isnan(limit)
        if undefined.any():
            u = np.where(undefined, np.inf, u)
        return u if u.ndim else float(u)

    @property
    def passed(self) -> Value:
        ok = np.asarray(self.utilisation) <= 1.0 + 1e-12
        return ok if ok.ndim else bool(ok)

    @property
    def margin(self) -> Value:
        """Limit minus value for an upper bound, value minus limit for a lower bound."""
        value, limit = np.asarray(self.value, float), np.asarray(self.limit, float)
        m = limit - value if self.sense is Sense.AT_MOST else value - limit
        return m if m.ndim else float(m)


def _utilisation(value: float, limit: float, sense: Sense) -> float:
    """The same rule as ``Check.utilisation`` for one beam, without numpy's per-call cost."""
    if math.isnan(value) or math.isnan(limit):
        return math.inf
    if sense is Sense.AT_MOST:
        return value / limit if limit > 0 else (math.inf if value > 0 else 0.0)
    return limit / value if value > 0 else (math.inf if limit > 0 else 0.0)


@dataclass(frozen=True)
class Regime:
    """A named state of the section with the clause that defines it."""

    name: str
    clause: Clause
    description: str = ""


# --- rule helpers: the same call on floats and on arrays ----------------------------

def per_beam(value: Any) -> Value:
    """A float for one beam, the array itself for a batch: the shape every rule returns."""
    if type(value) is float:
        return value
    return value if np.ndim(value) else float(value)


def shown(value: Any, spec: str = ".4g") -> str:
    """A value for an audit line: formatted for one beam, "per beam" for a batch."""
    return format(float(value), spec) if np.ndim(value) == 0 else "per beam"


def _out(value: np.ndarray) -> Value:
    """Arrays stay arrays; a 0-d result becomes a plain Python value."""
    return value if value.ndim else value.item()


def clamp(value: ArrayLike, lower: ArrayLike, upper: ArrayLike) -> Value:
    return _out(np.clip(np.asarray(value, float), lower, upper))


def interpolate(x: ArrayLike, xs: Sequence[float], ys: Sequence[float]) -> Value:
    """Linear interpolation in a table, held constant beyond its ends."""
    return _out(np.interp(np.asarray(x, float), xs, ys))


def smallest_of(*values: ArrayLike) -> Value:
    return _out(np.asarray(reduce(np.minimum, values), float))


def largest_of(*values: ArrayLike) -> Value:
    return _out(np.asarray(reduce(np.maximum, values), float))


def choose(condition: ArrayLike, if_true: ArrayLike, if_false: ArrayLike) -> Value:
    """``if_true`` where ``condition`` holds, else ``if_false``: an ``if`` for rules. Texts
    are chosen as Python objects (a batch's column of names, not fixed-width text)."""
    if _is_text(if_true) or _is_text(if_false):
        if_true, if_false = (np.asarray(v, dtype=object) for v in (if_true, if_false))
    return _out(np.where(condition, if_true, if_false))


def _is_text(value: Any) -> bool:
    return isinstance(value, str) or (isinstance(value, np.ndarray) and value.dtype.kind in "OU")


def sqrt(value: ArrayLike) -> Value:
    return _out(np.sqrt(np.asarray(value, float)))


def power(value: ArrayLike, exponent: ArrayLike) -> Value:
    return _out(np.power(np.asarray(value, float), exponent))


def log(value: ArrayLike) -> Value:
    return _out(np.log(np.asarray(value, float)))


def is_within(value: ArrayLike, lower: ArrayLike, upper: ArrayLike) -> Value:
    v = np.asarray(value, float)
    inside = (v >= lower) & (v <= upper)
    return inside if inside.ndim else bool(inside)
