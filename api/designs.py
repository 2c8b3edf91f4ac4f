"""Design over a schedule: the steel each edition requires and the bars chosen, as a
report for people and as records for programs (JSON, TOML, CSV)."""

from __future__ import annotations

import csv
import io
import math
from collections.abc import Sequence
from dataclasses import replace
from typing import TYPE_CHECKING, Any

from clausewise.provisions.beam import UnitSystem
from clausewise.provisions.design import PRACTICAL_MARGIN, Design, bars_text, design_many
from clausewise.provisions.engine import CAPACITY_ONLY, PASS
from clausewise.provisions.verdicts import CAUTION
from clausewise.results.display import convert
from clausewise.results.records import DIGITS, ShownNumbers, refused_beams, units_table
from clausewise.results.writers import COLUMN_UNITS

if TYPE_CHECKING:
    from rich.console import Group

    from clausewise.beamfile import Schedule
    from clausewise.provisions.registry import Edition



def design_schedule(schedule: Schedule, editions: Sequence[Edition], form: str | None,
                    situation: str, *, audit: bool = False,
                    at_given_depth: bool = False) -> list[Design]:
    """Every beam under every edition, beam by beam in file order. Each chosen arrangement
    was assessed by the same pipeline as ``check``; with ``audit`` it is assessed again
    one beam at a time, and a design whose bars do not pass is marked as such.
    ``at_given_depth``: see :func:`design_many`."""
    beams = [entry.beam for entry in schedule.entries]
    by_edition = {e.id: design_many(beams, e, form=form, situation=situation, audit=audit,
                                    at_given_depth=at_given_depth) for e in editions}
    out = []
    for i in range(len(beams)):
        for e in editions:
            d = by_edition[e.id][i]
            if d.assessment is not None and d.assessment.status not in (PASS, CAPACITY_ONLY):
                d = replace(d, status="chosen bars fail the check",
                            message=d.assessment.summary())
            out.append(d)
    return out


def design_status(designs: Sequence[Design], schedule: Schedule) -> int:
    """0 every beam designed with passing bars; 1 some beam has none (the section must
    grow, no bars fit, outside scope); 2 refused input or an edition could not design."""
    if schedule.problems or any(d.status == "error" for d in designs):
        return 2
    return 0 if all(d.passed for d in designs) else 1


def _lightest(designs: Sequence[Design]) -> dict[str, float]:
    """Per beam, the lightest steel mass (kg/m) over the editions that found bars."""
    best: dict[str, float] = {}
    for d in designs:
        if d.arrangement is not None:
            best[d.beam_id] = min(best.get(d.beam_id, math.inf), d.mass_per_metre)
    return best


DESIGN_KINDS = (("area", "mm²"), ("length", "mm"), ("mass", "kg/m"))


def design_record(d: Design, lightest: float | None, system: UnitSystem = UnitSystem.SI,
                  digits: int = DIGITS) -> dict[str, Any]:
    """One beam under one edition, its numbers in ``system`` (named in ``units``)."""
    a, q = d.arrangement, ShownNumbers(system, digits)

    def area(value: float | None) -> float | None:
        return q.value(value, "mm²")

    def length(value: float | None) -> float | None:
        return q.value(value, "mm")

    return {
        "beam": d.beam_id, "edition": d.edition_id, "status": d.status, "caution": CAUTION,
        "units": units_table(system, DESIGN_KINDS),
        "required_area": area(d.required_area),
        "compression_area": area(d.compression_area),
        "trial_depth": length(d.trial_depth), "set_by": d.set_by,
        "set_by_clause": d.set_by_clause, "bars": a.text if a else "",
        "layers": list(a.counts) if a else [],
        "layer_depths": [length(x) for x in a.depths] if a else [],
        "provided_area": area(d.provided_area),
        "provided_compression_area": area(a.compression_area) if a else None,
        "compression_depth": length(a.compression[2]) if a and a.compression else None,
        "mass_per_metre": q.value(d.mass_per_metre, "kg/m"),
        "more_than_lightest": q.value(d.mass_per_metre - lightest, "kg/m")
        if a and lightest else None,
        "utilisation": q.plain(d.utilisation), "governing": d.governing,
        "governing_clause": d.governing_clause, "least_depth": length(d.least_depth),
        "least_width": length(d.least_width), "candidates": d.candidates,
        "message": d.message,
    }


