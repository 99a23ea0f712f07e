"""Single source of the tool version (read by pyproject.toml and recorded in every result)."""

__version__ = "0.1.0"
