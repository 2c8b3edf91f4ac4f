"""The hook specification is the plugin author's reference: every hook documented, and the
guide's table of hooks matching the real signatures."""

from __future__ import annotations

import inspect
import re
from pathlib import Path

from clausewise.provisions import hookspecs

ROOT = Path(__file__).resolve().parents[1]
GUIDE = (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")


def hooks():
    return {name: fn for name, fn in vars(hookspecs).items()
            if callable(fn) and hasattr(fn, "clausewise_spec")}


def test_every_hook_is_documented_with_what_to_return():
    found = hooks()
    assert set(hookspecs.TOPICS) <= set(found)
    for name, fn in found.items():
        doc = inspect.getdoc(fn) or ""
        assert doc.startswith("Return"), f"{name}: the docstring should say what to return"


def test_the_guide_lists_every_hook_with_its_arguments():
    table = dict(re.findall(r"^\| `(\w+)\(([^)]*)\)` \|", GUIDE, re.M))
    for name, fn in hooks().items():
        assert name in table, f"DEVELOPERS.md does not list the hook {name}"
        listed = [a.strip() for a in table[name].split(",") if a.strip()]
        assert listed == list(inspect.signature(fn).parameters), name


# --- each hook declared once ----------------------------------------------------------------

def test_every_hook_has_one_row_in_the_table_and_every_row_a_hook():
    rows = [hook.name for hook in hookspecs.HOOKS]
    assert len(rows) == len(set(rows))
    assert set(rows) == set(hooks()), "declare every hook in hookspecs.HOOKS, once"
    for hook in hookspecs.HOOKS:
        spec = getattr(hookspecs, hook.name).clausewise_spec
        assert spec["firstresult"] is (not hook.every_layer), hook.name
    assert tuple(h.name for h in hookspecs.HOOKS if h.topic) == hookspecs.TOPICS


def test_the_guide_shows_the_table_made_from_the_declarations():
    assert hookspecs.guide_table() in GUIDE, (
        "DEVELOPERS.md section 3 must show hookspecs.guide_table() as it is:\n"
        + hookspecs.guide_table())


def test_the_edition_has_a_typed_method_for_every_hook_the_engine_calls():
    from clausewise.provisions.registry import Edition

    for hook in hookspecs.HOOKS[1:]:  # edition_info is read once, at registration
        method = getattr(Edition, "parameters" if hook.name == "edition_parameters"
                         else hook.name)
        params = [a for a in inspect.signature(method).parameters if a != "self"]
        assert params == list(hook.signature), hook.name


def test_section_and_response_protocols_match_what_rules_receive():
    from clausewise.core import Response, ResponseArrays
    from clausewise.provisions.engine import SectionView

    for protocol, concrete in ((hookspecs.SectionView, (SectionView,)),
                               (hookspecs.SolvedSection, (Response, ResponseArrays))):
        members = [n for n in vars(protocol) if not n.startswith("_")]
        assert members, protocol
        for cls in concrete:
            fields = set(getattr(cls, "__dataclass_fields__", {})) | set(dir(cls))
            missing = [n for n in members if n not in fields]
            assert not missing, f"{cls.__name__} lacks {missing} of {protocol.__name__}"
        for n in members:
            assert inspect.getdoc(getattr(protocol, n)), f"{protocol.__name__}.{n} undocumented"
