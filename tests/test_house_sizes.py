"""The house's sizes: a reader finds a thing where its name says and reads it in one sitting.

No function or class of the project over 150 lines; each built-in rule in a
module of its own, named for it, at most 200 lines, whose docstring is the
rule's documentation (DEVELOPERS.md, "Adding a rule").
"""
from __future__ import annotations

import ast
import os
import sys

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))

FUNCTION_LINES = 150
RULE_MODULE_LINES = 200


def _sources():
    for top in ("ctllint", "plugins"):
        for folder, dirs, files in os.walk(os.path.join(ROOT, top)):
            dirs[:] = [d for d in dirs if d not in ("__pycache__", "tests")]
            for name in sorted(files):
                if name.endswith(".py"):
                    yield os.path.join(folder, name)


def test_no_function_or_class_is_longer_than_a_sitting():
    long = []
    for path in _sources():
        with open(path, encoding="utf-8") as handle:
            tree = ast.parse(handle.read())
        for node in ast.walk(tree):
            if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.ClassDef)):
                lines = node.end_lineno - node.lineno + 1
                if lines > FUNCTION_LINES:
                    long.append(f"{os.path.relpath(path, ROOT)}:{node.lineno} {node.name} {lines} lines")
    assert not long, "over 150 lines: " + "; ".join(long)


def test_each_rule_has_its_own_small_module():
    from ctllint.checking.host import PluginHost

    host = PluginHost.create()
    assert len(host.rules) > 30
    for rule in host.rules.values():
        module = sys.modules[rule.check.__module__]
        if not module.__name__.startswith("ctllint_plugins."):
            continue  # a site's plugin (the example package) keeps its own layout
        assert module.__name__.rsplit(".", 1)[1] == rule.name.replace("-", "_"), (rule.name, module.__name__)
        assert getattr(module, "RULE", None) is rule, f"{module.__name__} does not hold RULE = Rule({rule.name!r}, ...)"
        with open(module.__file__, encoding="utf-8") as handle:
            lines = handle.read().count("\n")
        assert lines <= RULE_MODULE_LINES, f"{module.__file__}: {lines} lines"
        assert module.__doc__ and " ".join(module.__doc__.split()) == " ".join(rule.doc.split()), \
            f"{module.__name__}: its docstring is not the rule's documentation"


