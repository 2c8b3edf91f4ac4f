"""The example local editions as an installed third-party package, and the guide quoting it.

fixtures/local-editions is installed into the test environment (CI installs it
beforehand; when the installed copy matches the source it is used as it is), and a
fresh interpreter shows both editions listed and layered over their bases.
"""

import json
import os
import re
import shutil
import subprocess
import sys
import tomllib
from pathlib import Path

import pytest

from clausewise.provisions import Beam, Bending, Layer, Shape, assess

ROOT = Path(__file__).resolve().parents[1]
FIXTURE = ROOT / "fixtures" / "local-editions"
PACKAGE = FIXTURE / "local_editions"
GUIDE = ROOT / "DEVELOPERS.md"
GROUP = "clausewise.editions"
ANNEX, FIRM = "xb-na:2024", "tarnwick-beams:2025"
WRAPPER = "fennick-beams:2025"
EN, ACI = "en1992-1-1:2004", "aci318-19"


def clean_env(**extra):
    env = {k: v for k, v in os.environ.items() if not k.startswith("CLAUSEWISE_")}
    return env | extra


def python(code, **env):
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          env=clean_env(**env), cwd=ROOT, timeout=120)
    assert done.returncode == 0, done.stderr
    return done.stdout


PROBE = """
import importlib.metadata as m, json
try:
    import local_editions
    where = local_editions.__path__[0]
except ImportError:
    where = None
eps = {ep.name: ep.value for ep in m.entry_points(group="clausewise.editions")}
print(json.dumps({"where": where, "eps": eps}))
"""


def installed_copy_is_current():
    probe = json.loads(python(PROBE))
    if probe["where"] is None:
        return False
    wanted = tomllib.loads((FIXTURE / "pyproject.toml").read_text())["project"][
        "entry-points"][GROUP]
    if any(probe["eps"].get(name) != value for name, value in wanted.items()):
        return False
    installed = Path(probe["where"])
    return all((installed / src.name).is_file()
               and (installed / src.name).read_bytes() == src.read_bytes()
               for src in PACKAGE.glob("*.py"))


@pytest.fixture(scope="module")
def installed(tmp_path_factory):
    """Install the fixture package unless a current copy is installed already (from a copy,
    so the build leaves nothing in the source tree)."""
    if not installed_copy_is_current():
        copy = tmp_path_factory.mktemp("build") / FIXTURE.name
        shutil.copytree(FIXTURE, copy, ignore=shutil.ignore_patterns("build", "*.egg-info"))
        pip = [sys.executable, "-m", "pip", "install", "-q", "--no-deps"]
        done = subprocess.run([*pip, "--no-build-isolation", str(copy)], capture_output=True,
                              text=True, timeout=300)
        if done.returncode != 0:  # the environment's setuptools is older than the build needs
            done = subprocess.run([*pip, str(copy)], capture_output=True, text=True,
                                  timeout=300)
        assert done.returncode == 0, done.stdout + done.stderr
        assert installed_copy_is_current()


SCRIPT = """
import json
import clausewise
from clausewise.provisions import (Actions, Beam, Bending, Continuity, FloorLayout, Layer,
                                   Shape, assess)

def record(a):
    return {"status": a.status, "suppliers": a.suppliers(),
            "clauses": {p.name: [p.clause.ref, p.clause.title] for p in a.parameters},
            "M_Rd": a.design_resistance.value, "b_eff": a.effective_width and
            a.effective_width.value,
            "checks": [{"name": c.name, "symbol": c.symbol, "value": c.value, "limit": c.limit,
                        "passed": c.passed, "edition": c.clause.edition, "ref": c.clause.ref}
                       for c in a.checks]}

out = {"editions": {e.id: {"layers": [r.info.id for r in e.layers],
                           "distribution": e.layers[-1].distribution,
                           "source": e.layers[-1].source} for e in clausewise.editions()}}
ids = set(out["editions"])
tee = Beam("block in flange", Shape.TEE, Bending.SAGGING, 300.0, 600.0, 30.0, 500.0,
           (Layer(1800.0, 540.0),), flange_thickness=120.0, flange_width=1500.0,
           layout=FloorLayout(8000.0, Continuity.INTERIOR, clear_left=2400.0,
                              clear_right=2400.0), actions=Actions(dead=150e6, live=80e6))
if {"xb-na:2024", "en1992-1-1:2004"} <= ids:
    out["annex"] = {e: record(assess(tee, e)) for e in ("xb-na:2024", "en1992-1-1:2004")}
if {"tarnwick-beams:2025", "aci318-19"} <= ids:
    for label, area in (("moderate", 3100.0), ("heavy", 4200.0)):
        rect = Beam(label, Shape.RECTANGLE, Bending.SAGGING, 300.0, 600.0, 28.0, 420.0,
                    (Layer(area, 540.0),), actions=Actions(dead=100e6, live=60e6))
        out[label] = {e: record(assess(rect, e)) for e in ("tarnwick-beams:2025", "aci318-19")}
if {"fennick-beams:2025", "en1992-1-1:2004"} <= ids:
    unequal = Beam("unequal sides", Shape.TEE, Bending.SAGGING, 300.0, 600.0, 30.0, 500.0,
                   (Layer(1800.0, 540.0),), flange_thickness=120.0,
                   layout=FloorLayout(7500.0, Continuity.INTERIOR, clear_left=1000.0,
                                      clear_right=3000.0), actions=Actions(dead=150e6, live=80e6))
    out["wrapper"] = {}
    for e in ("fennick-beams:2025", "en1992-1-1:2004"):
        a = assess(unequal, e)
        out["wrapper"][e] = record(a) | {
            "sides": [[o.side, o.width, o.clause.edition, o.clause.ref]
                      for o in a.effective_width.overhangs],
            "topics": {t.hook: [list(t.answered_by), list(t.wrapped_by)] for t in a.topics}}
print(json.dumps(out))
"""


