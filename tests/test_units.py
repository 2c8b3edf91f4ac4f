"""Quantities and bar notation at the input boundary."""

from __future__ import annotations

import math

import pytest

from clausewise import units
from clausewise.provisions import UnitSystem
from clausewise.units import (
    AREA,
    LENGTH,
    MOMENT,
    NUMBER,
    STRESS,
    QuantityError,
    read_bars,
    read_quantity,
    to_internal,
)

# Conversion factors, NIST SP 811 Appendix B, from memory: 1 in = 25.4 mm (exact),
# 1 ft = 0.3048 m (exact), 1 psi = 6.894757 kPa, 1 kip = 4.448222 kN.
MM_PER_IN = 25.4
MPA_PER_PSI = 6.894757e-3
N_PER_KIP = 4448.222
NIST_REL = 1e-6  # the NIST factors above carry seven significant figures

US = UnitSystem.US
SI = UnitSystem.SI


@pytest.mark.parametrize(("text", "kind", "internal"), [
    ("650 mm", LENGTH, 650.0),
    ("26 in", LENGTH, 26 * MM_PER_IN),
    ("2.5 ft", LENGTH, 2.5 * 12 * MM_PER_IN),
    ("8.4 m", LENGTH, 8400.0),
    ("12 in.", LENGTH, 12 * MM_PER_IN),
    ("5000 psi", STRESS, 5000 * MPA_PER_PSI),
    ("30 MPa", STRESS, 30.0),
    ("30 N/mm2", STRESS, 30.0),
    ("30 N/mm²", STRESS, 30.0),
    ("4 ksi", STRESS, 4000 * MPA_PER_PSI),
    ("200 GPa", STRESS, 200_000.0),
    ("200 000 MPa", STRESS, 200_000.0),  # digits grouped by a space, common practice
    ("180 kN m", MOMENT, 180e6),
    ("180 kN*m", MOMENT, 180e6),
    ("180 kN·m", MOMENT, 180e6),
    ("180 kN.m", MOMENT, 180e6),
    ("180 kNm", MOMENT, 180e6),  # pint alone would read kNm as a kilo-number-metre
    ("130 kip ft", MOMENT, 130 * N_PER_KIP * 304.8),
    ("130 kip-ft", MOMENT, 130 * N_PER_KIP * 304.8),
    ("130 k-ft", MOMENT, 130 * N_PER_KIP * 304.8),
    ("1500 kip in", MOMENT, 1500 * N_PER_KIP * MM_PER_IN),
    ("1500 mm2", AREA, 1500.0),
    ("1500 mm²", AREA, 1500.0),
    ("2.4 in^2", AREA, 2.4 * MM_PER_IN**2),
    ("2.4 in2", AREA, 2.4 * MM_PER_IN**2),
    ("1e3 mm", LENGTH, 1000.0),
])
def test_quantities_convert_to_internal_units(text: str, kind: units.Kind,
                                              internal: float) -> None:
    value, shown = read_quantity(text, kind)
    assert value == pytest.approx(internal, rel=NIST_REL)
    assert shown == text


@pytest.mark.parametrize(("value", "kind", "si", "us", "shown_si", "shown_us"), [
    (650, LENGTH, 650.0, 650 * MM_PER_IN, "650 mm", "650 in"),
    ("650", LENGTH, 650.0, 650 * MM_PER_IN, "650 mm", "650 in"),
    (1500.0, AREA, 1500.0, 1500 * MM_PER_IN**2, "1500 mm²", "1500 in²"),
    (30, STRESS, 30.0, 30 * MPA_PER_PSI, "30 MPa", "30 psi"),
    (180, MOMENT, 180e6, 180 * N_PER_KIP * 304.8, "180 kN m", "180 kip ft"),
    (1.5, NUMBER, 1.5, 1.5, "1.5", "1.5"),
])
def test_plain_numbers_take_the_unit_system_default(value: object, kind: units.Kind, si: float,
                                                    us: float, shown_si: str,
                                                    shown_us: str) -> None:
    assert read_quantity(value, kind, SI) == (pytest.approx(si, rel=NIST_REL), shown_si)
    assert read_quantity(value, kind, US) == (pytest.approx(us, rel=NIST_REL), shown_us)


