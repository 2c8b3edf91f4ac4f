"""ACI 318-19, in its SI form and its inch-pound form.

The family rules of :mod:`clausewise.plugins.aci318` with the clause numbers of
318-14, which 318-19 kept. What 318-19 changes (from memory of the published
code): the tension-controlled limit follows the steel, εt ≥ εty + 0.003, with
εty = fy/Es for every grade (Table 21.2.2, 21.2.2.1).

Contents
  scope ............. 19.2.1.1 concrete strength, 20.2.2.4 steel strength, 9.9.1.1 deep beams
  flange width ...... 6.3.2.1 overhang limits, 6.3.2.2 isolated T
  concrete .......... 22.2.2.1 ultimate strain, 22.2.2.4.1 block, 22.2.2.4.3 β1
  steel ............. 20.2.2.1-2 elastic-plastic, Es
  strength .......... 21.2.2 φ by net tensile strain (εty + 0.003), 9.5.1.1 φMn ≥ Mu
  demand ............ 5.3.1 load combinations
  limits ............ 9.6.1.2-3 minimum steel, 9.3.3.1 net tensile strain
  detailing ......... 25.2.1-2 bar spacing, 24.3.2 crack control, 20.5.1.3.1 cover
"""

from __future__ import annotations

from typing import Any

import numpy as np

from clausewise.plugins.aci318 import FORMS, NOTATION, Aci318
from clausewise.provisions import Beam, EditionInfo, Factor, Parameter, Parameters


class Aci318_19(Aci318):
    """ACI 318-19: tension control measured from the yield strain."""

    info = EditionInfo(
        "aci318-19", "ACI 318-19 structural concrete building code", 2019, forms=FORMS,
        notation=NOTATION,
        summary="US code; member factor φ from the net tensile strain",
    )

    def tension_control_parameters(self) -> list[Parameter]:
        return [Parameter("tension_controlled_margin", 0.003,
                          self.clause("tension_controlled", "tension-controlled limit εty + 0.003"),
                          "εt beyond εty for tension control", (0.001, 0.01))]

    def yield_strain(self, beam: Beam, params: Parameters) -> Factor:
        es = self.steel_modulus(beam, params)
        return Factor("εty", np.asarray(beam.yield_strength, float) / es,
                      self.clause("yield_strain", "yield strain"), "fy/Es")

    def tension_controlled_strain(self, eps_ty: Any, params: Parameters) -> tuple[Any, str]:
        margin = params.value("tension_controlled_margin")
        return eps_ty + margin, f"εty + {margin:g}"


plugin = Aci318_19()
