"""One record per beam and edition as plain data (None where a value does not exist)."""

from __future__ import annotations

import math
from collections.abc import Iterable
from typing import TYPE_CHECKING, Any

from clausewise.provisions import (
    CAUTION,
    Assessment,
    Check,
    Clause,
    Envelope,
    Factor,
    Notation,
    UnitSystem,
)
from clausewise.provisions.verdicts import Status
from clausewise.provisions.widths import OverhangEnvelope
from clausewise.results.display import convert, in_notation, input_label

if TYPE_CHECKING:
    from clausewise.beamfile import InputProblem, Schedule
    from clausewise.provisions import Edition, Registry
    from clausewise.results.running import Outcome

INPUT_PROBLEM = "input problem"
STATUSES = tuple(Status)
DIGITS = 6  # significant figures of machine-readable numbers unless asked otherwise


def significant(value: float, digits: int) -> float:
    """``value`` rounded to ``digits`` significant figures."""
    return float(f"{value:.{digits}g}") if digits > 0 and value else value


class ShownNumbers:
    """Internal values (N, mm, MPa, N·mm, kg/m) as one unit system's numbers, rounded to
    a number of significant figures; None where a value does not exist (JSON has no
    NaN)."""

    def __init__(self, system: UnitSystem, digits: int) -> None:
        self.system, self.digits = system, digits

    def plain(self, value: Any) -> float | None:
        """None for a value that is missing or not finite (a plugin may answer None)."""
        try:
            number = float(value)
        except (TypeError, ValueError):
            return None
        return significant(number, self.digits) if math.isfinite(number) else None

    def unit(self, value: Any, unit: str) -> tuple[float | None, str]:
        number, shown = convert(value, unit, self.system)
        return self.plain(number), shown

    def value(self, value: Any, unit: str) -> float | None:
        return None if value is None else self.unit(value, unit)[0]


RESULT_KINDS = (("moment", "N·mm"), ("force", "N"), ("length", "mm"), ("area", "mm²"),
                ("stress", "MPa"))


def units_table(system: UnitSystem, kinds: tuple[tuple[str, str], ...] = RESULT_KINDS
                ) -> dict[str, str]:
    """The unit of each kind of quantity (by its internal unit) in ``system``."""
    return {kind: convert(1.0, internal, system)[1] for kind, internal in kinds}


def _clause(clause: Clause) -> dict[str, str]:
    return {"ref": clause.ref, "title": clause.title, "edition": clause.edition}


def _factor(factor: Factor, q: ShownNumbers) -> dict[str, Any]:
    value, unit = q.unit(factor.value, factor.unit)
    return {"symbol": factor.symbol, "value": value, "unit": unit, "basis": factor.basis,
            "clause": _clause(factor.clause)}


def _envelope(envelope: Envelope, q: ShownNumbers, n: Notation) -> dict[str, Any]:
    value, unit = q.unit(envelope.value, envelope.unit)
    return {
        "name": envelope.name, "symbol": in_notation(envelope.symbol, n),
        "bound": str(envelope.bound),
        "value": value, "unit": unit, "governing": envelope.governing_candidate.label,
        "candidates": [
            {"label": c.label, "value": q.value(c.value, envelope.unit),
             "excess": q.value(envelope.excess(c), envelope.unit),
             "governs": i == envelope.governing, "clause": _clause(c.clause)}
            for i, c in enumerate(envelope.candidates)],
    } | _overhangs(envelope, q)


def _overhangs(envelope: Envelope, q: ShownNumbers) -> dict[str, Any]:
    """Per slab side, the overhang and the rule that governs it (per-side width rules)."""
    if not isinstance(envelope, OverhangEnvelope):
        return {}
    return {"overhangs": [{"side": o.side, "width": q.value(o.width, "mm"),
                           "rule": o.rule.label, "clause": _clause(o.clause)}
                          for o in envelope.overhangs]}


def _check(check: Check, q: ShownNumbers, n: Notation) -> dict[str, Any]:
    """A check, its symbol in the edition's notation (as the text report writes it)."""
    value, unit = q.unit(check.value, check.unit)
    return {"name": check.name, "symbol": in_notation(check.symbol, n), "value": value,
            "limit": q.value(check.limit, check.unit), "unit": unit, "sense": str(check.sense),
            "utilisation": q.plain(check.utilisation), "passed": bool(check.passed),
            "clause": _clause(check.clause), "note": check.note}


