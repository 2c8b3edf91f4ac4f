"""The assessment: effective width -> laws -> mechanics -> resistance -> demand -> checks.

``evaluate`` is the one pipeline; it runs unchanged on a single beam (floats) and
on a batch of beams of one kind (arrays). ``assess`` wraps it for one beam and
returns an audited, immutable :class:`Assessment`.
"""

from __future__ import annotations

from collections.abc import Generator
from dataclasses import dataclass, replace
from functools import reduce
from typing import Any, TypeVar

import numpy as np

from clausewise.core import (
    ConcreteLaw,
    Response,
    ResponseArrays,
    SectionArrays,
    SectionError,
    cracking_moment,
    flanged_profile,
    gross_properties,
    solve_arrays,
)
from clausewise.provisions.answers import MaterialModel, Parameters, Resistance
from clausewise.provisions.beam import Beam, Context, UnitSystem
from clausewise.provisions.detailing import detailing_checks
from clausewise.provisions.registry import (
    Edition,
    EditionError,
    Registry,
    TopicAnswer,
    answers_trail,
    default_registry,
)
from clausewise.provisions.verdicts import (  # noqa: F401 (re-exported)
    CAPACITY_ONLY,
    CAUTION,
    ERROR,
    FAIL,
    NO_ACTIONS,
    NO_EQUILIBRIUM,
    OUT_OF_SCOPE,
    PASS,
    Status,
    governed_head,
    governing,
    outside_scope_line,
    status,
)
from clausewise.provisions.vocabulary import Check, Clause, Envelope, Factor, Sense, per_beam, shown


@dataclass(frozen=True)
class SectionView:
    """What rules may ask of the section with its effective flange: gross properties
    and the cracking moment, as floats for one beam and arrays for a batch."""

    arrays: SectionArrays
    single: bool

    def _out(self, value: np.ndarray) -> Any:
        return float(value[0]) if self.single else value

    @property
    def area(self) -> Any:
        return self._out(gross_properties(self.arrays).area)

    @property
    def centroid(self) -> Any:
        """Depth of the gross centroid below the compression face (mm)."""
        return self._out(gross_properties(self.arrays).centroid)

    @property
    def second_moment(self) -> Any:
        return self._out(gross_properties(self.arrays).second_moment)

    @property
    def max_width(self) -> Any:
        """Width of the widest strip (the flange of a flanged section), mm."""
        return self._out(self.arrays.widths.max(axis=1))

    def cracking_moment(self, flexural_tensile_strength: Any) -> Any:
        """Moment (N·mm) that cracks the tension face of the gross section."""
        return self._out(cracking_moment(self.arrays, flexural_tensile_strength))


@dataclass(frozen=True)
class LayerRecord:
    """One layer of the edition stack as recorded in results."""

    id: str
    title: str
    distribution: str
    version: str
    source: str


@dataclass(frozen=True)
class Evaluation:
    """The pipeline's raw result; values are floats or arrays like the beam's."""

    beam: Beam
    edition: Edition
    context: Context
    parameters: Parameters
    applicability: tuple[Check, ...]
    in_scope: Any
    effective_width: Envelope | None = None
    concrete: MaterialModel | None = None
    steel: MaterialModel | None = None
    section: SectionView | None = None
    response: Any = None
    resistance: Resistance | None = None
    design_resistance: Factor | None = None
    demand: Envelope | None = None
    checks: tuple[Check, ...] = ()
    remarks: tuple[str, ...] = ()  # what was not checked and why (detailing of areas)


def resolve_form(edition: Edition, beam: Beam, form: str | None) -> tuple[str, str]:
    """The published form to use and why: the user's choice, else the beam's units."""
    forms = edition.forms
    if form and form != "auto":
        if form in forms:
            return form, "chosen by the user"
        if len(forms) == 1:  # a choice between forms does not concern a one-form edition
            return forms[0], f"the edition's only form ({form} was asked for)"
        raise EditionError(f"edition {edition.id!r} has no form {form!r} "
                           f"(it has: {', '.join(forms)})")
    if beam.unit_system is UnitSystem.US and "inch-pound" in forms:
        return "inch-pound", "follows the beam's US customary units"
    if "SI" in forms:
        return "SI", "follows the beam's SI units" if len(forms) > 1 else "the edition's form"
    return forms[0], "the edition's only form"


def check_situation(edition: Edition, situation: str) -> None:
    """An edition is assessed only in a design situation it distinguishes: one whose
    strength rules do not change with the situation says so rather than answer as if
    they did."""
    if situation in edition.situations:
        return
    known = ", ".join(edition.situations)
    if edition.situations == ("persistent",):
        raise EditionError(
            f"edition {edition.id!r} has no {situation} design situation of its own: its "
            "resistance rules are the same in every situation, so assess it as persistent, "
            "with the factored moment of the situation given as moments.factored")
    raise EditionError(f"edition {edition.id!r} has no {situation} design situation "
                       f"(it distinguishes: {known})")


