"""A conformance kit for edition authors: properties every edition must keep.

Run it on installed editions (or on a parameter file) from a shell::

    python -m clausewise.conformance xb-na:2024
    python -m clausewise.conformance --annex my-annex.toml
    python -m clausewise.conformance --verbose         # every installed edition, each property

or from pytest, one test per property::

    import pytest
    from clausewise.provisions.testing import PROPERTIES, assert_conforms

    @pytest.mark.parametrize("prop", PROPERTIES, ids=lambda p: p.__name__)
    def test_my_edition_conforms(prop):
        assert_conforms("xb-na:2024", properties=[prop])

The beams are a fixed grid of realistic beams (interior and edge T and L beams,
a flange of given width, hogging over a support, two tension layers, a doubly
reinforced rectangle; three steel ratios) at strengths that lie inside the
edition's own applicability. Each property returns the findings it has, an
empty list when the edition conforms. An edition layered over a base (a national
annex, a firm's rules, a wrapping edition) is also checked to leave the stack
below it as it was: the base assessed alone gives the same results whether or not
the upper layer is installed and has been used.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from clausewise.provisions.answer_checks import AnswerError
from clausewise.provisions.batch import stack_beams
from clausewise.provisions.beam import (
    Actions,
    Beam,
    Bending,
    Context,
    Continuity,
    FloorLayout,
    Layer,
    Shape,
    UnitSystem,
)
from clausewise.provisions.declarations import declarations
from clausewise.provisions.engine import (
    OUT_OF_SCOPE,
    Assessment,
    Evaluation,
    assess,
    evaluate,
    resolve_form,
)
from clausewise.provisions.hookspecs import TOPICS
from clausewise.provisions.registry import Edition, Registry, answers_trail, default_registry
from clausewise.provisions.vocabulary import Check, Clause

FORM_TOLERANCE = 0.01
"""Two published forms (SI and inch-pound) may change a result by at most this share."""
LIMIT_TOLERANCE = 0.02
"""...and a check's value or limit by at most this: the forms round limits separately
(ACI 318-19 As,min: 200 psi/fy against 1.4 MPa/fy is 1.5 %)."""
BATCH_TOLERANCE = 1e-9
"""Batch (arrays) against single (floats) evaluation."""


@dataclass(frozen=True)
class Finding:
    """One way an edition breaks a property, on one beam where it matters."""

    property: str
    edition: str
    message: str
    beam: str = ""

    def __str__(self) -> str:
        where = f" [{self.beam}]" if self.beam else ""
        return f"{self.edition}: {self.property}{where}: {self.message}"


# --- the realistic beams ---------------------------------------------------------------

@dataclass(frozen=True)
class BeamKind:
    """A beam of a floor without its materials and steel area."""

    name: str
    shape: Shape
    bending: Bending
    web_width: float
    depth: float
    flange_thickness: float | None
    bar_depths: tuple[float, ...]  # tension layers; the steel is shared 60/40 over two
    layout: FloorLayout | None
    flange_width: float | None = None
    compression: tuple[Layer, ...] = ()

    def beam(self, fc: float, fy: float, ratio: float) -> Beam:
        """This kind with f'c, fy (MPa) and tension steel ``ratio`` of bw d."""
        shares = (1.0,) if len(self.bar_depths) == 1 else (0.6, 0.4)
        d = sum(s * depth for s, depth in zip(shares, self.bar_depths, strict=True))
        area = ratio * self.web_width * d
        moment = area * fy * d  # service moments of the order of the capacity
        return Beam(
            id=f"{self.name}, f'c {fc:g} MPa, fy {fy:g} MPa, ρw {ratio:g}", shape=self.shape,
            bending=self.bending, web_width=self.web_width, depth=self.depth,
            concrete_strength=fc, yield_strength=fy,
            tension=tuple(Layer(s * area, depth)
                          for s, depth in zip(shares, self.bar_depths, strict=True)),
            compression=self.compression, flange_thickness=self.flange_thickness,
            flange_width=self.flange_width, layout=self.layout,
            actions=Actions(dead=0.20 * moment, live=0.12 * moment))


