"""The conformance kit from the command line: ``python -m clausewise.conformance [ID...]
[--annex FILE]``. The kit itself (its properties and ``assert_conforms`` for pytest) is
``clausewise.provisions.testing``; this entry adds parameter files, which belong to the
application."""

from __future__ import annotations

from collections.abc import Sequence

from clausewise.annexfile import load_annex
from clausewise.provisions import CAUTION, ClausewiseError, default_registry
from clausewise.provisions.testing import PROPERTIES, check_edition


def main(argv: Sequence[str] | None = None) -> int:
    """Check editions from the command line: 0 conforms, 1 findings, 2 bad arguments."""
    import argparse


    parser = argparse.ArgumentParser(
        prog="python -m clausewise.conformance",
        description="Check that editions keep the properties every edition must keep.")
    parser.add_argument("editions", nargs="*", metavar="EDITION_ID",
                        help="edition ids (default: every installed edition)")
    parser.add_argument("--annex", action="append", default=[], metavar="FILE",
                        help="a parameter file to load and check (repeatable)")
    args = parser.parse_args(argv)
    registry = default_registry()
    ids = list(args.editions)
    try:
        ids += [load_annex(path, registry).info.id for path in args.annex]  # type: ignore[union-attr]
        editions = [registry.edition(i) for i in ids] if ids else registry.editions()
    except ClausewiseError as exc:
        print(f"error: {exc}")
        return 2
    total = 0
    for edition in editions:
        findings = check_edition(edition)
        total += len(findings)
        verdict = "conforms" if not findings else f"{len(findings)} finding(s)"
        print(f"{edition.id}: {verdict} ({len(PROPERTIES)} properties)")
        for finding in findings:
            print(f"  - {finding.property}{f' [{finding.beam}]' if finding.beam else ''}: "
                  f"{finding.message}")
    for record in registry.broken:
        print(f"broken plugin {record.name} ({record.source}): {record.error}")
    print(CAUTION)
    return 1 if total or registry.broken else 0


if __name__ == "__main__":
    raise SystemExit(main())
