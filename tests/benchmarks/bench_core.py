"""Benchmark of the core solver: scalar ``solve``, batch ``solve_arrays`` and a bare
closed-form numpy reference, on the same 100 000 random T sections.

Run as ``python tests/benchmarks/bench_core.py [sections] [scalar sample]``.
Not a test: pytest does not collect this folder.
"""

from __future__ import annotations

import sys
import time

import numpy as np

from clausewise.core import (
    ElasticPlastic,
    RectangularBlock,
    Section,
    SectionArrays,
    SteelLayer,
    solve,
    solve_arrays,
)

ES = 200_000.0
EPS_CU = 0.003


def random_tees(n: int, seed: int = 20240601) -> dict[str, np.ndarray]:
    rng = np.random.default_rng(seed)
    bw = rng.uniform(200.0, 450.0, n)
    h = rng.uniform(350.0, 1000.0, n)
    d = h - rng.uniform(40.0, 80.0, n)
    fc = rng.uniform(20.0, 60.0, n)
    return {
        "bw": bw,
        "bf": bw + rng.uniform(0.0, 2000.0, n),
        "hf": rng.uniform(0.1, 0.3, n) * h,
        "h": h,
        "d": d,
        "area": rng.uniform(0.002, 0.05, n) * bw * d,
        "fy": rng.uniform(400.0, 550.0, n),
        "stress": 0.85 * fc,
        # beta1 falling from 0.85 to 0.65 with strength (ACI 318 beta1 rule, from memory)
        "beta": np.clip(0.85 - 0.05 * (fc - 28.0) / 7.0, 0.65, 0.85),
    }


def batch_of(s: dict[str, np.ndarray]) -> tuple[SectionArrays, RectangularBlock]:
    sections = SectionArrays.from_profile(
        thicknesses=[s["hf"], s["h"] - s["hf"]], widths=[s["bf"], s["bw"]],
        labels=("flange", "web"), areas=[s["area"]], depths=[s["d"]],
        steel=[ElasticPlastic(modulus=ES, yield_stress=s["fy"])])
    return sections, RectangularBlock(s["stress"], s["beta"], EPS_CU)


def closed_form(s: dict[str, np.ndarray]) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Rectangle of width bf if the block stays in the flange, else the overhang/web split,
    both with yielding steel (common practice, no source). Returns c, Mn, steel yields."""
    tension = s["area"] * s["fy"]
    a_flange = tension / (s["stress"] * s["bf"])
    overhang = s["stress"] * (s["bf"] - s["bw"]) * s["hf"]
    a_web = (tension - overhang) / (s["stress"] * s["bw"])
    in_flange = a_flange <= s["hf"]
    a = np.where(in_flange, a_flange, a_web)
    moment = np.where(in_flange, tension * (s["d"] - a / 2),
                      overhang * (s["d"] - s["hf"] / 2)
                      + (tension - overhang) * (s["d"] - a / 2))
    c = a / s["beta"]
    yields = EPS_CU * (s["d"] - c) / c >= s["fy"] / ES
    return c, moment, yields


def timed(function, repeat: int) -> tuple[float, object]:
    best, result = np.inf, None
    for _ in range(repeat):
        start = time.perf_counter()
        result = function()
        best = min(best, time.perf_counter() - start)
    return best, result


def main(n: int = 100_000, sample: int = 2_000) -> None:
    s = random_tees(n)
    sections, block = batch_of(s)

    picks = np.linspace(0, n - 1, sample).astype(int)
    singles = [
        (Section.flanged(s["bf"][i], s["bw"][i], s["hf"][i], s["h"][i],
                         [SteelLayer(s["area"][i], s["d"][i], ElasticPlastic(ES, s["fy"][i]))]),
         RectangularBlock(s["stress"][i], s["beta"][i], EPS_CU))
        for i in picks
    ]

    t_scalar, scalar = timed(lambda: [solve(sec, law) for sec, law in singles], repeat=1)
    t_batch, batch = timed(lambda: solve_arrays(sections, block), repeat=3)
    t_build, _ = timed(lambda: batch_of(s), repeat=3)
    t_closed, (c_ref, m_ref, yields) = timed(lambda: closed_form(s), repeat=5)

    per = {"scalar": t_scalar / sample * 1e6, "batch": t_batch / n * 1e6,
           "batch+build": (t_batch + t_build) / n * 1e6, "closed": t_closed / n * 1e6}
    print(f"{n} random T sections (seed 20240601), scalar sample {sample}\n")
    print(f"{'path':<34}{'sections':>10}{'µs/section':>14}{'vs closed form':>16}")
    rows = [("scalar solve", sample, per["scalar"]),
            ("solve_arrays", n, per["batch"]),
            ("solve_arrays incl. building arrays", n, per["batch+build"]),
            ("closed-form numpy reference", n, per["closed"])]
    for name, count, us in rows:
        print(f"{name:<34}{count:>10}{us:>14.3f}{us / per['closed']:>15.0f}x")
    print(f"\nscalar / batch speed-up: {per['scalar'] / per['batch']:.0f}x")

    ok = batch.status == 0
    yielded = yields & batch.layer_yielded[:, 0] & ok
    rel_m = np.abs(batch.nominal_moment[yielded] / m_ref[yielded] - 1)
    rel_c = np.abs(batch.c[yielded] / c_ref[yielded] - 1)
    in_flange = batch.block_in_flange
    print(f"\nstatus OK: {ok.sum()} of {n}; steel yields: {yielded.sum()} "
          f"(block in flange {np.sum(yielded & in_flange)}, in web {np.sum(yielded & ~in_flange)})")
    print(f"batch vs closed form where steel yields: max |dMn/Mn| = {rel_m.max():.2e}, "
          f"max |dc/c| = {rel_c.max():.2e}")
    print(f"median iterations {np.median(batch.iterations):.0f}, max {batch.iterations.max()}; "
          f"max residual {np.nanmax(batch.residual):.1e}")
    scalar_m = np.array([r.nominal_moment for r in scalar])
    rel_s = np.abs(scalar_m / batch.nominal_moment[picks] - 1)
    print(f"scalar vs batch on the sample: max |dMn/Mn| = {rel_s.max():.2e}")
    if rel_m.max() > 1e-9 or rel_c.max() > 1e-9 or rel_s.max() > 1e-9:
        raise SystemExit("batch and closed form (or scalar) disagree beyond 1e-9")


if __name__ == "__main__":
    main(*(int(arg) for arg in sys.argv[1:3]))