T, L, RECT = Shape.TEE, Shape.ELL, Shape.RECTANGLE
SAG, HOG = Bending.SAGGING, Bending.HOGGING
KINDS = (
    BeamKind("interior T", T, SAG, 300.0, 600.0, 125.0, (540.0,), FloorLayout(
        8000.0, Continuity.INTERIOR, clear_span=7700.0, clear_left=2700.0, clear_right=2700.0)),
    BeamKind("edge L", L, SAG, 350.0, 700.0, 150.0, (630.0,), FloorLayout(
        7000.0, Continuity.END, clear_span=6650.0, clear_left=2500.0,
        zero_moment_length=5950.0)),
    BeamKind("T of given flange width", T, SAG, 250.0, 500.0, 100.0, (445.0,), FloorLayout(
        6000.0, Continuity.SIMPLE, clear_span=5750.0, clear_left=2000.0, clear_right=2000.0),
        flange_width=1100.0),
    BeamKind("doubly reinforced rectangle", RECT, SAG, 300.0, 550.0, None, (490.0,), None,
             compression=(Layer(402.0, 55.0),)),
    BeamKind("hogging T over a support", T, HOG, 300.0, 600.0, 125.0, (545.0,), FloorLayout(
        8000.0, Continuity.INTERIOR, clear_span=7700.0, clear_left=2700.0, clear_right=2700.0,
        adjacent_span=7000.0)),
    BeamKind("T with two layers", T, SAG, 300.0, 700.0, 120.0, (640.0, 590.0), FloorLayout(
        9000.0, Continuity.END, clear_span=8650.0, clear_left=3000.0, clear_right=3000.0)),
)
STRENGTHS = ((30.0, 500.0), (40.0, 420.0), (25.0, 415.0), (35.0, 400.0), (50.0, 460.0),
             (60.0, 500.0), (20.0, 250.0))
"""(f'c, fy) in MPa, in order of preference; the first two inside the scope are used."""
RATIOS = (0.006, 0.012, 0.02)
SWEEP = tuple(float(r) for r in np.linspace(0.002, 0.04, 20))
PROBES: tuple[tuple[str, dict[str, Any]], ...] = (
    ("f'c = 5 MPa", {"concrete_strength": 5.0}),
    ("f'c = 200 MPa", {"concrete_strength": 200.0}),
    ("fy = 2000 MPa", {"yield_strength": 2000.0}),
)
"""Strengths far outside any edition's scope: each must be refused, not extrapolated."""


def _context(edition: Edition, beam: Beam) -> Context:
    return Context(form=resolve_form(edition, beam, None)[0])


def in_scope(edition: Edition, beam: Beam) -> bool:
    context = _context(edition, beam)
    checks = edition.applicability(beam, edition.parameters(context), context)
    return all(bool(c.passed) for c in checks)


class Sample:
    """An edition, its realistic beams by kind, and their assessments (computed once)."""

    def __init__(self, edition: Edition, kinds: Sequence[BeamKind] = KINDS,
                 strengths: Sequence[tuple[float, float]] = STRENGTHS,
                 ratios: Sequence[float] = RATIOS) -> None:
        self.edition = edition
        self.problem = ""
        try:
            scope = [s for s in strengths if in_scope(edition, kinds[0].beam(*s, ratios[0]))]
        except Exception as exc:
            scope, self.problem = [], f"applicability raised {type(exc).__name__}: {exc}"
        if not scope and not self.problem:
            self.problem = ("none of the realistic strengths (f'c, fy) "
                            f"{', '.join(f'{fc:g}/{fy:g}' for fc, fy in strengths)} MPa "
                            "lies inside the edition's applicability")
        self.strengths = tuple(scope[:2])
        self.by_kind = {k.name: tuple(k.beam(fc, fy, r) for fc, fy in self.strengths
                                      for r in ratios) for k in kinds}
        self.kinds = {k.name: k for k in kinds}
        self._assessed: dict[tuple[str, UnitSystem], Assessment | Exception] = {}

    @property
    def beams(self) -> tuple[Beam, ...]:
        return tuple(b for group in self.by_kind.values() for b in group)

    def assessed(self, beam: Beam, units: UnitSystem = UnitSystem.SI) -> Assessment | Exception:
        """The single-beam assessment in the given unit system, or what it raised."""
        key = (beam.id, units)
        if key not in self._assessed:
            try:
                self._assessed[key] = assess(replace(beam, unit_system=units), self.edition)
            except Exception as exc:
                self._assessed[key] = exc
        return self._assessed[key]

    def assessments(self, units: UnitSystem = UnitSystem.SI
                    ) -> Iterator[tuple[Beam, Assessment | Exception]]:
        for beam in self.beams:
            yield beam, self.assessed(beam, units)