def build_section(beam: Beam, width: Any, steel: MaterialModel) -> SectionArrays:
    """The core section of a beam with a given (effective) flange width."""
    layers = (*beam.tension, *beam.compression)
    if beam.flanged and beam.flange_thickness is not None:
        thicknesses, widths, labels = flanged_profile(
            width, beam.web_width, beam.flange_thickness, beam.depth,
            flange_in_compression=beam.flange_in_compression)
    else:
        thicknesses, widths, labels = [beam.depth], [beam.web_width], ("web",)
    return SectionArrays.from_profile(
        thicknesses, widths, labels, [layer.area for layer in layers],
        [layer.depth for layer in layers], [steel.law] * len(layers))


_Done = TypeVar("_Done")
SolveRequest = tuple[SectionArrays, ConcreteLaw]
"""A section batch and its concrete law, to be solved (:func:`solve_arrays`)."""


def evaluate(beam: Beam, edition: Edition, context: Context,
             applicability: tuple[Check, ...] | None = None) -> Evaluation:
    """Run every topic of ``edition`` on ``beam``; stop after applicability when a single
    beam is outside the edition's scope. ``applicability``: the edition's scope checks
    of these very beams, where the caller has them already (the batch path asks first,
    to cut out the beams outside scope)."""
    return solved_at_once(evaluation(beam, edition, context, applicability))


def solved_at_once(steps: Generator[SolveRequest, ResponseArrays, _Done]) -> _Done:
    """Run steps that ask for a section to be solved, solving it as asked."""
    try:
        request = next(steps)
        while True:
            request = steps.send(solve_arrays(*request))
    except StopIteration as finished:
        return finished.value


def evaluation(beam: Beam, edition: Edition, context: Context,
               applicability: tuple[Check, ...] | None = None
               ) -> Generator[SolveRequest, ResponseArrays, Evaluation]:
    """:func:`evaluate` as steps: it yields its section and concrete law and is sent the
    solved section, so a caller may solve the sections of many evaluations in one call
    (:func:`clausewise.core.solve_together`)."""
    if beam.flanged and beam.flange_thickness is None:
        raise SectionError(f"beam {beam.id!r}: a {beam.shape.value} beam needs its flange "
                           "(slab) thickness hf in mm")
    check_situation(edition, context.situation)
    params = edition.parameters(context)
    if applicability is None:
        applicability = tuple(edition.applicability(beam, params, context))
    in_scope = _all_passed(applicability)
    result = Evaluation(beam, edition, context, params, applicability, in_scope)
    if not beam.is_batch and not in_scope:
        return result

    width = None
    if beam.flanged:
        result = replace(result, effective_width=edition.effective_flange_width(
            beam, params, context))
        width = result.effective_width.value  # type: ignore[union-attr]
    concrete = edition.concrete_law(beam, params, context)
    steel = edition.steel_law(beam, params, context)
    arrays = build_section(beam, width, steel)
    solved: ResponseArrays = yield arrays, concrete.law
    response: Response | ResponseArrays = solved if beam.is_batch else solved.row(0)
    section = SectionView(arrays, single=not beam.is_batch)

    resistance = edition.resistance_factor(beam, response, params, context)
    equilibrium = solved.equilibrium if beam.is_batch else bool(solved.equilibrium[0])
    moment = np.where(equilibrium, response.nominal_moment, np.nan)
    phi = resistance.factor
    design_resistance = Factor(
        "M_Rd", per_beam(phi.value * moment), resistance.requirement,
        f"{phi.symbol} = {shown(phi.value)} times the nominal moment Mn", "N·mm")
    demand = edition.design_actions(beam, params, context)

    checks: list[Check] = []
    if demand is not None:
        checks.append(Check("flexural strength", demand.value, design_resistance.value,
                            Sense.AT_MOST, resistance.requirement, "M_Ed", "N·mm",
                            f"governing combination: {_governing_label(demand)}"))
    checks += edition.minimum_reinforcement(beam, section, response, demand, resistance,
                                            params, context)
    checks += edition.ductility_limits(beam, section, response, params, context)
    checks += edition.additional_checks(beam, section, response, demand, resistance, params,
                                        context)
    detailing, remarks = detailing_checks(beam, edition, params, context)
    checks += detailing
    return replace(result, concrete=concrete, steel=steel, section=section, response=response,
                   resistance=resistance, design_resistance=design_resistance, demand=demand,
                   checks=tuple(checks), remarks=tuple(remarks))