def test_wrong_kind_names_what_was_expected() -> None:
    with pytest.raises(QuantityError) as caught:
        to_internal("30 MPa", LENGTH)
    assert str(caught.value).startswith(
        "expected a length (e.g. '300 mm' or '12 in'), got '30 MPa'")
    assert "that is a stress" in caught.value.expected
    assert isinstance(caught.value, ValueError)


@pytest.mark.parametrize(("value", "kind", "fragment"), [
    ("300 kN", MOMENT, "that is a force"),
    ("3 m3", LENGTH, "that is a volume"),
    ("30 mm", STRESS, "that is a length"),
    ("1500 mm", AREA, "that is a length"),
    ("3 mmm", LENGTH, "'mmm' is not a unit known here"),
    ("2,5 m", LENGTH, "decimal point"),
    ("4 25 mm", LENGTH, "decimal point"),
    ("mm", LENGTH, "a number must come first"),
    ("", LENGTH, "a number must come first"),
    ("-5 mm", LENGTH, "a positive length"),
    ("0 mm", LENGTH, "a positive length"),
    ("-5 kN m", MOMENT, "a positive moment"),
    (float("nan"), LENGTH, "a finite length"),
    (float("inf"), STRESS, "a finite stress"),
    (10**400, LENGTH, "a finite length"),
    ("1e400 mm", LENGTH, "a finite length"),
    (True, LENGTH, "a length (e.g. '300 mm' or '12 in')"),
    ([300], LENGTH, "a length (e.g. '300 mm' or '12 in')"),
])
def test_bad_quantities_are_refused_with_a_reason(value: object, kind: units.Kind,
                                                  fragment: str) -> None:
    with pytest.raises(QuantityError) as caught:
        to_internal(value, kind)
    assert fragment in caught.value.expected
    assert kind.name in caught.value.expected


def test_sign_rules() -> None:
    assert to_internal("0 kN m", MOMENT, sign="non-negative") == 0.0
    assert to_internal("-5 kN m", MOMENT, sign="any") == -5e6
    with pytest.raises(QuantityError, match="zero or more"):
        to_internal("-5 kN m", MOMENT, sign="non-negative")


# ASTM A615 inch-pound bars, nominal area in in², from memory.
A615_AREA_IN2 = {3: 0.11, 4: 0.20, 5: 0.31, 6: 0.44, 7: 0.60, 8: 0.79, 9: 1.00, 10: 1.27,
                 11: 1.56}


@pytest.mark.parametrize("size", sorted(A615_AREA_IN2))
def test_us_bar_sizes_have_their_nominal_areas(size: int) -> None:
    bars = read_bars(f"3 #{size}")
    assert bars.area == pytest.approx(3 * A615_AREA_IN2[size] * MM_PER_IN**2, rel=1e-9)
    assert bars.count == 3


def test_number_8_bar_is_510_mm2() -> None:
    # ASTM A615 #8: 0.79 in² = 509.7 mm², commonly quoted as 510 mm², from memory
    assert read_bars("1 #8").area == pytest.approx(510, abs=0.5)
    assert read_bars("3 No. 8").area == read_bars("3 #8").area == read_bars("3#8").area


def circle(d: float) -> float:
    return math.pi * d * d / 4  # area of a round bar from its nominal diameter


@pytest.mark.parametrize(("text", "area", "shown"), [
    ("4 x 25 mm", 4 * circle(25), "4 x 25 mm"),
    ("4x25mm", 4 * circle(25), "4x25mm"),
    ("4 × 25 mm", 4 * circle(25), "4 × 25 mm"),
    ("2 x 20 mm + 2 x 16 mm", 2 * circle(20) + 2 * circle(16), "2 x 20 mm + 2 x 16 mm"),
    ("4 N20", 4 * circle(20), "4 N20"),
    ("4N20", 4 * circle(20), "4N20"),
    ("3 T16", 3 * circle(16), "3 T16"),
    ("3 Y16", 3 * circle(16), "3 Y16"),
    ("4 Ø20", 4 * circle(20), "4 Ø20"),
    ("2 x 1 in", 2 * circle(25.4), "2 x 1 in"),
    ("2 x .75 in", 2 * circle(19.05), "2 x .75 in"),
    ("3 #8 + 2 #6", (3 * 0.79 + 2 * 0.44) * MM_PER_IN**2, "3 #8 + 2 #6"),  # ASTM A615
    ("3 25M", 3 * 500.0, "3 25M"),  # CSA G30.18 25M: 500 mm², from memory
    ("4-15M", 4 * 200.0, "4-15M"),  # CSA G30.18 15M: 200 mm², from memory
    ("  4   x 25 mm ", 4 * circle(25), "4 x 25 mm"),
])
def test_bar_notation(text: str, area: float, shown: str) -> None:
    bars = read_bars(text)
    assert bars.area == pytest.approx(area, rel=1e-9)
    assert bars.text == shown


