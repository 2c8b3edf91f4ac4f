"""Results as plain data: one record per beam and edition, for JSON, TOML and CSV.

Machine-readable results use one fixed set of units whatever the beam's input
units (moments kN·m, forces kN, lengths mm, areas mm², stresses MPa), named in
the document's ``units`` table; the inputs are kept as the engineer wrote them.
Every record carries the edition id, the form, the stack's versions, the status,
the governing check and the caution.
"""

from __future__ import annotations

import csv
import io
import json
import math
import os
import tempfile
from collections.abc import Iterable, Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any

from clausewise.core.errors import ClausewiseError
from clausewise.provisions.beam import UnitSystem
from clausewise.provisions.engine import CAUTION, ERROR, Assessment, assess
from clausewise.provisions.materials import MM_PER_IN, MPA_PER_PSI
from clausewise.provisions.vocabulary import Check, Clause, Envelope, Factor

if TYPE_CHECKING:
    from clausewise.provisions.inputs import BeamEntry, InputProblem, Schedule
    from clausewise.provisions.registry import Edition, Registry

INPUT_PROBLEM = "input problem"
STATUSES = ("pass", "fail", "outside scope", "no equilibrium", ERROR)

N_PER_KIP = 4448.2216152605  # 1000 lbf in N, exact by definition of the pound-force
MM_PER_FT = 12 * MM_PER_IN

# internal unit -> (shown unit, factor) per unit system
_SCALES: dict[UnitSystem, dict[str, tuple[str, float]]] = {
    UnitSystem.SI: {"N·mm": ("kN·m", 1e-6), "N": ("kN", 1e-3), "mm": ("mm", 1.0),
                    "mm²": ("mm²", 1.0), "MPa": ("MPa", 1.0)},
    UnitSystem.US: {"N·mm": ("kip·ft", 1 / (N_PER_KIP * MM_PER_FT)), "N": ("kip", 1 / N_PER_KIP),
                    "mm": ("in", 1 / MM_PER_IN), "mm²": ("in²", 1 / MM_PER_IN**2),
                    "MPa": ("psi", 1 / MPA_PER_PSI)},
}
UNITS = {"moment": "kN·m", "force": "kN", "length": "mm", "area": "mm²", "stress": "MPa"}


def convert(value: Any, unit: str, system: UnitSystem = UnitSystem.SI) -> tuple[float, str]:
    """An internal value (N, mm, MPa, N·mm) in the units shown for a unit system."""
    shown, scale = _SCALES[system].get(unit, (unit, 1.0))
    return float(value) * scale, shown


def number(value: Any, digits: int = 4) -> str:
    """``digits`` significant figures, no trailing zeros, thousands grouped from 10 000."""
    v = float(value)
    if not math.isfinite(v):
        return "—" if math.isnan(v) else "∞" if v > 0 else "-∞"
    if v == 0:
        return "0"
    magnitude = math.floor(math.log10(abs(v)))
    if magnitude >= digits - 1:
        return f"{v:,.0f}".replace(",", " ") if abs(v) >= 10_000 else f"{v:.0f}"
    text = f"{v:.{digits - 1 - magnitude}f}"
    return text.rstrip("0").rstrip(".")


@dataclass(frozen=True)
class Units:
    """How one beam's quantities are shown to the engineer: in its own unit system,
    with psi turning to ksi from 100 000 psi (moduli)."""

    system: UnitSystem

    def value(self, value: Any, unit: str, digits: int = 4) -> str:
        shown, name = convert(value, unit, self.system)
        if name == "psi" and abs(shown) >= 100_000:
            shown, name = shown / 1000, "ksi"
        text = number(shown, digits)
        return f"{text} {name}" if name and math.isfinite(shown) else text

    def unit(self, unit: str) -> str:
        return convert(1.0, unit, self.system)[1]

    def moment(self, value: Any) -> str:
        return self.value(value, "N·mm")

    def length(self, value: Any) -> str:
        return self.value(value, "mm")


def _mode_for(path: Path) -> int:
    """The permissions a plain new file would get (the temporary one is private), or those
    of the file being replaced."""
    if path.exists():
        return path.stat().st_mode & 0o7777
    umask = os.umask(0)
    os.umask(umask)
    return 0o666 & ~umask


def write_atomic(path: Path, data: str | bytes) -> None:
    """Write a file whole or not at all: a temporary file in the same folder, then
    ``os.replace``, so a reader never sees half a file and an old file survives a failure."""
    raw = data.encode() if isinstance(data, str) else data
    fd, temporary = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".tmp")
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(raw)
            os.fchmod(handle.fileno(), _mode_for(path))
        os.replace(temporary, path)
    except BaseException:
        os.unlink(temporary)
        raise


# --- running a schedule ----------------------------------------------------------------

@dataclass(frozen=True)
class Outcome:
    """One beam under one edition: its assessment, or why it could not be assessed."""

    entry: BeamEntry
    edition: str
    assessment: Assessment | None = None
    error: str = ""
    situation: str = "persistent"

    @property
    def status(self) -> str:
        return self.assessment.status if self.assessment else ERROR