def _all_passed(checks: tuple[Check, ...]) -> Any:
    if not checks:
        return True
    if all(type(c.passed) is bool for c in checks):  # one beam
        return all(c.passed for c in checks)
    passed = reduce(np.logical_and, (c.passed for c in checks))
    return passed if np.ndim(passed) else bool(passed)


def _governing_label(envelope: Envelope) -> str:
    if np.ndim(envelope.governing):
        return "per beam"
    return envelope.governing_candidate.label


# --- the audited single-beam result ---------------------------------------------------

@dataclass(frozen=True)
class Assessment:
    """One beam under one edition, with every value's clause and supplier."""

    beam: Beam
    edition_id: str
    edition_title: str
    stack: tuple[LayerRecord, ...]
    form: str
    form_basis: str
    parameters: tuple[Any, ...]
    applicability: tuple[Check, ...]
    status: Status
    effective_width: Envelope | None
    concrete_factors: tuple[Factor, ...]
    steel_factors: tuple[Factor, ...]
    response: Response | None
    resistance: Resistance | None
    design_resistance: Factor | None
    demand: Envelope | None
    checks: tuple[Check, ...]
    situation: str = "persistent"
    concrete_law: Any = None  # the core law solved (for figures and further study)
    section: SectionView | None = None
    caution: str = CAUTION
    topics: tuple[TopicAnswer, ...] = ()  # which layer answered each hook, which wrapped it
    remarks: tuple[str, ...] = ()  # what was not checked and why

    @property
    def all_checks(self) -> tuple[Check, ...]:
        return self.applicability + self.checks

    @property
    def governing(self) -> Check | None:
        """The check with the highest utilisation (scope checks first when outside scope)."""
        pool = self.checks if self.status != OUT_OF_SCOPE else self.applicability
        worst, _ = governing(pool)
        return None if worst is None else pool[worst]

    @property
    def passed(self) -> bool:
        return self.status == PASS

    @property
    def nominal_moment(self) -> float:
        return self.response.nominal_moment if self.response else float("nan")

    def suppliers(self) -> dict[str, str]:
        """Who supplied each parameter, by name."""
        return {p.name: p.clause.edition for p in self.parameters}

    def summary(self) -> str:
        """One line saying what governs."""
        if self.status == OUT_OF_SCOPE:
            return outside_scope_line(self.edition_id, [(c.name, c.clause.ref)
                                                        for c in self.applicability
                                                        if not c.passed])
        if self.status == NO_EQUILIBRIUM and self.response is not None:
            return f"{self.response.message}"
        check = self.governing
        if check is None:
            return NO_ACTIONS
        return governed_head(self.status, check.name, f"{check.clause.edition} "
                             f"{check.clause.ref}") + f"{check.utilisation:.3f}"


def _stack(edition: Edition) -> tuple[LayerRecord, ...]:
    return tuple(LayerRecord(r.info.id, r.info.title, r.distribution,  # type: ignore[union-attr]
                             r.version, r.source) for r in edition.layers)


def _status(ev: Evaluation) -> Status:
    equilibrium = ev.response is None or ev.response.equilibrium
    return status(in_scope=ev.in_scope, equilibrium=equilibrium, checks=ev.checks,
                  has_demand=ev.demand is not None)


def assess(beam: Beam, edition: str | Edition, *, form: str | None = None,
           situation: str = "persistent", registry: Registry | None = None) -> Assessment:
    """Assess one beam under one edition (an id or an :class:`Edition`)."""
    if beam.is_batch:
        raise TypeError("assess takes one beam; use assess_many for a batch")
    if isinstance(edition, str):
        edition = (registry or default_registry()).edition(edition)
    chosen, basis = resolve_form(edition, beam, form)
    with answers_trail() as trail:
        ev = evaluate(beam, edition, Context(form=chosen, situation=situation))
    return Assessment(
        beam=beam, edition_id=edition.id, edition_title=edition.info.title,
        stack=_stack(edition), form=chosen, form_basis=basis,
        parameters=tuple(ev.parameters.values()), applicability=ev.applicability,
        status=_status(ev), effective_width=ev.effective_width,
        concrete_factors=ev.concrete.factors if ev.concrete else (),
        steel_factors=ev.steel.factors if ev.steel else (),
        response=ev.response, resistance=ev.resistance,
        design_resistance=ev.design_resistance, demand=ev.demand, checks=ev.checks,
        situation=situation, concrete_law=ev.concrete.law if ev.concrete else None,
        section=ev.section, topics=tuple(trail.values()),
        remarks=ev.remarks,
    )


def input_clause(what: str) -> Clause:
    """The clause of a value the engineer gave outright."""
    return Clause("input", what, "engineer")
