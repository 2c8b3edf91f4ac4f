"""One record per beam and edition as plain data (None where a value does not exist)."""

from __future__ import annotations

import math
from collections.abc import Iterable
from typing import TYPE_CHECKING, Any

from clausewise.provisions import CAUTION, Assessment, Check, Clause, Envelope, Factor
from clausewise.provisions.verdicts import ERROR
from clausewise.results.display import UNITS, convert

if TYPE_CHECKING:
    from clausewise.beamfile import InputProblem, Schedule
    from clausewise.provisions import Edition, Registry
    from clausewise.results.running import Outcome

INPUT_PROBLEM = "input problem"
STATUSES = ("pass", "fail", "outside scope", "no equilibrium", ERROR)


def _number(value: Any) -> float | None:
    """A finite float, or None (JSON has no NaN or infinity)."""
    number = float(value)
    return number if math.isfinite(number) else None


def _si(value: Any, unit: str) -> tuple[float | None, str]:
    number, shown = convert(value, unit)
    return _number(number), shown


def _clause(clause: Clause) -> dict[str, str]:
    return {"ref": clause.ref, "title": clause.title, "edition": clause.edition}


def _factor(factor: Factor) -> dict[str, Any]:
    value, unit = _si(factor.value, factor.unit)
    return {"symbol": factor.symbol, "value": value, "unit": unit, "basis": factor.basis,
            "clause": _clause(factor.clause)}


def _envelope(envelope: Envelope) -> dict[str, Any]:
    value, unit = _si(envelope.value, envelope.unit)
    return {
        "name": envelope.name, "symbol": envelope.symbol, "bound": str(envelope.bound),
        "value": value, "unit": unit, "governing": envelope.governing_candidate.label,
        "candidates": [
            {"label": c.label, "value": _si(c.value, envelope.unit)[0],
             "excess": _si(envelope.excess(c), envelope.unit)[0],
             "governs": i == envelope.governing, "clause": _clause(c.clause)}
            for i, c in enumerate(envelope.candidates)],
    }


def _check(check: Check) -> dict[str, Any]:
    value, unit = _si(check.value, check.unit)
    return {"name": check.name, "symbol": check.symbol, "value": value,
            "limit": _si(check.limit, check.unit)[0], "unit": unit, "sense": str(check.sense),
            "utilisation": _number(check.utilisation), "passed": bool(check.passed),
            "clause": _clause(check.clause), "note": check.note}


def _governing(a: Assessment) -> dict[str, Any] | None:
    check = a.governing
    if check is None:
        return None
    return {"name": check.name, "utilisation": _number(check.utilisation),
            "clause": _clause(check.clause)}


def _section(a: Assessment) -> dict[str, Any] | None:
    r = a.response
    if r is None:
        return None
    return {
        "equilibrium": r.equilibrium, "message": r.message,
        "neutral_axis_depth": _number(r.c), "zone_depth": _number(r.zone_depth),
        "block_case": r.block_case, "block_in_flange": r.block_in_flange,
        "c_over_d": _number(r.c_over_d), "c_over_dt": _number(r.c_over_dt),
        "net_tensile_strain": _number(r.net_tensile_strain),
        "concrete_force": _si(r.concrete_force, "N")[0],
        "overhang_force": _si(r.overhang_force, "N")[0],
        "web_force": _si(r.web_force, "N")[0],
        "nominal_moment": _si(r.nominal_moment, "N·mm")[0],
        "layers": [{"depth": _number(s.depth), "area": _number(s.area),
                    "strain": _number(s.strain), "stress": _number(s.stress),
                    "force": _si(s.force, "N")[0], "yielded": s.yielded}
                   for s in r.layers],
    }


def _resistance(a: Assessment) -> dict[str, Any] | None:
    if a.resistance is None or a.design_resistance is None:
        return None
    return {"factor": _factor(a.resistance.factor), "regime": a.resistance.regime.name,
            "regime_clause": _clause(a.resistance.regime.clause),
            "design_resistance": _si(a.design_resistance.value, "N·mm")[0],
            "requirement": _clause(a.resistance.requirement)}


def record(outcome: Outcome) -> dict[str, Any]:
    """One beam under one edition as plain data (None where a value does not exist)."""
    entry, a = outcome.entry, outcome.assessment
    base: dict[str, Any] = {
        "beam": entry.beam.id, "title": entry.beam.title, "edition": outcome.edition,
        "situation": outcome.situation, "status": outcome.status, "caution": CAUTION,
        "inputs": dict(entry.shown),
    }
    if a is None:
        return base | {"error": outcome.error}
    return base | {
        "edition_title": a.edition_title, "form": a.form, "form_basis": a.form_basis,
        "stack": [{"id": s.id, "title": s.title, "distribution": s.distribution,
                   "version": s.version, "source": s.source} for s in a.stack],
        "summary": a.summary(), "governing_check": _governing(a),
        "effective_width": _envelope(a.effective_width) if a.effective_width else None,
        "section": _section(a), "resistance": _resistance(a),
        "demand": _envelope(a.demand) if a.demand else None,
        "checks": [_check(c) for c in a.checks],
        "remarks": list(a.remarks),
        "applicability": [_check(c) for c in a.applicability],
        "factors": [_factor(f) for f in (*a.concrete_factors, *a.steel_factors)],
        "parameters": [{"name": p.name, "value": p.value, "unit": p.unit,
                        "description": p.description, "supplier": p.clause.edition,
                        "clause": _clause(p.clause)} for p in a.parameters],
    }


def problem_record(problem: InputProblem) -> dict[str, Any]:
    return {"file": problem.file, "beam": problem.beam, "field": problem.field,
            "value": problem.value, "expected": problem.expected, "message": problem.message}


def document(schedule: Schedule, outcomes: Iterable[Outcome]) -> dict[str, Any]:
    """The whole run: project, results per beam and edition, and the beams refused."""
    from clausewise import __version__

    p = schedule.project
    return {
        "caution": CAUTION, "tool": "clausewise", "version": __version__,
        "source": str(schedule.source),
        "project": {"name": p.name, "building": p.building, "town": p.town,
                    "engineer": p.engineer, "notes": p.notes},
        "units": UNITS,
        "results": [record(o) for o in outcomes],
        "problems": [problem_record(q) for q in schedule.problems],
    }


def editions_document(registry: Registry) -> dict[str, Any]:
    """The installed editions and the broken plugins, as plain data."""
    return {
        "caution": CAUTION,
        "editions": [{"id": r.info.id, "title": r.info.title, "year": r.info.year,
                      "extends": r.info.extends, "forms": list(registry.forms(r)),
                      "distribution": r.distribution, "version": r.version,
                      "source": r.source}
                     for r in registry.records if r.ok and r.info],
        "broken": [{"name": r.name, "source": r.source, "distribution": r.distribution,
                    "version": r.version, "error": r.error} for r in registry.broken]
        + [{"name": edition_id, "source": "edition stack", "distribution": "", "version": "",
            "error": why} for edition_id, why in registry.unusable().items()],
    }


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
