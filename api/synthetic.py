"""Seeded synthetic schedules of invented beams, for benchmarks and tests.

Every beam is realistic for an office floor and inside the applicability
ranges of all built-in editions (f'c 25-45 MPa cylinder, fy 420 or 500 MPa),
so a schedule exercises every edition without tripping a scope check.
"""

from __future__ import annotations

from typing import Any

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


def schedule_document(beams: list[Beam], name: str = "synthetic schedule") -> dict[str, Any]:
    """The beams as a beam file (plain numbers in SI units: mm, mm², MPa, kN·m)."""

    def layers(items: tuple[Layer, ...]) -> list[dict[str, float]]:
        return [{"area": round(layer.area, 3), "depth": round(layer.depth, 3)}
                for layer in items]

    def entry(beam: Beam) -> dict[str, Any]:
        item: dict[str, Any] = {
            "id": beam.id, "title": beam.title, "shape": beam.shape.value,
            "bending": beam.bending.value, "web_width": beam.web_width,
            "overall_depth": round(beam.depth, 3),
            "concrete_strength": round(beam.concrete_strength, 3),
            "yield_strength": beam.yield_strength, "tension": layers(beam.tension),
        }
        if beam.flange_thickness is not None:
            item["slab_thickness"] = round(beam.flange_thickness, 3)
        if beam.compression:
            item["compression"] = layers(beam.compression)
        if beam.layout is not None:
            floor = {"span": round(beam.layout.span, 3),
                     "continuity": beam.layout.continuity.value}
            for key in ("clear_span", "clear_left", "clear_right", "adjacent_span"):
                value = getattr(beam.layout, key)
                if value is not None:
                    floor[key] = round(value, 3)
            item["floor"] = floor
        moments = {key: round(value / 1e6, 4) for key in ("dead", "live")
                   if (value := getattr(beam.actions, key)) is not None}
        if moments:
            item["moments"] = moments
        return item

    return {"project": {"name": name, "units": "SI",
                        "notes": "invented beams generated for benchmarks and tests"},
            "beam": [entry(b) for b in beams]}


def main(argv: list[str] | None = None) -> int:
    """``python -m clausewise.synthetic --beams N --seed S --out FILE``."""
    import argparse

    import tomli_w

    parser = argparse.ArgumentParser(description="write a seeded schedule of invented beams")
    parser.add_argument("--beams", type=int, default=100_000)
    parser.add_argument("--seed", type=int, default=0)
    parser.add_argument("--out", required=True)
    args = parser.parse_args(argv)
    document = schedule_document(synthetic_beams(args.beams, args.seed))
    with open(args.out, "wb") as handle:
        tomli_w.dump(document, handle)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
