"""The examples in the package's docstrings run and print what they say."""

from __future__ import annotations

import doctest
import importlib

import numpy as np
import pytest

import flatray

MODULES = ["flatray", "flatray.stack", "flatray.interface", "flatray.path", "flatray.image",
           "flatray.batch", "flatray.media", "flatray.survey", "flatray.camera"]


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name):
    module = importlib.import_module(name)
    globs = {n: getattr(flatray, n) for n in flatray.__all__}
    globs["np"] = np
    result = doctest.testmod(module, extraglobs=globs, report=True, verbose=False)
    assert result.failed == 0
    assert result.attempted > 0


def test_every_public_function_has_a_docstring():
    for name in flatray.__all__:
        obj = getattr(flatray, name)
        if callable(obj) and not isinstance(obj, type):
            assert obj.__doc__, name
