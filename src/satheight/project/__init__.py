"""The project file: reading, validating and the records it is read into."""

from .reader import load_project, parse_project

__all__ = ["load_project", "parse_project"]