Property = Callable[[Sample], list[Finding]]


def _finding(sample: Sample, prop: str, message: str, beam: Beam | None = None) -> Finding:
    return Finding(prop, sample.edition.id, message, beam.id if beam else "")


def _raised(sample: Sample, prop: str, beam: Beam, exc: Exception) -> Finding:
    return _finding(sample, prop, f"assessment raised {type(exc).__name__}: {exc}", beam)


def _close(a: Any, b: Any, rel: float) -> bool:
    return bool(np.all(np.isclose(np.asarray(a, float), np.asarray(b, float), rtol=rel,
                                  atol=1e-12, equal_nan=True)))


# --- the properties ----------------------------------------------------------------------

def hook_contract(sample: Sample) -> list[Finding]:
    """The base edition implements every topic, the whole stack answers every topic it is
    asked, and each answer has the type its hook promises."""
    edition, name = sample.edition, "hook contract"
    base = edition.layers[0].info
    assert base is not None
    found = [_finding(sample, name, f"base edition {base.id!r} does not answer the topic "
                      f"{topic}") for topic in TOPICS if base.id not in edition.implementers(topic)]
    for group in sample.by_kind.values():
        beam = group[0]
        try:
            with answers_trail() as trail:
                ev = evaluate(beam, edition, _context(edition, beam))
        except Exception as exc:
            found.append(_raised(sample, name, beam, exc))
            continue
        missing = [what for what, answer in _answers(beam, ev) if answer is None]
        missing += [f"{topic} (no layer answered)" for topic in TOPICS
                    if topic in trail and not trail[topic].answered_by]
        if not ev.applicability:
            missing.append("applicability (no scope checks)")
        if missing:
            found.append(_finding(sample, name, f"no answer for {', '.join(missing)}", beam))
    return found


def _answers(beam: Beam, ev: Evaluation) -> list[tuple[str, Any]]:
    answers = [("concrete_law", ev.concrete), ("steel_law", ev.steel),
               ("resistance_factor", ev.resistance), ("design_actions", ev.demand)]
    if beam.flanged:
        answers.append(("effective_flange_width", ev.effective_width))
    return answers


