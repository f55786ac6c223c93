"""ctllint: design-rule checks for motor-control and relay-logic schematics kept as text.

The core is in packages named for the stages of the flow, data moving one way
(each may import only those before it; ``tests/test_house.py`` holds the code
to it with import-linter):

    reading  -> circuit -> checking -> review -> output -> commands
    (files)     (graph)    (rules run)  (diff)   (reports)  (CLI, editor)

The faces for plugins are ``ctllint.hookimpl``, ``ctllint.api`` and
``ctllint.testing``. Modules that stood at the top level before the stages
(``ctllint.model``, ``ctllint.circuit`` and the rest in ``_MOVED``) still
import, with a ``DeprecationWarning`` naming their new place.
"""
import importlib
import importlib.abc
import importlib.util
import sys
import warnings
from importlib.metadata import PackageNotFoundError, version as _version

try:
    __version__ = _version("ctllint")
except PackageNotFoundError:  # running from a source tree that is not installed
    __version__ = "0.0.0+source"

import pluggy  # noqa: E402

# The marker of hook implementations (``@ctllint.hookimpl``), for the project
# name the host's hook specifications use (``ctllint.checking.hookspecs``).
# Made here, not imported from there, so that the package's face imports no stage.
hookimpl = pluggy.HookimplMarker("ctllint")

__all__ = ["__version__", "hookimpl"]

# Where each module of the flat layout went (the module names plugins used).
_MOVED = {
    "model": "reading.model", "kinds": "reading.kinds", "quantities": "reading.quantities",
    "loader": "reading.loader", "terminals": "reading.terminals", "safeio": "reading.safeio",
    "yamlsafe": "reading.yamlsafe", "tables": "circuit.tables", "wiresets": "circuit.wiresets",
    "simulate": "circuit.simulate", "host": "checking.host", "engine": "checking.engine",
    "hookspecs": "checking.hookspecs", "config": "checking.config", "suppress": "checking.suppress",
    "report": "output.report", "draw": "output.draw", "schema": "output.schema", "diff": "review.diff",
    "yamlhints": "reading.yamlhints", "budget": "reading.budget",
    "run": "checking.run", "discover": "checking.discover", "baseline": "checking.baseline",
    "core_rules": "checking.core_rules", "htmlreport": "output.htmlreport", "export": "output.export",
    "progress": "output.progress", "cli": "commands.cli", "lsp": "commands.editor.server",
    "editing": "commands.editor.editing",
}


class _MovedModules(importlib.abc.MetaPathFinder, importlib.abc.Loader):
    """Imports an old module name as its new module, once, with a DeprecationWarning."""

    def find_spec(self, fullname, path, target=None):
        if fullname.startswith("ctllint.") and fullname[8:] in _MOVED:
            return importlib.util.spec_from_loader(fullname, self)
        return None

    def create_module(self, spec):
        return None  # a placeholder; exec_module puts the real module in its place

    def exec_module(self, module):
        new = "ctllint." + _MOVED[module.__name__[8:]]
        warnings.warn(f"{module.__name__} is now {new}: import it from there (the old name will go in a later release)",
                      DeprecationWarning, stacklevel=2)
        # the import system returns what sys.modules holds under the name after exec_module
        sys.modules[module.__name__] = importlib.import_module(new)


sys.meta_path.append(_MovedModules())
