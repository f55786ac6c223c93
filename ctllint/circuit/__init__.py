"""Stage 2, circuit: a schematic as a graph, and the questions rules ask of it.

``analysis`` builds one circuit per schematic (wires are nodes, elements are
edges) and answers RULES.md's shared terms once, lazily (supply of a load,
energizing paths, serves, in series, shorts); ``paths`` holds the pieces
shared with ``simulate``, the behaviour model; ``wiresets`` is the
union-find the analyses and the simulator build on; ``tables`` holds the
published rating tables the sizing rules compare with.

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
