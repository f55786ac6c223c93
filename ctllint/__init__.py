"""ctllint: design-rule checks for motor-control and relay-logic schematics kept as text."""
from importlib.metadata import PackageNotFoundError, version as _version

try:
    __version__ = _version("ctllint")
except PackageNotFoundError:  # running from a source tree that is not installed
    __version__ = "0.0.0+source"

from .hookspecs import hookimpl  # noqa: E402

__all__ = ["__version__", "hookimpl"]
