"""The built-in rule plugins of ctllint, installed as ``ctllint_plugins``.

Each module is one plugin (a rule family) registered through the ``ctllint``
entry-point group, exactly as a site's own plugin is.
"""
