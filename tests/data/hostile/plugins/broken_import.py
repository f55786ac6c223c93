"""A plugin that fails to import (tests/test_hostile.py)."""
import ctllint_no_such_module_anywhere  # noqa: F401
