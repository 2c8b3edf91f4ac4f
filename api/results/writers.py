"""JSON, TOML and CSV text of the records."""

from __future__ import annotations

import csv
import io
import json
import math
from typing import Any

from clausewise.results.display import UNITS
from clausewise.results.records import INPUT_PROBLEM, refused_beams


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


COLUMN_UNITS = {"kN·m": "kNm", "kip·ft": "kip_ft", "mm": "mm", "in": "in", "mm²": "mm2",
                "in²": "in2", "kg/m": "kg_per_m", "lb/ft": "lb_per_ft"}
"""A unit as it is spelled in a CSV column's name."""


def result_columns(units: dict[str, str]) -> tuple[str, ...]:
    """The one column scheme of every CSV of results (check, compare, batch): the unit
    in the name of every column that has one; the caution in every row, so a file or
    a filtered copy of it never loses it and the header stays the first row."""
    moment, length = COLUMN_UNITS[units["moment"]], COLUMN_UNITS[units["length"]]
    return ("beam", "edition", "form", "situation", "status", "utilisation",
            "governing_check", "governing_clause", f"M_Ed_{moment}", f"M_Rd_{moment}",
            f"Mn_{moment}", "resistance_factor", f"b_eff_{length}", "width_governed_by",
            "combination", f"c_{length}", "net_tensile_strain", "regime", "block_case",
            "stack", "summary", "caution")


NUMBER_COLUMNS = (5, 8, 9, 10, 11, 12, 15, 16)
"""The positions in :func:`result_columns` of the columns that hold numbers (JSON Lines
write them as JSON numbers)."""


def csv_row(rec: dict[str, Any]) -> dict[str, Any]:
    """One result record as a flat CSV row (None where a value does not exist)."""
    governing = rec.get("governing_check") or {}
    section = rec.get("section") or {}
    resistance = rec.get("resistance") or {}
    demand = rec.get("demand") or {}
    width = rec.get("effective_width") or {}
    factor = resistance.get("factor") or {}
    clause = governing.get("clause")
    values = (
        rec["beam"], rec["edition"], rec.get("form", ""), rec["situation"], rec["status"],
        governing.get("utilisation"), governing.get("name", ""),
        f"{clause['edition']} {clause['ref']}" if clause else "", demand.get("value"),
        resistance.get("design_resistance"), section.get("nominal_moment"),
        factor.get("value"), width.get("value"), width.get("governing", ""),
        demand.get("governing", ""), section.get("neutral_axis_depth"),
        section.get("net_tensile_strain"), resistance.get("regime", ""),
        section.get("block_case", ""),
        "; ".join(f"{s['id']} {s['version']} ({s['distribution']})"
                  for s in rec.get("stack", ())),
        rec.get("summary") or rec.get("error", ""), rec["caution"],
    )
    return dict(zip(result_columns(rec.get("units") or UNITS), values, strict=True))


def _cell(value: Any) -> Any:
    """Blank for a missing or non-finite number (a spreadsheet reads "nan" as text, and
    JSON has none); a number as its shortest text ("420", not "420.0")."""
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return ""
    return format(value, ".15g") if isinstance(value, float) else value


def to_csv(data: dict[str, Any]) -> str:
    """One row per beam and edition, then one per refused beam; the header is the first
    row and the caution is a column. Every record must share one unit system (the
    command line asks for SI when a file mixes them)."""
    from clausewise.provisions import CAUTION
    from clausewise.results.display import UNITS

    systems = {tuple(r["units"].items()) for r in data["results"]}
    if len(systems) > 1:
        raise ValueError("these results mix unit systems; a CSV needs one: use --units SI")
    units = data["results"][0]["units"] if data["results"] else UNITS
    columns = result_columns(units)
    out = io.StringIO()
    writer = csv.DictWriter(out, columns, lineterminator="\n")
    writer.writeheader()
    for rec in data["results"]:
        writer.writerow({k: _cell(v) for k, v in csv_row(rec).items()})
    for beam, messages in refused_beams((p["beam"], None, p["message"])
                                        for p in data["problems"]):
        writer.writerow({"beam": beam or "", "status": INPUT_PROBLEM, "summary": messages,
                         "caution": CAUTION})
    return out.getvalue()


def parameters_csv(data: dict[str, Any]) -> str:
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(["edition", "form", "name", "value", "unit", "may be set to", "clause",
                     "supplier", "description", "caution"])
    for p in data["parameters"]:
        allowed = " | ".join(p["choices"]) if "choices" in p else \
            " to ".join(f"{b:g}" for b in p["bounds"]) if "bounds" in p else ""
        writer.writerow([data["edition"], data["form"], p["name"], p["value"], p["unit"],
                         allowed, p["clause"], p["supplier"], p["description"],
                         data["caution"]])
    return out.getvalue()


def editions_csv(data: dict[str, Any]) -> str:
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(["id", "title", "year", "extends", "forms", "distribution", "version",
                     "error", "caution"])
    for e in data["editions"]:
        writer.writerow([e["id"], e["title"], e["year"], e["extends"] or "",
                         " ".join(e["forms"]), e["distribution"], e["version"], "",
                         data["caution"]])
    for b in data["broken"]:
        writer.writerow([b["name"], "", "", "", "", b["distribution"], b["version"], b["error"],
                         data["caution"]])
    return out.getvalue()




def topics_csv(data: dict[str, Any]) -> str:
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(["hook", "answered_by", "wrapped_by", "caution"])
    for t in data["topics"]:
        writer.writerow([t["hook"], " ".join(t["answered_by"]), " ".join(t["wrapped_by"]),
                         data["caution"]])
    return out.getvalue()