def test_bars_report_count_and_largest_diameter() -> None:
    mixed = read_bars("2 x 20 mm + 3 x 16 mm")
    assert (mixed.count, mixed.largest_diameter) == (5, 20.0)
    assert read_bars("3 #8").largest_diameter == pytest.approx(25.4)  # #8: 1.000 in, ASTM A615


def test_bar_diameter_without_unit_takes_the_system_length() -> None:
    assert read_bars("4 x 20").area == pytest.approx(4 * circle(20))
    with pytest.raises(QuantityError, match="between 3 and 60 mm"):
        read_bars("4 x 20", US)  # 20 in is no bar
    assert read_bars("4 x 0.75", US).area == pytest.approx(4 * circle(19.05))


@pytest.mark.parametrize(("text", "fragment"), [
    ("4 25 mm", "a count, then the bar size"),
    ("#8", "a count, then the bar size"),
    ("25 mm", "a count, then the bar size"),
    ("325M", "a count, then the bar size"),
    ("3 #12", "US sizes are #3, #4"),
    ("3 12M", "metric M sizes are 10M"),
    ("0 x 20 mm", "a count from 1"),
    ("4 x 25 MPa", "the bar diameter must be a length"),
    ("4 x 250 mm", "between 3 and 60 mm"),
    ("2 #8 +", "a count, then the bar size"),
    ("four bars", "a count, then the bar size"),
])
def test_bad_bars_are_refused(text: str, fragment: str) -> None:
    with pytest.raises(QuantityError) as caught:
        read_bars(text)
    assert fragment in str(caught.value)
    assert "'4 x 25 mm', '3 #8'" in caught.value.expected


def test_bars_must_be_text() -> None:
    with pytest.raises(QuantityError, match="bars such as"):
        read_bars(4)


def test_pint_is_asked_once_per_distinct_unit_spelling(monkeypatch: pytest.MonkeyPatch) -> None:
    """100 000 values in five spellings (plus the defaults of plain numbers) reach pint a
    handful of times: the unit text is split off and its lookup cached."""
    calls: list[str] = []
    real = units._pint_unit

    def counting(text: str) -> units.UnitInfo:
        calls.append(text)
        return real(text)

    monkeypatch.setattr(units, "_pint_unit", counting)
    units.unit_info.cache_clear()
    units._read_text.cache_clear()
    units._default_unit.cache_clear()
    spellings = [("mm", LENGTH), ("in", LENGTH), ("MPa", STRESS), ("kip-ft", MOMENT),
                 ("mm2", AREA)]
    total = 0.0
    for i in range(100_000):
        unit, kind = spellings[i % len(spellings)]
        total += to_internal(f"{1 + i * 0.001:.3f} {unit}", kind)
        if i % 1000 == 0:
            total += to_internal(1 + i, LENGTH, US)  # plain number: default unit "inch"
    assert total > 0
    # each normalised spelling once: the five above and "inch", the US default length
    assert sorted(calls) == sorted(["mm", "in", "MPa", "kip*ft", "mm**2", "inch"])


def test_a_unit_in_the_wrong_case_is_named_and_the_right_one_suggested():
    """pint reads "MM" as megamolar: the message says it is no length and suggests mm."""
    with pytest.raises(QuantityError) as error:
        read_quantity("600 MM", LENGTH)
    assert "'MM' is not a unit of length" in error.value.expected
    assert "did you mean 'mm'?" in error.value.expected and "[" not in error.value.expected