def parameters_declared(sample: Sample) -> list[Finding]:
    """Every named parameter cites a clause of a layer of the stack, is a finite number
    or a word, and keeps the kind, bounds and choices every layer below declares."""
    edition, name = sample.edition, "parameters declared"
    stack = {r.info.id for r in edition.layers if r.info}
    found = []
    for form in edition.forms:
        for p in edition.parameters(Context(form=form)).values():
            if not (p.clause.ref and p.clause.edition in stack):
                found.append(_finding(sample, name, f"{p.name}: clause {p.clause} must have a "
                                      f"ref and name a layer of the stack ({', '.join(stack)})"))
            if isinstance(p.value, bool) or not isinstance(p.value, int | float | str) or (
                    not isinstance(p.value, str) and not math.isfinite(p.value)):
                found.append(_finding(sample, name, f"{p.name} = {p.value!r} is neither a "
                                      "finite number nor a word"))
    for decl in declarations(edition).values():
        kinds = {isinstance(p.value, str) for p in decl.parameters}
        bounds = decl.bounds
        if len(kinds) > 1:
            found.append(_finding(sample, name, f"{decl.name}: the layers disagree whether it "
                                  "is a number or a word"))
        elif bounds is not None and bounds[0] > bounds[1]:
            found.append(_finding(sample, name, f"{decl.name}: the layers' bounds do not "
                                  f"overlap ({[p.bounds for p in decl.parameters]})"))
        elif bounds is not None and decl.numeric:
            found += [_finding(sample, name, f"{decl.name} = {p.value:g} ({p.clause.edition} "
                               f"{p.clause.ref}) lies outside {bounds[0]:g} to {bounds[1]:g}")
                      for p in decl.parameters if not bounds[0] <= float(p.value) <= bounds[1]]
        elif decl.choices is not None and not decl.numeric:
            found += [_finding(sample, name, f"{decl.name} = {p.value!r} ({p.clause.edition} "
                               f"{p.clause.ref}) is not one of {', '.join(decl.choices)}")
                      for p in decl.parameters if p.value not in decl.choices]
    return found


def resistance_factor_in_range(sample: Sample) -> list[Finding]:
    """The member factor lies in (0, 1]."""
    found, name = [], "resistance factor in (0, 1]"
    for beam, a in sample.assessments():
        if isinstance(a, Exception):
            found.append(_raised(sample, name, beam, a))
        elif a.resistance is not None and not 0.0 < a.resistance.factor.value <= 1.0:
            found.append(_finding(sample, name, f"{a.resistance.factor.symbol} = "
                                  f"{a.resistance.factor.value!r}", beam))
    return found


def answers_make_sense(sample: Sample) -> list[Finding]:
    """Every answer's value makes physical sense, as the engine checks it on every call
    (clausewise.provisions.answer_checks): φ in (0, 1], partial factors at least 1,
    block factors in (0, 1], a plausible ultimate strain, a positive finite effective
    width and a factored moment not negative in the beam's bending sense."""
    found, name = [], "answers make sense"
    for beam in sample.beams:
        try:
            evaluate(beam, sample.edition, _context(sample.edition, beam))
        except AnswerError as exc:
            found.append(_finding(sample, name, str(exc), beam))
        except Exception:  # other faults are the other properties' findings
            continue
    return found


def actual_flange_width(beam: Beam) -> float:
    """The width the slab can give: the given width, else bw plus half the clear
    distance to the next web on each slab side (common practice, no source)."""
    if beam.flange_width is not None:
        return float(beam.flange_width)
    layout = beam.layout
    sides = {T: (layout.clear_left, layout.clear_right), L: (layout.clear_left,)}[beam.shape] \
        if layout else (None,)
    return float(beam.web_width) + sum(0.5 * s if s is not None else math.inf for s in sides)


def effective_width_within_flange(sample: Sample) -> list[Finding]:
    """bw ≤ effective flange width ≤ the actual flange width."""
    found, name = [], "effective width within the flange"
    for beam, a in sample.assessments():
        if isinstance(a, Exception):
            found.append(_raised(sample, name, beam, a))
            continue
        if not beam.flanged or a.effective_width is None:
            continue
        width, bw, upper = a.effective_width.value, beam.web_width, actual_flange_width(beam)
        if not bw * (1 - 1e-12) <= width <= upper * (1 + 1e-12):
            found.append(_finding(sample, name, f"b_eff = {width:.6g} mm, expected between "
                                  f"bw = {bw:g} and {upper:.6g} mm", beam))
    return found


