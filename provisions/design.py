"""Design: the least steel each edition requires, and bars that fit the web.

The search never assumes yielding: every candidate is a beam assessed by the same
pipeline as a check (strain compatibility in the core, the edition's checks on
top), many candidates at once through the array path (:func:`assess_columns`).

1. Required area. The tension steel sits at the depth that cover, stirrup and a
   trial bar give. Candidate areas on a geometric grid from almost nothing to
   the most steel the concrete could ever balance (fc × gross area / fy) are
   assessed together; the passing areas form one interval (strength and minimum
   steel rise with the area, ductility falls), so the first passing grid point
   and the last failing one bracket the least area, and one round of 128 points
   narrows it to about 0.12 %. The check failing just below it is the one that set
   it. A passing interval narrower than one grid step (16 %) would be missed and
   reported as no tension-only design.
2. Where no tension-only area passes: compression steel at the cover depth
   (a grid of compression areas against tension areas; the least total steel
   that passes), and the least overall depth and, separately, the least web width
   at which a tension-only section passes (10 mm steps).
3. Arrangement. Every catalogue size, from 2 bars up to two full layers (the
   bottom layer filled first, the upper one directly above at the edition's
   clear distance), is assessed with its true layer depths and its bars, so the
   engine's detailing checks decide the fit. Of the arrangements that pass every
   check, those within PRACTICAL_MARGIN (15 %) of the lightest one's steel mass are
   taken as equally economical, and among them the one with fewer layers, then fewer
   tension bars (two and three count alike: a bar in each corner and one between is
   no harder to place than two), then less steel is chosen: 6 x 16 mm rather than
   14 x 10 mm in two layers, which is lighter by 9 % but not what an engineer would
   place (common practice: fewer, larger bars in one layer where the mass hardly
   differs), and 3 x 20 mm rather than 2 x 25 mm.

Arrangements with less than 0.7 of the area required at the trial depth are not
assessed: they would need steel some 40 % deeper than the trial depth (the
property tests assess every lighter arrangement and find each failing).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np
from numpy.typing import NDArray

from clausewise.core.errors import ClausewiseError
from clausewise.provisions.bars import CATALOGUES, BarSize, catalogue_of
from clausewise.provisions.batch import (
    BatchTable,
    _floats,
    assess_columns,
    kind_of,
    stack_beams,
    take_beam,
)
from clausewise.provisions.beam import Beam, Context, Layer, UnitSystem
from clausewise.provisions.detailing import bars_that_fit, cover, stirrup_diameter
from clausewise.provisions.engine import (
    CAPACITY_ONLY,
    OUT_OF_SCOPE,
    PASS,
    Assessment,
    assess,
    check_situation,
    evaluate,
    resolve_form,
)
from clausewise.provisions.registry import Edition, Registry, default_registry

GRID = 48  # candidate areas of the first scan
POINTS = 128  # one round of refinement between the last failing and first passing areas
COMPRESSION_GRID = 12  # compression areas tried where tension steel alone cannot pass
FINE = 8  # then this many areas to a step of the first grids, about the pair found
COMPRESSION_OPTIONS = 12  # compression bar groups tried with each tension arrangement,
COMPRESSION_MARGIN = 2.5  # spread from the least area up to this multiple of it, or
COMPRESSION_SHARE = 0.25  # up to this share of the tension area more, where that is more
GROW_STEP = 10.0  # mm: resolution of the least depth and width
GROW_LIMIT = 3.0  # grow up to this multiple of the given depth or width
PRACTICAL_MARGIN = 0.15  # passing arrangements this much heavier than the lightest compete
LIGHTEST_SHARE = 0.7  # arrangements lighter than this share of the required area are skipped
TRIAL_BAR = {"metric": 20.0, "US": 25.4, "CSA": 19.5, "N": 20.0}  # mm, for the trial depth

NO_MOMENTS = ("no moments given: the least steel that passes every other check (minimum "
              "steel, detailing); give moments to design for strength")
DESIGNED, COMPRESSION, NO_DESIGN, NO_FIT = ("designed", "designed with compression steel",
                                            "no design", "no arrangement fits")


class DesignError(ClausewiseError, ValueError):
    """A beam that cannot be designed as given (names the field to change)."""


@dataclass(frozen=True)
class Arrangement:
    """Bars of one size in one or two tension layers (bottom first), and optional
    compression bars."""

    size: BarSize
    counts: tuple[int, ...]
    depths: tuple[float, ...]  # mm from the compression face, per layer
    compression: tuple[BarSize, int, float] | None = None  # size, count, depth
    edge: float = 0.0  # mm from the web face to the outer bars: cover + stirrup

    def positions(self, web_width: float) -> list[tuple[float, float, float]]:
        """(x from the web's centre line, depth from the compression face, diameter) of every
        bar, the outer bars against the stirrup legs and the rest evenly between."""
        groups = [(n, self.size.diameter, depth) for n, depth in
                  zip(self.counts, self.depths, strict=True)]
        if self.compression is not None:
            size, n, depth = self.compression
            groups.append((n, size.diameter, depth))
        out = []
        for n, db, depth in groups:
            reach = web_width / 2 - self.edge - db / 2
            xs = [0.0] if n == 1 else list(np.linspace(-reach, reach, n))
            out += [(float(x), depth, db) for x in xs]
        return out

    @property
    def count(self) -> int:
        return sum(self.counts)

    @property
    def area(self) -> float:
        return self.count * self.size.area

    @property
    def compression_area(self) -> float:
        return 0.0 if self.compression is None else self.compression[1] * \
            self.compression[0].area

    @property
    def mass_per_metre(self) -> float:
        """kg/m of the tension and compression bars (7850 kg/m³, common practice)."""
        extra = 0.0 if self.compression is None else self.compression[1] * \
            self.compression[0].mass_per_metre
        return self.count * self.size.mass_per_metre + extra

    @property
    def text(self) -> str:
        """"4 x 20 mm", "5 #8 (3 + 2)"; compression bars after a semicolon."""
        main = bars_text(self.count, self.size)
        if len(self.counts) > 1:
            main += f" ({' + '.join(str(n) for n in self.counts)})"
        if self.compression is not None:
            main += f"; compression {bars_text(self.compression[1], self.compression[0])}"
        return main

    def layers(self) -> tuple[tuple[Layer, ...], tuple[Layer, ...]]:
        """Tension and compression layers as the engine reads them."""
        d = self.size.diameter
        tension = tuple(Layer(n * self.size.area, depth, n, d, n * d)
                        for n, depth in zip(self.counts, self.depths, strict=True))
        if self.compression is None:
            return tension, ()
        size, n, depth = self.compression
        return tension, (Layer(n * size.area, depth, n, size.diameter, n * size.diameter),)


def bars_text(n: int, size: BarSize) -> str:
    return f"{n} x {size.name}" if size.name.endswith("mm") else f"{n} {size.name}"


@dataclass(frozen=True)
class Design:
    """The steel one edition requires for one beam, and the bars chosen."""

    beam_id: str
    edition_id: str
    status: str
    required_area: float = math.nan  # mm², tension steel
    trial_depth: float = math.nan  # mm, depth of the tension steel in the search
    set_by: str = ""  # the check that set the required area (failing just below it)
    set_by_clause: str = ""
    compression_area: float = 0.0  # mm², where compression steel is needed
    arrangement: Arrangement | None = None
    utilisation: float = math.nan  # governing utilisation of the chosen arrangement
    governing: str = ""  # governing check of the chosen arrangement
    governing_clause: str = ""
    least_depth: float | None = None  # mm: where no tension-only section passes
    least_width: float | None = None
    candidates: int = 0  # beams assessed by the search for this design
    message: str = ""
    search: tuple[tuple[float, bool, str], ...] = ()  # (area, passed, governing) near the bound
    assessment: Assessment | None = field(default=None, compare=False)

    @property
    def provided_area(self) -> float:
        return math.nan if self.arrangement is None else self.arrangement.area

    @property
    def mass_per_metre(self) -> float:
        return math.nan if self.arrangement is None else self.arrangement.mass_per_metre

    @property
    def passed(self) -> bool:
        """A design is good when its chosen bars pass every check."""
        return self.arrangement is not None and self.utilisation <= 1.0 + 1e-12


# --- the bar catalogue of a beam ---------------------------------------------------------

def bar_sizes(beam: Beam) -> tuple[str, tuple[BarSize, ...]]:
    """The notation system and sizes a beam may use: those it names in ``bar_sizes``
    (all from one catalogue), else metric for SI and US sizes for US units."""
    if not beam.bar_sizes:
        system = "US" if beam.unit_system is UnitSystem.US else "metric"
        return system, CATALOGUES[system]
    found = catalogue_of(beam.bar_sizes)
    if found is not None:
        return found
    raise DesignError(f"beam {beam.id!r}: bar_sizes {list(beam.bar_sizes)} are not all from "
                      "one catalogue (metric '20 mm', US '#8', CSA '25M' or Australian 'N20')")


# --- one group of beams of one kind under one edition ----------------------------------------

@dataclass
class _Group:
    """Beams of one kind (same shape, bending, optional inputs) stacked for the search."""

    edition: Edition
    beams: list[Beam]
    batch: Beam
    context: Context
    form: str | None
    given_depth: NDArray[np.float64] | None = None  # d of the file's bars (NaN: none given)
    count: NDArray[np.int_] = field(default_factory=lambda: np.zeros(0, int))
    clauses: dict[str, str] = field(default_factory=dict)  # check name -> clause
    limits_by_size: dict[float, Any] = field(default_factory=dict)

    @property
    def size(self) -> int:
        return len(self.beams)

    def assess(self, rows: NDArray[np.int_], tension: tuple[Layer, ...],
               compression: tuple[Layer, ...] = ()) -> BatchTable:
        """Assess candidate beams: ``rows`` index the group's beams, the layers are arrays
        over the candidates; every row counts as one candidate of its beam."""
        sub = replace(take_beam(self.batch, rows), tension=tension, compression=compression)
        np.add.at(self.count, rows, 1)
        return assess_columns(sub, [self.edition], ids=[""] * rows.size, form=self.form,
                              situation=self.context.situation)[self.edition.id]

    def limits(self, diameter: float) -> Any:
        """The edition's detailing limits for bars of one diameter (asked once per size)."""
        if diameter not in self.limits_by_size:
            params = self.edition.parameters(self.context)
            self.limits_by_size[diameter] = self.edition.detailing_limits(
                self.batch, diameter, params, self.context)
        return self.limits_by_size[diameter]




def _steel_depth(group: _Group, diameter: float) -> tuple[NDArray[np.float64], Any]:
    """Depth from the compression face of one layer of bars of ``diameter`` at the cover,
    and the detailing limits for that size."""
    limits = group.limits(diameter)
    if limits is None:
        raise DesignError(f"edition {group.edition.id!r} gives no detailing limits, so the "
                          "depth of the bars cannot be placed; give the tension layers")
    n = group.size
    edge = _floats(cover(group.batch, limits), n) + _floats(stirrup_diameter(group.batch), n)
    return _floats(group.batch.depth, n) - edge - diameter / 2, limits


def _most_steel(b: Beam, n: int) -> NDArray[np.float64]:
    """More tension steel than the concrete could ever balance: fc × gross area / fy
    (the flange taken as given, else as wide as 24 hf + bw); the top of the scan."""
    bw, h = _floats(b.web_width, n), _floats(b.depth, n)
    area = bw * h
    if b.flanged:
        hf = _floats(b.flange_thickness, n)
        bf = _floats(b.flange_width, n) if b.flange_width is not None else bw + 24 * hf
        area = area + (bf - bw) * hf
    return _floats(b.concrete_strength, n) * area / _floats(b.yield_strength, n)


def _passed(table: BatchTable) -> NDArray[np.bool_]:
    """Every check passes: a beam given without moments has no strength check, so its
    least steel is the least that passes the others (minimum steel, detailing)."""
    return np.asarray((table.status == PASS) | (table.status == CAPACITY_ONLY), dtype=bool)


@dataclass
class _Bracket:
    """The least passing area found for each beam of a search, and the failing area just
    below it with the check that fails there (the one that set the bound)."""

    least: NDArray[np.float64]
    lower: NDArray[np.float64]
    found: NDArray[np.bool_]
    set_by: NDArray[np.str_]
    set_by_clause: NDArray[np.str_]


NO_CHECK_SETS_IT = "no check: the least area searched passes (no minimum steel applies)"


def _least_area(group: _Group, depth: NDArray[np.float64], top: NDArray[np.float64],
                beams: NDArray[np.int_], compression: tuple[Layer, ...] = (),
                shares: NDArray[np.float64] | None = None) -> _Bracket:
    """The least passing tension area of each of ``beams`` (nan where none passes on the
    grid): a geometric grid, then one round of points between the last failing and the
    first passing grid area (resolution 1/128 of a 16 % step, about 0.12 %)."""
    k = beams.size
    shares = np.geomspace(1e-3, 1.0, GRID) if shares is None else shares
    areas = top[beams, None] * shares[None, :]
    table = group.assess(np.repeat(beams, GRID),
                         (Layer(areas.ravel(), np.repeat(depth[beams], GRID)),),
                         _take(compression, np.repeat(np.arange(k), GRID)))
    passed = _passed(table).reshape(k, GRID)
    found = passed.any(axis=1)
    first = np.argmax(passed, axis=1)
    rows = np.arange(k)
    hi = areas[rows, first]
    lo = np.where(first > 0, areas[rows, np.maximum(first - 1, 0)], 0.0)
    below = rows * GRID + np.maximum(first - 1, 0)
    set_by = np.asarray(table.governing_check, dtype=object)[below]
    clause = np.asarray(table.governing_clause, dtype=object)[below]
    none_fails = found & (first == 0)  # the search's least area passes: no check set it
    set_by[none_fails], clause[none_fails] = NO_CHECK_SETS_IT, ""
    ok = np.flatnonzero(found & (first > 0))
    if ok.size:
        steps = np.linspace(0.0, 1.0, POINTS + 1)[1:]
        trial = lo[ok, None] + (hi[ok] - lo[ok])[:, None] * steps[None, :]
        table = group.assess(np.repeat(beams[ok], POINTS),
                             (Layer(trial.ravel(), np.repeat(depth[beams[ok]], POINTS)),),
                             _take(compression, np.repeat(ok, POINTS)))
        passed = _passed(table).reshape(ok.size, POINTS)
        # the upper end passed before; a row that passes nowhere keeps its bracket
        first = np.where(passed.any(axis=1), np.argmax(passed, axis=1), POINTS - 1)
        inner = np.arange(ok.size)
        hi[ok] = trial[inner, first]
        moved = first > 0
        lo[ok] = np.where(moved, trial[inner, np.maximum(first - 1, 0)], lo[ok])
        below = inner * POINTS + np.maximum(first - 1, 0)
        set_by[ok] = np.where(moved, np.asarray(table.governing_check, dtype=object)[below],
                              set_by[ok])
        clause[ok] = np.where(moved, np.asarray(table.governing_clause, dtype=object)[below],
                              clause[ok])
    return _Bracket(np.where(found, hi, np.nan), lo, np.asarray(found, bool), set_by, clause)


def _take(layers: tuple[Layer, ...], rows: NDArray[np.int_]) -> tuple[Layer, ...]:
    return tuple(Layer(_floats(layer.area, int(rows.max()) + 1)[rows],
                       _floats(layer.depth, int(rows.max()) + 1)[rows]) for layer in layers)


def _scope_message(table: BatchTable, index: int) -> str:
    return str(table.message[index]) or "outside the edition's scope"


def _design_group(group: _Group, audit: bool) -> list[Design]:
    """Design every beam of a group under its edition."""
    n = group.size
    group.count = np.zeros(n, int)
    system, sizes = bar_sizes(group.beams[0])
    sizes_by_beam = [bar_sizes(b)[1] for b in group.beams]
    trial = min(sizes, key=lambda s: abs(s.diameter - TRIAL_BAR[system])).diameter
    depth, _ = _steel_depth(group, trial)
    if group.given_depth is not None:  # the steel where the file has it, to compare
        depth = np.where(np.isnan(group.given_depth), depth, group.given_depth)
    top = _most_steel(group.batch, n)
    everyone = np.arange(n)
    bracket = _least_area(group, depth, top, everyone)
    found = bracket.found
    designs: dict[int, Design] = {}
    for i in map(int, np.flatnonzero(found)):
        designs[i] = Design(
            group.beams[i].id, group.edition.id, DESIGNED, float(bracket.least[i]),
            float(depth[i]), str(bracket.set_by[i]), str(bracket.set_by_clause[i]),
            search=((float(bracket.lower[i]), False, str(bracket.set_by[i])),
                    (float(bracket.least[i]), True, "")))
    missing = np.flatnonzero(~found)
    if missing.size:
        designs.update(_without_tension_only(group, missing, depth, top, trial))
    _arrange(group, designs, sizes_by_beam)
    out = []
    for i in range(n):
        d = replace(designs[i], candidates=int(group.count[i]))
        if audit and d.arrangement is not None:
            d = replace(d, assessment=_audit(group, i, d.arrangement))
        out.append(d)
    return out


def _without_tension_only(group: _Group, missing: NDArray[np.int_], depth: NDArray[np.float64],
                          top: NDArray[np.float64], trial: float) -> dict[int, Design]:
    """Where tension steel alone cannot pass: compression steel, and how far the section
    must grow."""
    out: dict[int, Design] = {}
    probe = group.assess(missing, (Layer(top[missing] * 0.05, depth[missing]),))
    in_scope = probe.status != OUT_OF_SCOPE
    for j, i in enumerate(missing):
        if not in_scope[j]:
            out[i] = Design(group.beams[i].id, group.edition.id, OUT_OF_SCOPE,
                            message=_scope_message(probe, j))
    scoped = missing[np.asarray(in_scope, bool)]
    if scoped.size == 0:
        return out
    grow_depth = _least_growth(group, scoped, trial, "depth")
    grow_width = _least_growth(group, scoped, trial, "web_width")
    # compression steel at the cover depth: the least total steel on a grid of pairs, then
    # the tension area refined at that compression area
    _, limits = _steel_depth(group, trial)
    edge = _floats(cover(group.batch, limits), group.size) + \
        _floats(stirrup_diameter(group.batch), group.size)
    shares = np.geomspace(0.01, 0.5, COMPRESSION_GRID)
    k = scoped.size
    tension_shares = np.geomspace(1e-2, 1.5, GRID)
    at = edge + trial / 2  # the compression bars' depth
    best, tension = _least_pair(group, scoped, top[scoped, None] * shares[None, :], depth, at,
                                top[scoped, None] * tension_shares[None, :])
    has = np.isfinite(best)
    if has.any():  # again about the pair found, on grids FINE times finer: two compression
        # steps either side (the coarse tension grid can hide a lighter pair one step off)
        c_step, t_step = shares[1] / shares[0], tension_shares[1] / tension_shares[0]
        fine_c = best[has, None] * np.geomspace(c_step ** -2, c_step, 3 * FINE + 1)[None, :]
        fine_t = tension[has, None] * np.geomspace(1 / t_step, t_step, 2 * FINE + 1)[None, :]
        best[has], tension[has] = _least_pair(group, scoped[has], fine_c, depth, at, fine_t)
        has = np.isfinite(best)
    best_total = np.full(k, np.inf)
    if has.any():
        # the least tension area at that compression area, below the pair's (which passes)
        found_tension = np.full(group.size, np.nan)
        found_tension[scoped[has]] = tension[has]
        t_step = tension_shares[1] / tension_shares[0]
        refined = _least_area(group, depth, found_tension, scoped[has],
                              (Layer(best[has], at[scoped[has]]),),
                              np.geomspace(1 / t_step, 1.0, GRID))
        best_total[has] = np.where(refined.found, refined.least + best[has], np.inf)
    for j, i in enumerate(scoped):
        grow: dict[str, Any] = dict(least_depth=grow_depth[j], least_width=grow_width[j])
        if np.isfinite(best_total[j]):
            out[i] = Design(group.beams[i].id, group.edition.id, COMPRESSION,
                            float(best_total[j] - best[j]), float(depth[i]),
                            "strength with compression steel: tension steel alone would "
                            "break a ductility limit",
                            compression_area=float(best[j]), message="no tension-only area "
                            "passes: compression steel designed", **grow)
        else:
            out[i] = Design(group.beams[i].id, group.edition.id, NO_DESIGN,
                            trial_depth=float(depth[i]), message="no area of steel passes: "
                            "the section must grow", **grow)
    return out


def _least_pair(group: _Group, beams: NDArray[np.int_], compression: NDArray[np.float64],
                depth: NDArray[np.float64], at: NDArray[np.float64],
                tension: NDArray[np.float64]) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """Per beam, the compression and tension areas of the passing pair with the least total
    steel, every compression area of its row of ``compression`` (at depth ``at``) against
    every tension area of its row of ``tension``; NaN where no pair passes."""
    k, count = compression.shape
    kinds = tension.shape[1]
    pairs_c = np.repeat(compression, kinds, axis=1).ravel()
    pairs_t = np.tile(tension, (1, count)).ravel()
    rows = np.repeat(beams, count * kinds)
    table = group.assess(rows, (Layer(pairs_t, depth[rows]),), (Layer(pairs_c, at[rows]),))
    passed = _passed(table).reshape(k, -1)
    total = np.where(passed, (pairs_t + pairs_c).reshape(k, -1), np.inf)
    pick = np.argmin(total, axis=1)
    found = np.isfinite(total[np.arange(k), pick])
    return (np.where(found, compression[np.arange(k), pick // kinds], np.nan),
            np.where(found, tension[np.arange(k), pick % kinds], np.nan))


def _least_growth(group: _Group, beams: NDArray[np.int_], trial: float,
                  dimension: str) -> list[float | None]:
    """The least overall depth (or web width) in 10 mm steps at which some tension-only
    area passes, up to three times the given size; None beyond."""
    given = _floats(getattr(group.batch, dimension), group.size)[beams]
    steps = np.arange(1, int(math.ceil((GROW_LIMIT - 1) * given.max() / GROW_STEP)) + 1)
    sizes = given[:, None] + GROW_STEP * steps[None, :]
    valid = sizes <= GROW_LIMIT * given[:, None]
    if dimension == "web_width" and group.batch.flanged and group.batch.flange_width is not None:
        widest = _floats(group.batch.flange_width, group.size)[beams][:, None]
        valid &= sizes <= widest  # a web no wider than the flange given outright
        sizes = np.minimum(sizes, widest)
    shares = np.geomspace(1e-3, 1.0, 24)
    k, m = sizes.shape
    rows = np.repeat(beams, m * shares.size)
    grown = np.repeat(sizes.ravel(), shares.size)
    depth, _ = _steel_depth(group, trial)
    steel = depth[rows]
    if dimension == "depth":  # the steel keeps its distance from the tension face
        steel = steel + grown - _floats(group.batch.depth, group.size)[rows]
    sub = replace(take_beam(group.batch, rows), **{dimension: grown})  # type: ignore[arg-type]
    areas = _most_steel(sub, rows.size) * np.tile(shares, k * m)
    table = assess_columns(replace(sub, tension=(Layer(areas, steel),), compression=()),
                           [group.edition], ids=[""] * rows.size, form=group.form,
                           situation=group.context.situation)[group.edition.id]
    np.add.at(group.count, rows, 1)
    passed = _passed(table).reshape(k, m, shares.size).any(axis=2) & valid
    out: list[float | None] = []
    for j in range(k):
        hit = np.flatnonzero(passed[j])
        out.append(float(sizes[j, hit[0]]) if hit.size else None)
    return out


# --- arrangements -------------------------------------------------------------------------

def _arrange(group: _Group, designs: dict[int, Design],
             sizes_by_beam: list[tuple[BarSize, ...]]) -> None:
    """Choose the preferred passing arrangement (:func:`preferred`) for every designed beam,
    in place."""
    todo = [i for i, d in designs.items() if d.status in (DESIGNED, COMPRESSION)]
    if not todo:
        return
    candidates: list[tuple[int, Arrangement]] = []
    options = {i: _compression_bars(group, i, designs[i], sizes_by_beam[i]) for i in todo}
    for size in sorted({s for i in todo for s in sizes_by_beam[i]}, key=lambda s: s.diameter):
        depth, limits = _steel_depth(group, size.diameter)
        s_min = _floats(limits.clear_in_layer.value, group.size)
        s_v = _floats(limits.clear_between_layers.value, group.size)
        edge = _floats(cover(group.batch, limits), group.size)
        stirrup = _floats(stirrup_diameter(group.batch), group.size)
        fit = _floats(bars_that_fit(group.batch.web_width, size.diameter, s_min, edge, stirrup),
                     group.size)
        for i in todo:
            if size not in sizes_by_beam[i] or fit[i] < 2:
                continue
            d = designs[i]
            per_layer = int(fit[i])
            for n in range(2, 2 * per_layer + 1):
                if n * size.area < LIGHTEST_SHARE * d.required_area:
                    continue
                counts = layer_counts(n, per_layer)
                if counts is None:
                    continue
                depths = (float(depth[i]),) if len(counts) == 1 else (
                    float(depth[i]), float(depth[i] - size.diameter - s_v[i]))
                candidates += [(i, Arrangement(size, counts, depths, compression,
                                               float(edge[i] + stirrup[i])))
                               for compression in options[i]]
    chosen = _preferred_passing(group, candidates)
    params = group.edition.parameters(group.context)
    scope = {c.name for c in group.edition.applicability(group.batch, params, group.context)}
    for i in todo:
        if i in chosen:
            arrangement, table, row = chosen[i]
            name, clause, utilisation = _governing(table, row, scope)
            if not clause:
                clause = _clause_of(group, i, arrangement, name)
            designs[i] = replace(designs[i], arrangement=arrangement, utilisation=utilisation,
                                 governing=name, governing_clause=clause)
        else:
            designs[i] = replace(designs[i], status=NO_FIT, message="no arrangement of the "
                                 "catalogue fits the web and passes every check")


def layer_counts(n: int, per_layer: int) -> tuple[int, ...] | None:
    """How n bars sit: one layer when they fit, else the bottom layer as full as leaves at
    least 2 bars for the layer above, which never holds more than the one below; None
    beyond two layers (common practice: upper bars directly above lower ones)."""
    if n <= per_layer:
        return (n,) if n >= 2 else None
    bottom = min(per_layer, n - 2)
    return (bottom, n - bottom) if 2 <= n - bottom <= bottom else None


def _compression_bars(group: _Group, i: int, design: Design, sizes: tuple[BarSize, ...]
                      ) -> list[tuple[BarSize, int, float] | None]:
    """Compression bars to try with the tension bars: none where none is needed, else the
    lightest one-layer groups (2 bars or more, fitting the web) of at least the required
    compression area, since the true tension depth may ask for a little more: where the
    least compression area is small, what more the tension bars ask scales with them."""
    if design.compression_area <= 0:
        return [None]
    ceiling = max(COMPRESSION_MARGIN * design.compression_area,
                  design.compression_area + COMPRESSION_SHARE * design.required_area)
    options: list[tuple[float, BarSize, int, float]] = []
    stirrup = float(_floats(stirrup_diameter(group.batch), group.size)[i])
    for size in sizes:
        limits = group.limits(size.diameter)
        c = float(_floats(cover(group.batch, limits), group.size)[i])
        s_min = float(_floats(limits.clear_in_layer.value, group.size)[i])
        fit = int(bars_that_fit(group.beams[i].web_width, size.diameter, s_min, c, stirrup))
        least = max(2, math.ceil(design.compression_area / size.area))
        options += [(n * size.area, size, n, c + stirrup + size.diameter / 2)
                    for n in range(least, fit + 1)
                    if n * size.area <= ceiling]
    options.sort(key=lambda o: o[0])
    step = max(1, len(options) // COMPRESSION_OPTIONS)
    return [(size, n, depth) for _, size, n, depth in options[::step]]


def _preferred_passing(group: _Group, candidates: list[tuple[int, Arrangement]]
                       ) -> dict[int, tuple[Arrangement, BatchTable, int]]:
    """Assess every candidate (grouped by layer count, so each batch is of one kind) and
    keep, per beam, the preferred of those that pass (:func:`preferred`)."""
    passing: dict[int, list[tuple[Arrangement, BatchTable, int]]] = {}
    by_kind: dict[tuple[int, bool], list[tuple[int, Arrangement]]] = {}
    for beam_index, arrangement in candidates:
        key = (len(arrangement.counts), arrangement.compression is not None)
        by_kind.setdefault(key, []).append((beam_index, arrangement))
    for (layers, with_compression), items in by_kind.items():
        rows = np.array([i for i, _ in items])
        tension = tuple(_stack_layer([a.layers()[0][j] for _, a in items])
                        for j in range(layers))
        compression = (_stack_layer([a.layers()[1][0] for _, a in items]),) \
            if with_compression else ()
        table = group.assess(rows, tension, compression)
        passed = _passed(table)
        for row, ((i, arrangement), ok) in enumerate(zip(items, passed, strict=True)):
            if ok:
                passing.setdefault(i, []).append((arrangement, table, row))
    chosen: dict[int, tuple[Arrangement, BatchTable, int]] = {}
    for i, found in passing.items():
        best = preferred([a for a, _, _ in found])
        chosen[i] = next(item for item in found if item[0] is best)
    return chosen


def _governing(table: BatchTable, row: int, scope: set[str]) -> tuple[str, str, float]:
    """The governing check of a chosen arrangement, leaving out the scope checks and the
    clear distance between layers, which the arrangement meets exactly by construction."""
    pool = {name: float(u[row]) for name, u in table.utilisation.items()
            if not name.startswith("clear distance between") and name not in scope}
    if not pool:
        return (str(table.governing_check[row]), str(table.governing_clause[row]),
                float(table.governing_utilisation[row]))
    name = max(pool, key=lambda key: pool[key])
    clause = str(table.governing_clause[row]) if name == table.governing_check[row] else ""
    return name, clause, pool[name]


def _clause_of(group: _Group, i: int, arrangement: Arrangement, name: str) -> str:
    """The clause of a named check, from one assessment of the arrangement."""
    if name not in group.clauses:
        ev = evaluate(with_bars(group.beams[i], arrangement), group.edition, group.context)
        group.clauses.update({c.name: f"{c.clause.edition} {c.clause.ref}" for c in ev.checks})
    return group.clauses.get(name, "")


def preferred(passing: Sequence[Arrangement]) -> Arrangement:
    """Of passing arrangements, the one an engineer would place: among those within
    PRACTICAL_MARGIN of the lightest steel mass, fewer layers, then fewer tension bars
    (below four alike), then less steel (compression bars included)."""
    lightest = min(a.mass_per_metre for a in passing)
    economical = [a for a in passing
                  if a.mass_per_metre <= lightest * (1 + PRACTICAL_MARGIN) + 1e-9]
    return min(economical, key=lambda a: (len(a.counts), max(a.count, 3),
                                          round(a.mass_per_metre, 9)))


def _stack_layer(layers: list[Layer]) -> Layer:
    return Layer(*(np.array([getattr(layer, name) for layer in layers], float)
                   for name in ("area", "depth", "count", "diameter", "bars_width")))


def _audit(group: _Group, i: int, arrangement: Arrangement) -> Assessment:
    """The chosen bars' full, audited assessment, as ``check`` would make it."""
    tension, compression = arrangement.layers()
    beam = replace(group.beams[i], tension=tension, compression=compression)
    return assess(beam, group.edition, form=group.form, situation=group.context.situation)


def with_bars(beam: Beam, arrangement: Arrangement) -> Beam:
    """The beam with the arrangement's bars in place of any it had."""
    tension, compression = arrangement.layers()
    return replace(beam, tension=tension, compression=compression)


# --- the public entry points ------------------------------------------------------------------

def design_many(beams: Sequence[Beam], edition: str | Edition, *, form: str | None = None,
                situation: str = "persistent", registry: Registry | None = None,
                audit: bool = False, at_given_depth: bool = False) -> list[Design]:
    """Design every beam under one edition through the array path; results in input order.
    Bars a beam gives are replaced by the design's. With ``audit``, each chosen
    arrangement also carries its full assessment. With ``at_given_depth``, the required
    area of a beam that gives tension steel is found with the steel at that steel's
    centroid (to compare with it), else at the trial depth. A group that fails is designed
    again beam by beam, so one bad beam is reported as an error and the rest go on."""
    ed = (registry or default_registry()).edition(edition) if isinstance(edition, str) \
        else edition
    out: list[Design | None] = [None] * len(beams)
    groups: dict[tuple[Any, ...], list[int]] = {}
    for i, beam in enumerate(beams):
        bare = replace(beam, tension=(), compression=())
        try:
            groups.setdefault((kind_of(bare), bar_sizes(bare)[0]), []).append(i)
        except DesignError as exc:
            out[i] = Design(beam.id, ed.id, "error", message=str(exc))
    for members in groups.values():
        results = _design_members(ed, [beams[i] for i in members], form, situation, audit,
                                  at_given_depth)
        if results is None:  # one bad beam spoiled its group: design them one by one
            results = [d for i in members for d in _design_members(
                ed, [beams[i]], form, situation, audit, at_given_depth) or ()]
        for i, result in zip(members, results, strict=True):
            out[i] = result
    return [d for d in out if d is not None]


def _design_members(edition: Edition, beams: list[Beam], form: str | None, situation: str,
                    audit: bool, at_given_depth: bool = False) -> list[Design] | None:
    """Design beams of one kind together; None when a group of several raised (a single
    beam that raises gets an error design)."""
    group_beams = [replace(b, tension=(), compression=()) for b in beams]
    given = np.array([float(b.effective_depth) if b.tension else math.nan for b in beams]) \
        if at_given_depth else None
    try:
        chosen, _ = resolve_form(edition, group_beams[0], form)
        group = _Group(edition, group_beams, stack_beams(group_beams),
                       Context(form=chosen, situation=situation), form, given)
        _ready(group)
        designs = _design_group(group, audit)
        if not group_beams[0].actions.given:  # the same for the whole group
            designs = [replace(d, message=NO_MOMENTS) if d.arrangement is not None else d
                       for d in designs]
        return designs
    except (ClausewiseError, ValueError, ArithmeticError) as exc:
        if len(beams) == 1:
            return [Design(beams[0].id, edition.id, "error",
                           message=f"{type(exc).__name__}: {exc}")]
        return None


def _ready(group: _Group) -> None:
    """Raise here, once, what would fail every trial of the search: a design situation the
    edition does not distinguish, or actions it cannot factor (EN 1992-1-1's accidental
    situation needs the factored moment). Each trial's error was taken for a failing
    area: the beam was told to grow, after a search of every area row by row."""
    check_situation(group.edition, group.context.situation)
    params = group.edition.parameters(group.context)
    group.edition.design_actions(group.batch, params, group.context)


def design(beam: Beam, edition: str | Edition, **options: Any) -> Design:
    """Design one beam under one edition, with the audit of the chosen bars."""
    options.setdefault("audit", True)
    return design_many([beam], edition, **options)[0]
