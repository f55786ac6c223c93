"""The built-in rule plugins of ctllint, installed as ``ctllint_plugins``.

Each package is one plugin (a rule family: wiring, motor_control, ratings,
behaviour) registered through the ``ctllint`` entry-point group, exactly as a
site's own plugin is. Inside a plugin, one module per rule, named for it; a
plugin's ``__init__`` lists its rule modules once (``rules_from``), and
modules whose names start with ``_`` hold what several of its rules share.
"""
