"""Sense checks on what a plugin answers: values, not only types.

A plugin is code the engineer did not write. A member factor of 5, a partial factor
below 1 or a negative factored moment has the right type and would still give a
number that looks like a result; here such an answer becomes an :class:`AnswerError`
naming the plugin, the hook and the value, so that edition's result is an error and
the other editions go on. Values may be floats (one beam) or arrays (a batch): every
element must make sense.

The ranges are the trade's, wide enough for every published edition:

- a member (resistance) factor φ lies in (0, 1]; NaN is allowed only as "no value"
  for a section without equilibrium (a factor that depends on its strain);
- a partial factor on a material (γc, γs, γm, ...) is at least 1;
- a stress-block factor (α1, α2, β1, λ, η, αcc, AS 3600's γ) lies in (0, 1];
- an ultimate concrete strain lies in [ULTIMATE_STRAIN] (0.002 to 0.01: published
  values are 0.0026 to 0.0035, common practice);
- a material law is no stronger than the beam's materials: steel never yields above the
  specified yield strength (a hardening branch may rise to 1.5 times it), and the
  concrete's stress never exceeds 1.25 times the specified strength (room for a cylinder
  given where an edition works in cube strength, and the other way round);
- an effective flange width is positive and finite;
- a factored moment is finite and not negative in the beam's own bending sense.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Iterable
from functools import lru_cache
from typing import Any

import numpy as np

from clausewise.core import (
    BilinearHardening,
    ElasticPlastic,
    ParabolaRectangle,
    PiecewiseLinear,
    RectangularBlock,
)
from clausewise.provisions.answers import MaterialModel, Resistance
from clausewise.provisions.detailing import DetailingLimits, senseless
from clausewise.provisions.registry import PluginError
from clausewise.provisions.vocabulary import Envelope, Factor

ULTIMATE_STRAIN = (0.002, 0.01)
CONCRETE_LAWS = (RectangularBlock, ParabolaRectangle)
STEEL_LAWS = (ElasticPlastic, BilinearHardening, PiecewiseLinear)

_PARTIAL = re.compile(r"^γ[a-zA-Z]")  # γc, γs, γm (AS 3600's bare γ is a block factor)
_BLOCK = re.compile(r"^(α\d?|αcc|β\d?|λ|η|γ)$")
_MEMBER = re.compile(r"^φ[a-z]?$")
_ULTIMATE = re.compile(r"^εcu\d?$")


class AnswerError(PluginError, ValueError):
    """A plugin answer of the right type whose value makes no physical sense."""

    def __init__(self, edition_id: str, plugin: str, hook: str, problems: list[str]) -> None:
        super().__init__(f"edition {edition_id!r}: plugin {plugin!r}, hook {hook} answered "
                         + "; ".join(problems))
        self.edition_id, self.plugin, self.hook = edition_id, plugin, hook
        self.problems = tuple(problems)


def _values(value: Any) -> np.ndarray:
    """The answer's numbers; something that is not a number reads as infinity, which every
    range refuses (None would otherwise pass as NaN)."""
    if value is None or isinstance(value, str | bool):
        return np.array([np.inf])
    try:
        return np.asarray(value, dtype=float).ravel()
    except (TypeError, ValueError):
        return np.array([np.inf])


def _shown(values: np.ndarray, bad: np.ndarray, raw: Any = 0.0) -> str:
    """The first bad value as written; a non-number as itself (None, a word)."""
    if raw is None or isinstance(raw, str | bool):
        return repr(raw)
    return repr(float(values[bad][0])) if values.size else "no value"


def _within(values: np.ndarray, ok: Callable[[Any], Any],
            allow_nan: bool = False) -> np.ndarray:
    """The elements that are out of range (NaN counts as out unless allowed)."""
    if values.size == 1:  # one beam: the same test on a float, without numpy's per-call cost
        v = float(values[0])
        return np.array([not (bool(ok(v)) or (allow_nan and math.isnan(v)))])
    with np.errstate(invalid="ignore"):
        good = ok(values) | (np.isnan(values) if allow_nan else False)
    return ~good


_Rule = tuple[Callable[[np.ndarray], np.ndarray], str]
_FACTOR_RULES: tuple[tuple[re.Pattern[str], _Rule], ...] = (
    (_MEMBER, (lambda v: (v > 0) & (v <= 1), "a member factor in (0, 1]")),
    (_PARTIAL, (lambda v: np.isfinite(v) & (v >= 1), "a partial factor of at least 1")),
    (_BLOCK, (lambda v: (v > 0) & (v <= 1), "a stress-block factor in (0, 1]")),
    (_ULTIMATE, (lambda v: (v >= ULTIMATE_STRAIN[0]) & (v <= ULTIMATE_STRAIN[1]),
                 f"an ultimate strain from {ULTIMATE_STRAIN[0]:g} to {ULTIMATE_STRAIN[1]:g}")),
)


@lru_cache(maxsize=256)
def _rule_for(symbol: str) -> _Rule | None:
    """The range a factor's symbol puts it in, or None for a symbol with no fixed range."""
    return next((rule for pattern, rule in _FACTOR_RULES if pattern.match(symbol)), None)


def _factor_problem(factor: Factor) -> str:
    rule = _rule_for(factor.symbol)
    if rule is None:
        return ""
    ok, expected = rule
    values = _values(factor.value)
    bad = _within(values, ok)
    if not bad.any():
        return ""
    return f"{factor.symbol} = {_shown(values, bad, factor.value)}, expected {expected}"