def _governing(a: Assessment, q: ShownNumbers) -> dict[str, Any] | None:
    check = a.governing
    if check is None:
        return None
    return {"name": check.name, "utilisation": q.plain(check.utilisation),
            "clause": _clause(check.clause)}


def _section(a: Assessment, q: ShownNumbers) -> dict[str, Any] | None:
    r = a.response
    if r is None:
        return None
    return {
        "equilibrium": r.equilibrium, "message": r.message,
        "neutral_axis_depth": q.value(r.c, "mm"), "zone_depth": q.value(r.zone_depth, "mm"),
        "block_case": r.block_case, "block_in_flange": r.block_in_flange,
        "c_over_d": q.plain(r.c_over_d), "c_over_dt": q.plain(r.c_over_dt),
        "net_tensile_strain": q.plain(r.net_tensile_strain),
        "concrete_force": q.value(r.concrete_force, "N"),
        "overhang_force": q.value(r.overhang_force, "N"),
        "web_force": q.value(r.web_force, "N"),
        "nominal_moment": q.value(r.nominal_moment, "N·mm"),
        "layers": [{"depth": q.value(s.depth, "mm"), "area": q.value(s.area, "mm²"),
                    "strain": q.plain(s.strain), "stress": q.value(s.stress, "MPa"),
                    "force": q.value(s.force, "N"), "yielded": s.yielded}
                   for s in r.layers],
    }


def _resistance(a: Assessment, q: ShownNumbers) -> dict[str, Any] | None:
    if a.resistance is None or a.design_resistance is None:
        return None
    return {"factor": _factor(a.resistance.factor, q), "regime": a.resistance.regime.name,
            "regime_clause": _clause(a.resistance.regime.clause),
            "design_resistance": q.value(a.design_resistance.value, "N·mm"),
            "requirement": _clause(a.resistance.requirement)}


def record(outcome: Outcome, units: str = "beam", digits: int = DIGITS) -> dict[str, Any]:
    """One beam under one edition as plain data (None where a value does not exist), in
    the beam's own unit system (``units="beam"``) or in SI, to ``digits`` significant
    figures; the record's ``units`` table names the unit of each kind of quantity."""
    entry, a = outcome.entry, outcome.assessment
    system = UnitSystem.SI if units == "SI" else entry.beam.unit_system
    q = ShownNumbers(system, digits)
    n = outcome.notation
    base: dict[str, Any] = {
        "beam": entry.beam.id, "title": entry.beam.title, "edition": outcome.edition,
        "situation": outcome.situation, "status": outcome.status, "caution": CAUTION,
        "units": units_table(system),
        "inputs": {input_label(k, outcome.notation): v for k, v in entry.shown.items()},
    }
    if a is None:
        return base | {"error": outcome.error}
    return base | {
        "edition_title": a.edition_title, "form": a.form, "form_basis": a.form_basis,
        "notation": {"concrete": n.concrete, "steel": n.steel, "neutral_axis": n.neutral_axis,
                     "strain": n.strain, "nominal": n.nominal, "resistance": n.resistance,
                     "demand": n.demand},
        "stack": [{"id": s.id, "title": s.title, "distribution": s.distribution,
                   "version": s.version, "source": s.source} for s in a.stack],
        "summary": a.summary(), "governing_check": _governing(a, q),
        "effective_width": _envelope(a.effective_width, q, n) if a.effective_width else None,
        "section": _section(a, q), "resistance": _resistance(a, q),
        "demand": _envelope(a.demand, q, n) if a.demand else None,
        "checks": [_check(c, q, n) for c in a.checks],
        "remarks": list(a.remarks),
        "applicability": [_check(c, q, n) for c in a.applicability],
        "factors": [_factor(f, q) for f in (*a.concrete_factors, *a.steel_factors)],
        "parameters": [{"name": p.name, "value": p.value, "unit": p.unit,
                        "description": p.description, "supplier": p.clause.edition,
                        "clause": _clause(p.clause)} for p in a.parameters],
        "topics": [{"hook": t.hook, "answered_by": list(t.answered_by),
                    "wrapped_by": list(t.wrapped_by)} for t in a.topics],
    }