@pytest.fixture(scope="module")
def result(installed):
    return json.loads(python(SCRIPT))


def needs(result, key, *editions):
    if key not in result:
        pytest.skip(f"edition(s) {', '.join(editions)} not installed")
    return result[key]


def test_both_local_editions_are_listed_over_their_bases(result):
    editions = result["editions"]
    if ACI in editions:
        assert editions[FIRM]["layers"] == [ACI, FIRM]
        assert editions[FIRM]["distribution"] == "clausewise-local-editions"
        assert editions[FIRM]["source"] == "entry point local_editions.tarnwick_beams"
    if EN not in editions:
        pytest.skip(f"edition {EN} not installed, so {ANNEX} cannot be listed")
    assert editions[ANNEX]["layers"] == [EN, ANNEX]


def test_annex_supplies_exactly_its_three_parameters(result):
    annex = needs(result, "annex", ANNEX, EN)[ANNEX]
    suppliers = annex["suppliers"]
    assert {n for n, s in suppliers.items() if s == ANNEX} == {"alpha_cc", "k1", "k2_scale"}
    assert suppliers["gamma_c"] == EN and suppliers["gamma_s"] == EN
    assert set(suppliers.values()) == {ANNEX, EN}
    assert annex["clauses"]["alpha_cc"][0] == "NA 2.6 (3.1.6(1))"


def test_annex_changes_resistance_by_the_hand_ratio(result):
    both = needs(result, "annex", ANNEX, EN)
    # EN 1992-1-1 3.1.6(1) fcd = αcc fck/γc, 3.1.7(3) λ = 0.8 and η = 1 up to C50/60,
    # 3.2.7 fyd = fyk/γs, γc = 1.5, γs = 1.15 (Table 2.1N), all from memory;
    # block in the flange: x = As fyd/(η fcd b λ), M_Rd = As fyd (d - λx/2)
    area, b, d, fck, fyk, hf = 1800.0, 1500.0, 540.0, 30.0, 500.0, 120.0
    fyd = fyk / 1.15

    def hand(alpha_cc):
        x = area * fyd / (1.0 * alpha_cc * fck / 1.5 * b * 0.8)
        assert 0.8 * x < hf  # the block stays in the flange
        return area * fyd * (d - 0.8 * x / 2)

    annex, base = both[ANNEX], both[EN]
    assert annex["b_eff"] == base["b_eff"] == b  # the given width governs 5.3.2.1 (1900 mm)
    assert base["M_Rd"] == pytest.approx(hand(1.0), rel=1e-9)
    assert annex["M_Rd"] == pytest.approx(hand(0.85), rel=1e-9)
    assert annex["M_Rd"] / base["M_Rd"] == pytest.approx(hand(0.85) / hand(1.0), rel=1e-9)


def test_annex_relaxes_the_neutral_axis_limit(result, edition_with):
    both = needs(result, "annex", ANNEX, EN)
    # 5.5(4) applies by default only where moments are redistributed (δ < 1): with δ = 1
    # neither the annex nor the base checks xu/d
    for e in (ANNEX, EN):
        assert not [c for c in both[e]["checks"] if c["symbol"] == "xu/d"]
    # where it is applied with δ = 1 (neutral_axis_limit = always), the annex's k1 and k2
    # act. EN 1992-1-1 5.5(4) with δ = 1 and εcu2 = 0.0035 (from memory): xu/d ≤ (1 - k1)/k2,
    # k2 = k2_scale (0.6 + 0.0014/0.0035) = k2_scale
    tee = Beam("block in flange", Shape.TEE, Bending.SAGGING, 300.0, 600.0, 30.0, 500.0,
               (Layer(1800.0, 540.0),), flange_thickness=120.0, flange_width=1500.0)
    limit = {e: next(c.limit for c in assess(tee, edition_with(
        e, neutral_axis_limit="always")).checks if c.symbol == "xu/d") for e in (ANNEX, EN)}
    assert limit[EN] == pytest.approx((1 - 0.44) / 1.25, rel=1e-12)
    assert limit[ANNEX] == pytest.approx((1 - 0.4) / 1.0, rel=1e-12)


