"""ACI 318-14, in its SI form and its inch-pound form.

The family rules of :mod:`clausewise.plugins.aci318` as they stand: 318-14 set
the chapter numbering that 318-19 kept, and differs from 318-19 here only in φ
(from memory of the published code): tension-controlled from εt ≥ 0.005,
compression-controlled up to εty, linear between, and Grade 420 (60) bars may
take εty = 0.002 (Table 21.2.2, 21.2.2.1).

Contents
  scope ............. 19.2.1.1 concrete strength, 20.2.2.4 steel strength, 9.9.1.1 deep beams
  flange width ...... 6.3.2.1 overhang limits, 6.3.2.2 isolated T
  concrete .......... 22.2.2.1 ultimate strain, 22.2.2.4.1 block, 22.2.2.4.3 β1
  steel ............. 20.2.2.1-2 elastic-plastic, Es
  strength .......... 21.2.2 φ by net tensile strain (0.005), 9.5.1.1 φMn ≥ Mu
  demand ............ 5.3.1 load combinations
  limits ............ 9.6.1.2-3 minimum steel, 9.3.3.1 net tensile strain
  detailing ......... 25.2.1-2 bar spacing, 24.3.2 crack control, 20.5.1.3.1 cover
"""

from __future__ import annotations

from clausewise.plugins.aci318 import FORMS, NOTATION, Aci318
from clausewise.provisions import EditionInfo


class Aci318_14(Aci318):
    """ACI 318-14: the family rules with a fixed tension-controlled strain."""

    info = EditionInfo(
        "aci318-14", "ACI 318-14 structural concrete building code", 2014, forms=FORMS,
        notation=NOTATION,
        summary="US code; φ from the net tensile strain, tension-controlled from 0.005",
    )


plugin = Aci318_14()
