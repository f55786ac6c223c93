"""Further ``ctllint`` sub-commands, one module each.

A module registers itself with ``ctllint.cli.command(name, help)`` applied
to a ``(configure, run)`` pair; importing this package imports them all.
"""
import importlib
import pkgutil

for _info in sorted(pkgutil.iter_modules(__path__), key=lambda m: m.name):
    importlib.import_module(f"{__name__}.{_info.name}")
