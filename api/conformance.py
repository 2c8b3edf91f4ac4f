"""The conformance kit from the command line: ``python -m clausewise.conformance [ID...]
[--annex FILE] [--verbose]``. The kit itself (its properties and ``assert_conforms`` for pytest) is
``clausewise.provisions.testing``; this entry adds parameter files, which belong to the
application."""

from __future__ import annotations

from collections.abc import Sequence

from clausewise.annexfile import load_annex
from clausewise.provisions import CAUTION, ClausewiseError, default_registry
from clausewise.provisions.testing import PROPERTIES, check_properties

SHOWN = 5  # findings of one property shown before the rest are counted (--verbose: all)


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
    parser.add_argument("-v", "--verbose", action="store_true",
                        help="print every property and its outcome, not only the findings")
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
        outcomes = check_properties(edition)
        findings = [f for _, found in outcomes for f in found]
        total += len(findings)
        verdict = "conforms" if not findings else f"{len(findings)} finding(s)"
        layers = " < ".join(r.info.id for r in edition.layers if r.info)
        print(f"{edition.id}: {verdict} ({len(PROPERTIES)} properties; layers {layers})")
        for name, found in outcomes:
            if args.verbose:
                print(f"  {'ok  ' if not found else 'FAIL'} {name}"
                      + (f" ({len(found)} finding(s))" if found else ""))
            shown = found if args.verbose else found[:SHOWN]
            for finding in shown:
                print(f"  - {finding.property}{f' [{finding.beam}]' if finding.beam else ''}: "
                      f"{finding.message}")
            if len(found) > len(shown):
                print(f"  - {name}: {len(found) - len(shown)} more finding(s) of this "
                      "property (--verbose shows every one)")
    for record in registry.broken:
        print(f"broken plugin {record.name} ({record.source}): {record.error}")
    print(CAUTION)
    return 1 if total or registry.broken else 0


if __name__ == "__main__":
    raise SystemExit(main())
