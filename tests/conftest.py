"""Shared test helpers, and the markers that let the pure-mechanics suite run alone.

Markers (registered in pyproject.toml):

- ``cad``: the test needs the CAD kernel (OCP / cadquery / trimesh) or an external tool
  (the browser, the glTF validator).  ``pytest -m "not cad"`` runs the rest in seconds.
- ``browser``: the test drives chromium or node (also marked ``cad``).

A test module is marked by its name (``CAD_TEST_MODULES``, ``BROWSER_TEST_MODULES``); a
new test module that needs the kernel is added there.
"""
import ast
import json
import os
from pathlib import Path

import pytest

#: the JSON Schemas of the contracts live in the shared folder beside the repository
#: (CI lays a copy of it beside the clone; GEOMJOINT_SCHEMAS points elsewhere, e.g. from a worktree)
SCHEMA_DIR = Path(os.environ.get("GEOMJOINT_SCHEMAS") or Path(__file__).resolve().parents[2] / "shared" / "schemas")

#: the project's own copy of the result schema: the contract plus the fields geomjoint adds
PROJECT_SCHEMA_DIR = Path(__file__).resolve().parent / "schemas"


def load_project_schema(name: str) -> dict:
    return json.loads((PROJECT_SCHEMA_DIR / name).read_text())


#: the package's source folder
PACKAGE_DIR = Path(__file__).resolve().parents[1] / "geomjoint"

#: libraries of the CAD kernel and meshing: a module importing one needs the kernel
CAD_LIBRARIES = frozenset({"OCP", "cadquery", "trimesh", "build123d"})

#: test modules that read, build or write CAD models (directly or through the pipeline)
CAD_TEST_MODULES = frozenset({
    "test_api", "test_cli", "test_cluster", "test_cones", "test_corpus", "test_geometry_hardware",
    "test_geometry_model", "test_geometry_scan", "test_geometry_stacks", "test_markup",
    "test_outputs_agree", "test_pipeline", "test_properties", "test_methods", "test_required_length",
    "test_comparison", "test_not_analysed", "test_hardware_shapes",
    "test_check_outputs", "test_scan_instances",
    "test_realworld_reading", "test_realworld_checks", "test_holes_and_threads",
})
#: test modules that drive chromium or node
BROWSER_TEST_MODULES = frozenset({"test_report_browser", "test_glb_validator"})


def load_schema(name: str) -> dict:
    path = SCHEMA_DIR / name
    if not path.exists():
        raise FileNotFoundError(f"contract schema {path} is missing: the shared folder must lie beside the repository")
    return json.loads(path.read_text())


def validate_result(doc: dict) -> None:
    """A result document against the shared contract and against the project's own copy."""
    import jsonschema

    jsonschema.validate(doc, load_schema("result.schema.json"))
    jsonschema.validate(doc, load_project_schema("result.schema.json"))


def module_name(path: Path) -> str:
    """Dotted module name of a source file under the package ("geomjoint.mechanics.vdi")."""
    parts = list(path.relative_to(PACKAGE_DIR.parent).with_suffix("").parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def imported_modules(path: Path, top_level_only: bool = False) -> list[tuple[int, str]]:
    """(line, absolute module name) of every import in a source file, read with ast.

    Relative imports are resolved against the file's package; ``from a import b`` yields
    ``a.b`` as well as ``a`` (b may be a submodule).  With ``top_level_only`` the imports
    inside functions (lazy imports) are left out.
    """
    tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
    package = module_name(path).split(".")
    if path.name != "__init__.py":
        package = package[:-1]
    nodes = tree.body if top_level_only else ast.walk(tree)
    found: list[tuple[int, str]] = []
    for node in nodes:
        if isinstance(node, ast.Import):
            found += [(node.lineno, alias.name) for alias in node.names]
        elif isinstance(node, ast.ImportFrom):
            base = node.module or ""
            if node.level:
                stem = package[: len(package) - node.level + 1]
                base = ".".join(stem + ([base] if base else []))
            found.append((node.lineno, base))
            found += [(node.lineno, f"{base}.{alias.name}") for alias in node.names if alias.name != "*"]
    return found


def _cad_deselected(config) -> bool:
    """True when the -m expression drops every test marked cad (then its modules are not even
    imported, so the kernel is never loaded)."""
    expr = config.getoption("markexpr", "") or ""
    if not expr:
        return False
    try:
        from _pytest.mark.expression import Expression
    except ImportError:     # pytest's expression parser moved: collect everything, marks still deselect
        return False
    compiled = Expression.compile(expr)
    return not compiled.evaluate(lambda name: name in ("cad", "browser"))


def pytest_ignore_collect(collection_path, config):
    if collection_path.suffix == ".py" and collection_path.stem in CAD_TEST_MODULES | BROWSER_TEST_MODULES:
        return True if _cad_deselected(config) else None
    return None


def _kernel_loaded() -> bool:
    import sys

    return any(name.split(".")[0] in CAD_LIBRARIES for name in sys.modules)


@pytest.fixture(autouse=True)
def _no_kernel_without_the_cad_mark(request):
    """In a run that drops the cad tests, a test that loads the CAD kernel fails, naming the
    mark it lacks (so the pure-mechanics suite stays free of the kernel)."""
    before = _kernel_loaded()
    yield
    if not before and _cad_deselected(request.config) and _kernel_loaded():
        pytest.fail(f"{request.node.nodeid} loads the CAD kernel: mark it cad (tests/conftest.py)",
                    pytrace=False)


def pytest_collection_modifyitems(config, items):
    for item in items:
        stem = Path(str(item.fspath)).stem
        if stem in CAD_TEST_MODULES or stem in BROWSER_TEST_MODULES:
            item.add_marker(pytest.mark.cad)
        if stem in BROWSER_TEST_MODULES:
            item.add_marker(pytest.mark.browser)
