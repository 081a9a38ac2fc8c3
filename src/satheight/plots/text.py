"""Text on figures: input text made safe to draw, and labels shared by every plot."""

from __future__ import annotations

#: Longest name drawn before it is shortened [characters].
NAME_MAX = 40


def safe_text(value, max_len: int = NAME_MAX) -> str:
    """Text from input files made safe to draw.

    matplotlib reads text between two unescaped ``$`` as mathtext (and fails on
    unknown ``\\commands`` inside it). Escaping every ``$`` as ``\\$`` keeps the text
    out of math mode; matplotlib then shows ``\\$`` as ``$`` and every other
    backslash as it is, so the text is drawn exactly as written. Line breaks and
    tabs become blanks and very long text is shortened.
    """
    s = "" if value is None else str(value)
    s = " ".join(s.split())
    if len(s) > max_len:
        s = s[: max_len - 1] + "\u2026"
    return s.replace("$", r"\$")


def unit_label(name: str, unit: str, name_max: int = 24) -> str:
    """``name [unit]`` with both parts escaped; the bare name when the unit is empty."""
    name, unit = safe_text(name, name_max), safe_text(unit, 12)
    return f"{name} [{unit}]" if unit else name


def log_sw_label(source: str) -> str:
    """Legend text of the log Sw from its source (``"archie"``, ``"curve:<MNEMONIC>"``)."""
    src = source or ""
    if src in ("archie", "simandoux", "indonesia"):
        return f"Log Sw ({src.capitalize()})"
    if src.startswith("curve:"):
        mnem = safe_text(src.split(":", 1)[1], 12)
        return f"Log Sw ({mnem})" if mnem else "Log Sw"
    return "Log Sw"


def hydrocarbon_label(kind: str) -> str:
    """Legend text of a hydrocarbon fill (``"oil"`` -> ``"Oil (1 - SHM Sw)"``)."""
    name = safe_text(str(kind).capitalize(), 12) or "Hydrocarbon"
    return f"{name} (1 \u2212 SHM Sw)"
