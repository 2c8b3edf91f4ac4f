"""AS 3600-2018, concrete structures (Australia).

The section is analysed with characteristic strengths; a capacity reduction
factor φ, which falls as the neutral axis deepens (kuo = ku/do), turns the
ultimate strength Muo into the design strength. Values from memory of the
published standard; clause titles are our own words.

Contents
  scope ............. 1.1.2 / 3.1.1 concrete strength, 3.2.1 steel strength,
                      12.1.1 non-flexural members (deep beams)
  flange width ...... 8.8.2 bw + 0.2a (T), bw + 0.1a (L), half the clear distance
  concrete .......... 8.1.3 ultimate strain, α2 and γ (capped at 0.85 or not, by choice)
  steel ............. 3.2.2 Es, elastic-plastic
  strength .......... Table 2.2.2 φ from kuo, 2.2.2 φMuo ≥ M*
  demand ............ AS/NZS 1170.0 4.2.2 load combinations
  limits ............ 8.1.6.1 minimum strength 1.2 Mcr, 8.1.5 kuo limit
  detailing ......... bar spacing (common practice), 8.6.1 crack control, cover
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np

from clausewise.provisions import (
    Beam,
    BeamDataError,
    Candidate,
    Check,
    Clause,
    Context,
    Continuity,
    DetailingLimits,
    EditionInfo,
    ElasticPlastic,
    Envelope,
    Factor,
    FloorLayout,
    MaterialModel,
    Notation,
    OverhangRule,
    Parameter,
    Parameters,
    RectangularBlock,
    Regime,
    Resistance,
    Sense,
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
)

EDITION = EditionInfo(
    "as3600:2018", "AS 3600-2018 concrete structures", 2018,
    summary="Australian standard; capacity reduction factor φ from kuo",
    notation=Notation("f'c", "fsy", "dn", "εst", "Muo", "φMuo", "M*"),
)
clause = EDITION.clause
LOADS = clause("AS/NZS 1170.0 4.2.2", "strength load combinations of the loading standard")
PHI_TABLE = clause("Table 2.2.2", "capacity reduction factor")
LOWER_LIMIT_ONLY, BOTH_LIMITS = "at least 0.67", "0.67 to 0.85"
NON_FLEXURAL = clause("12.1.1", "non-flexural members: deep beams, by clear span or "
                      "projection over overall depth")
ZERO_MOMENT_ESTIMATE = clause("8.8.2 (estimate of a)", "distance between points of zero "
                              "moment estimated from the span: common practice, not AS text")
ZERO_MOMENT_CONTINUOUS = clause("8.8.2", "distance between points of zero moment: for "
                                "continuous beams a may be taken as 0.7L (from memory)")


@hookimpl
def edition_info() -> EditionInfo:
    return EDITION


@hookimpl
def edition_parameters(context: Context) -> Sequence[Parameter]:
    return [
        Parameter("ultimate_strain", 0.003, clause("8.1.3", "ultimate concrete strain"),
                  "strain at the extreme compression fibre", (0.002, 0.004)),
        Parameter("gamma_limits", LOWER_LIMIT_ONLY, clause("8.1.3", "limits of the block "
                  "depth factor γ (a contested reading)"),
                  f"{LOWER_LIMIT_ONLY!r}: γ = 0.97 - 0.0025 f'c with only the lower limit, "
                  "the default because that is how we recall the 2018 text (we recall the cap "
                  f"0.85 with the earlier form 1.05 - 0.007 f'c); {BOTH_LIMITS!r}: also "
                  "capped at 0.85, as others recall it, which lowers γ below f'c = 48 MPa "
                  "and changes φMuo by up to about 5 %", choices=(LOWER_LIMIT_ONLY,
                                                                   BOTH_LIMITS)),
        Parameter("steel_modulus", 200_000.0, clause("3.2.2", "modulus of reinforcement"),
                  "200 000 MPa", (150_000.0, 210_000.0), "MPa"),
        Parameter("phi_max", 0.85, PHI_TABLE, "φ at small kuo (Class N bars)", (0.5, 1.0)),
        Parameter("phi_min", 0.65, PHI_TABLE, "φ at large kuo (Class N bars)", (0.5, 1.0)),
        Parameter("phi_class_l", 0.65, PHI_TABLE, "φ with Class L bars", (0.5, 1.0)),
        Parameter("kuo_limit", 0.36, clause("8.1.5", "ductility: neutral-axis depth ratio"),
                  "greatest kuo = ku/do", (0.2, 0.6)),
        Parameter("min_strength_ratio", 1.2, clause("8.1.6.1", "minimum strength in bending"),
                  "Muo at least this multiple of Mcr", (1.0, 2.0)),
        Parameter("flexural_tensile_coefficient", 0.6,
                  clause("3.1.1.3", "characteristic flexural tensile strength"),
                  "f'ct.f = coefficient · √f'c", (0.3, 1.0)),
        Parameter("fc_min", 20.0, clause("1.1.2", "range of concrete strength covered"),
                  "least f'c (also 3.1.1)", (10.0, 30.0), "MPa"),
        Parameter("fc_max", 100.0, clause("1.1.2", "range of concrete strength covered"),
                  "greatest f'c (also 3.1.1)", (50.0, 150.0), "MPa"),
        Parameter("fsy_max", 500.0, clause("3.2.1", "yield strength of reinforcement"),
                  "greatest fsy covered", (300.0, 700.0), "MPa"),
        Parameter("deep_beam_ratio_cantilever", 1.5, NON_FLEXURAL, "least projection over "
                  "overall depth of a cantilever (from memory)", (1.0, 10.0)),
        Parameter("deep_beam_ratio_simple", 3.0, NON_FLEXURAL, "least clear span over overall "
                  "depth of a simply supported beam (from memory)", (1.0, 10.0)),
        Parameter("deep_beam_ratio_continuous", 4.0, NON_FLEXURAL, "least clear span over "
                  "overall depth of a continuous beam (from memory)", (1.0, 10.0)),
        Parameter("zero_moment_simple", 1.0, ZERO_MOMENT_ESTIMATE,
                  "a / span of a simply supported span", (0.5, 1.0)),
        Parameter("zero_moment_end", 0.7, ZERO_MOMENT_CONTINUOUS,
                  "a / span of an end span", (0.5, 1.0)),
        Parameter("zero_moment_interior", 0.7, ZERO_MOMENT_CONTINUOUS,
                  "a / span of an interior span", (0.5, 1.0)),
        ratio_parameter(clause("-", "cylinder about 0.8 of cube strength: common practice, "
                               "not AS text")),
        Parameter("dead_only_factor", 1.35, LOADS, "1.35G", (1.0, 2.0)),
        Parameter("dead_factor", 1.2, LOADS, "1.2G + 1.5Q", (1.0, 2.0)),
        Parameter("live_factor", 1.5, LOADS, "1.2G + 1.5Q", (1.0, 2.0)),
    ]


# --- scope ----------------------------------------------------------------------------

@hookimpl
def applicability(beam: Beam, params: Parameters, context: Context) -> Sequence[Check]:
    fc = cylinder_strength(beam, params).value
    return [
        Check("concrete strength at least the least covered", fc, params.value("fc_min"),
              Sense.AT_LEAST, params["fc_min"].clause, "f'c", "MPa"),
        Check("concrete strength at most the greatest covered", fc, params.value("fc_max"),
              Sense.AT_MOST, params["fc_max"].clause, "f'c", "MPa"),
        Check("yield strength within the range covered", beam.yield_strength,
              params.value("fsy_max"), Sense.AT_MOST, params["fsy_max"].clause, "fsy", "MPa"),
        *_deep_beam(beam, params),
    ]


DEEP_BEAM_RATIOS = {Continuity.CANTILEVER: "deep_beam_ratio_cantilever",
                    Continuity.SIMPLE: "deep_beam_ratio_simple",
                    Continuity.END: "deep_beam_ratio_continuous",
                    Continuity.INTERIOR: "deep_beam_ratio_continuous"}


def _deep_beam(beam: Beam, params: Parameters) -> list[Check]:
    """12.1.1: a non-flexural member (a deep beam) below 1.5 (cantilever), 3 (simply
    supported) or 4 (continuous) clear span or projection over overall depth."""
    if beam.layout is None:
        return []
    name = DEEP_BEAM_RATIOS[beam.layout.continuity]
    return span_depth_check(beam, params.value(name), params[name].clause)


# --- effective flange width -------------------------------------------------------------

ESTIMATES = {Continuity.SIMPLE: ("zero_moment_simple", "simply supported span: common "
                                  "practice, not AS text"),
             Continuity.END: ("zero_moment_end", "end span: 8.8.2 for continuous beams"),
             Continuity.INTERIOR: ("zero_moment_interior", "interior span: 8.8.2 for "
                                   "continuous beams")}


def zero_moment_length(beam: Beam, layout: FloorLayout, params: Parameters) -> tuple[Any, str]:
    """Distance a between points of zero moment (mm) and the basis of its value."""
    if layout.zero_moment_length is not None:
        return layout.zero_moment_length, "a as given"
    if layout.continuity not in ESTIMATES:
        raise BeamDataError(f"beam {beam.id!r}: AS 3600 needs the floor's zero_moment_length "
                            f"(mm) for a {layout.continuity.value} span; it cannot be "
                            "estimated from the span")
    name, kind = ESTIMATES[layout.continuity]
    ratio = params.value(name)
    return ratio * np.asarray(layout.span, float), \
        f"a = {ratio:g} l, {kind}"


@hookimpl
def effective_flange_width(beam: Beam, params: Parameters, context: Context) -> Envelope:
    sides = len(half_clear_distance(beam))
    rule = clause("8.8.2", "effective width of T- and L-beams")
    rules = []
    if beam.layout is not None:
        a, basis = zero_moment_length(beam, beam.layout, params)
        # bw + 0.2a for a T and bw + 0.1a for an L are 0.1a on each slab side
        rules = [OverhangRule(f"0.1a ({basis})", (0.1 * np.asarray(a, float),) * sides, rule),
                 OverhangRule("half the clear distance to the next web",
                              half_clear_distance(beam), rule)]
    return overhang_envelope(beam, rules)


# --- materials --------------------------------------------------------------------------

STRESS_BLOCK = clause("8.1.3", "rectangular stress block")


def alpha2(fc: Any) -> Factor:
    """Block intensity factor: 0.85 - 0.0015 f'c, at least 0.67."""
    return Factor("α2", largest_of(0.85 - 0.0015 * np.asarray(fc, float), 0.67), STRESS_BLOCK,
                  "0.85 - 0.0015 f'c, at least 0.67")


