"""EN 1992-1-1:2004 with the recommended values of its nationally determined parameters.

Safety acts on the materials (fcd = αcc fck/γc, fyd = fyk/γs), so the member
factor is 1. Every nationally determined parameter is a named parameter
(``alpha_cc``, ``gamma_c``, ``k1``...) that an annex extending this edition may
replace; the rules read them, never the numbers. Values from memory of the
published standard; clause titles are our own words.

Contents
  parameters ........ 2.4.2.4 partial factors, 3.1.6(1) αcc, 3.1.7 concrete model,
                      3.2.7 steel branch, 5.5(4) k1-k4, 9.2.1.1 steel ratios, EN 1990 6.10
  scope ............. 3.1.2(2)P concrete classes, 3.2.2(3)P yield strength,
                      5.3.1(3) deep beams
  flange width ...... 5.3.2.1 effective width, Figure 5.2 distance l0
  concrete .......... 3.1.6(1) fcd, Table 3.1 strains and fctm, 3.1.7 block or parabola
  steel ............. 3.2.7 design diagram, horizontal or inclined top branch
  strength .......... 6.1 M_Ed at most M_Rd, partial factors on the materials
  demand ............ EN 1990 6.10 fundamental combination, or 6.10a/b by choice
  limits ............ 9.2.1.1(1) minimum steel, 9.2.1.1(3) maximum steel, 5.5(4) xu/d
                      where moments are redistributed (always, by choice)
  detailing ......... 8.2(2) bar spacing, 4.4.1 cover (7.3.3 crack control: not checked)
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import replace
from typing import Any

import numpy as np

from clausewise.provisions import (
    Beam,
    BeamDataError,
    Bending,
    BilinearHardening,
    Candidate,
    Check,
    ClassTable,
    Combination,
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
    ParabolaRectangle,
    Parameter,
    Parameters,
    RectangularBlock,
    Regime,
    Resistance,
    Sense,
    aggregate_size,
    choose,
    cylinder_strength,
    factored_moment,
    half_clear_distance,
    hookimpl,
    input_clause,
    largest_of,
    log,
    overhang_envelope,
    per_beam,
    power,
    ratio_parameter,
    shown,
    span_depth_check,
)

EDITION = EditionInfo(
    "en1992-1-1:2004", "EN 1992-1-1:2004 concrete structures, general rules "
    "(recommended values)", 2004,
    summary="Eurocode 2; partial factors on the materials, no member factor",
    notation=Notation("fck", "fyk", "x", "εs", "M_Rd", "M_Rd", "M_Ed"),
    situations=("persistent", "transient", "accidental"),
)
clause = EDITION.clause

NORMAL_STRENGTH_UP_TO = 50.0  # MPa: Table 3.1 and 3.1.7(3) change form above C50/60
RECTANGULAR, PARABOLA = "rectangular", "parabola-rectangle"
HORIZONTAL, INCLINED = "horizontal", "inclined"
SINGLE_EXPRESSION, PAIR_OF_EXPRESSIONS = "6.10", "6.10a/b"
WHERE_REDISTRIBUTED, ALWAYS = "where redistributed", "always"
SITUATIONS = {"persistent": "", "transient": "", "accidental": "_accidental"}


@hookimpl
def edition_info() -> EditionInfo:
    return EDITION


@hookimpl
def edition_parameters(context: Context) -> Sequence[Parameter]:
    factors = clause("2.4.2.4, Table 2.1N", "partial factors for materials")
    ductility = clause("5.5(4)", "redistribution limit on the neutral-axis depth")
    combination = clause("EN 1990 6.10", "fundamental combination, recommended factors")
    return [
        Parameter("alpha_cc", 1.0, clause("3.1.6(1)", "long-term effects on compressive "
                  "strength"), "αcc in fcd = αcc fck/γc", (0.8, 1.0)),
        Parameter("gamma_c", 1.5, factors, "γc, persistent and transient situations",
                  (1.0, 2.0)),
        Parameter("gamma_s", 1.15, factors, "γs, persistent and transient situations",
                  (1.0, 1.5)),
        Parameter("gamma_c_accidental", 1.2, factors, "γc, accidental situation", (1.0, 2.0)),
        Parameter("gamma_s_accidental", 1.0, factors, "γs, accidental situation", (1.0, 1.5)),
        Parameter("concrete_model", RECTANGULAR, clause("3.1.7", "stress-strain relation for "
                  "section design"), f"{RECTANGULAR} (3.1.7(3)) or {PARABOLA} (3.1.7(1))",
                  choices=(RECTANGULAR, PARABOLA)),
        Parameter("steel_branch", HORIZONTAL, clause("3.2.7(2)", "top branch of the steel "
                  "design diagram"), f"{HORIZONTAL} (no strain limit) or {INCLINED} (to εud)",
                  choices=(HORIZONTAL, INCLINED)),
        Parameter("steel_k", 1.08, clause("Annex C, Table C.1", "ductility class B"),
                  "k = (ft/fy)k, for the inclined branch", (1.0, 1.35)),
        Parameter("steel_eps_uk", 0.05, clause("Annex C, Table C.1", "ductility class B"),
                  "εuk, strain at maximum force, for the inclined branch", (0.025, 0.1)),
        Parameter("eps_ud_ratio", 0.9, clause("3.2.7(2)", "design strain limit"),
                  "εud/εuk", (0.5, 1.0)),
        Parameter("steel_modulus", 200_000.0, clause("3.2.7(4)", "modulus of reinforcement"),
                  "Es = 200 GPa", (190_000.0, 210_000.0), "MPa"),
        Parameter("fck_min", 12.0, clause("3.1.2(2)P", "lowest concrete class"),
                  "C12/15", (8.0, 30.0), "MPa"),
        Parameter("fck_max", 90.0, clause("3.1.2(2)P", "highest concrete class"),
                  "C90/105; Table 3.1 ends there", (50.0, 90.0), "MPa"),
        Parameter("fyk_min", 400.0, clause("3.2.2(3)P", "range of yield strength"),
                  "lowest fyk the rules cover", (200.0, 500.0), "MPa"),
        Parameter("fyk_max", 600.0, clause("3.2.2(3)P", "range of yield strength"),
                  "highest fyk the rules cover", (500.0, 700.0), "MPa"),
        Parameter("deep_beam_ratio", 3.0, clause("5.3.1(3)", "a deep beam: span less than 3h"),
                  "least span over overall depth of a beam (from memory)", (2.0, 10.0)),
        Parameter("redistribution_ratio", 1.0, ductility,
                  "δ, moment after redistribution over elastic moment (1: none)", (0.7, 1.0)),
        Parameter("neutral_axis_limit", WHERE_REDISTRIBUTED, clause(
            "5.5(4)", "when the neutral-axis limit applies (a contested reading)"),
            f"{WHERE_REDISTRIBUTED!r} (default): only where moments are redistributed, "
            "δ < 1, which is what the recommended text requires; "
            f"{ALWAYS!r}: also with δ = 1, as a ductility practice some national annexes "
            "adopt (xu/d ≤ 0.448 up to C50/60 with the recommended k1, k2)",
            choices=(WHERE_REDISTRIBUTED, ALWAYS)),
        Parameter("k1", 0.44, ductility, "k1, up to C50/60", (0.3, 0.6)),
        Parameter("k2_scale", 1.25, ductility, "k2 = k2_scale (0.6 + 0.0014/εcu2)",
                  (0.8, 1.5)),
        Parameter("k3", 0.54, ductility, "k3, above C50/60", (0.3, 0.7)),
        Parameter("k4_scale", 1.25, ductility, "k4 = k4_scale (0.6 + 0.0014/εcu2)",
                  (0.8, 1.5)),
        Parameter("asmin_fctm_coeff", 0.26, clause("9.2.1.1(1)", "minimum tension steel"),
                  "coefficient of fctm/fyk", (0.1, 0.5)),
        Parameter("asmin_ratio_floor", 0.0013, clause("9.2.1.1(1)", "minimum tension steel"),
                  "least As/(bt d)", (0.0005, 0.005)),
        Parameter("asmax_ratio", 0.04, clause("9.2.1.1(3)", "maximum steel"),
                  "greatest (As + As')/Ac outside laps", (0.01, 0.1)),
        ratio_parameter(clause("-", "cylinder about 0.8 of cube strength beyond Table 3.1: "
                               "common practice, not EN text")),
        Parameter("dead_factor", 1.35, combination, "γG on permanent actions", (1.0, 2.0)),
        Parameter("live_factor", 1.5, combination, "γQ on the leading variable action",
                  (1.0, 2.0)),
        Parameter("combination_rule", SINGLE_EXPRESSION, clause(
            "EN 1990 6.4.3.2(3)", "expression 6.10, or the less favourable of 6.10a and 6.10b"),
            f"{SINGLE_EXPRESSION} (recommended) or {PAIR_OF_EXPRESSIONS} (a national choice)",
            choices=(SINGLE_EXPRESSION, PAIR_OF_EXPRESSIONS)),
        Parameter("psi_0", 0.7, clause("EN 1990 Table A1.1", "combination value of imposed "
                  "loads in buildings"), "ψ0 of the imposed load in 6.10a (0.7 for categories "
                  "A to D; 1.0 for storage)", (0.0, 1.0)),
        Parameter("xi", 0.85, clause("EN 1990 Table A1.2(B)", "reduction of unfavourable "
                  "permanent actions in 6.10b"), "ξ in 6.10b", (0.5, 1.0)),
    ]


def partial_factor_name(material: str, context: Context) -> str:
    """``gamma_c`` / ``gamma_s`` or their accidental values, by the design situation."""
    if context.situation not in SITUATIONS:
        raise ValueError(f"design situation {context.situation!r}: expected one of "
                         f"{', '.join(SITUATIONS)}")
    return f"gamma_{material}{SITUATIONS[context.situation]}"


def partial_factor(params: Parameters, material: str, context: Context) -> Factor:
    name = partial_factor_name(material, context)
    return Factor(f"γ{material}", params.value(name), params[name].clause,
                  f"{context.situation} design situation: {params.cite(name)}")


# Table 3.1 strength classes, fck (cylinder) / fck,cube (MPa), from memory
STRENGTH_CLASSES = ClassTable((
    (12, 15), (16, 20), (20, 25), (25, 30), (30, 37), (35, 45), (40, 50), (45, 55),
    (50, 60), (55, 67), (60, 75), (70, 85), (80, 95), (90, 105),
), clause("Table 3.1", "strength classes: cylinder and cube pairs"), "Table 3.1")


def characteristic_strength(beam: Beam, params: Parameters) -> Factor:
    """fck, the specified cylinder strength (converted when given as cube strength: by the
    class pairs of Table 3.1, beyond them by ``cylinder_cube_ratio``)."""
    return replace(cylinder_strength(beam, params, STRENGTH_CLASSES), symbol="fck")


# --- scope ----------------------------------------------------------------------------

@hookimpl
def applicability(beam: Beam, params: Parameters, context: Context) -> Sequence[Check]:
    fck = characteristic_strength(beam, params)
    fyk = beam.yield_strength
    return [
        Check("concrete strength at least the lowest class", fck.value,
              params.value("fck_min"), Sense.AT_LEAST, params["fck_min"].clause, "fck", "MPa",
              fck.basis),
        Check("concrete strength at most the highest class", fck.value,
              params.value("fck_max"), Sense.AT_MOST, params["fck_max"].clause, "fck", "MPa",
              fck.basis),
        Check("yield strength at least the lowest covered", fyk, params.value("fyk_min"),
              Sense.AT_LEAST, params["fyk_min"].clause, "fyk", "MPa"),
        Check("yield strength at most the highest covered", fyk, params.value("fyk_max"),
              Sense.AT_MOST, params["fyk_max"].clause, "fyk", "MPa"),
        *span_depth_check(beam, params.value("deep_beam_ratio"), params["deep_beam_ratio"].clause,
                          clear=False),
    ]


# --- effective flange width -------------------------------------------------------------

def zero_moment_distance(beam: Beam, layout: FloorLayout) -> tuple[Any, str]:
    """l0 (mm) and how it was found: the engineer's value, else Figure 5.2.

    Figure 5.2 as recalled: 0.85 l1 in an end span, 0.7 l2 in an interior span,
    0.15 (l1 + l2) over an interior support, 0.15 l2 + l3 over the support of a
    cantilever l3 (its note asks for a cantilever under half the adjacent span and
    adjacent spans within 2/3 to 1.5 of each other). A single simple span is taken
    as l0 = l, its points of zero moment being the supports.
    """
    if layout.zero_moment_length is not None:
        l0 = layout.zero_moment_length
        return l0, "l0 as given"
    span = np.asarray(layout.span, float)
    adjacent, assumed = layout.adjacent_span, ""
    if adjacent is None:
        adjacent, assumed = span, "; adjacent span not given, taken equal to l"
    if layout.continuity is Continuity.CANTILEVER:
        l0 = per_beam(0.15 * np.asarray(adjacent, float) + span)
        return l0, f"l0 = 0.15 l2 + l (cantilever{assumed})"
    if beam.bending is Bending.HOGGING:
        l0 = per_beam(0.15 * (span + np.asarray(adjacent, float)))
        return l0, f"l0 = 0.15 (l1 + l2) (over a support{assumed})"
    fraction, where = {Continuity.SIMPLE: (1.0, "simple span"),
                       Continuity.END: (0.85, "end span"),
                       Continuity.INTERIOR: (0.7, "interior span")}[layout.continuity]
    l0 = per_beam(fraction * span)
    share = "l" if fraction == 1.0 else f"{fraction:g} l"
    return l0, f"l0 = {share} ({where})"


@hookimpl
def effective_flange_width(beam: Beam, params: Parameters, context: Context) -> Envelope:
    rules: list[OverhangRule] = []
    if beam.layout is not None:
        l0, how = zero_moment_distance(beam, beam.layout)
        l0 = np.asarray(l0, float)
        half_clear = half_clear_distance(beam)
        width = clause("5.3.2.1(3)", "effective width of each overhang")
        basis = f"l0 = {shown(l0, '.6g')} mm"
        rules = [
            OverhangRule(f"0.2bi + 0.1l0 with {how}", tuple(
                None if bi is None else 0.2 * bi + 0.1 * l0 for bi in half_clear), width,
                basis),
            OverhangRule(f"0.2l0 with {how}", (0.2 * l0,) * len(half_clear), width, basis),
            OverhangRule("bi (half the clear distance to the next web)", half_clear, width),
        ]
    return overhang_envelope(beam, rules)


# --- materials: Table 3.1 -------------------------------------------------------------

def _beyond_normal(fck: Any) -> Any:
    """How far fck exceeds C50/60 (0 up to it), MPa."""
    return largest_of(np.asarray(fck, float) - NORMAL_STRENGTH_UP_TO, 0.0)


def _decay(fck: Any) -> Any:
    """[(90 - fck)/100]^4 of the high-strength rows of Table 3.1."""
    return power((90.0 - np.asarray(fck, float)) / 100.0, 4)


def ultimate_strain(fck: Any, symbol: str = "εcu3") -> Factor:
    """εcu2 = εcu3 (Table 3.1): 3.5‰ up to C50/60, smaller above."""
    normal = np.asarray(fck, float) <= NORMAL_STRENGTH_UP_TO
    value = choose(normal, 3.5, 2.6 + 35.0 * _decay(fck)) / 1000.0
    return Factor(symbol, value, clause("Table 3.1", "ultimate compressive strain"),
                  "3.5‰ up to C50/60, else 2.6 + 35[(90 - fck)/100]^4 ‰")


def strain_at_peak(fck: Any) -> Factor:
    value = (2.0 + 0.085 * power(_beyond_normal(fck), 0.53)) / 1000.0
    return Factor("εc2", value, clause("Table 3.1", "strain at peak stress"),
                  "2.0‰ up to C50/60, else 2.0 + 0.085 (fck - 50)^0.53 ‰")


def parabola_exponent(fck: Any) -> Factor:
    normal = np.asarray(fck, float) <= NORMAL_STRENGTH_UP_TO
    value = choose(normal, 2.0, 1.4 + 23.4 * _decay(fck))
    return Factor("n", value, clause("Table 3.1", "exponent of the parabola"),
                  "2 up to C50/60, else 1.4 + 23.4[(90 - fck)/100]^4")


def tensile_strength(fck: Any) -> tuple[Factor, Factor]:
    """fcm = fck + 8 and the mean axial tensile strength fctm (Table 3.1), MPa."""
    table = clause("Table 3.1", "strength of concrete")
    fcm = np.asarray(fck, float) + 8.0
    normal = np.asarray(fck, float) <= NORMAL_STRENGTH_UP_TO
    fctm = choose(normal, 0.30 * power(fck, 2.0 / 3.0), 2.12 * log(1.0 + fcm / 10.0))
    return (Factor("fcm", per_beam(fcm), table, "fck + 8 MPa", "MPa"),
            Factor("fctm", fctm, table, "0.30 fck^(2/3) up to C50/60, else "
                   "2.12 ln(1 + fcm/10)", "MPa"))


def block_factors(fck: Any) -> tuple[Factor, Factor]:
    """λ (depth of the block over x) and η (its intensity over fcd), 3.1.7(3)."""
    beyond = _beyond_normal(fck)
    block = clause("3.1.7(3)", "rectangular stress block")
    return (Factor("λ", 0.8 - beyond / 400.0, block,
                   "0.8 up to C50/60, else 0.8 - (fck - 50)/400"),
            Factor("η", 1.0 - beyond / 200.0, block,
                   "1.0 up to C50/60, else 1.0 - (fck - 50)/200"))


@hookimpl
def concrete_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    fck = characteristic_strength(beam, params)
    alpha = params["alpha_cc"]
    alpha_cc = Factor("αcc", alpha.value, alpha.clause, params.cite("alpha_cc"))
    gamma_c = partial_factor(params, "c", context)
    fcd = Factor("fcd", per_beam(alpha.value * np.asarray(fck.value, float) / gamma_c.value),
                 clause("3.1.6(1)", "design compressive strength"),
                 f"αcc fck/γc with {params.cite('alpha_cc')}, "
                 f"{params.cite(partial_factor_name('c', context))}", "MPa")
    if params.choice("concrete_model") == RECTANGULAR:
        depth, intensity = block_factors(fck.value)
        eps_cu3 = ultimate_strain(fck.value, "εcu3")
        stress = Factor("η fcd", per_beam(intensity.value * np.asarray(fcd.value, float)),
                        clause("3.1.7(3)", "rectangular stress block"), "η times fcd", "MPa")
        law: Any = RectangularBlock(stress.value, depth.value, eps_cu3.value)
        shape: tuple[Factor, ...] = (depth, intensity, eps_cu3, stress)
    else:
        eps_c2, eps_cu2 = strain_at_peak(fck.value), ultimate_strain(fck.value, "εcu2")
        n = parabola_exponent(fck.value)
        law = ParabolaRectangle(fcd.value, eps_c2.value, eps_cu2.value, n.value)
        shape = (eps_c2, eps_cu2, n)
    return MaterialModel(law, (fck, alpha_cc, gamma_c, fcd, *shape, *tensile_strength(fck.value)))


@hookimpl
def steel_law(beam: Beam, params: Parameters, context: Context) -> MaterialModel:
    fyk = np.asarray(beam.yield_strength, float)
    gamma_s = partial_factor(params, "s", context)
    es = beam.steel_modulus if beam.steel_modulus is not None else params.value("steel_modulus")
    diagram = clause("3.2.7(2)", "design diagram of reinforcement")
    fyd = Factor("fyd", per_beam(fyk / gamma_s.value), diagram,
                 f"fyk/γs with {params.cite(partial_factor_name('s', context))}", "MPa")
    eps_yd = Factor("εyd", per_beam(np.asarray(fyd.value) / es), diagram, "fyd/Es")
    factors = (Factor("fyk", beam.yield_strength, input_clause("characteristic yield strength"),
                      "as specified", "MPa"),
               gamma_s, fyd,
               Factor("Es", es, clause("3.2.7(4)", "modulus of reinforcement"),
                      "as given" if beam.steel_modulus is not None
                      else params.cite("steel_modulus"), "MPa"),
               eps_yd)
    if params.choice("steel_branch") == HORIZONTAL:
        return MaterialModel(ElasticPlastic(es, fyd.value), factors)
    k, eps_uk = params.value("steel_k"), params.value("steel_eps_uk")
    eps_ud = Factor("εud", params.value("eps_ud_ratio") * eps_uk, params["eps_ud_ratio"].clause,
                    f"{params.cite('eps_ud_ratio')} times {params.cite('steel_eps_uk')}")
    slope = Factor("Es,h", per_beam((k - 1.0) * np.asarray(fyd.value) / (eps_uk - eps_yd.value)),
                   diagram, f"from (εyd, fyd) to (εuk, k fyd) with {params.cite('steel_k')}",
                   "MPa")
    return MaterialModel(BilinearHardening(es, fyd.value, slope.value, eps_ud.value),
                         (*factors, slope, eps_ud))


# --- strength ---------------------------------------------------------------------------

@hookimpl
def resistance_factor(beam: Beam, response: Any, params: Parameters,
                      context: Context) -> Resistance:
    materials = clause("2.4.2.4", "partial factors for materials")
    gammas = ", ".join(params.cite(partial_factor_name(m, context)) for m in ("c", "s"))
    return Resistance(
        Factor("member factor", 1.0, materials,
               "none: the partial factors act on the materials (fcd, fyd)"),
        Regime("partial factors on materials", materials,
               f"{context.situation} design situation: {gammas}"),
        clause("6.1", "design moment resistance at least the design moment"))


@hookimpl
def design_actions(beam: Beam, params: Parameters, context: Context) -> Envelope | None:
    """EN 1990 6.10, or the less favourable of 6.10a and 6.10b (its national choice)."""
    g, q = params.value("dead_factor"), params.value("live_factor")
    rule = params["dead_factor"].clause
    if params.choice("combination_rule") == SINGLE_EXPRESSION:
        combinations = [Combination(g, q, rule)]
    else:
        psi, xi = params.value("psi_0"), params.value("xi")
        pair = params["combination_rule"].clause
        combinations = [Combination(g, psi * q, pair, f"{g:g}G + {psi:g}×{q:g}Q (6.10a)"),
                        Combination(xi * g, q, pair, f"{xi:g}×{g:g}G + {q:g}Q (6.10b)")]
    if context.situation == "accidental" and beam.actions.factored is None \
            and (beam.actions.dead is not None or beam.actions.live is not None):
        raise BeamDataError(
            f"beam {beam.id!r}, field moments.factored: the accidental design situation "
            "needs the design moment of the accidental combination (EN 1990 6.11: G + Ad + "
            "ψ Q, with the accidental action Ad), given as moments.factored in kN m; the "
            "service moments dead and live cannot make it without the accidental action")
    return factored_moment(beam, combinations, input_clause("design moment as given"),
                           name="design moment", symbol="M_Ed", symbols=("G", "Q"))


# --- reinforcement limits ---------------------------------------------------------------

@hookimpl
def minimum_reinforcement(beam: Beam, section: Any, response: Any, params: Parameters,
                          context: Context) -> Sequence[Check]:
    """9.2.1.1(1) minimum tension steel."""
    _, fctm = tensile_strength(characteristic_strength(beam, params).value)
    fyk = np.asarray(beam.yield_strength, float)
    ratio = largest_of(params.value("asmin_fctm_coeff") * np.asarray(fctm.value) / fyk,
                       params.value("asmin_ratio_floor"))
    if beam.flanged and not beam.flange_in_compression:
        bt = section.max_width
        width = ("bt = the effective flange in tension (wider than the mean width of the "
                 "tension zone, so on the safe side)")
    else:
        bt = beam.web_width
        width = "bt = bw (flange in compression)" if beam.flanged else "bt = b"
    return [
        Check("minimum tension reinforcement", beam.tension_area,
              per_beam(ratio * np.asarray(bt, float) * beam.effective_depth),
              Sense.AT_LEAST, clause("9.2.1.1(1)", "minimum tension steel"), "As", "mm²",
              f"max(coefficient fctm/fyk, floor) bt d with {width}; "
              f"fctm = {shown(fctm.value, '.6g')} MPa; "
              f"{params.cite('asmin_fctm_coeff')}, {params.cite('asmin_ratio_floor')}"),
    ]


@hookimpl
def ductility_limits(beam: Beam, section: Any, response: Any, params: Parameters,
                     context: Context) -> Sequence[Check]:
    """9.2.1.1(3) maximum steel, and 5.5(4) as a limit on xu/d: δ ≥ k1 + k2 xu/d up to
    C50/60, δ ≥ k3 + k4 xu/d above. 5.5(4) binds where moments are redistributed (δ < 1);
    with δ = 1 it is applied only when ``neutral_axis_limit`` says "always" (a ductility
    practice some national annexes adopt, not a requirement of the recommended text)."""
    steel = beam.tension_area + np.asarray(beam.compression_area, float)
    maximum = Check("maximum reinforcement", per_beam(steel),
                    per_beam(params.value("asmax_ratio") * np.asarray(section.area, float)),
                    Sense.AT_MOST, clause("9.2.1.1(3)", "maximum steel"), "As + As'", "mm²",
                    "Ac taken as the gross area of the section with its effective flange; "
                    f"outside lap locations; {params.cite('asmax_ratio')}")
    delta = params.value("redistribution_ratio")
    redistributed = delta < 1.0
    if not redistributed and params.choice("neutral_axis_limit") == WHERE_REDISTRIBUTED:
        return [maximum]
    fck = np.asarray(characteristic_strength(beam, params).value, float)
    strain_term = 0.6 + 0.0014 / np.asarray(ultimate_strain(fck, "εcu2").value)
    k2 = params.value("k2_scale") * strain_term
    k4 = params.value("k4_scale") * strain_term
    limit = choose(fck <= NORMAL_STRENGTH_UP_TO, (delta - params.value("k1")) / k2,
                   (delta - params.value("k3")) / k4)
    cited = ", ".join(params.cite(n) for n in ("neutral_axis_limit", "redistribution_ratio",
                                               "k1", "k2_scale", "k3", "k4_scale"))
    name = "neutral-axis depth for the redistribution assumed" if redistributed else \
        "neutral-axis depth without redistribution (ductility practice)"
    why = "moments redistributed (δ < 1)" if redistributed else \
        "δ = 1: applied because neutral_axis_limit = always, not required by the recommended text"
    return [maximum, Check(name, per_beam(
        np.asarray(response.c, float) / np.asarray(beam.effective_depth, float)), limit,
        Sense.AT_MOST, clause("5.5(4)", "redistribution limit on the neutral-axis depth"),
        "xu/d", "", f"{why}; (δ - k1)/k2 up to C50/60, (δ - k3)/k4 above, k = scale (0.6 + "
        f"0.0014/εcu2); {cited}")]



# --- detailing (8.2 spacing of bars, 7.3.3 crack control, 4.4.1 cover) ---------------

@hookimpl
def detailing_limits(beam: Beam, diameter: Any, params: Parameters,
                     context: Context) -> DetailingLimits:
    """Clear distance max(k1·φ, dg + k2, 20 mm) with the recommended k1 = 1, k2 = 5 mm,
    horizontally and vertically (8.2(2)). Crack control without direct calculation
    (7.3.3, Table 7.3N) needs the steel stress under the quasi-permanent load, which
    the beam does not give: not checked. Default cover cnom = cmin + Δcdev (4.4.1):
    cmin,dur 15 mm (XC1, structural class S4, Table 4.4N) + 10 mm; all from memory."""
    spacing = clause("8.2(2)", "clear distance between bars (recommended k1 = 1, k2 = 5 mm)")
    aggregate = np.asarray(aggregate_size(beam), float)
    terms = [Candidate("k1·φ", diameter, spacing),
             Candidate("dg + k2", per_beam(aggregate + 5.0), spacing),
             Candidate("20 mm", 20.0, spacing)]
    return DetailingLimits(
        Envelope.largest("least clear distance between bars", "s_min", terms, "mm"),
        Envelope.largest("least clear distance between layers", "s_v", terms, "mm"),
        None,
        Factor("cnom", 25.0, clause("4.4.1", "nominal cover cmin + Δcdev"),
               "cmin,dur 15 mm (XC1, S4) + Δcdev 10 mm", "mm"),
        "EN 1992-1-1 7.3.3 (Table 7.3N) ties bar spacing to the steel stress under the "
        "quasi-permanent load, which the beam file does not give")