def design_document(schedule: Schedule, designs: Sequence[Design], units: str = "beam",
                    digits: int = DIGITS) -> dict[str, Any]:
    """The whole design run. ``units``: "beam" (each beam's own system, named in each
    record's ``units``) or "SI" (mm², mm, kg/m); numbers to ``digits`` significant
    figures."""
    from clausewise import __version__

    p = schedule.project
    lightest = _lightest(designs)
    systems = {e.beam.id: UnitSystem.SI if units == "SI" else e.beam.unit_system
               for e in schedule.entries}
    return {
        "caution": CAUTION, "tool": "clausewise", "version": __version__,
        "source": str(schedule.source),
        "project": {"name": p.name, "building": p.building, "town": p.town,
                    "engineer": p.engineer, "notes": p.notes},
        "units": units, "digits": digits,
        "designs": [design_record(d, lightest.get(d.beam_id),
                                  systems.get(d.beam_id, UnitSystem.SI), digits)
                    for d in designs],
        "problems": [{"beam": q.beam, "field": q.field, "message": q.message}
                     for q in schedule.problems],
    }


# record key -> CSV column; a unit kind in braces takes the records' unit ("_mm2")
CSV_COLUMNS = {"beam": "beam", "edition": "edition", "status": "status",
               "required_area": "required_area_{area}",
               "compression_area": "compression_area_{area}",
               "trial_depth": "trial_depth_{length}",
               "set_by": "set_by", "set_by_clause": "set_by_clause", "bars": "bars",
               "layer_depths": "layer_depths_{length}",
               "provided_area": "provided_area_{area}",
               "provided_compression_area": "provided_compression_area_{area}",
               "compression_depth": "compression_depth_{length}",
               "mass_per_metre": "mass_{mass}",
               "more_than_lightest": "more_than_lightest_{mass}",
               "utilisation": "utilisation", "governing": "governing",
               "governing_clause": "governing_clause", "least_depth": "least_depth_{length}",
               "least_width": "least_width_{length}", "candidates": "candidates",
               "message": "message", "caution": "caution"}


def design_csv(data: dict[str, Any]) -> str:
    """One row per beam and edition, then one per refused beam: the header is the first
    row, as for check, compare and batch, and the caution is a column of every row."""
    systems = {tuple(r["units"].items()) for r in data["designs"]}
    if len(systems) > 1:
        raise ValueError("these designs mix unit systems; a CSV needs one: use --units SI")
    units = data["designs"][0]["units"] if data["designs"] else units_table(UnitSystem.SI,
                                                                           DESIGN_KINDS)
    names = {k: v.format(**{kind: COLUMN_UNITS[u] for kind, u in units.items()})
             for k, v in CSV_COLUMNS.items()}
    out = io.StringIO()
    columns = csv.DictWriter(out, list(names.values()), lineterminator="\n",
                             extrasaction="ignore")
    columns.writeheader()
    for rec in data["designs"]:
        row = {names[k]: "" if v is None else "; ".join(map(str, v)) if isinstance(v, list)
               else v for k, v in rec.items() if k in names}
        columns.writerow(row)
    for beam, messages in refused_beams((p["beam"], None, p["message"])
                                        for p in data["problems"]):
        columns.writerow({"beam": beam or "", "status": "input problem", "message": messages,
                          "caution": data["caution"]})
    return out.getvalue()


# --- the report for people ----------------------------------------------------------------

def _area(value: float, us: bool) -> str:
    if not math.isfinite(value):
        return "–"
    return f"{convert(value, 'mm²', UnitSystem.US)[0]:.2f}" if us else f"{value:.0f}"


def _mass(value: float, us: bool) -> str:
    if not math.isfinite(value):
        return "–"
    return f"{convert(value, 'kg/m', UnitSystem.US)[0]:.2f}" if us else f"{value:.2f}"


