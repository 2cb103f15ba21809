"""Version of the Python package; the loaded C library must report the same."""

__version__ = "0.1.0"