def run(schedule: Schedule, editions: Sequence[Edition], form: str | None,
        situation: str) -> Iterator[Outcome]:
    """Every good beam of the schedule under every edition, one at a time.

    A beam that an edition cannot assess (a broken plugin, a form the edition lacks,
    a degenerate section) becomes an outcome with the error, and the others go on.
    """
    for entry in schedule.entries:
        for edition in editions:
            try:
                found = assess(entry.beam, edition, form=form, situation=situation)
            except ClausewiseError as exc:
                yield Outcome(entry, edition.id, error=str(exc), situation=situation)
            else:
                yield Outcome(entry, edition.id, found, situation=situation)


# --- records -----------------------------------------------------------------------------

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


# --- writers -------------------------------------------------------------------------------

def to_json(data: dict[str, Any]) -> str:
    return json.dumps(data, indent=2, ensure_ascii=False, allow_nan=False) + "\n"


def _without_none(value: Any) -> Any:
    if isinstance(value, dict):
        return {k: _without_none(v) for k, v in value.items() if v is not None}
    if isinstance(value, list):
        return [_without_none(v) for v in value if v is not None]
    return value


def to_toml(data: dict[str, Any]) -> str:
    """TOML has no null: absent values are left out."""
    import tomli_w

    return tomli_w.dumps(_without_none(data))


CSV_COLUMNS = (
    "beam", "edition", "form", "situation", "status", "governing_check", "governing_clause",
    "utilisation", "M_Ed_kNm", "M_Rd_kNm", "Mn_kNm", "resistance_factor", "b_eff_mm",
    "block_case", "c_mm", "c_over_d", "net_tensile_strain", "regime", "stack", "summary",
)


def csv_row(rec: dict[str, Any]) -> dict[str, Any]:
    """One result record as a flat CSV row (blank where a value does not exist)."""
    governing = rec.get("governing_check") or {}
    section = rec.get("section") or {}
    resistance = rec.get("resistance") or {}
    demand = rec.get("demand") or {}
    width = rec.get("effective_width") or {}
    factor = resistance.get("factor") or {}
    clause = governing.get("clause")
    return {
        "beam": rec["beam"], "edition": rec["edition"], "form": rec.get("form", ""),
        "situation": rec["situation"], "status": rec["status"],
        "governing_check": governing.get("name", ""),
        "governing_clause": f"{clause['edition']} {clause['ref']}" if clause else "",
        "utilisation": governing.get("utilisation"), "M_Ed_kNm": demand.get("value"),
        "M_Rd_kNm": resistance.get("design_resistance"),
        "Mn_kNm": section.get("nominal_moment"),
        "resistance_factor": f"{factor['symbol']} = {factor['value']:.4g}" if factor else "",
        "b_eff_mm": width.get("value"), "block_case": section.get("block_case", ""),
        "c_mm": section.get("neutral_axis_depth"), "c_over_d": section.get("c_over_d"),
        "net_tensile_strain": section.get("net_tensile_strain"),
        "regime": resistance.get("regime", ""),
        "stack": "; ".join(f"{s['id']} {s['version']} ({s['distribution']})"
                           for s in rec.get("stack", ())),
        "summary": rec.get("summary") or rec.get("error", ""),
    }


def to_csv(data: dict[str, Any]) -> str:
    """One row per beam and edition, then one per refused beam; the caution is the
    first row, so a spreadsheet shows it in its first cell."""
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow([f"# {data['caution']}"])
    columns = csv.DictWriter(out, CSV_COLUMNS, lineterminator="\n")
    columns.writeheader()
    for rec in data["results"]:
        columns.writerow({k: "" if v is None else v for k, v in csv_row(rec).items()})
    for problem in data["problems"]:
        columns.writerow({"beam": problem["beam"] or "", "status": INPUT_PROBLEM,
                          "summary": problem["message"]})
    return out.getvalue()


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


def parameters_csv(data: dict[str, Any]) -> str:
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow([f"# {data['caution']}"])
    writer.writerow(["edition", "form", "name", "value", "unit", "may be set to", "clause",
                     "supplier", "description"])
    for p in data["parameters"]:
        allowed = " | ".join(p["choices"]) if "choices" in p else \
            " to ".join(f"{b:g}" for b in p["bounds"]) if "bounds" in p else ""
        writer.writerow([data["edition"], data["form"], p["name"], p["value"], p["unit"],
                         allowed, p["clause"], p["supplier"], p["description"]])
    return out.getvalue()


def editions_csv(data: dict[str, Any]) -> str:
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow([f"# {data['caution']}"])
    writer.writerow(["id", "title", "year", "extends", "forms", "distribution", "version",
                     "error"])
    for e in data["editions"]:
        writer.writerow([e["id"], e["title"], e["year"], e["extends"] or "",
                         " ".join(e["forms"]), e["distribution"], e["version"], ""])
    for b in data["broken"]:
        writer.writerow([b["name"], "", "", "", "", b["distribution"], b["version"], b["error"]])
    return out.getvalue()


# --- the schema of the JSON results ---------------------------------------------------------

def _obj(properties: dict[str, Any], required: Sequence[str] = ()) -> dict[str, Any]:
    return {"type": "object", "properties": properties, "required": list(required)}


