"""Benchmark of the assessment paths, side by side in one run (not a timed test).

    python tests/benchmarks/bench_batch.py [--beams 100000] [--audited 300]

Figures, all CPU time of this process (the machines are shared and noisy):
- ``assess`` (the audited single-beam path) on a sample, µs per beam-edition;
- ``assess_many`` on the whole schedule, µs per beam-edition, for a mixed schedule
  (many kinds of beam: more groups) and a design search (one kind, varied steel);
- ``assess_columns`` on the same design search given as arrays (no beam objects);
- a bare closed-form reference written here: rectangular/T block with yielding
  steel, ACI-style φ = 0.9, numpy only;
- start-up of the command line against ``python -c "import pydantic, rich, pluggy, numpy"``.
"""

from __future__ import annotations

import argparse
import subprocess
import sys
import time
from collections import Counter
from dataclasses import replace

import numpy as np

from clausewise.provisions import assess, default_registry
from clausewise.provisions.batch import assess_columns, assess_many
from clausewise.synthetic import synthetic_beams

EDITIONS = ("aci318-19", "en1992-1-1:2004")


def cpu(fn, *args, **kwargs):
    start = time.process_time()
    result = fn(*args, **kwargs)
    return time.process_time() - start, result


def design_columns(count: int, seed: int):
    """One T beam with ``count`` candidate steel areas and concrete strengths, as arrays."""
    template = next(b for b in synthetic_beams(50, seed) if b.shape.value == "T"
                    and b.bending.value == "sagging" and len(b.tension) == 1
                    and not b.compression)
    rng = np.random.default_rng(seed)
    areas = rng.uniform(0.004, 0.02, count) * template.web_width * template.tension[0].depth
    strengths = rng.uniform(25.0, 45.0, count)
    return replace(template, id="candidate", concrete_strength=strengths,
                   tension=(replace(template.tension[0], area=areas),))


def design_search(count: int, seed: int) -> list:
    """The same candidates as beam objects."""
    batch = design_columns(count, seed)
    return [replace(batch, id=f"D{i:07d}", concrete_strength=float(fc),
                    tension=(replace(batch.tension[0], area=float(a)),))
            for i, (a, fc) in enumerate(zip(batch.tension[0].area, batch.concrete_strength,
                                            strict=True))]


def closed_form(beams: list) -> float:
    """Textbook yielding-steel capacity on arrays: the floor any general solver pays."""
    bw = np.array([b.web_width for b in beams])
    bf = np.array([b.web_width + 2000.0 if b.flanged else b.web_width for b in beams])
    hf = np.array([b.flange_thickness or b.depth for b in beams])
    area = np.array([b.tension_area for b in beams])
    d = np.array([b.effective_depth for b in beams])
    fc = np.array([b.concrete_strength for b in beams])
    fy = np.array([b.yield_strength for b in beams])
    start = time.process_time()
    a_flange = area * fy / (0.85 * fc * bf)
    overhang = 0.85 * fc * (bf - bw) * hf / fy
    a_web = (area - overhang) * fy / (0.85 * fc * bw)
    mn = np.where(a_flange <= hf, area * fy * (d - a_flange / 2),
                  overhang * fy * (d - hf / 2) + (area - overhang) * fy * (d - a_web / 2))
    _ = 0.9 * mn
    return time.process_time() - start


def startup() -> tuple[float, float]:
    def best(cmd: list[str]) -> float:
        times = []
        for _ in range(5):
            start = time.perf_counter()
            subprocess.run(cmd, check=True, capture_output=True)
            times.append(time.perf_counter() - start)
        return min(times)

    bare = best([sys.executable, "-c", "import pydantic, rich, pluggy, numpy"])
    ours = best([sys.executable, "-m", "clausewise.cli", "--help"])
    return ours, bare


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--beams", type=int, default=100_000)
    parser.add_argument("--audited", type=int, default=300)
    args = parser.parse_args()
    default_registry()
    rows = []
    for name, beams in (("mixed schedule", synthetic_beams(args.beams, seed=7)),
                        ("design search", design_search(args.beams, seed=7))):
        pairs = len(beams) * len(EDITIONS)
        seconds, tables = cpu(assess_many, beams, EDITIONS)
        sample = beams[:: max(1, len(beams) // args.audited)][: args.audited]
        audited, _ = cpu(lambda s=sample: [assess(b, e) for b in s for e in EDITIONS])
        reference = closed_form(beams)
        statuses = {e: dict(Counter(map(str, t.status))) for e, t in tables.items()}
        rows.append((name, len(beams), audited / (len(sample) * len(EDITIONS)) * 1e6,
                     seconds / pairs * 1e6, reference / len(beams) * 1e6, statuses))
    print(f"{'schedule':16s} {'beams':>7s} {'assess µs':>10s} {'assess_many µs':>15s} "
          f"{'closed form µs':>15s}   (per beam-edition, CPU time)")
    for name, count, single, many, ref, statuses in rows:
        print(f"{name:16s} {count:7d} {single:10.1f} {many:15.2f} {ref:15.3f}   "
              f"audited/batch = {single / many:.0f}x, batch/closed form = {many / ref:.0f}x")
        for edition, counts in statuses.items():
            print(f"    {edition}: {counts}")
    columns = design_columns(args.beams, seed=7)
    seconds, _ = cpu(assess_columns, columns, EDITIONS)
    print(f"{'design search, as arrays':27s} assess_columns "
          f"{seconds / (args.beams * len(EDITIONS)) * 1e6:.2f} µs per beam-edition")
    ours, bare = startup()
    print(f"start-up: clausewise --help {ours * 1e3:.0f} ms, bare imports {bare * 1e3:.0f} ms, "
          f"ratio {ours / bare:.2f}")


if __name__ == "__main__":
    main()