def _ref(clause: str) -> str:
    """The clause reference without the edition id ("aci318-19 9.5.1.1" -> "9.5.1.1")."""
    return clause.split(" ", 1)[-1] if clause else ""


def _editions_of(designs: Sequence[Design]) -> list[str]:
    return list(dict.fromkeys(d.edition_id for d in designs))


def design_report(schedule: Schedule, designs: Sequence[Design],
                  situation: str = "persistent") -> Group:
    """Per beam, one row per edition: required steel, chosen bars, provided steel,
    utilisation, mass and the excess over the lightest edition; then what set the
    required area and what governs the bars. Readable at 80 columns."""
    from rich import box
    from rich.console import Group
    from rich.rule import Rule
    from rich.table import Table
    from rich.text import Text

    from clausewise.report import NumbersKept, caution, header, problems_table

    entries = {e.beam.id: e for e in schedule.entries}
    lightest = _lightest(designs)
    parts: list[Any] = [header(schedule, "design", situation, _editions_of(designs))]

    def table(*columns: tuple[str, str, bool]) -> Table:
        t = Table(box=box.SIMPLE_HEAD, pad_edge=False, collapse_padding=True,
                  show_edge=False)
        for name, justify, wrap in columns:
            t.add_column(name, justify=justify, no_wrap=not wrap,  # type: ignore[arg-type]
                         overflow="fold")
        return t

    for beam_id in dict.fromkeys(d.beam_id for d in designs):
        beam = entries[beam_id].beam
        us = beam.unit_system is UnitSystem.US
        area_unit, mass_unit = ("in²", "lb/ft") if us else ("mm²", "kg/m")
        steel = table(("edition", "left", False), (f"As req\n{area_unit}", "right", False),
                      ("bars chosen", "left", True), (f"As prov\n{area_unit}", "right", False),
                      ("util.", "right", False), (mass_unit, "right", False),
                      ("+" + mass_unit, "right", False))
        why = table(("edition", "left", False), ("required area set by", "left", True),
                    ("the chosen bars: governing check", "left", True))
        notes: list[str] = []
        for d in (d for d in designs if d.beam_id == beam_id):
            a = d.arrangement
            required = _area(d.required_area, us)
            if d.compression_area > 0:
                required += f"\n{_area(d.compression_area, us)} top"
            bars = d.status if a is None else _bars_cell(a, us)
            extra = "" if a is None else _mass(d.mass_per_metre - lightest[beam_id], us)
            provided = _area(d.provided_area, us)
            if a is not None and a.compression is not None:
                provided += f"\n{_area(a.compression_area, us)} top"
            steel.add_row(Text(d.edition_id), Text(required), NumbersKept(bars), Text(provided),
                          Text(f"{d.utilisation:.2f}" if a else "–"),
                          Text(_mass(d.mass_per_metre, us)), Text(extra))
            set_by = f"{d.set_by} ({_ref(d.set_by_clause)})" if d.set_by_clause else d.set_by
            governs = f"{d.governing} ({_ref(d.governing_clause)})" if a else d.message
            why.add_row(Text(d.edition_id), Text(set_by), Text(governs))
            grow = _growth(d, us)
            if grow:
                notes.append(f"{d.edition_id}: tension steel alone passes from {grow}")
        title = beam_id + (f" · {beam.title}" if beam.title else "")
        parts += [Rule(Text(title), align="left"), steel, why]
        parts += [NumbersKept(Text(n, style="dim")) for n in notes]
    parts += _steel_by_edition(designs, entries)
    if schedule.problems:
        parts.append(problems_table(schedule.problems))
    parts.append(Text("As req: the least tension steel that passes every check at the trial "
                      "depth with the compression steel found beside it (top); bars chosen "
                      "with more compression bars may need less tension steel than As req; "
                      "bars chosen: of the arrangements "
                      f"that pass, within {PRACTICAL_MARGIN:.0%} of the lightest one's mass, "
                      "the fewest layers, then the fewest bars; +kg/m or +lb/ft: steel mass above "
                      "the lightest edition's; in the summary, +: compression steel needed too.",
                      style="dim"))
    parts.append(caution())
    return Group(*parts)


