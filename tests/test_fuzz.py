"""A seeded mutator over the demo file: hostile values in every field never give a
traceback, a numpy warning, or a "pass" that carries a non-finite number.

Each mutant is one beam of the demo (fixtures/demo/quellmoor-library.toml) with one
to three fields changed, deleted or added, checked in-process under every installed
edition and written by every writer. A mutant may be refused (an input problem, or a
whole-file InputError): that is the point; what may not happen is a crash, or a result
that passes on a number that does not exist.
"""

from __future__ import annotations

import copy
import io
import math
import random
import tomllib
import warnings
from pathlib import Path
from typing import Any

import tomli_w
from rich.console import Console

from clausewise import report, results
from clausewise.beamfile import InputError, parse_schedule
from clausewise.provisions import default_registry
from clausewise.provisions.verdicts import PASS

DEMO = Path(__file__).resolve().parents[1] / "fixtures" / "demo" / "quellmoor-library.toml"
MUTANTS = 600
SEED = 16  # among the seeds tried, one that also reaches a plugin dividing by zero

NASTY: tuple[Any, ...] = (
    0, -1, 1e-324, 5e-324, 1e-300, 1e308, -1e308, 1.7976931348623157e308, 1e12, 3.0, 0.5,
    "0 mm", "-300 mm", "nan mm", "inf mm", "1e308 mm", "1e-300 mm", "5e-324 mm", "300 ly",
    "300 MPa", "30 mm", "4 x 25 mm", "12 x 32 mm", "200 x 60 mm", "1 x 3 mm", "3 #18",
    "9e999", "", " ", "x" * 300, "\x00", "300", "1e3 m", "2,5 m", "600 mm", "595 mm",
    "0.001 mm", "100 m", "1e6 kN m", "-5 kN m", "1e30 kN m", "5000 psi", "60 ksi", "12 in",
    True, [], {}, ["4 x 25 mm"], {"bars": "4 x 25 mm"}, "hogging", "sagging", "T", "L",
    "rectangular", "inverted T", "cube", "cantilever", "US", "SI", "100000 MPa", "300000 MPa",
    "1000 MPa", "150 MPa", "5 MPa", "150000 psi", "50 mm", "5000 mm", "4000 mm", "40 mm",
)
FIELDS = (
    "web_width", "overall_depth", "slab_thickness", "effective_flange_width",
    "concrete_strength", "yield_strength", "steel_modulus", "shape", "bending", "units",
    "strength_basis", "title", "id", "isolated", "statically_determinate",
)
NESTED = (
    ("tension", 0, "bars"), ("tension", 0, "depth"), ("tension", 0, "area"),
    ("tension", 0, "centroid_from_face"), ("compression", 0, "bars"),
    ("compression", 0, "depth"), ("floor", None, "span"), ("floor", None, "clear_span"),
    ("floor", None, "clear_left"), ("floor", None, "continuity"),
    ("floor", None, "adjacent_span"), ("moments", None, "dead"), ("moments", None, "live"),
    ("moments", None, "factored"),
)
DELETED = object()


def _scaled(value: Any, rng: random.Random) -> Any:
    """A quantity of the demo with its number scaled: near misses and slips of the unit."""
    if not isinstance(value, str):
        return rng.choice(NASTY)
    number, _, unit = value.partition(" ")
    try:
        scaled = float(number) * rng.choice((0.1, 0.5, 0.9, 0.99, 1.01, 1.1, 2.0, 10.0, 1e3))
    except ValueError:
        return rng.choice(NASTY)
    return f"{scaled:.6g} {unit}".strip()


def _mutate(beam: dict[str, Any], rng: random.Random) -> dict[str, Any]:
    beam = copy.deepcopy(beam)
    for _ in range(1 if rng.random() < 0.7 else 2):
        roll = rng.random()
        value = DELETED if roll < 0.05 else rng.choice(NASTY) if roll < 0.35 else None
        if rng.random() < 0.5:
            key = rng.choice(FIELDS)
            value = _scaled(beam.get(key), rng) if value is None else value
            if value is DELETED:
                beam.pop(key, None)
            else:
                beam[key] = value
            continue
        table, index, key = rng.choice(NESTED)
        holder = beam.get(table)
        if index is not None:
            if not isinstance(holder, list) or not holder:
                holder = beam[table] = [{"bars": "2 x 16 mm", "depth": "50 mm"}]
            holder = holder[index]
        elif not isinstance(holder, dict):
            holder = beam[table] = {}
        if not isinstance(holder, dict):
            continue
        value = _scaled(holder.get(key), rng) if value is None else value
        if value is DELETED:
            holder.pop(key, None)
        else:
            holder[key] = value
    return beam


def _mutants() -> list[str]:
    demo = tomllib.loads(DEMO.read_text(encoding="utf-8"))
    header = {k: v for k, v in demo.items() if k != "beam"}
    rng = random.Random(SEED)
    texts = []
    for _ in range(MUTANTS):
        beam = _mutate(rng.choice(demo["beam"]), rng)
        texts.append(tomli_w.dumps({**header, "beam": [beam]}))
    return texts


def _finite_numbers(value: Any) -> bool:
    if isinstance(value, dict):
        return all(_finite_numbers(v) for v in value.values())
    if isinstance(value, list):
        return all(_finite_numbers(v) for v in value)
    return not isinstance(value, float) or math.isfinite(value)


def test_hostile_beam_files_never_crash_and_never_pass_on_a_non_finite_number():
    editions = default_registry().editions()
    assert len(_mutants()) >= 300
    outcomes_seen, refused = 0, 0
    # a numpy warning must never reach the user: recorded (as errors they would be caught
    # inside a hook and hidden as an edition error)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        for number, text in enumerate(_mutants()):
            try:
                schedule = parse_schedule(text, f"mutant-{number}.toml")
            except InputError:
                refused += 1
                continue
            refused += bool(schedule.problems)
            outcomes = list(results.run(schedule, editions, None, "persistent"))
            outcomes_seen += len(outcomes)
            doc = results.document(schedule, outcomes)
            results.to_json(doc)  # allow_nan=False: a NaN that leaks in raises here
            results.to_toml(doc)
            results.to_csv(doc)
            if number % 10 == 0:  # the report for people too, on a sample (rich is slower)
                Console(file=io.StringIO(), width=110).print(
                    report.check_report(schedule, outcomes))
            for outcome, rec in zip(outcomes, doc["results"], strict=True):
                if outcome.status != PASS:
                    continue
                a = outcome.assessment
                assert a is not None and a.resistance is not None, text
                numbers = [a.design_resistance.value, a.nominal_moment,
                           a.resistance.factor.value]
                numbers += [c.utilisation for c in a.checks]
                assert all(math.isfinite(float(v)) for v in numbers), (number, text)
                assert _finite_numbers(rec), (number, text)
    assert [str(w.message) for w in caught] == []
    # the mutator must exercise both paths: refused input and assessed beams
    assert MUTANTS // 4 < refused < MUTANTS - MUTANTS // 10 and outcomes_seen > MUTANTS