def capacity_grows_with_steel(sample: Sample) -> list[Finding]:
    """While the tension steel yields, more of it never lowers the nominal moment, nor the
    design resistance while the member factor stays the same.

    (A member factor that falls with the net tensile strain, as in the ACI transition
    zone, may lower φMn of a T beam with the block in the web as steel is added: that is
    the standard's own rule, not a fault of the edition.)
    """
    found, name = [], "capacity grows with steel"
    for kind in sample.kinds.values():
        if not sample.strengths:
            break
        beams = [kind.beam(*sample.strengths[0], r) for r in SWEEP]
        batch = stack_beams(beams)
        try:
            ev = evaluate(batch, sample.edition, _context(sample.edition, beams[0]))
        except Exception as exc:
            found.append(_finding(sample, name, f"batch evaluation raised "
                                  f"{type(exc).__name__}: {exc}", beams[0]))
            continue
        r = ev.response
        yielding = r.equilibrium & np.all(r.layer_yielded[:, :len(kind.bar_depths)], axis=1)
        assert ev.design_resistance is not None and ev.resistance is not None
        nominal = np.asarray(r.nominal_moment, dtype=np.float64)
        design = np.broadcast_to(np.asarray(ev.design_resistance.value, dtype=np.float64),
                                 nominal.shape)
        phi = np.broadcast_to(np.asarray(ev.resistance.factor.value, dtype=np.float64),
                              nominal.shape)
        for i in range(len(beams) - 1):
            if not (yielding[i] and yielding[i + 1]):
                continue
            same_factor = abs(phi[i + 1] - phi[i]) <= 1e-12
            for what, m in (("Mn", nominal), ("M_Rd", design)):
                if (what == "Mn" or same_factor) and m[i + 1] < m[i] * (1 - 1e-9):
                    found.append(_finding(sample, name, f"{what} falls from {m[i]:.6g} to "
                                          f"{m[i + 1]:.6g} N·mm as ρw rises to "
                                          f"{SWEEP[i + 1]:.4g}", beams[i + 1]))
                    break
            else:
                continue
            break
    return found


def _clauses(a: Assessment) -> Iterator[tuple[str, Any]]:
    for p in a.parameters:
        yield f"parameter {p.name}", p.clause
    for c in a.all_checks:
        yield f"check {c.name!r}", c.clause
    for f in (*a.concrete_factors, *a.steel_factors):
        yield f"factor {f.symbol}", f.clause
    if a.resistance is not None:
        yield f"factor {a.resistance.factor.symbol}", a.resistance.factor.clause
        yield f"regime {a.resistance.regime.name}", a.resistance.regime.clause
        yield "strength requirement", a.resistance.requirement
    if a.design_resistance is not None:
        yield "design resistance", a.design_resistance.clause
    for envelope in (a.effective_width, a.demand):
        if envelope is not None:
            for candidate in envelope.candidates:
                yield f"{envelope.name} candidate {candidate.label!r}", candidate.clause


def clauses_complete(sample: Sample) -> list[Finding]:
    """Every Factor, Check, Candidate, Regime and Parameter names its clause and supplier."""
    found, name, seen = [], "clauses complete", set()
    for beam, a in sample.assessments():
        if isinstance(a, Exception):
            found.append(_raised(sample, name, beam, a))
            continue
        for what, clause in _clauses(a):
            ok = isinstance(clause, Clause) and bool(clause.ref) and bool(clause.edition)
            if not ok and what not in seen:
                seen.add(what)
                found.append(_finding(sample, name, f"{what} has clause {clause!r}: it needs "
                                      "a ref and the edition that supplies it", beam))
    return found


def scope_refuses_extrapolation(sample: Sample) -> list[Finding]:
    """Realistic beams lie inside the scope; strengths far outside it are refused."""
    name = "scope refuses extrapolation"
    if not sample.strengths:
        return [_finding(sample, name, sample.problem)]
    found, probe = [], sample.beams[0]
    for label, change in PROBES:
        beam = replace(probe, id=f"{probe.id}, probed at {label}", **change)
        try:
            a = assess(beam, sample.edition)
        except Exception as exc:
            found.append(_raised(sample, name, beam, exc))
            continue
        if a.status != OUT_OF_SCOPE or a.design_resistance is not None:
            found.append(_finding(sample, name, f"{label} was assessed (status {a.status!r}) "
                                  "instead of refused as outside scope", beam))
    return found


