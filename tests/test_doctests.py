"""Every docstring example of the package runs (the house style: each formula's worked example).

The modules are found by walking the package's source files, so a new module's examples run
without being listed.  A module that imports the CAD kernel at load time (or a geometry module)
is marked ``cad``.
"""
import doctest
import importlib

import pytest

from conftest import CAD_LIBRARIES, PACKAGE_DIR, imported_modules, module_name


def _needs_cad(path) -> bool:
    for _, name in imported_modules(path, top_level_only=True):
        if name.split(".")[0] in CAD_LIBRARIES or name.startswith("geomjoint.geometry"):
            return True
    return False


def _modules():
    for path in sorted(PACKAGE_DIR.rglob("*.py")):
        name = module_name(path)
        if name == "geomjoint.__main__":
            continue   # the entry point: importing it runs the command
        marks = [pytest.mark.cad] if name.startswith("geomjoint.geometry") or _needs_cad(path) else []
        yield pytest.param(name, marks=marks, id=name)


@pytest.mark.parametrize("name", list(_modules()))
def test_docstring_examples_run(name):
    module = importlib.import_module(name)
    result = doctest.testmod(module, optionflags=doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE, verbose=False)
    assert result.failed == 0, f"{result.failed} of {result.attempted} docstring examples of {name} fail (see above)"


def test_the_big_modules_have_examples():
    # the walk must find the examples at all (a broken walk would pass every module vacuously)
    for name in ("geomjoint.mechanics.vdi", "geomjoint.mechanics.stripping", "geomjoint.mechanics.pattern",
                 "geomjoint.mechanics.fe", "geomjoint.limits"):
        finder = doctest.DocTestFinder()
        examples = sum(len(t.examples) for t in finder.find(importlib.import_module(name)))
        assert examples > 0, name
