"""JSON, TOML and CSV text of the records."""

from __future__ import annotations

import csv
import io
import json
import math
from typing import Any

from clausewise.results.records import INPUT_PROBLEM


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


def _factor_text(factor: dict[str, Any]) -> str:
    """``φ = 0.9``; a factor without a finite value (no equilibrium, or a plugin's NaN)
    says so instead of failing."""
    if not factor:
        return ""
    value = factor.get("value")
    shown = f"{value:.4g}" if isinstance(value, int | float) and math.isfinite(value) \
        else "no value"
    return f"{factor.get('symbol', '')} = {shown}"


def _cell(value: Any) -> Any:
    """A CSV cell: blank for a missing or non-finite number (a spreadsheet reads "nan" as
    text, and JSON has none)."""
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return ""
    return value


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
        "resistance_factor": _factor_text(factor),
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
        columns.writerow({k: _cell(v) for k, v in csv_row(rec).items()})
    for problem in data["problems"]:
        columns.writerow({"beam": problem["beam"] or "", "status": INPUT_PROBLEM,
                          "summary": problem["message"]})
    return out.getvalue()


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


