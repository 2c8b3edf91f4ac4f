"""The ACI 318 family: the rules its editions share, written once.

Each edition module (``aci318_19``, ``aci318_14``, ``aci318_11``) makes a small
subclass of :class:`Aci318` that names the edition, its clause numbers and the
few rules it changes, and exposes one instance as ``plugin`` for its entry
point. The editions are separate codes, not layers of one another: none
``extends`` another, and every value cites the edition being assessed.

Where the editions differ, the family holds the rule most of them share and an
edition overrides the plain method behind it (never a hook, so the hook markers
stay here). Every rule evaluates the published form in use: SI, or inch-pound
with strengths in psi; the two are soft conversions, so coefficients differ
slightly. Values are recalled from memory of the published codes, not read from
them; clause titles are our own words.

Contents (clause numbers of 318-14 and 318-19; 318-11 numbers its own)
  scope ............. 19.2.1.1 concrete strength, 20.2.2.4 steel strength,
                      9.9.1.1 deep beams
  flange width ...... 6.3.2.1 overhang limits, 6.3.2.2 isolated T
  concrete .......... 22.2.2.1 ultimate strain, 22.2.2.4.1 block, 22.2.2.4.3 β1
  steel ............. 20.2.2.1-2 elastic-plastic, Es
  strength .......... 21.2.2 φ by net tensile strain (tension-controlled at 0.005,
                      Grade 420 εty = 0.002: 318-14 and 318-11), 9.5.1.1 φMn ≥ Mu
  demand ............ 5.3.1 load combinations
  limits ............ 9.6.1.2-3 minimum steel, 9.3.3.1 net tensile strain
  detailing ......... 25.2.1-2 bar spacing, 24.3.2 crack control, 20.5.1.3.1 cover
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from types import MappingProxyType
from typing import Any, ClassVar

import numpy as np

from clausewise.provisions import (
    MPA_PER_PSI,
    Beam,
    Candidate,
    Check,
    Clause,
    Context,
    DetailingLimits,
    EditionInfo,
    ElasticPlastic,
    Envelope,
    Factor,
    MaterialModel,
    Notation,
    OverhangRule,
    Parameter,
    Parameters,
    RectangularBlock,
    Regime,
    Resistance,
    Sense,
    Shape,
    aggregate_size,
    choose,
    clamp,
    cylinder_strength,
    dead_alone_and_with_live,
    factored_moment,
    half_clear_distance,
    hookimpl,
    largest_of,
    overhang_envelope,
    per_beam,
    ratio_parameter,
    smallest_of,
    span_depth_check,
    sqrt,
    stirrup_diameter,
)

INCH_POUND = "inch-pound"
FORMS = ("SI", INCH_POUND)
NOTATION = Notation("f'c", "fy", "c", "εt", "Mn", "φMn", "Mu")  # the family's symbols

# Clause numbers by topic as 318-14 reorganised the code by member; 318-19 kept them.
CLAUSES_2014: Mapping[str, str] = MappingProxyType({
    "concrete_minimum": "19.2.1.1",
    "steel_maximum": "20.2.2.4",
    "tee_flange": "6.3.2.1",
    "ell_flange": "6.3.2.1",
    "isolated_tee": "6.3.2.2",
    "ultimate_strain": "22.2.2.1",
    "stress_block": "22.2.2.4.1",
    "beta1": "22.2.2.4.3",
    "steel_law": "20.2.2.1",
    "steel_modulus": "20.2.2.2",
    "phi": "21.2.2",
    "yield_strain": "21.2.2.1",
    "tension_controlled": "21.2.2",
    "design_strength": "9.5.1.1",
    "combinations": "5.3.1",
    "minimum_steel": "9.6.1.2",
    "flange_in_tension": "9.6.1.2",
    "minimum_steel_waiver": "9.6.1.3",
    "beam_strain": "9.3.3.1",
    "deep_beam": "9.9.1.1",
})

# Detailing clauses of 318-14 and 318-19 (318-11 numbers its own): spacing, layers, crack
# control, cover.
DETAILING_CLAUSES_2014: Mapping[str, str] = MappingProxyType({
    "bar_spacing": "25.2.1", "layer_spacing": "25.2.2", "crack_control": "24.3.2",
    "cover": "20.5.1.3.1",
})

# Bars of Grade 420 (SI) or Grade 60 (inch-pound), MPa, and how near fy must be to count.
GRADE_420 = (420.0, 60_000 * MPA_PER_PSI)
GRADE_TOLERANCE = 0.005


def psi(value_mpa: Any) -> Any:
    return np.asarray(value_mpa, float) / MPA_PER_PSI


def is_grade_420(fy: Any) -> Any:
    """Whether a yield strength (MPa) is that of Grade 420 (60) bars, in either form."""
    fy = np.asarray(fy, float)
    hit = np.logical_or.reduce([np.abs(fy - s) <= GRADE_TOLERANCE * s for s in GRADE_420])
    return hit if hit.ndim else bool(hit)


class Aci318:
    """The shared rules of an ACI 318 edition; a subclass sets ``info`` and what differs.

    Methods marked ``@hookimpl`` answer the hooks; the plain methods below them
    (``flange_limits``, ``yield_strain``, ``tension_controlled_strain``,
    ``tension_control_parameters``) are what an edition overrides.
    """

    info: ClassVar[EditionInfo]
    clauses: ClassVar[Mapping[str, str]] = CLAUSES_2014

    def clause(self, topic: str, title: str) -> Clause:
        """The clause of this edition on ``topic``, with our own short title."""
        return self.info.clause(self.clauses[topic], title)

    # --- who the edition is ----------------------------------------------------------

    @hookimpl
    def edition_info(self) -> EditionInfo:
        return self.info

    @hookimpl
    def edition_parameters(self, context: Context) -> Sequence[Parameter]:
        ip = context.form == INCH_POUND
        c = self.clause
        return [
            Parameter("ultimate_strain", 0.003, c("ultimate_strain", "ultimate concrete strain"),
                      "strain at the extreme compression fibre", (0.002, 0.004)),
            Parameter("block_intensity", 0.85, c("stress_block", "stress block intensity"),
                      "block stress as a fraction of f'c", (0.6, 1.0)),
            Parameter("steel_modulus", 29_000_000 * MPA_PER_PSI if ip else 200_000.0,
                      c("steel_modulus", "modulus of reinforcement"),
                      "29 000 ksi" if ip else "200 000 MPa", (150_000.0, 210_000.0), "MPa"),
            Parameter("phi_tension", 0.90, c("phi", "φ tension-controlled"),
                      "member factor when tension-controlled", (0.5, 1.0)),
            Parameter("phi_compression", 0.65, c("phi", "φ compression-controlled"),
                      "member factor when compression-controlled (other than spiral)", (0.5, 1.0)),
            *self.tension_control_parameters(),
            Parameter("min_net_tensile_strain", 0.004,
                      c("beam_strain", "net tensile strain of beams"),
                      "least εt of a non-prestressed beam", (0.002, 0.01)),
            Parameter("fc_min", 2500 * MPA_PER_PSI if ip else 17.0,
                      c("concrete_minimum", "least specified concrete strength"),
                      "2500 psi" if ip else "17 MPa", (10.0, 30.0), "MPa"),
            Parameter("fc_max", 14_500 * MPA_PER_PSI if ip else 100.0,
                      c("stress_block", "no code upper limit: this plugin stops where the "
                        "block's test basis ends"),
                      "14 500 psi" if ip else "100 MPa; raise it only with evidence for the "
                      "block at higher strength", (55.0, 200.0), "MPa"),
            Parameter("fy_max", 80_000 * MPA_PER_PSI if ip else 550.0,
                      c("steel_maximum", "greatest yield strength for flexure"),
                      "80 000 psi" if ip else "550 MPa", (300.0, 700.0), "MPa"),
            Parameter("deep_beam_ratio", 4.0, c("deep_beam", "deep beams: ln at most 4h"),
                      "least clear span over overall depth of a beam designed by flexure "
                      "(from memory)", (2.0, 10.0)),
            ratio_parameter(self.info.clause("-", "cylinder about 0.8 of cube strength: common "
                                             "practice, not ACI text")),
            Parameter("dead_only_factor", 1.4, c("combinations", "dead load alone: 1.4D"),
                      "factor on dead load alone", (1.0, 2.0)),
            Parameter("dead_factor", 1.2, c("combinations", "dead with live load: 1.2D + 1.6L"),
                      "dead-load factor with live load", (1.0, 2.0)),
            Parameter("live_factor", 1.6, c("combinations", "dead with live load: 1.2D + 1.6L"),
                      "live-load factor", (1.0, 2.0)),
        ]

    def tension_control_parameters(self) -> list[Parameter]:
        """Where φ changes: tension-controlled at a fixed strain, and the Grade 420 (60)
        yield strain (318-14, 318-11)."""
        c = self.clause
        return [
            Parameter("tension_controlled_strain", 0.005,
                      c("tension_controlled", "tension-controlled limit"),
                      "least εt of a tension-controlled section", (0.003, 0.01)),
            Parameter("yield_strain_grade_420", 0.002,
                      c("yield_strain", "yield strain of Grade 420 (60) bars"),
                      "εty taken for Grade 420 (60 ksi) bars in place of fy/Es", (0.0015, 0.0025)),
        ]

    # --- scope -----------------------------------------------------------------------

    @hookimpl
    def applicability(self, beam: Beam, params: Parameters, context: Context) -> Sequence[Check]:
        fc = cylinder_strength(beam, params).value
        return [
            Check("concrete strength at least the code minimum", fc, params.value("fc_min"),
                  Sense.AT_LEAST, params["fc_min"].clause, "f'c", "MPa"),
            Check("concrete strength within the plugin's range", fc, params.value("fc_max"),
                  Sense.AT_MOST, params["fc_max"].clause, "f'c", "MPa",
                  params["fc_max"].description),
            Check("yield strength within the flexure limit", beam.yield_strength,
                  params.value("fy_max"), Sense.AT_MOST, params["fy_max"].clause, "fy", "MPa"),
            *span_depth_check(beam, params.value("deep_beam_ratio"),
                              params["deep_beam_ratio"].clause),
        ]

    # --- effective flange width ------------------------------------------------------

    @hookimpl
    def effective_flange_width(self, beam: Beam, params: Parameters,
                               context: Context) -> Envelope:
        rules, extra = self.flange_limits(beam)
        if self.isolated_tee(beam):
            extra = [*extra, Candidate("4 bw (isolated T)", 4 * np.asarray(beam.web_width, float),
                                       self.clause("isolated_tee", "isolated T-beam flange"))]
        return overhang_envelope(beam, rules, extra)

    def flange_limits(self, beam: Beam) -> tuple[list[OverhangRule], list[Candidate]]:
        """Overhang limits per side (Table 6.3.2.1 of 318-14 and 318-19): T ≤ 8hf, sw/2,
        ln/8; L ≤ 6hf, sw/2, ln/12. Returns the rules and any total-width candidates."""
        tee = beam.shape is Shape.TEE
        topic = "tee_flange" if tee else "ell_flange"
        slab_limit, span_divisor = (8, 8) if tee else (6, 12)
        rules = [self.slab_rule(beam, slab_limit, topic)]
        layout = beam.layout
        if layout is not None:
            rules.append(self.spacing_rule(beam, topic))
            clear = layout.clear_span
            label = f"ln/{span_divisor}" if clear is not None else \
                f"ln/{span_divisor} (ln taken as the span: clear span not given)"
            ln = layout.span if clear is None else clear
            rules.append(OverhangRule(label, self.on_each_side(beam, np.asarray(ln, float)
                                                               / span_divisor),
                                      self.clause(topic, "overhang limit from clear span")))
        return rules, []

    def slab_rule(self, beam: Beam, multiple: int, topic: str) -> OverhangRule:
        hf = np.asarray(beam.flange_thickness, float)
        return OverhangRule(f"{multiple}hf", self.on_each_side(beam, multiple * hf),
                            self.clause(topic, "overhang limit from slab thickness"))

    def spacing_rule(self, beam: Beam, topic: str) -> OverhangRule:
        return OverhangRule("sw/2", half_clear_distance(beam),
                            self.clause(topic, "overhang limit from clear web spacing"))

    @staticmethod
    def on_each_side(beam: Beam, limit: Any) -> tuple[Any, ...]:
        return (limit,) * len(half_clear_distance(beam))

    @staticmethod
    def isolated_tee(beam: Beam) -> bool:
        """A T the engineer marks as isolated: its flange is not part of a slab."""
        return beam.shape is Shape.TEE and beam.isolated

    # --- materials -------------------------------------------------------------------

    def beta1(self, fc_mpa: Any, form: str) -> Factor:
        """Depth factor of the block, in the form in use: 0.85 up to 28 MPa (4000 psi),
        0.05 less per 7 MPa (1000 psi), 0.65 from 55 MPa (8000 psi). The SI line reaches
        0.65 only at 56 MPa, so the table's step at 55 MPa is kept as published."""
        if form == INCH_POUND:
            fc, start, step, floor_at, unit = psi(fc_mpa), 4000.0, 1000.0, 8000.0, "psi"
        else:
            fc, start, step, floor_at, unit = np.asarray(fc_mpa, float), 28.0, 7.0, 55.0, "MPa"
        line = clamp(0.85 - 0.05 * (fc - start) / step, 0.65, 0.85)
        value = choose(fc >= floor_at, 0.65, line)
        basis = (f"0.85 - 0.05 (f'c - {start:g} {unit})/{step:g} {unit} within 0.65..0.85; "
                 f"0.65 from {floor_at:g} {unit}")
        return Factor("β1", value, self.clause("beta1", "depth factor of the stress block"),
                      basis)

    @hookimpl
    def concrete_law(self, beam: Beam, params: Parameters, context: Context) -> MaterialModel:
        fc = cylinder_strength(beam, params)
        b1 = self.beta1(fc.value, context.form)
        alpha = params.value("block_intensity")
        eps_cu = params.value("ultimate_strain")
        stress = Factor("0.85 f'c", alpha * np.asarray(fc.value, float),
                        params["block_intensity"].clause, params.cite("block_intensity"), "MPa")
        return MaterialModel(
            RectangularBlock(stress.value, b1.value, eps_cu),
            (fc, stress, b1, Factor("εcu", eps_cu, params["ultimate_strain"].clause)),
        )

    @staticmethod
    def steel_modulus(beam: Beam, params: Parameters) -> Any:
        return beam.steel_modulus if beam.steel_modulus is not None else \
            params.value("steel_modulus")

    @hookimpl
    def steel_law(self, beam: Beam, params: Parameters, context: Context) -> MaterialModel:
        es = self.steel_modulus(beam, params)
        fy = beam.yield_strength
        return MaterialModel(
            ElasticPlastic(es, fy),
            (Factor("fy", fy, self.clause("steel_law", "elastic-plastic reinforcement"),
                    "specified yield strength", "MPa"),
             Factor("Es", es, params["steel_modulus"].clause,
                    params["steel_modulus"].description, "MPa"),
             self.yield_strain(beam, params)),
        )

    def yield_strain(self, beam: Beam, params: Parameters) -> Factor:
        """εty that sets φ: fy/Es, or the Grade 420 (60) value (318-14, 318-11)."""
        fy = np.asarray(beam.yield_strength, float)
        grade = is_grade_420(fy)
        value = choose(grade, params.value("yield_strain_grade_420"),
                       fy / self.steel_modulus(beam, params))
        taken = params.cite("yield_strain_grade_420")
        if np.ndim(grade):
            basis = f"per beam: {taken} for Grade 420 (60) bars, else fy/Es"
        else:
            basis = f"Grade 420 (60) bars: {taken}" if grade else "fy/Es"
        return Factor("εty", value, self.clause("yield_strain", "yield strain"), basis)

    # --- strength --------------------------------------------------------------------

    def tension_controlled_strain(self, eps_ty: Any, params: Parameters) -> tuple[Any, str]:
        """The least εt of a tension-controlled section, and how it is set."""
        return params.value("tension_controlled_strain"), params.cite("tension_controlled_strain")

    def strength_factor(self, beam: Beam, eps_t: Any, params: Parameters
                        ) -> tuple[Factor, Regime]:
        """φ: compression-controlled up to εty, tension-controlled from the limit, linear
        between."""
        eps_ty = np.asarray(self.yield_strain(beam, params).value, float)
        limit, limit_basis = self.tension_controlled_strain(eps_ty, params)
        phi_t, phi_c = params.value("phi_tension"), params.value("phi_compression")
        eps_t = np.asarray(eps_t, float)
        phi = clamp(phi_c + (phi_t - phi_c) * (eps_t - eps_ty) / (limit - eps_ty), phi_c, phi_t)
        name = choose(eps_t >= limit, "tension-controlled",
                      choose(eps_t <= eps_ty, "compression-controlled", "transition"))
        table = self.clause("phi", "strength reduction factor by net tensile strain")
        return (Factor("φ", phi, table, f"εt against εty and {limit_basis}"),
                Regime(name, table, "set by the net tensile strain of the extreme layer"))

    @hookimpl
    def resistance_factor(self, beam: Beam, response: Any, params: Parameters,
                          context: Context) -> Resistance:
        factor, regime = self.strength_factor(beam, response.net_tensile_strain, params)
        return Resistance(factor, regime,
                          self.clause("design_strength", "design strength at least demand"))

    # --- demand ----------------------------------------------------------------------

    @hookimpl
    def design_actions(self, beam: Beam, params: Parameters,
                       context: Context) -> Envelope | None:
        return factored_moment(beam, dead_alone_and_with_live(params),
                               self.clause("combinations", "factored moment as given"),
                               symbol="Mu")

    # --- reinforcement limits --------------------------------------------------------

    def minimum_area(self, beam: Beam, width: Any, params: Parameters, form: str) -> Any:
        """As,min for a web (or tension-flange) width in mm: the larger of two ratios."""
        fc, fy = cylinder_strength(beam, params).value, np.asarray(beam.yield_strength, float)
        if form == INCH_POUND:
            ratio = largest_of(3 * sqrt(psi(fc)) / psi(fy), 200 / psi(fy))
        else:
            ratio = largest_of(0.25 * sqrt(fc) / fy, 1.4 / fy)
        return ratio * np.asarray(width, float) * beam.effective_depth

    @hookimpl
    def minimum_reinforcement(self, beam: Beam, section: Any, response: Any,
                              demand: Envelope | None, resistance: Resistance,
                              params: Parameters, context: Context) -> Sequence[Check]:
        bw = np.asarray(beam.web_width, float)
        width, note = bw, "width bw"
        if beam.flanged and not beam.flange_in_compression and beam.statically_determinate:
            width = smallest_of(section.max_width, 2 * bw)
            note = (f"width the lesser of bf and 2bw: flange in tension "
                    f"({self.clauses['flange_in_tension']})")
        limit = required = self.minimum_area(beam, width, params, context.form)
        # Not needed where the steel provided is at least 4/3 of that required by analysis;
        # the area required is estimated as As·Mu/(φMn), which errs on the safe side.
        if demand is not None:
            with np.errstate(divide="ignore", invalid="ignore"):
                by_analysis = (beam.tension_area * demand.value
                               / (resistance.factor.value * response.nominal_moment))
            limit = smallest_of(required, 4.0 / 3.0 * by_analysis)
            note += (f"; waived to 4/3 of the area required by analysis where smaller "
                     f"({self.clauses['minimum_steel_waiver']})")
        return [Check("minimum tension reinforcement", beam.tension_area, per_beam(limit),
                      Sense.AT_LEAST, self.clause("minimum_steel", "minimum flexural "
                                                  "reinforcement"), "As", "mm²", note)]

    @hookimpl
    def ductility_limits(self, beam: Beam, response: Any, params: Parameters,
                         context: Context) -> Sequence[Check]:
        return [Check("net tensile strain", response.net_tensile_strain,
                      params.value("min_net_tensile_strain"), Sense.AT_LEAST,
                      params["min_net_tensile_strain"].clause, "εt")]

    @hookimpl
    def additional_checks(self, beam: Beam, section: Any, response: Any, params: Parameters,
                          context: Context) -> Sequence[Check]:
        """An isolated T may count its flange in compression only if hf ≥ bw/2."""
        if not (self.isolated_tee(beam) and beam.flange_in_compression):
            return []
        return [Check("flange thickness of an isolated T", beam.flange_thickness,
                      per_beam(0.5 * np.asarray(beam.web_width, float)), Sense.AT_LEAST,
                      self.clause("isolated_tee", "isolated T-beam flange"), "hf", "mm",
                      "the beam is marked isolated: its flange is not part of a slab")]

    # --- detailing (25.2.1-2 spacing, 24.3.2 crack control, 20.5.1.3.1 cover) -------

    detailing_clauses: ClassVar[Mapping[str, str]] = DETAILING_CLAUSES_2014

    def detailing_clause(self, topic: str, title: str) -> Clause:
        return self.info.clause(self.detailing_clauses[topic], title)

    @hookimpl
    def detailing_limits(self, beam: Beam, diameter: Any, params: Parameters,
                         context: Context) -> DetailingLimits:
        """Clear spacing the largest of db, 25 mm (1 in.) and 4/3 of the aggregate; layers
        25 mm (1 in.) apart; crack-control spacing with fs = 2/3 fy; cover 40 mm (1.5 in.)
        for beams not exposed to weather or earth (from memory)."""
        ip = context.form == INCH_POUND
        least = 25.4 if ip else 25.0
        spacing = self.detailing_clause("bar_spacing", "clear spacing of parallel bars")
        layers = self.detailing_clause("layer_spacing", "clear distance between layers")
        crack = self.detailing_clause("crack_control", "spacing of bars for crack control")
        aggregate = aggregate_size(beam)
        cover_value = 1.5 * 25.4 if ip else 40.0
        cover_to_bar = np.asarray(beam.cover if beam.cover is not None else cover_value,
                                  float) + stirrup_diameter(beam)
        fs = 2.0 / 3.0 * np.asarray(beam.yield_strength, float)  # fs may be taken as 2/3 fy
        if ip:
            ratio = 40_000.0 / psi(fs)
            limits = [Candidate("15(40 000/fs) − 2.5cc", per_beam((15 * ratio - 2.5 * cover_to_bar
                                                               / 25.4) * 25.4), crack),
                      Candidate("12(40 000/fs)", per_beam(12 * ratio * 25.4), crack)]
        else:
            ratio = 280.0 / fs
            limits = [Candidate("380(280/fs) − 2.5cc", per_beam(380 * ratio - 2.5 * cover_to_bar),
                                crack),
                      Candidate("300(280/fs)", per_beam(300 * ratio), crack)]
        return DetailingLimits(
            Envelope.largest("least clear spacing in a layer", "s_min", [
                Candidate("db", diameter, spacing),
                Candidate("1 in." if ip else "25 mm", least, spacing),
                Candidate("4/3 of the aggregate size", per_beam(4 / 3 * np.asarray(aggregate,
                                                                                 float)),
                          spacing)], "mm"),
            Envelope.largest("least clear distance between layers", "s_v", [
                Candidate("1 in." if ip else "25 mm", least, layers)], "mm"),
            Envelope.smallest("largest bar spacing for crack control", "s_max", limits, "mm"),
            Factor("cover", cover_value, self.detailing_clause(
                "cover", "cover of beams not exposed to weather or earth"),
                "1.5 in." if ip else "40 mm", "mm"))


