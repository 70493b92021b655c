"""The layout of the package: no import cycle among its modules (imports inside functions
included), no module over 500 lines, and every subpackage's "May import:" line saying exactly
what the import-linter contracts in pyproject.toml allow it."""

from __future__ import annotations

import importlib
import re
from pathlib import Path

import grimp
import networkx as nx
import pytest

try:
    import tomllib
except ImportError:  # Python 3.10
    tomllib = pytest.importorskip("tomli")

ROOT = Path(__file__).resolve().parent.parent
PACKAGE = ROOT / "satorder"
MAX_LINES = 500


@pytest.fixture(scope="module")
def imports() -> nx.DiGraph:
    """Every import between satorder modules, as grimp reads them from the source: at module
    level, inside functions and under ``TYPE_CHECKING`` alike."""
    graph = grimp.build_graph("satorder", include_external_packages=False, cache_dir=None)
    g = nx.DiGraph()
    for module in graph.modules:
        g.add_node(module)
        for imported in graph.find_modules_directly_imported_by(module):
            g.add_edge(module, imported)
    return g


def test_the_import_graph_sees_imports_inside_functions(imports):
    # the --draw helpers import the picture module only when called (inside the function)
    assert imports.has_edge("satorder.cli.common", "satorder.render.order_svg")


def test_no_import_cycle_among_modules(imports):
    cycles = [sorted(c) for c in nx.strongly_connected_components(imports) if len(c) > 1]
    assert cycles == []


def test_no_module_over_500_lines():
    long = {str(p.relative_to(ROOT)): n for p in PACKAGE.rglob("*.py")
            if (n := len(p.read_text(encoding="utf-8").splitlines())) > MAX_LINES}
    assert long == {}


def _contracts() -> list[dict]:
    with open(ROOT / "pyproject.toml", "rb") as f:
        return tomllib.load(f)["tool"]["importlinter"]["contracts"]


def allowed_imports() -> dict[str, set[str]]:
    """For each layer of the layers contract, the satorder modules it may import: every layer
    below it, less what a forbidden contract whose source is that very layer rules out."""
    contracts = _contracts()
    (layers,) = [c for c in contracts if c["type"] == "layers"]
    rows = [[name.strip() for name in re.split(r"[|:]", row)] for row in layers["layers"]]
    allowed = {}
    for i, row in enumerate(rows):
        below = {f"satorder.{name}" for lower in rows[i + 1:] for name in lower}
        for name in row:
            allowed[f"satorder.{name}"] = set(below)
    for c in contracts:
        if c["type"] == "forbidden":
            for source in c["source_modules"]:
                if source in allowed:
                    allowed[source] -= set(c["forbidden_modules"])
    return allowed


def may_import_line(module: str) -> set[str] | None:
    """The satorder modules named in the "May import:" sentence of a module's docstring."""
    doc = importlib.import_module(module).__doc__ or ""
    m = re.search(r"May import:(.*?)\.(?:\s|$)", doc, re.S)
    if m is None:
        return None
    return set(re.findall(r"satorder\.\w+", m.group(1)))


def test_contracts_cover_every_subpackage():
    names = {p.name for p in PACKAGE.iterdir() if (p / "__init__.py").exists()}
    names |= {p.stem for p in PACKAGE.glob("*.py") if p.stem not in ("__init__", "__main__")}
    assert {f"satorder.{n}" for n in names} == set(allowed_imports())


@pytest.mark.parametrize("module", sorted(allowed_imports()))
def test_may_import_line_matches_the_contracts(module):
    assert may_import_line(module) == allowed_imports()[module]


def test_the_contracts_are_not_vacuous():
    allowed = allowed_imports()
    below_cli = [v for k, v in allowed.items() if k != "satorder.cli"]
    assert "satorder.cli" not in set().union(*below_cli)
    assert not allowed["satorder.certify"] & {"satorder.graph", "satorder.sat",
                                              "satorder.pipeline", "satorder.measure"}
    assert "satorder.certify" not in allowed["satorder.sat"] | allowed["satorder.graph"]
