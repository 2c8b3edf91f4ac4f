"""Seeded synthetic schedules of invented beams, for benchmarks and tests.

Every beam is realistic for an office floor and inside the applicability
ranges of all built-in editions (f'c 25-45 MPa cylinder, fy 420 or 500 MPa),
so a schedule exercises every edition without tripping a scope check.
"""

from __future__ import annotations

import numpy as np

from clausewise.provisions.beam import (
    Actions,
    Beam,
    Bending,
    Continuity,
    FloorLayout,
    Layer,
    Shape,
)

_CONTINUITY = (Continuity.SIMPLE, Continuity.END, Continuity.INTERIOR)


def synthetic_beams(count: int, seed: int = 0) -> list[Beam]:
    """``count`` invented beams: T, L and rectangular, sagging and hogging, some with
    compression steel and two tension layers."""
    rng = np.random.default_rng(seed)
    beams = []
    for i in range(count):
        shape = (Shape.TEE, Shape.TEE, Shape.ELL, Shape.RECTANGLE)[int(rng.integers(4))]
        bending = Bending.HOGGING if shape is not Shape.RECTANGLE and rng.random() < 0.2 \
            else Bending.SAGGING
        bw = float(rng.choice([250.0, 300.0, 350.0, 400.0]))
        h = float(rng.uniform(450.0, 800.0))
        hf = float(rng.uniform(110.0, 180.0)) if shape is not Shape.RECTANGLE else None
        span = float(rng.uniform(5000.0, 9000.0))
        cover = 60.0
        d = h - cover
        fy = float(rng.choice([420.0, 500.0]))
        ratio = float(rng.uniform(0.004, 0.018))
        area = ratio * bw * d
        tension: tuple[Layer, ...] = (Layer(area, d),)
        if rng.random() < 0.3:
            tension = (Layer(0.6 * area, d), Layer(0.4 * area, d - 50.0))
        compression = (Layer(float(rng.uniform(400.0, 1200.0)), 55.0),) \
            if rng.random() < 0.25 else ()
        layout = None
        if shape is not Shape.RECTANGLE:
            clear = float(rng.uniform(1500.0, 3500.0))
            layout = FloorLayout(
                span=span, continuity=_CONTINUITY[int(rng.integers(3))],
                clear_span=span - bw, clear_left=clear,
                clear_right=clear if shape is Shape.TEE else None,
                adjacent_span=span if bending is Bending.HOGGING else None)
        dead = float(rng.uniform(0.3, 0.9)) * 0.4 * 0.9 * fy * area * (d - 40.0) / 1.5
        beams.append(Beam(
            id=f"S{i:07d}", shape=shape, bending=bending, web_width=bw, depth=h,
            concrete_strength=float(rng.uniform(25.0, 45.0)), yield_strength=fy,
            tension=tension, compression=compression, flange_thickness=hf, layout=layout,
            actions=Actions(dead=dead, live=0.6 * dead),
            title="synthetic beam",
        ))
    return beams
