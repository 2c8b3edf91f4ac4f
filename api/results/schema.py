"""JSON Schema (draft 2020-12) of the JSON results."""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from clausewise.provisions import CAUTION
from clausewise.provisions.verdicts import ERROR
from clausewise.results.records import STATUSES


def _obj(properties: dict[str, Any], required: Sequence[str] = ()) -> dict[str, Any]:
    return {"type": "object", "properties": properties, "required": list(required)}


_NUM = {"type": ["number", "null"]}
_KINDS = ("moment", "force", "length", "area", "stress")
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
    "overhangs": {"type": "array", "items": _obj(
        {"side": _STR, "width": _NUM, "rule": _STR, "clause": _CLAUSE},
        ("side", "width", "rule", "clause"))},
}, ("name", "value", "governing", "candidates"))


def _nullable(schema: dict[str, Any]) -> dict[str, Any]:
    return {"anyOf": [schema, {"type": "null"}]}


def results_schema() -> dict[str, Any]:
    """JSON Schema (draft 2020-12) of the JSON results document."""
    result = _obj({
        "beam": _STR, "title": _STR, "edition": _STR, "edition_title": _STR,
        "situation": _STR, "status": {"enum": list(STATUSES)}, "caution": {"const": CAUTION},
        "inputs": {"type": "object", "additionalProperties": _STR},
        "units": _obj({k: _STR for k in _KINDS}, _KINDS),
        "notation": {"type": "object", "additionalProperties": _STR},
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
        "remarks": {"type": "array", "items": _STR},
        "applicability": {"type": "array", "items": _CHECK},
        "factors": {"type": "array", "items": _FACTOR},
        "parameters": {"type": "array", "items": _obj(
            {"name": _STR, "value": {"type": ["number", "string"]}, "unit": _STR,
             "description": _STR, "supplier": _STR, "clause": _CLAUSE},
            ("name", "value", "supplier", "clause"))},
        "topics": {"type": "array", "items": _obj(
            {"hook": _STR, "answered_by": {"type": "array", "items": _STR},
             "wrapped_by": {"type": "array", "items": _STR}},
            ("hook", "answered_by", "wrapped_by"))},
    }, ("beam", "edition", "situation", "status", "caution", "units", "inputs"))
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
            "units": {"enum": ["beam", "SI"]},
            "digits": {"type": "integer", "minimum": 1},
            "results": {"type": "array", "items": result},
            "problems": {"type": "array", "items": _obj(
                {"file": _STR, "beam": {"type": ["string", "null"]}, "field": _STR,
                 "value": _STR, "expected": _STR, "message": _STR},
                ("file", "field", "message"))},
        }, ("caution", "tool", "version", "source", "project", "units", "results",
            "problems")),
    }