def gamma(fc: Any, reading: str = LOWER_LIMIT_ONLY) -> Factor:
    """Block depth factor: 0.97 - 0.0025 f'c, at least 0.67; in the other reading of 8.1.3
    also at most 0.85 (which binds below f'c = 48 MPa)."""
    value = largest_of(0.97 - 0.0025 * np.asarray(fc, float), 0.67)
    if reading == LOWER_LIMIT_ONLY:
        return Factor("γ", value, STRESS_BLOCK, "0.97 - 0.0025 f'c, at least 0.67 "
                      f"(gamma_limits = {reading})")
    return Factor("γ", smallest_of(value, 0.85), STRESS_BLOCK, "0.97 - 0.0025 f'c within "
                  f"0.67..0.85 (gamma_limits = {reading})")


@hookimpl
def concrete_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    fc = cylinder_strength(beam, params)
    a2, g = alpha2(fc.value), gamma(fc.value, params.choice("gamma_limits"))
    eps_cu = params.value("ultimate_strain")
    stress = Factor("α2 f'c", per_beam(a2.value * np.asarray(fc.value, float)), STRESS_BLOCK,
                    "block intensity", "MPa")
    return MaterialModel(
        RectangularBlock(stress.value, g.value, eps_cu),
        (fc, a2, g, stress, Factor("εcu", eps_cu, params["ultimate_strain"].clause)),
    )