def _factors_problems(factors: Iterable[Any]) -> list[str]:
    return [p for f in factors if isinstance(f, Factor) and (p := _factor_problem(f))]


STEEL_OVERSTRENGTH = 1.5  # a hardening branch's top stress over fy, beyond any class
CONCRETE_OVERSTRENGTH = 1.25  # a block's stress over the specified strength, either basis


def _stronger_than(values: Any, specified: Any, times: float) -> bool:
    """Any beam whose law stress exceeds ``times`` its specified strength (NaN counts)."""
    with np.errstate(invalid="ignore"):
        ok = np.asarray(values, float) <= times * np.asarray(specified, float) * (1 + 1e-9)
    return not bool(np.all(ok))


def _concrete(answer: MaterialModel, beam: Any = None) -> list[str]:
    law = answer.law
    if not isinstance(law, CONCRETE_LAWS):
        return [f"law {type(law).__name__}, expected one of "
                f"{', '.join(t.__name__ for t in CONCRETE_LAWS)}"]
    problems = _factors_problems(answer.factors)
    strain = _values(law.ultimate_strain)
    low, high = ULTIMATE_STRAIN
    bad = _within(strain, lambda v: (v >= low) & (v <= high))
    if bad.any():
        problems.append(f"ultimate strain {_shown(strain, bad)}, expected {low:g} to {high:g}")
    if isinstance(law, RectangularBlock):
        depth = _values(law.depth_factor)
        bad = _within(depth, lambda v: (v > 0) & (v <= 1))
        if bad.any():
            problems.append(f"block depth factor {_shown(depth, bad)}, expected a value in "
                            "(0, 1]")
    stress = law.stress if isinstance(law, RectangularBlock) else law.peak_stress
    if beam is not None and _stronger_than(stress, beam.concrete_strength,
                                           CONCRETE_OVERSTRENGTH):
        problems.append(f"concrete stress {_values(stress).max():.6g} MPa, expected at most "
                        f"{CONCRETE_OVERSTRENGTH:g} times the specified strength "
                        f"({_values(beam.concrete_strength).min():.6g} MPa)")
    return problems


def _steel(answer: MaterialModel, beam: Any = None) -> list[str]:
    law = answer.law
    if not isinstance(law, STEEL_LAWS):
        return [f"law {type(law).__name__}, expected one of "
                f"{', '.join(t.__name__ for t in STEEL_LAWS)}"]
    problems = _factors_problems(answer.factors)
    if beam is None:
        return problems
    fy = beam.yield_strength
    if isinstance(law, PiecewiseLinear):
        top = np.max([np.asarray(s, float) for _, s in law.points], axis=0)
        if _stronger_than(top, fy, STEEL_OVERSTRENGTH):
            problems.append(f"steel stress {_values(top).max():.6g} MPa on the design "
                            f"curve, expected at most {STEEL_OVERSTRENGTH:g} fy "
                            f"({_values(fy).min():.6g} MPa)")
    elif _stronger_than(law.yield_stress, fy, 1.0):
        problems.append(f"steel yield stress {_values(law.yield_stress).max():.6g} MPa, "
                        f"expected at most the specified fy ({_values(fy).min():.6g} MPa)")
    return problems


def _resistance(answer: Resistance, response: Any = None) -> list[str]:
    factor = answer.factor
    values = _values(factor.value)
    bad = _within(values, lambda v: (v > 0) & (v <= 1), allow_nan=True)
    if response is not None and not bad.any():  # NaN only where there is no equilibrium
        equilibrium = np.asarray(getattr(response, "equilibrium", False), bool).ravel()
        values, equilibrium = np.broadcast_arrays(values, equilibrium)
        bad = np.isnan(values) & equilibrium
    if bad.any():
        return [f"{factor.symbol} = {_shown(values, bad, factor.value)}, expected a "
                "resistance factor in "
                "(0, 1]"]
    return []


def _width(answer: Envelope) -> list[str]:
    values = _values(answer.value)
    bad = _within(values, lambda v: np.isfinite(v) & (v > 0))
    if bad.any():
        return [f"effective width {_shown(values, bad, answer.value)} mm, expected a positive "
                "finite width"]
    return []


def _demand(answer: Envelope) -> list[str]:
    values = _values(answer.value)
    bad = _within(values, lambda v: np.isfinite(v) & (v >= 0))
    if bad.any():
        return [f"factored moment {_shown(values, bad, answer.value)} N·mm, expected a finite "
                "moment of zero or more in the beam's bending sense"]
    return []


def _detailing(limits: DetailingLimits) -> list[str]:
    problem = senseless(limits)
    return [problem] if problem else []


_LAW_CHECKS: dict[str, Callable[[Any, Any], list[str]]] = {
    "concrete_law": _concrete,
    "steel_law": _steel,
}
_CHECKS: dict[str, Callable[[Any], list[str]]] = {
    "effective_flange_width": _width,
    "design_actions": _demand,
    "detailing_limits": _detailing,
}


def answer_problems(hook: str, value: Any, response: Any = None, beam: Any = None
                    ) -> list[str]:
    """What is wrong with a typed answer of ``hook`` ([] when it makes sense);
    ``response`` is the section's response a resistance factor was asked for, ``beam``
    the beam a material law was asked for (its specified strengths bound the law)."""
    if value is None:
        return []
    if hook == "resistance_factor":
        return _resistance(value, response)
    if hook in _LAW_CHECKS:
        return _LAW_CHECKS[hook](value, beam)
    check = _CHECKS.get(hook)
    return [] if check is None else check(value)
