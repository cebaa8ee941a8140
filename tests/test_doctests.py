"""Run the docstring examples of the installed package (STYLE.md habit 15)."""

import doctest
import importlib
import pkgutil

import pytest

import uvcheck

MODULES = sorted(m.name for m in pkgutil.walk_packages(uvcheck.__path__, "uvcheck.")
                 if not m.name.endswith("__main__") and not m.name.endswith("cie_cache"))


@pytest.mark.parametrize("name", MODULES)
def test_doctests(name):
    mod = importlib.import_module(name)
    result = doctest.testmod(mod, optionflags=doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE)
    assert result.failed == 0