def net_tensile_strain(area):
    # ACI 318-19 22.2.2.4.1 block 0.85 f'c over a = β1 c, β1 = 0.85 at 28 MPa
    # (Table 22.2.2.4.3), εcu = 0.003 (22.2.2.1), all from memory
    a = area * 420.0 / (0.85 * 28.0 * 300.0)
    c = a / 0.85
    return 0.003 * (540.0 - c) / c


def test_firm_rule_fails_a_beam_the_code_accepts(result):
    both = needs(result, "moderate", FIRM, ACI)
    eps_t = net_tensile_strain(3100.0)
    assert 0.004 <= eps_t < 0.005
    firm = {c["name"]: c for c in both[FIRM]["checks"]}
    code = {c["name"]: c for c in both[ACI]["checks"]}
    assert code["net tensile strain"]["value"] == pytest.approx(eps_t, rel=1e-9)
    assert code["net tensile strain"]["passed"] and code["net tensile strain"]["limit"] == 0.004
    assert firm["net tensile strain"]["value"] == pytest.approx(eps_t, rel=1e-9)
    assert not firm["net tensile strain"]["passed"]
    assert (firm["net tensile strain"]["edition"], firm["net tensile strain"]["ref"]) == (
        FIRM, "TO-B1")
    assert both[FIRM]["suppliers"]["min_net_tensile_strain"] == FIRM
    assert both[FIRM]["suppliers"]["phi_tension"] == ACI
    assert both[FIRM]["status"] == "fail" and both[ACI]["status"] == "pass"
    assert both[FIRM]["M_Rd"] == both[ACI]["M_Rd"]  # the rule changes a check, not φMn


def test_firm_check_caps_the_steel_ratio(result):
    moderate = {c["name"]: c for c in needs(result, "moderate", FIRM, ACI)[FIRM]["checks"]}
    heavy = {c["name"]: c for c in result["heavy"][FIRM]["checks"]}
    # ρw = As/(bw d) (common practice, no source)
    assert moderate["tension steel ratio"]["value"] == pytest.approx(3100 / (300 * 540))
    assert moderate["tension steel ratio"]["passed"]
    assert heavy["tension steel ratio"]["value"] == pytest.approx(4200 / (300 * 540))
    assert not heavy["tension steel ratio"]["passed"]
    assert heavy["tension steel ratio"]["ref"] == "TO-B2"
    assert "tension steel ratio" not in {c["name"] for c in result["heavy"][ACI]["checks"]}


def test_wrapping_firm_edition_limits_each_overhang_by_its_own_least_limit(result):
    both = needs(result, "wrapper", WRAPPER, EN)
    assert result["editions"][WRAPPER]["layers"] == [EN, WRAPPER]
    # EN 1992-1-1 5.3.2.1(3), l0 = 0.7 l = 5250 mm (from memory): left bi = 500 governs;
    # right min(0.2·1500 + 525, 1050, 1500) = 825, and 6 hf = 720 under the house rule
    # (each overhang the least of its own limits, common practice)
    assert both[EN]["b_eff"] == pytest.approx(300 + 500 + 825)
    assert both[WRAPPER]["b_eff"] == pytest.approx(300 + 500 + 720)
    assert both[WRAPPER]["sides"] == [["left", 500.0, EN, "5.3.2.1(3)"],
                                      ["right", 720.0, WRAPPER, "FL-3"]]
    assert both[WRAPPER]["topics"]["effective_flange_width"] == [[EN], [WRAPPER]]
    assert both[EN]["topics"]["effective_flange_width"] == [[EN], []]
    assert both[WRAPPER]["suppliers"]["overhang_hf_multiple"] == WRAPPER


def test_only_switch_loads_the_named_edition_and_its_base(installed):
    listed = python("import clausewise; print(' '.join(e.id for e in clausewise.editions()))",
                    CLAUSEWISE_EDITIONS=FIRM).split()
    if ACI not in listed:
        pytest.skip(f"edition {ACI} not installed")
    assert listed == [ACI, FIRM]


# --- the guide quotes the tested files verbatim --------------------------------------------

INCLUDE = re.compile(r"<!-- quote: (?P<path>\S+) -->\n```[a-z]*\n(?P<body>.*?)```", re.S)


def quoted_blocks():
    return [(m["path"], m["body"]) for m in INCLUDE.finditer(GUIDE.read_text(encoding="utf-8"))]


def test_guide_quotes_the_fixture_files_verbatim():
    blocks = quoted_blocks()
    quoted = {path for path, _ in blocks}
    assert {"fixtures/local-editions/pyproject.toml",
            "fixtures/local-editions/local_editions/brennmark_na.py",
            "fixtures/local-editions/local_editions/tarnwick_beams.py",
            "fixtures/local-editions/local_editions/fennick_beams.py",
            "fixtures/annexes/lornholm-na-2023.toml"} <= quoted
    for path, body in blocks:
        text = (ROOT / path).read_text(encoding="utf-8")
        assert body in text, f"DEVELOPERS.md quotes {path}, but the file no longer has:\n{body}"


def test_guide_quotes_the_whole_example_modules():
    whole = {path: body for path, body in quoted_blocks() if path.endswith(".py")}
    for path, body in whole.items():
        assert body == (ROOT / path).read_text(encoding="utf-8"), path
