"""The project file: reading, validating and the records it is read into."""

from .reader import load_project, parse_project
from .values import check_fwl_near_wells

__all__ = ["load_project", "parse_project", "check_fwl_near_wells"]
