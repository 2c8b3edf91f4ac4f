"""ACI 318-11, in its SI form and its inch-pound form.

The family rules of :mod:`clausewise.plugins.aci318` under the older, chapter-
by-topic numbering. φ is as in 318-14 (tension-controlled from εt ≥ 0.005,
Grade 420 (60) bars may take the compression-controlled limit as 0.002). The
flange width differs: a T flange is limited in total to a quarter of the span,
and the span (not the clear span) limits an L flange. Clause numbers and
values are recalled from memory of the published code.

Contents
  scope ............. 1.1.1 concrete strength, 9.4 steel strength, 10.7.1 deep beams
  flange width ...... 8.12.2 T flange, 8.12.3 L flange, 8.12.4 isolated T
  concrete .......... 10.2.3 ultimate strain, 10.2.7.1 block, 10.2.7.3 β1
  steel ............. 10.2.4 elastic-plastic, 8.5.2 Es
  strength .......... 9.3.2 φ, 10.3.3 compression-controlled limit,
                      10.3.4 tension-controlled limit, 9.1.1 φMn ≥ Mu
  demand ............ 9.2.1 load combinations
  limits ............ 10.5.1-3 minimum steel, 10.3.5 net tensile strain of beams
  detailing ......... 7.6.1-2 bar spacing, 10.6.4 crack control, 7.7.1 cover
"""

from __future__ import annotations

from types import MappingProxyType

import numpy as np

from clausewise.plugins.aci318 import FORMS, NOTATION, Aci318
from clausewise.provisions import Beam, Candidate, EditionInfo, OverhangRule, Shape

# Clause numbers by topic, from memory of 318-11.
CLAUSES_2011 = MappingProxyType({
    "concrete_minimum": "1.1.1",
    "steel_maximum": "9.4",
    "tee_flange": "8.12.2",
    "ell_flange": "8.12.3",
    "isolated_tee": "8.12.4",
    "ultimate_strain": "10.2.3",
    "stress_block": "10.2.7.1",
    "beta1": "10.2.7.3",
    "steel_law": "10.2.4",
    "steel_modulus": "8.5.2",
    "phi": "9.3.2",
    "yield_strain": "10.3.3",
    "tension_controlled": "10.3.4",
    "design_strength": "9.1.1",
    "combinations": "9.2.1",
    "minimum_steel": "10.5.1",
    "flange_in_tension": "10.5.2",
    "minimum_steel_waiver": "10.5.3",
    "beam_strain": "10.3.5",
    "deep_beam": "10.7.1",
})


class Aci318_11(Aci318):
    """ACI 318-11: the family rules, numbered by topic, with span-based flange limits."""

    info = EditionInfo(
        "aci318-11", "ACI 318-11 structural concrete building code", 2011, forms=FORMS,
        notation=NOTATION,
        summary="US code; φ from the net tensile strain, flange width from the span",
    )
    clauses = CLAUSES_2011

    def flange_limits(self, beam: Beam) -> tuple[list[OverhangRule], list[Candidate]]:
        """T: total ≤ span/4, overhang ≤ 8hf, ≤ sw/2 (8.12.2); L: overhang ≤ span/12,
        ≤ 6hf, ≤ sw/2 (8.12.3)."""
        tee = beam.shape is Shape.TEE
        topic = "tee_flange" if tee else "ell_flange"
        rules = [self.slab_rule(beam, 8 if tee else 6, topic)]
        extra: list[Candidate] = []
        layout = beam.layout
        if layout is not None:
            rules.append(self.spacing_rule(beam, topic))
            span = np.asarray(layout.span, float)
            if tee:
                extra.append(Candidate("span/4", span / 4,
                                       self.clause(topic, "total width limit from span")))
            else:
                rules.append(OverhangRule("span/12", self.on_each_side(beam, span / 12),
                                          self.clause(topic, "overhang limit from span")))
        return rules, extra


plugin = Aci318_11()

# Detailing clauses of 318-11: spacing limits (7.6.1, 7.6.2), crack control (10.6.4),
# cover (7.7.1), from memory.
Aci318_11.detailing_clauses = MappingProxyType({
    "bar_spacing": "7.6.1", "layer_spacing": "7.6.2", "crack_control": "10.6.4",
    "cover": "7.7.1",
})