_NUM = {"type": ["number", "null"]}
_STR = {"type": "string"}
_CLAUSE = _obj({"ref": _STR, "title": _STR, "edition": _STR}, ("ref", "title", "edition"))
_CHECK = _obj({"name": _STR, "symbol": _STR, "value": _NUM, "limit": _NUM, "unit": _STR,
               "sense": {"enum": ["at most", "at least"]}, "utilisation": _NUM,
               "passed": {"type": "boolean"}, "clause": _CLAUSE, "note": _STR},
              ("name", "value", "limit", "sense", "utilisation", "passed", "clause"))
_FACTOR = _obj({"symbol": _STR, "value": _NUM, "unit": _STR, "basis": _STR,
                "clause": _CLAUSE}, ("symbol", "value", "clause"))
_ENVELOPE = _obj({
    "name": _STR, "symbol": _STR, "bound": {"enum": ["smallest", "largest"]}, "value": _NUM,
    "unit": _STR, "governing": _STR,
    "candidates": {"type": "array", "minItems": 1, "items": _obj(
        {"label": _STR, "value": _NUM, "excess": _NUM, "governs": {"type": "boolean"},
         "clause": _CLAUSE}, ("label", "value", "governs", "clause"))},
}, ("name", "value", "governing", "candidates"))


def _nullable(schema: dict[str, Any]) -> dict[str, Any]:
    return {"anyOf": [schema, {"type": "null"}]}


def results_schema() -> dict[str, Any]:
    """JSON Schema (draft 2020-12) of the JSON results document."""
    result = _obj({
        "beam": _STR, "title": _STR, "edition": _STR, "edition_title": _STR,
        "situation": _STR, "status": {"enum": list(STATUSES)}, "caution": {"const": CAUTION},
        "inputs": {"type": "object", "additionalProperties": _STR},
        "error": _STR, "form": _STR, "form_basis": _STR, "summary": _STR,
        "stack": {"type": "array", "minItems": 1, "items": _obj(
            {"id": _STR, "title": _STR, "distribution": _STR, "version": _STR,
             "source": _STR}, ("id", "distribution", "version"))},
        "governing_check": _nullable(_obj({"name": _STR, "utilisation": _NUM,
                                           "clause": _CLAUSE}, ("name", "clause"))),
        "effective_width": _nullable(_ENVELOPE),
        "section": _nullable(_obj({
            "equilibrium": {"type": "boolean"}, "message": _STR, "block_case": _STR,
            "block_in_flange": {"type": "boolean"}, "neutral_axis_depth": _NUM,
            "zone_depth": _NUM, "c_over_d": _NUM, "c_over_dt": _NUM,
            "net_tensile_strain": _NUM, "concrete_force": _NUM, "overhang_force": _NUM,
            "web_force": _NUM, "nominal_moment": _NUM,
            "layers": {"type": "array", "items": _obj(
                {"depth": _NUM, "area": _NUM, "strain": _NUM, "stress": _NUM, "force": _NUM,
                 "yielded": {"type": "boolean"}}, ("depth", "area", "strain", "stress"))},
        }, ("equilibrium", "block_case", "nominal_moment", "layers"))),
        "resistance": _nullable(_obj({
            "factor": _FACTOR, "regime": _STR, "regime_clause": _CLAUSE,
            "design_resistance": _NUM, "requirement": _CLAUSE,
        }, ("factor", "regime", "design_resistance"))),
        "demand": _nullable(_ENVELOPE),
        "checks": {"type": "array", "items": _CHECK},
        "applicability": {"type": "array", "items": _CHECK},
        "factors": {"type": "array", "items": _FACTOR},
        "parameters": {"type": "array", "items": _obj(
            {"name": _STR, "value": {"type": ["number", "string"]}, "unit": _STR,
             "description": _STR, "supplier": _STR, "clause": _CLAUSE},
            ("name", "value", "supplier", "clause"))},
    }, ("beam", "edition", "situation", "status", "caution", "inputs"))
    result["if"] = {"properties": {"status": {"const": ERROR}}}
    result["then"] = {"required": ["error"]}
    result["else"] = {"required": ["form", "stack", "summary", "governing_check", "checks"]}
    return {
        "$schema": "https://json-schema.org/draft/2020-12/schema",
        "title": "clausewise results",
        "description": "Flexural checks of beams under design-standard editions. " + CAUTION,
        **_obj({
            "caution": {"const": CAUTION}, "tool": {"const": "clausewise"}, "version": _STR,
            "source": _STR,
            "project": _obj({k: _STR for k in ("name", "building", "town", "engineer",
                                                "notes")}),
            "units": _obj({k: {"const": v} for k, v in UNITS.items()}, tuple(UNITS)),
            "results": {"type": "array", "items": result},
            "problems": {"type": "array", "items": _obj(
                {"file": _STR, "beam": {"type": ["string", "null"]}, "field": _STR,
                 "value": _STR, "expected": _STR, "message": _STR},
                ("file", "field", "message"))},
        }, ("caution", "tool", "version", "source", "project", "units", "results",
            "problems")),
    }
