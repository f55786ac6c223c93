"""Stage 3, checking: plugins found, rules run, findings kept or suppressed.

``hookspecs`` (the plugin hooks, documented), ``host`` (plugins loaded and
isolated, rules run with their limits), ``engine`` (one file: load, rules,
suppressions), ``run`` (many files: discovery, cache, worker processes),
``config``, ``suppress``, ``baseline``, ``discover``, ``core_rules`` (the
rules of the core itself) and ``usage`` (usage errors, writing a report).

May import: ``ctllint.reading``, ``ctllint.circuit`` and ``ctllint.api``.
Never the built-in plugins: they come in through entry points like a site's own.
"""
