"""No import cycles inside ``app/`` or inside ``core/``.

The graph is read from the source with ``ast``, so it sees every import a module can make, those inside
functions included (a function-level import only postpones a cycle to the first call, it does not
remove it), and ``__import__``/``importlib.import_module`` calls given a literal name.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[2]
#: folder → the package name it installs as (pyproject's package-dir mapping)
PACKAGES = {"app": "pmdc_sizer.app", "core": "pmdc_sizer.core"}


def module_names(folder: Path, package: str) -> dict[str, Path]:
    """Every module of the package under ``folder``: dotted name → file (``__init__`` names its package)."""
    names = {}
    for path in sorted(folder.rglob("*.py")):
        parts = list(path.relative_to(folder).with_suffix("").parts)
        if parts[-1] == "__init__":
            parts.pop()
        names[".".join([package, *parts])] = path
    return names


def _imported(node: ast.AST, module: str, is_package: bool) -> list[str]:
    """Dotted names an import statement or a literal dynamic import asks for (unresolved to files)."""
    if isinstance(node, ast.Import):
        return [alias.name for alias in node.names]
    if isinstance(node, ast.ImportFrom):
        if node.level:
            base = module.split(".") if is_package else module.split(".")[:-1]
            base = base[: len(base) - (node.level - 1)]
            stem = ".".join(base + ([node.module] if node.module else []))
        else:
            stem = node.module or ""
        # ``from package import name``: the name may be a submodule or an attribute of the package.
        return [f"{stem}.{alias.name}" for alias in node.names] + [stem]
    if isinstance(node, ast.Call) and node.args and isinstance(node.args[0], ast.Constant) \
            and isinstance(node.args[0].value, str):
        function = node.func
        name = getattr(function, "id", None) or getattr(function, "attr", "")
        if name in ("__import__", "import_module"):
            return [node.args[0].value]
    return []


def import_graph(folder: Path, package: str) -> dict[str, set[str]]:
    """module → the modules of the same package it imports, anywhere in its source."""
    modules = module_names(folder, package)
    graph: dict[str, set[str]] = {name: set() for name in modules}
    for name, path in modules.items():
        tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
        is_package = path.name == "__init__.py"
        for node in ast.walk(tree):
            wanted = _imported(node, name, is_package)
            if isinstance(node, ast.ImportFrom):
                # the submodule when the name is one, otherwise the module the names come from
                submodules = [w for w in wanted[:-1] if w in modules]
                wanted = submodules or wanted[-1:]
            graph[name] |= {w for w in wanted if w in modules and w != name}
    return graph


def cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """The strongly connected groups of more than one module (Tarjan's algorithm), each sorted."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    on_stack: set[str] = set()
    found: list[list[str]] = []

    def visit(node: str) -> None:
        index[node] = low[node] = len(index)
        stack.append(node)
        on_stack.add(node)
        for successor in sorted(graph[node]):
            if successor not in index:
                visit(successor)
                low[node] = min(low[node], low[successor])
            elif successor in on_stack:
                low[node] = min(low[node], index[successor])
        if low[node] == index[node]:
            group = []
            while True:
                member = stack.pop()
                on_stack.discard(member)
                group.append(member)
                if member == node:
                    break
            if len(group) > 1:
                found.append(sorted(group))

    for node in sorted(graph):
        if node not in index:
            visit(node)
    return found


def _describe(groups: list[list[str]], graph: dict[str, set[str]]) -> str:
    lines = []
    for group in groups:
        members = set(group)
        lines.append("; ".join(f"{m} → {', '.join(sorted(graph[m] & members))}" for m in group))
    return "\n".join(lines)


@pytest.mark.parametrize("folder", sorted(PACKAGES))
def test_no_import_cycle(folder):
    graph = import_graph(REPO / folder, PACKAGES[folder])
    assert len(graph) > 5, "the walk found the package's modules"
    assert any(graph.values()), "the walk found the imports between them"
    found = cycles(graph)
    assert not found, f"import cycles in {folder}/:\n{_describe(found, graph)}"


def test_the_check_finds_a_cycle_through_a_function_level_import(tmp_path):
    package = tmp_path / "pkg"
    (package / "sub").mkdir(parents=True)
    (package / "__init__.py").write_text("")
    (package / "first.py").write_text("from .sub import second\n")
    (package / "sub" / "__init__.py").write_text("")
    (package / "sub" / "second.py").write_text("def later():\n    from .. import third\n")
    (package / "third.py").write_text("import importlib\nimportlib.import_module('pkg.first')\n")
    (package / "alone.py").write_text("from pkg.first import something\n")
    graph = import_graph(package, "pkg")
    assert graph["pkg.alone"] == {"pkg.first"}
    assert cycles(graph) == [["pkg.first", "pkg.sub.second", "pkg.third"]]
