"""The layers never reach up: each package's imports, read with ast from its source files.

geometry/ knows no job, analysis, report, check run or scene; catalog/ is the ground floor
(nothing of geomjoint above it: only errors and units); mechanics/ imports no CAD library and
nothing above it (only catalog, errors, units and itself).  Lazy imports inside functions count.
"""
import pytest

from conftest import CAD_LIBRARIES, PACKAGE_DIR, imported_modules

#: modules above the geometry layer (the pipeline, outputs, reports)
ABOVE_GEOMETRY = ("geomjoint.analysis", "geomjoint.report", "geomjoint.job", "geomjoint.checkrun",
                  "geomjoint.scene", "geomjoint.remedies", "geomjoint.grouping", "geomjoint.cli",
                  "geomjoint.cluster", "geomjoint.cadquery_plugin", "geomjoint.starter")
#: what catalog/ may import of geomjoint
CATALOG_MAY_IMPORT = ("geomjoint.catalog", "geomjoint.errors", "geomjoint.units")
#: what mechanics/ may import of geomjoint
MECHANICS_MAY_IMPORT = CATALOG_MAY_IMPORT + ("geomjoint.mechanics",)

#: known violations being moved by other work: (file, imported module) -> reason.  Each runs as
#: a strict xfail, so the test turns loud once the import is gone and the entry must go.
KNOWN: dict[tuple[str, str], str] = {}


def _within(name: str, prefixes) -> bool:
    return any(name == p or name.startswith(p + ".") for p in prefixes)


def _forbidden(package: str, name: str) -> bool:
    top = name.split(".")[0]
    if package == "geometry":
        return _within(name, ABOVE_GEOMETRY)
    if package == "catalog":
        return top == "geomjoint" and name != "geomjoint" and not _within(name, CATALOG_MAY_IMPORT) \
            or top in CAD_LIBRARIES
    if package == "mechanics":
        return top in CAD_LIBRARIES or (top == "geomjoint" and name != "geomjoint"
                                        and not _within(name, MECHANICS_MAY_IMPORT))
    raise AssertionError(package)


def _violations(package: str) -> dict[tuple[str, str], list[str]]:
    """(file, offending top module under geomjoint or the library) -> ['file:line imports name']."""
    found: dict[tuple[str, str], list[str]] = {}
    for path in sorted((PACKAGE_DIR / package).rglob("*.py")):
        rel = path.relative_to(PACKAGE_DIR).as_posix()
        for line, name in imported_modules(path):
            if name == "geomjoint" and package != "geometry":
                # `from geomjoint import x` is checked as geomjoint.x (imported_modules yields both)
                continue
            if _forbidden(package, name):
                parts = name.split(".")
                key_name = ".".join(parts[:2]) if parts[0] == "geomjoint" else parts[0]
                found.setdefault((rel, key_name), []).append(f"{rel}:{line} imports {name}")
    return found


def _cases():
    for package in ("geometry", "catalog", "mechanics"):
        yield pytest.param(package, None, id=f"{package}")
        for key, reason in KNOWN.items():
            if key[0].startswith(package + "/"):
                yield pytest.param(package, key, id=f"{package}-known-{key[0]}-{key[1]}",
                                   marks=pytest.mark.xfail(strict=True, reason=reason))


@pytest.mark.parametrize("package, known", list(_cases()))
def test_package_imports_nothing_above_it(package, known):
    found = _violations(package)
    if known is None:
        unexpected = {k: v for k, v in found.items() if k not in KNOWN}
        assert not unexpected, "layer broken: " + "; ".join(sum(unexpected.values(), []))
    else:
        assert known not in found, "; ".join(found[known])


def test_the_walk_sees_imports():
    # the walk must find real imports, or every layer would pass vacuously
    names = {n for _, n in imported_modules(PACKAGE_DIR / "geometry" / "scan.py")}
    assert "geomjoint.geometry.stacks" in names
    names = {n for _, n in imported_modules(PACKAGE_DIR / "analysis.py")}
    assert "geomjoint.geometry.cones" in names        # a lazy import inside a function
    assert _forbidden("mechanics", "OCP.TopoDS") and _forbidden("catalog", "geomjoint.mechanics.bolt")
    assert _forbidden("geometry", "geomjoint.report.palette") and not _forbidden("geometry", "geomjoint.mechanics")
