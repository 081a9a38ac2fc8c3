"""The ``[zones.function]`` table of a project file: a J-Sw family with its parameters,
or a function from a model file written by ``satheight fit``."""

from __future__ import annotations

from typing import Any

from ..errors import InputFileError, ModelError
from ..io.model_file import load_models
from ..models import FAMILIES, build_function, get_family
from .types import FunctionSpec
from .values import _show

_FUNCTION_FIXED_KEYS = ("family", "j_min", "j_max")
_FUNCTION_FILE_KEYS = ("file", "rock_type", "family", "j_min", "j_max")


def read_function(reader, raw: Any, key: str) -> FunctionSpec:
    if not isinstance(raw, dict):
        raise reader.error(key, f"expected a table, found {_show(raw)}",
                         hint=f"write it as a [{key.split('[')[0]}.function] section")
    if "file" in raw:
        return read_function_file(reader, raw, key)
    if "family" not in raw:
        raise reader.error(f"{key}.family", "required key 'family' is missing",
                         hint="use one of " + ", ".join(sorted(FAMILIES)))
    family = reader.text(raw["family"], f"{key}.family")
    try:
        cls = get_family(family, where=f"{key}.family")
    except ModelError as exc:
        raise reader.error(f"{key}.family", exc.what, hint=exc.hint) from None
    reader.table(raw, key, _FUNCTION_FIXED_KEYS + tuple(cls.param_names))

    j_range = None
    if ("j_min" in raw) != ("j_max" in raw):
        missing = "j_max" if "j_min" in raw else "j_min"
        raise reader.error(f"{key}.{missing}", f"{missing!r} is missing while the other "
                         "end of the calibrated J range is given",
                         hint="give both j_min and j_max, or neither")
    if "j_min" in raw:
        j_min = reader.number(raw["j_min"], f"{key}.j_min")
        j_max = reader.number(raw["j_max"], f"{key}.j_max")
        if not 0 <= j_min < j_max:
            raise reader.error(f"{key}.j_min", f"calibrated J range j_min = {raw['j_min']!r}, "
                             f"j_max = {raw['j_max']!r} does not satisfy 0 <= j_min < j_max",
                             hint="check the two values")
        j_range = (j_min, j_max)

    params = {}
    for p in cls.param_names:
        if p in raw:
            params[p] = reader.number(raw[p], f"{key}.{p}")
    try:
        fn = build_function(family, params, j_range=j_range, where=key)
    except ModelError as exc:
        hint = exc.hint or (f"check the {family} parameters "
                            f"({', '.join(cls.param_names)}) against their allowed ranges")
        raise reader.error(key, exc.what, hint=hint) from None
    return FunctionSpec(family=family, params=dict(fn.params_), j_range=fn.j_range_)

def read_function_file(reader, raw: dict, key: str) -> FunctionSpec:
    """``[zones.function] file = "models.json"`` (+ optional rock_type, family, j range)."""
    reader.table(raw, key, _FUNCTION_FILE_KEYS)
    text = reader.text(raw["file"], f"{key}.file")
    path = (reader.path.parent.resolve() / text).resolve()
    try:
        mf = load_models(path)
    except (ModelError, InputFileError) as exc:
        raise reader.error(f"{key}.file", f"model file {text!r}: {exc}",
                         hint="paths are relative to the project file; the file is written "
                              "by 'satheight fit'") from None
    family = reader.text(raw["family"], f"{key}.family") if "family" in raw else None
    j_range = None
    if ("j_min" in raw) != ("j_max" in raw):
        missing = "j_max" if "j_min" in raw else "j_min"
        raise reader.error(f"{key}.{missing}", f"{missing!r} is missing while the other end of "
                         "the calibrated J range is given", hint="give both or neither")
    if "j_min" in raw:
        j_range = (reader.number(raw["j_min"], f"{key}.j_min"),
                   reader.number(raw["j_max"], f"{key}.j_max"))
        if not 0 <= j_range[0] < j_range[1]:
            raise reader.error(f"{key}.j_min", "calibrated range does not satisfy "
                             "0 <= j_min < j_max", hint="check the two values")

    def one(rock_type: str, k: str) -> FunctionSpec:
        try:
            fn = mf.function(rock_type, family, where=k)
        except ModelError as exc:
            raise reader.error(k, exc.what, hint=exc.hint) from None
        return FunctionSpec(family=fn.name, params=dict(fn.params_),
                            j_range=j_range or fn.j_range_, file=path, rock_type=rock_type)

    if "rock_type" in raw or len(mf.rock_types) == 1:
        rt = (reader.text(raw["rock_type"], f"{key}.rock_type") if "rock_type" in raw
              else next(iter(mf.rock_types)))
        return one(rt, f"{key}.rock_type")
    if not mf.rule.applies_to_logs:
        raise reader.error(f"{key}.rock_type",
                         f"model file {text!r} holds {len(mf.rock_types)} rock types grouped "
                         f"by plug-table column {mf.rule.column!r}, which logs cannot supply",
                         hint="add rock_type = one of "
                              + ", ".join(repr(r) for r in mf.rock_types))
    specs = {rt: one(rt, f"{key}.file") for rt in mf.rock_types}
    first = next(iter(specs.values()))
    return FunctionSpec(family=first.family, params=first.params, j_range=first.j_range,
                        file=path, rock_type=None, by_rock_type=specs, rock_rule=mf.rule)
