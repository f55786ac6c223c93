"""Stage 2, circuit: a schematic as a graph, and the questions rules ask of it.

``graph`` builds one circuit per schematic (wires are nodes, elements are
edges); ``analysis`` holds ``Circuit``, which answers RULES.md's shared
terms on it once, lazily (supply of a load, energizing paths, serves, in
series, shorts), from each load's route (``routes``) and the algorithms on
plain edge lists (``edges``, ``serving``); ``paths`` holds the pieces
shared with ``simulate``, the behaviour model (a package: devices, state,
settling, timers, scenarios); ``wiresets`` is the union-find the analyses
and the simulator build on; ``tables`` holds the published rating tables
the sizing rules compare with.

May import: ``ctllint.reading``.
"""


def __getattr__(name):
    # ``from ctllint.circuit import Circuit`` named the flat module that is now ``analysis``
    import importlib
    import warnings

    analysis = importlib.import_module("ctllint.circuit.analysis")
    if hasattr(analysis, name):
        warnings.warn(f"ctllint.circuit.{name} is now ctllint.circuit.analysis.{name}: import it from there",
                      DeprecationWarning, stacklevel=2)
        value = globals()[name] = getattr(analysis, name)  # warned once; the import system looks twice
        return value
    raise AttributeError(f"module 'ctllint.circuit' has no attribute {name!r}")
