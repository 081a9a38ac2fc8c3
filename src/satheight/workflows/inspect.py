"""``satheight inspect``: what a LAS file holds and which curves the tool would use."""

from __future__ import annotations

import json

from ..io.las import describe_las
from .output_folder import check_input_file

__all__ = ["inspect_las", "description_text"]


def las_description(path) -> dict:
    """:func:`satheight.io.las.describe_las` of a LAS file whose path was checked first:
    a FIFO, a device or a symbolic-link loop is refused before it is opened."""
    check_input_file(path, "LAS file")
    return describe_las(path)


def inspect_las(path, as_json: bool = False) -> str:
    """The listing of a LAS file as text: a table, or JSON with ``as_json``."""
    info = las_description(path)
    if as_json:
        return json.dumps(info, indent=2, default=str)
    return description_text(info)


def description_text(info: dict) -> str:
    """Plain-text listing of :func:`satheight.io.las.describe_las`'s dict."""
    lines = [f"file: {info.get('path')}", f"well: {info.get('well')}"]
    dr = info.get("depth", {})
    lines.append(f"depth: {dr.get('start')} to {dr.get('stop')} {dr.get('unit')}, step "
                 f"{dr.get('step')}, {info.get('n_samples')} samples")
    lines.append(f"{'curve':<12} {'unit':<10} {'nulls':>7} {'min':>12} {'max':>12}  description")
    for c in info.get("curves", []):
        lo = "" if c.get("min") is None else f"{c['min']:.6g}"
        hi = "" if c.get("max") is None else f"{c['max']:.6g}"
        lines.append(f"{c['mnemonic']:<12} {c.get('unit') or '':<10} {c.get('n_null', 0):>7} "
                     f"{lo:>12} {hi:>12}  {c.get('description') or ''}")
    lines.append("roles:")
    for role, r in info.get("roles", {}).items():
        if isinstance(r, dict):
            chosen = r.get("mnemonic")
            if chosen:
                lines.append(f"  {role:<13} {chosen}")
            else:
                lines.append(f"  {role:<13} none (tried {', '.join(r.get('aliases_tried', []))})")
        else:
            lines.append(f"  {role:<13} {r}")
    lines += [f"note: {w}" for w in info.get("warnings", [])]
    return "\n".join(lines)