@hookimpl
def steel_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    es = beam.steel_modulus if beam.steel_modulus is not None else params.value("steel_modulus")
    fsy = beam.yield_strength
    return MaterialModel(
        ElasticPlastic(es, fsy),
        (Factor("fsy", fsy, clause("3.2.1", "yield strength of reinforcement"),
                "characteristic yield strength", "MPa"),
         Factor("Es", es, params["steel_modulus"].clause, params["steel_modulus"].description,
                "MPa"),
         Factor("εsy", per_beam(np.asarray(fsy, float) / es), clause("3.2.2", "yield strain"),
                "fsy/Es")),
    )


# --- strength ---------------------------------------------------------------------------

def capacity_factor(kuo: Any, ductility_class: str, params: Parameters) -> tuple[Factor, Regime]:
    """φ for bending without axial force: 1.24 - 13 kuo/12 within its limits (Class N),
    a fixed value for Class L bars."""
    if ductility_class.upper() == "L":
        phi = params.value("phi_class_l")
        return (Factor("φ", phi, PHI_TABLE, "Class L reinforcement"),
                Regime("Class L reinforcement", PHI_TABLE, "φ fixed, whatever kuo"))
    lower, upper = params.value("phi_min"), params.value("phi_max")
    kuo = np.asarray(kuo, float)
    phi = clamp(1.24 - 13.0 * kuo / 12.0, lower, upper)
    at_upper, at_lower = 12.0 * (1.24 - upper) / 13.0, 12.0 * (1.24 - lower) / 13.0
    name = choose(kuo <= at_upper, f"φ = {upper:g}: shallow neutral axis",
                  choose(kuo >= at_lower, f"φ = {lower:g}: deep neutral axis",
                         "φ falls with kuo"))
    return (Factor("φ", phi, PHI_TABLE, f"1.24 - 13 kuo/12 within {lower:g}..{upper:g}, "
                   "Class N bars"),
            Regime(name, PHI_TABLE, "set by kuo = ku/do of the extreme tension layer"))


