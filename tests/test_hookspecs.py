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