def _growth(d: Design, us: bool) -> str:
    """The least overall depth or web width at which tension steel alone passes."""
    return " or ".join(f"{what} {_depths([size], us)}" for what, size in (
        ("overall depth", d.least_depth), ("web width", d.least_width)) if size)


def _depths(depths: Sequence[float], us: bool) -> str:
    return ", ".join(f"{convert(d, 'mm', UnitSystem.US)[0]:.2f}" if us else f"{d:.0f}"
                     for d in depths) + \
        (" in" if us else " mm")


def _bars_cell(a: Any, us: bool = False) -> str:
    """Tension bars, with the layers, their depths (as a beam file gives them, to re-check
    the bars) and any compression bars on lines of their own."""
    text = bars_text(a.count, a.size)
    if len(a.counts) > 1:
        text += f" ({' + '.join(str(n) for n in a.counts)})"
    text += f"\nd = {_depths(a.depths, us)}"
    if a.compression is not None:
        size, n, depth = a.compression
        text += f"\ncompression {bars_text(n, size)}\nd' = {_depths([depth], us)}"
    return text


# --- the figure -----------------------------------------------------------------------------

def design_figure(d: Design, beam: Any) -> Any:
    """The section with the chosen bars drawn where they sit (to scale, the soffit at the
    bottom as in the check figures), the stirrup outline, and the design's numbers."""
    from matplotlib.patches import Circle, Rectangle

    from clausewise import figures
    from clausewise.provisions.detailing import stirrup_diameter

    a = d.arrangement
    if a is None:
        raise ValueError(f"beam {d.beam_id} under {d.edition_id}: no bars were chosen")
    bw, h = float(beam.web_width), float(beam.depth)
    hogging = beam.bending.value == "hogging"
    flange = 0.0
    if beam.flanged and d.assessment is not None and d.assessment.effective_width is not None:
        flange = float(d.assessment.effective_width.value)
    width = max(bw, flange)
    figure = figures.Figure(figsize=(5.0, 5.0))
    ax = figure.add_axes((0.08, 0.12, 0.84, 0.74))

    def y(depth: float) -> float:  # height above the soffit
        return depth if hogging else h - depth

    ax.add_patch(Rectangle((-bw / 2, 0.0), bw, h, facecolor=figures.CONCRETE,
                           edgecolor="black", lw=1.0))
    if flange > bw:
        hf = float(beam.flange_thickness)
        left = -bw / 2 if beam.shape.value == "L" else -flange / 2
        bottom = 0.0 if beam.flange_at_soffit else h - hf  # an inverted T's flange is below
        ax.add_patch(Rectangle((left, bottom), flange, hf, facecolor=figures.CONCRETE,
                               edgecolor="black", lw=1.0))
    inset = a.edge - float(stirrup_diameter(beam)) / 2  # the stirrup's centre line
    ax.add_patch(Rectangle((-bw / 2 + inset, inset), bw - 2 * inset, h - 2 * inset,
                           fill=False, edgecolor="#555555", lw=0.8, ls="--"))
    for x, depth, db in a.positions(bw):
        ax.add_patch(Circle((x, y(depth)), db / 2, facecolor=figures.STEEL,
                            edgecolor="black", lw=0.5))
    ax.set_xlim(-width / 2 - 20, width / 2 + 20)
    ax.set_ylim(-20, h + 20)
    ax.set_aspect("equal")
    ax.axis("off")
    figure.text(0.02, 0.97, f"{d.beam_id} · {d.edition_id}: {a.text}", fontsize=10,
                va="top")
    figure.text(0.02, 0.92, f"As req {d.required_area:.0f} mm², provided {a.area:.0f} mm²; "
                f"{d.governing} {d.utilisation:.2f}; {a.mass_per_metre:.2f} kg/m",
                fontsize=8, va="top")
    figure.text(0.02, 0.02, CAUTION, fontsize=6, color="#555555", wrap=True)
    return figure