def _results(a: Assessment) -> list[tuple[str, Any]]:
    out = [("design resistance", a.design_resistance.value if a.design_resistance else None),
           ("member factor", a.resistance.factor.value if a.resistance else None),
           ("effective width", a.effective_width.value if a.effective_width else None),
           ("design moment", a.demand.value if a.demand else None)]
    return [(what, value) for what, value in out if value is not None]


def _check_values(checks: Sequence[Check]) -> list[tuple[str, Any]]:
    return [(f"{c.name} {part}", v) for c in checks
            for part, v in (("value", c.value), ("limit", c.limit))]


def unit_system_neutral(sample: Sample) -> list[Finding]:
    """The beam's unit system changes no result of a one-form edition, and changes a
    two-form edition's results within FORM_TOLERANCE (checks within LIMIT_TOLERANCE)."""
    found, name = [], "unit system neutral"
    two_forms = "inch-pound" in sample.edition.forms
    main, limits = (FORM_TOLERANCE, LIMIT_TOLERANCE) if two_forms else (1e-12, 1e-12)
    for beam, si in sample.assessments():
        us = sample.assessed(beam, UnitSystem.US)
        if isinstance(si, Exception):
            found.append(_raised(sample, name, beam, si))
            continue
        if isinstance(us, Exception):
            found.append(_raised(sample, name, beam, us))
            continue
        if not two_forms and si.status != us.status:
            found.append(_finding(sample, name, f"status {si.status!r} in SI units but "
                                  f"{us.status!r} in US customary units", beam))
        pairs = [(w, a, b, main) for (w, a), (_, b) in zip(_results(si), _results(us),
                                                           strict=False)]
        if [c.name for c in si.all_checks] != [c.name for c in us.all_checks]:
            found.append(_finding(sample, name, "the checks differ between unit systems", beam))
        else:
            pairs += [(w, a, b, limits) for (w, a), (_, b) in zip(
                _check_values(si.all_checks), _check_values(us.all_checks), strict=True)]
        for what, a, b, rel in pairs:
            if not _close(a, b, rel):
                allowed = f"up to {rel:.0%} allowed" if two_forms else "no change allowed"
                found.append(_finding(sample, name, f"{what}: {a:.6g} in SI units, {b:.6g} in "
                                      f"US customary units ({allowed})", beam))
    return found


def batch_matches_single(sample: Sample) -> list[Finding]:
    """Evaluating a kind's beams as one batch (numpy arrays) gives each beam's single
    result to BATCH_TOLERANCE."""
    found, name = [], "batch matches single"
    for group in sample.by_kind.values():
        singles = [(b, sample.assessed(b)) for b in group]
        rows = [(b, a) for b, a in singles if isinstance(a, Assessment)
                and a.status != OUT_OF_SCOPE]
        if len(rows) < 2:
            continue
        try:
            ev = evaluate(stack_beams([b for b, _ in rows]), sample.edition,
                          _context(sample.edition, rows[0][0]))
        except Exception as exc:
            found.append(_finding(sample, name, f"batch evaluation raised "
                                  f"{type(exc).__name__}: {exc}", rows[0][0]))
            continue
        batch = [(w, np.asarray(v)) for w, v in _evaluation_results(ev)]
        for i, (beam, a) in enumerate(rows):
            single = _results(a) + _check_values(a.checks)
            if len(single) != len(batch):
                found.append(_finding(sample, name, f"{len(batch)} results in the batch, "
                                      f"{len(single)} for the single beam", beam))
                break
            for (what, one), (_, many) in zip(single, batch, strict=True):
                row = np.broadcast_to(many, (len(rows),))[i]
                if not _close(one, row, BATCH_TOLERANCE):
                    found.append(_finding(sample, name, f"{what}: {one!r} single, {row!r} in "
                                          "the batch", beam))
    return found


