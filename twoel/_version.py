"""Package version (single source: pyproject.toml, read from the installed metadata)."""

from importlib import metadata

try:
    __version__ = metadata.version("twoel")
except metadata.PackageNotFoundError:  # running from a checkout without installation
    __version__ = "0.1.0+checkout"
