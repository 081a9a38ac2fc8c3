"""The package's shape: folders follow the data flow, imports only go downward, no cycles.

Read with the standard library's ``ast`` from the source files, nothing is imported or run.

Layers, from the bottom (a module may import its own layer or the ones below it; the science
layer, io, project, plots and workflows are separate groups: io may not import project, plots may
not import io or project):

0. records and boundary: errors, constants, units, well, results
1. science: pure functions and fitted models (everything else at the top level, and models/)
2. io/: file formats only
3. project/: the project file;  plots/: figures (plots sit on the science layer only)
4. workflows/: the commands' steps
5. the command line and the package's public face (cli, __init__, __main__)
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PKG = Path(__file__).resolve().parents[1] / "src" / "satheight"
NAME = "satheight"
MAX_MODULE_LINES = 600
MAX_FUNCTION_LINES = 80
BASE = {"errors", "constants", "units", "well", "results"}
TOP = {"cli", "__main__", "", "api"}   # "" is the package's __init__; api its public face


def _modules() -> dict[str, Path]:
    mods = {}
    for f in PKG.rglob("*.py"):
        parts = list(f.relative_to(PKG).with_suffix("").parts)
        if parts[-1] == "__init__":
            parts = parts[:-1]
        mods[".".join(parts)] = f
    return mods


MODULES = _modules()


def _group(mod: str) -> tuple[int, str]:
    """(rank, group) of a module name relative to the package ('' = the package itself)."""
    head = mod.split(".")[0]
    if mod in TOP:
        return 5, "top"
    if head == "workflows":
        return 4, "workflows"
    if head in ("project", "plots"):
        return 3, head
    if head == "io":
        return 2, "io"
    if head in BASE:
        return 0, "base"
    return 1, "science"


def _internal_targets(mod: str, node: ast.AST, is_pkg: bool) -> list[str]:
    """Modules of the package that an import statement names (relative to the package)."""
    if isinstance(node, ast.Import):
        names = [a.name for a in node.names]
    else:
        if node.level:
            base = mod.split(".") if mod else []
            if not is_pkg:
                base = base[:-1]
            base = base[: len(base) - (node.level - 1)]
            stem = ".".join([NAME, *base, *([node.module] if node.module else [])])
        else:
            stem = node.module or ""
        names = [stem] + [f"{stem}.{a.name}" for a in node.names]
    out = []
    for n in names:
        if n == NAME or n.startswith(NAME + "."):
            rel = n[len(NAME) + 1:] if n != NAME else ""
            if rel and rel in MODULES:      # the package itself (its __version__) is no layer
                out.append(rel)
    return out


def _imports() -> dict[str, list[tuple[str, int, bool]]]:
    """module -> [(target, line, inside a function)]"""
    found = {}
    for mod, path in MODULES.items():
        tree = ast.parse(path.read_text(encoding="utf-8"))
        inside = {id(x) for fn in ast.walk(tree)
                  if isinstance(fn, (ast.FunctionDef, ast.AsyncFunctionDef))
                  for x in ast.walk(fn) if isinstance(x, (ast.Import, ast.ImportFrom))}
        rows = []
        for node in ast.walk(tree):
            if isinstance(node, (ast.Import, ast.ImportFrom)):
                for t in _internal_targets(mod, node, path.name == "__init__.py"):
                    if t != mod:
                        rows.append((t, node.lineno, id(node) in inside))
        found[mod] = rows
    return found


IMPORTS = _imports()


def test_no_import_cycles():
    graph = {m: {t for t, _, _ in rows} for m, rows in IMPORTS.items() if m != ""}
    state, cycles = {}, []

    def visit(m, trail):
        state[m] = "open"
        for t in sorted(graph.get(m, ())):
            if state.get(t) == "open":
                cycles.append(trail[trail.index(t):] + [t])
            elif t not in state:
                visit(t, trail + [t])
        state[m] = "done"

    for m in sorted(graph):
        if m not in state:
            visit(m, [m])
    # layout rules (module docstring; DEVELOPERS.md): no import cycles
    assert cycles == []


def test_imports_only_go_downward():
    wrong = []
    for mod, rows in IMPORTS.items():
        rank, group = _group(mod)
        for target, line, _ in rows:
            t_rank, t_group = _group(target)
            if t_group == group:
                continue
            if t_rank >= rank or (group == "plots" and t_group in ("io", "project")):
                wrong.append(f"{MODULES[mod].relative_to(PKG)}:{line} imports {target}")
    # layout rules (module docstring; DEVELOPERS.md): imports only downward
    assert wrong == []


def test_no_package_import_inside_a_function():
    """Imports of our own modules sit at the top of the file (optional libraries may be lazy)."""
    inside = [f"{MODULES[m].relative_to(PKG)}:{line} {t}"
              for m, rows in IMPORTS.items() for t, line, fn in rows if fn]
    # layout rules (module docstring; DEVELOPERS.md): no imports of our own modules inside functions
    assert inside == []


@pytest.mark.parametrize("mod", sorted(MODULES))
def test_module_and_function_sizes(mod):
    text = MODULES[mod].read_text(encoding="utf-8")
    # layout rules (module docstring; DEVELOPERS.md): no module over 600 lines
    assert text.count("\n") <= MAX_MODULE_LINES
    long = [f"{fn.name} ({fn.end_lineno - fn.lineno + 1} lines)"
            for fn in ast.walk(ast.parse(text))
            if isinstance(fn, (ast.FunctionDef, ast.AsyncFunctionDef))
            and fn.end_lineno - fn.lineno + 1 > MAX_FUNCTION_LINES]
    assert long == []


def test_no_getattr_with_a_default():
    """Our records have the fields they declare: ``getattr(x, "name", default)`` hides which."""
    found = []
    for mod, path in MODULES.items():
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if (isinstance(node, ast.Call) and isinstance(node.func, ast.Name)
                    and node.func.id == "getattr" and len(node.args) == 3):
                found.append(f"{path.relative_to(PKG)}:{node.lineno}")
    # layout rules (module docstring; DEVELOPERS.md): no getattr with a default on our own records
    assert found == []


def test_science_modules_do_no_file_or_figure_work():
    """Science modules (layer 1) import neither matplotlib nor lasio: figures and formats live above."""
    wrong = []
    for mod, path in MODULES.items():
        if _group(mod)[1] != "science":
            continue
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            names = ([a.name for a in node.names] if isinstance(node, ast.Import)
                     else [node.module or ""] if isinstance(node, ast.ImportFrom) else [])
            wrong += [f"{path.relative_to(PKG)}: {n}" for n in names
                      if n.split(".")[0] in ("matplotlib", "lasio")]
    # layout rules (module docstring; DEVELOPERS.md): science modules do no I/O and no plotting
    assert wrong == []