def steel_comparison_report(schedule: Schedule, designs: Sequence[Design],
                            situation: str = "persistent") -> Group:
    """``compare --steel``: every beam against every edition, the tension steel each
    requires beside the steel the file gives, and what set it where it is not strength."""
    from rich.console import Group
    from rich.text import Text

    from clausewise.report import NumbersKept, caution, header, problems_table

    entries = {e.beam.id: e for e in schedule.entries}
    parts: list[Any] = [header(schedule, "required steel compared", situation,
                               _editions_of(designs))]
    parts += _steel_by_edition(designs, entries, alone=True)
    set_by = sorted({(d.edition_id, d.set_by) for d in designs
                     if d.set_by and d.set_by != "flexural strength"})
    for edition_id, what in set_by:
        beams = [d.beam_id for d in designs if (d.edition_id, d.set_by) == (edition_id, what)]
        parts.append(Text(f"{edition_id}: the area of {', '.join(beams)} is set by {what}",
                          style="dim"))
    for d in designs:  # a blank cell says why
        if not math.isfinite(d.required_area):
            grow = _growth(d, entries[d.beam_id].beam.unit_system is UnitSystem.US)
            parts.append(NumbersKept(Text(
                f"{d.edition_id}: – for {d.beam_id}: {d.message or d.status}"
                + (f"; tension steel alone passes from {grow}" if grow else ""),
                style="dim")))
    if schedule.problems:
        parts.append(problems_table(schedule.problems))
    parts.append(Text("required: the least tension steel that passes every check of the "
                      "edition, placed at the centroid of the file's tension steel (where "
                      "the file gives none, at the depth cover, stirrup and a trial bar "
                      "give); +: compression steel needed too; given: the bars of the file; "
                      "* the edition whose chosen bars are lightest. `clausewise design` "
                      "shows the bars.", style="dim"))
    parts.append(caution())
    return Group(*parts)


def _steel_by_edition(designs: Sequence[Design], entries: dict[str, Any],
                      alone: bool = False) -> list[Any]:
    """Every beam against every edition at a glance: the required tension steel, with the
    lightest edition's marked; editions in columns, four to a table so it fits 80 columns.
    ``alone``: the view stands by itself, so it is shown for one edition too and gives
    the steel the file provides."""
    from rich import box
    from rich.rule import Rule
    from rich.table import Table
    from rich.text import Text

    editions = list(dict.fromkeys(d.edition_id for d in designs))
    by = {(d.beam_id, d.edition_id): d for d in designs}
    beams = list(dict.fromkeys(d.beam_id for d in designs))
    if len(editions) < 2 and not alone:
        return []
    parts: list[Any] = [Rule(Text("required tension steel by edition (* lightest bars)"),
                             align="left")]
    per_table = 3 if alone else 4
    for start in range(0, len(editions), per_table):
        chunk = editions[start:start + per_table]
        table = Table(box=box.SIMPLE_HEAD, pad_edge=False, show_edge=False)
        table.add_column("beam", no_wrap=True)
        if alone:
            table.add_column("given", justify="right", no_wrap=True)
        for e in chunk:
            table.add_column(e, justify="right", no_wrap=True)
        for beam_id in beams:
            us = entries[beam_id].beam.unit_system is UnitSystem.US
            lightest = min((by[beam_id, e].mass_per_metre for e in editions
                            if by[beam_id, e].arrangement is not None), default=math.nan)
            cells = []
            for e in chunk:
                d = by[beam_id, e]
                mark = "*" if d.arrangement is not None and math.isclose(
                    d.mass_per_metre, lightest, rel_tol=1e-9) else " "
                top = f" +{_area(d.compression_area, us)}" if d.compression_area > 0 else ""
                cells.append(Text(f"{_area(d.required_area, us)}{top} "
                                  f"{'in²' if us else 'mm²'}{mark}"))
            given = _given_steel(entries[beam_id].beam, us) if alone else None
            table.add_row(Text(beam_id), *([Text(given)] if given is not None else []),
                          *cells)
        parts.append(table)
    return parts


def _given_steel(beam: Any, us: bool) -> str:
    """The tension steel the file gives ("–" for a beam left to design)."""
    if not beam.tension:
        return "–"
    return f"{_area(float(beam.tension_area), us)} {'in²' if us else 'mm²'}"
