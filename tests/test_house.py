"""The house's layout, held to what DEVELOPERS.md says of it.

The core's stages import downwards only, the core never imports the built-in
plugins, and no package has an import circle: the three contracts in
pyproject.toml's ``[tool.importlinter]``, checked with import-linter (a
maintained library for exactly this). The contracts are also checked to be
able to fail: an upward import written into a copy of the tree breaks them.
"""
from __future__ import annotations

import os
import shutil
import subprocess
import sys

import pytest

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
LINT = [sys.executable, "-c", "import sys; from importlinter.cli import lint_imports_command; sys.exit(lint_imports_command())"]


def lint_imports(cwd: str, env: dict | None = None) -> subprocess.CompletedProcess:
    return subprocess.run(LINT + ["--no-cache"], cwd=cwd, capture_output=True, text=True, env=env)


def test_import_contracts_are_kept():
    proc = lint_imports(ROOT)
    assert proc.returncode == 0, proc.stdout + proc.stderr
    assert "3 kept, 0 broken" in proc.stdout


@pytest.mark.parametrize("importer, imported, contract", [
    ("ctllint/reading/quantities.py", "ctllint.output.report", "stages"),
    ("ctllint/circuit/wiresets.py", "ctllint_plugins.behaviour", "core never imports"),
    ("ctllint/output/draw/__init__.py", "ctllint.commands.cli", "stages"),
])
def test_an_upward_import_breaks_a_contract(tmp_path, importer, imported, contract):
    tree = tmp_path / "tree"
    shutil.copytree(ROOT, tree, ignore=shutil.ignore_patterns(".git", ".venv", "__pycache__", "fixtures", "tests", "*.egg-info"))
    with open(tree / importer, "a", encoding="utf-8") as handle:
        handle.write(f"\nimport {imported}  # an import against the flow\n")
    # the copy's packages come first on the path (the plugins folder under its installed name)
    (tmp_path / "paths").mkdir()
    os.symlink(tree / "ctllint", tmp_path / "paths" / "ctllint")
    os.symlink(tree / "plugins", tmp_path / "paths" / "ctllint_plugins")
    env = dict(os.environ, PYTHONPATH=str(tmp_path / "paths"))
    proc = lint_imports(str(tree), env)
    assert proc.returncode != 0, proc.stdout
    broken = proc.stdout.split("Broken contracts")[-1]
    assert contract in broken, proc.stdout


# -- the old module names ------------------------------------------------------

def test_old_module_names_still_import_with_a_deprecation_warning():
    # a site's plugin written against the flat layout keeps working for now
    code = (
        "import warnings, json\n"
        "warnings.simplefilter('always')\n"
        "with warnings.catch_warnings(record=True) as seen:\n"
        "    from ctllint.model import Severity\n"
        "    from ctllint.circuit import path_text\n"
        "    import ctllint.tables as tables\n"
        "import ctllint.reading.model, ctllint.circuit.paths, ctllint.circuit.tables\n"
        "print(json.dumps([Severity is ctllint.reading.model.Severity, path_text is ctllint.circuit.paths.path_text,\n"
        "                  tables is ctllint.circuit.tables, [str(w.category.__name__) for w in seen],\n"
        "                  [str(w.message) for w in seen]]))\n"
    )
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT)
    assert proc.returncode == 0, proc.stderr
    import json

    same_model, same_path_text, same_tables, categories, messages = json.loads(proc.stdout)
    assert same_model and same_path_text and same_tables
    assert categories == ["DeprecationWarning"] * 3
    assert "ctllint.model is now ctllint.reading.model" in messages[0]
    assert "ctllint.circuit.analysis.path_text" in messages[1]


def test_the_hook_marker_of_the_face_is_the_hosts():
    import ctllint
    from ctllint.checking import hookspecs

    assert hookspecs.PROJECT == "ctllint" and ctllint.hookimpl.project_name == hookspecs.PROJECT


def test_no_module_imports_itself_round_a_circle():
    # import-linter's acyclic_siblings contract compares siblings; a package and its own modules
    # (a package's __init__ importing a module that imports the package back) are not siblings,
    # so every module's imports are also checked here for a circle of any length
    import grimp
    import networkx as nx

    graph = grimp.build_graph("ctllint", "ctllint_plugins", exclude_type_checking_imports=True, cache_dir=None)
    imports = nx.DiGraph()
    for module in graph.modules:
        imports.add_node(module)
        imports.add_edges_from((module, other) for other in graph.find_modules_directly_imported_by(module) if other in graph.modules)
    assert imports.number_of_nodes() > 100
    circles = [sorted(c) for c in nx.strongly_connected_components(imports) if len(c) > 1]
    assert not circles, circles
