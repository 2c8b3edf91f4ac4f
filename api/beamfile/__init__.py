"""Beam schedules: the TOML input file, its checks, and its mapping to :class:`Beam`.

A schedule file has an optional ``[project]`` table (name, building, town,
engineer, notes, ``units = "SI"`` or ``"US"``), an optional ``[run]`` table
(``editions``, ``form``, ``situation``, ``require`` with version specifiers such
as ``"aci318-19>=0.1"``, ``annexes`` as paths relative to the file) and one
``[[beam]]`` table per beam. Quantities are strings with units ("650 mm",
"5000 psi", "180 kN m") or plain numbers in the unit system's defaults.

Conventions a user must know (also in ``fixtures/demo/README.md``):

- ``bending = "hogging"`` means compression at the soffit. Every layer ``depth``
  is measured from the compression face: from the top in sagging, from the
  soffit in hogging. ``centroid_from_face`` is the other way of placing a layer:
  the distance from the face the layer lies near (the tension face for tension
  steel, the compression face for compression steel) to the layer's centroid.
- ``shape = "inverted T"`` has its flange at the soffit: ``Shape.TEE`` with
  ``flange_at_soffit``. The bending stays as given, since the rules need the moment's
  sense (a span or a support) as well as which face the flange is on: in sagging the
  flange is in tension, in hogging in compression.
- ``statically_determinate`` defaults to true for a simple span, a cantilever, and a beam
  given without a floor (the side on which minimum steel is larger).
- Each quantity has a plausible range for a building beam (``models.PLAUSIBLE``, stated
  in the schema as ``x-plausible-range``); beyond it the value is refused as a slip of
  the unit. A beam that cannot be built is refused too: bars beyond the section's faces,
  bars wider side by side than the width at their depth, tension steel nearer the
  compression face than mid-depth.
- Plain numbers in a file that declares no unit system are read as SI, with one warning
  per file (``Schedule.warnings``) naming the fields so read.

Whole-file problems raise :class:`InputError`; a bad beam becomes an
:class:`InputProblem` and the other beams still load.
"""

from clausewise.beamfile.errors import InputError, InputProblem
from clausewise.beamfile.loading import (
    BeamEntry,
    ProjectInfo,
    Schedule,
    load_schedule,
    parse_schedule,
)
from clausewise.beamfile.models import json_schema

__all__ = ["BeamEntry", "InputError", "InputProblem", "ProjectInfo", "Schedule",
           "json_schema", "load_schedule", "parse_schedule"]