def kuo_of(beam: Beam, response: Any) -> Any:
    """Neutral-axis depth over the depth of the extreme tension layer, do."""
    return per_beam(response.c / np.asarray(beam.extreme_tension_depth, float))


@hookimpl
def resistance_factor(beam: Beam, response: Any, params: Parameters,
                      context: Context) -> Resistance:
    factor, regime = capacity_factor(kuo_of(beam, response), beam.ductility_class, params)
    return Resistance(factor, regime,
                      clause("2.2.2", "design capacity at least the design action effect"))


@hookimpl
def design_actions(beam: Beam, params: Parameters, context: Context) -> Envelope | None:
    return factored_moment(beam, dead_alone_and_with_live(params),
                           LOADS, name="design moment", symbol="M*", symbols=("G", "Q"))


# --- reinforcement limits ---------------------------------------------------------------

@hookimpl
def minimum_reinforcement(beam: Beam, section: Any, response: Any, params: Parameters,
                          context: Context) -> Sequence[Check]:
    fc = cylinder_strength(beam, params).value
    fct = params.value("flexural_tensile_coefficient") * sqrt(fc)
    ratio = params.value("min_strength_ratio")
    return [Check("minimum strength in bending", response.nominal_moment,
                  per_beam(ratio * section.cracking_moment(fct)), Sense.AT_LEAST,
                  params["min_strength_ratio"].clause, "Muo", "N·mm",
                  f"Muo at least {ratio:g} Mcr; Mcr = Z f'ct.f of the gross section with its "
                  "effective flange, neglecting shrinkage and prestress")]


@hookimpl
def ductility_limits(beam: Beam, response: Any, params: Parameters,
                     context: Context) -> Sequence[Check]:
    return [Check("neutral-axis depth ratio", kuo_of(beam, response),
                  params.value("kuo_limit"), Sense.AT_MOST, params["kuo_limit"].clause, "kuo",
                  "", "kuo = ku/do, do the depth of the extreme tension layer")]



# --- detailing (spacing of bars: common practice, 8.6.1 crack control, cover) ----------

@hookimpl
def detailing_limits(beam: Beam, diameter: Any, params: Parameters,
                     context: Context) -> DetailingLimits:
    """Clear distance between bars: not recalled with confidence from the standard, so the
    common-practice value max(db, 1.5 × aggregate size, 25 mm). Crack control for beams
    (8.6.1): tension bars near the tension face at most 300 mm apart, centre to centre
    (from memory; the fuller rule ties steel stress to bar size). Default cover 30 mm:
    common practice for interior beams (Table 4.10.3.2 sets it by exposure)."""
    practice = Clause("common practice", "clear distance between bars (not the clause)",
                      EDITION.id)
    aggregate = np.asarray(aggregate_size(beam), float)
    terms = [Candidate("db", diameter, practice),
             Candidate("1.5 × aggregate size", per_beam(1.5 * aggregate), practice),
             Candidate("25 mm", 25.0, practice)]
    return DetailingLimits(
        Envelope.largest("least clear distance between bars", "s_min", terms, "mm"),
        Envelope.largest("least clear distance between layers", "s_v", terms, "mm"),
        Envelope.smallest("largest bar spacing for crack control", "s_max", [
            Candidate("300 mm", 300.0, clause("8.6.1", "crack control of beams"))], "mm"),
        Factor("cover", 30.0, Clause("common practice", "cover of interior beams; Table "
                                     "4.10.3.2 sets it by exposure", EDITION.id),
               "30 mm", "mm"))