def refused_beams(problems: Iterable[tuple[str | None, int | None, str]]
                  ) -> list[tuple[str | None, str]]:
    """One ``(beam id, messages)`` per refused beam, its problems' messages joined in file
    order, from ``(beam id, place in the file, message)``: a table keyed by beam (and
    edition) then has one row for each, as for an assessed beam. Beams without an id stay
    apart by their place; a problem of no beam is a row of its own."""
    grouped: dict[Any, tuple[str | None, list[str]]] = {}
    for beam, place, message in problems:
        key = object() if beam is None and place is None else (beam, place)
        grouped.setdefault(key, (beam, []))[1].append(message)
    return [(beam, "; ".join(messages)) for beam, messages in grouped.values()]


def problem_record(problem: InputProblem) -> dict[str, Any]:
    return {"file": problem.file, "beam": problem.beam, "field": problem.field,
            "value": problem.value, "expected": problem.expected, "message": problem.message}


def document(schedule: Schedule, outcomes: Iterable[Outcome], units: str = "beam",
             digits: int = DIGITS) -> dict[str, Any]:
    """The whole run: project, results per beam and edition, and the beams refused.
    ``units``: "beam" (each beam's own system, named in each record's ``units``) or
    "SI"; numbers to ``digits`` significant figures."""
    from clausewise import __version__

    p = schedule.project
    return {
        "caution": CAUTION, "tool": "clausewise", "version": __version__,
        "source": str(schedule.source),
        "project": {"name": p.name, "building": p.building, "town": p.town,
                    "engineer": p.engineer, "notes": p.notes},
        "units": units, "digits": digits,
        "results": [record(o, units, digits) for o in outcomes],
        "problems": [problem_record(q) for q in schedule.problems],
    }


def editions_document(registry: Registry) -> dict[str, Any]:
    """The installed editions and the broken plugins, as plain data."""
    return {
        "caution": CAUTION,
        "editions": [{"id": r.info.id, "title": r.info.title, "year": r.info.year,
                      "extends": r.info.extends, "forms": list(registry.forms(r)),
                      "distribution": r.distribution, "version": r.version,
                      "source": r.source, "own_topics": _own_topics(registry, r.info.id)}
                     for r in registry.records if r.ok and r.info],
        "broken": [{"name": r.name, "source": r.source, "distribution": r.distribution,
                    "version": r.version, "error": r.error} for r in registry.broken]
        + [{"name": edition_id, "source": "edition stack", "distribution": "", "version": "",
            "error": why} for edition_id, why in registry.unusable().items()],
    }


def _own_topics(registry: Registry, edition_id: str) -> dict[str, str]:
    """What a layer answers or wraps itself, by hook (empty where its stack is broken)."""
    from clausewise.provisions import EditionError

    try:
        return registry.edition(edition_id).contributions()
    except EditionError:
        return {}


def parameters_document(edition: Edition, form: str) -> dict[str, Any]:
    """An edition's named parameters after layering, with their contract and supplier."""
    from clausewise.provisions.beam import Context

    rows = []
    for p in edition.parameters(Context(form=form)).values():
        row: dict[str, Any] = {"name": p.name, "value": p.value, "unit": p.unit,
                               "description": p.description, "clause": p.clause.ref,
                               "clause_title": p.clause.title, "supplier": p.clause.edition}
        if p.bounds is not None:
            row["bounds"] = list(p.bounds)
        if p.choices is not None:
            row["choices"] = list(p.choices)
        rows.append(row)
    return {"caution": CAUTION, "edition": edition.id, "form": form, "parameters": rows}


def topics_document(edition: Edition) -> dict[str, Any]:
    """Which layer of an edition's stack answers each hook as installed, and which wrap it."""
    from clausewise.provisions.hookspecs import HOOKS

    return {"caution": CAUTION, "edition": edition.id,
            "layers": [r.info.id for r in edition.layers if r.info],
            "topics": [{"hook": t.hook, "answered_by": list(t.answered_by),
                        "wrapped_by": list(t.wrapped_by)}
                       for t in (edition.layering(h.name) for h in HOOKS)]}