def _evaluation_results(ev: Evaluation) -> list[tuple[str, Any]]:
    out = [("design resistance", ev.design_resistance.value if ev.design_resistance else None),
           ("member factor", ev.resistance.factor.value if ev.resistance else None),
           ("effective width", ev.effective_width.value if ev.effective_width else None),
           ("design moment", ev.demand.value if ev.demand else None)]
    return [(w, v) for w, v in out if v is not None] + _check_values(ev.checks)


def base_unchanged(sample: Sample) -> list[Finding]:
    """The stack below the edition, assessed alone, gives the same results before and
    after the edition is used, and names no upper layer: a layer that wraps or replaces
    a topic changes its own stack only."""
    edition, name = sample.edition, "base unchanged"
    if len(edition.layers) < 2:
        return []
    below = edition.layers[:-1]
    top = edition.layers[-1].info.id  # type: ignore[union-attr]
    found = []
    for beam in (group[0] for group in sample.by_kind.values()):
        try:
            before = assess(beam, Edition(below))
            sample.assessed(beam)  # the upper layer at work
            after = assess(beam, Edition(below))
        except Exception as exc:
            found.append(_raised(sample, name, beam, exc))
            continue
        for (what, one), (_, two) in zip(_results(before) + _check_values(before.checks),
                                         _results(after) + _check_values(after.checks),
                                         strict=False):
            if not _close(one, two, 0.0):
                found.append(_finding(sample, name, f"{what} of the base alone: {one!r} "
                                      f"before, {two!r} after {top} was used", beam))
        named = [t.hook for t in after.topics if top in (*t.answered_by, *t.wrapped_by)]
        if named:
            found.append(_finding(sample, name, f"the base alone is answered by {top} for "
                                  f"{', '.join(named)}", beam))
    return found


PROPERTIES: tuple[Property, ...] = (
    hook_contract, parameters_declared, resistance_factor_in_range,
    effective_width_within_flange, capacity_grows_with_steel, clauses_complete,
    scope_refuses_extrapolation, unit_system_neutral, batch_matches_single, base_unchanged,
    answers_make_sense,
)
"""Every property of the kit, in the order they are reported (parametrize over it)."""


# --- entry points ------------------------------------------------------------------------

def check_properties(edition: str | Edition, registry: Registry | None = None,
                     properties: Sequence[Property] = PROPERTIES
                     ) -> list[tuple[str, list[Finding]]]:
    """Each property's name and findings on ``edition`` (an id or an Edition), in order;
    a property that needs realistic beams when none lies in scope is reported under
    "realistic beams" and left out."""
    if isinstance(edition, str):
        edition = (registry or default_registry()).edition(edition)
    sample = Sample(edition)
    if sample.problem:  # no realistic beam to try: say why, and check what needs none
        return [("realistic beams", [_finding(sample, "realistic beams", sample.problem)])] + [
            (prop.__name__, _guarded(prop, sample)) for prop in properties
            if prop is parameters_declared]
    return [(prop.__name__, _guarded(prop, sample)) for prop in properties]


def check_edition(edition: str | Edition, registry: Registry | None = None,
                  properties: Sequence[Property] = PROPERTIES) -> list[Finding]:
    """Every finding of ``properties`` on ``edition`` (an id or an Edition); [] conforms."""
    return [finding for _, found in check_properties(edition, registry, properties)
            for finding in found]


def _guarded(prop: Property, sample: Sample) -> list[Finding]:
    """A property's findings; an edition that makes the property itself fail is a finding
    too, never a traceback."""
    try:
        return prop(sample)
    except Exception as exc:
        return [_finding(sample, prop.__name__, f"raised {type(exc).__name__}: {exc}")]


def assert_conforms(edition: str | Edition, registry: Registry | None = None,
                    properties: Sequence[Property] = PROPERTIES) -> None:
    """Raise AssertionError listing every finding (for pytest)."""
    findings = check_edition(edition, registry, properties)
    if findings:
        raise AssertionError(f"{len(findings)} finding(s):\n" + "\n".join(map(str, findings)))
