"""Every docstring example of the package runs as a test (numpydoc Examples sections are executable).

The modules are found by walking the installed package, so the renderers and the weighting tables (which live in
their own folders of the repository and install as ``hazard.reports`` and ``hazard.weighting_tables``) are
included.
"""

import doctest
import importlib
import pkgutil

import pytest

import hazard
import hazard.reports
import hazard.weighting_tables

ROOTS = (hazard, hazard.reports, hazard.weighting_tables)  # the last two may live outside hazard/ (editable install)
MODULES = sorted(
    {root.__name__ for root in ROOTS}
    | {name for root in ROOTS for _, name, _ in pkgutil.walk_packages(root.__path__, root.__name__ + ".")}
)


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name):
    module = importlib.import_module(name)
    failures, _ = doctest.testmod(module, optionflags=doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE)
    assert failures == 0, f"{failures} docstring example(s) of {name} failed (run: python -m doctest -v)"
