"""The modular decomposition tree as an SVG picture, each node labelled with its share of the
answer count (series: k!, prime: 2, parallel: 1).

Layout: leaves left to right in tree order, one row per depth, every internal node centred
over its children.

>>> from satorder.graph.modular import modular_decomposition
>>> svg = decomposition_svg(modular_decomposition([{1}, {0}, set()]), ["kiln", "loom", "quay"])
>>> svg.startswith("<svg") and "parallel" in svg and "quay" in svg
True
"""

from __future__ import annotations

from html import escape

from satorder.graph.modular import LEAF, PRIME, SERIES, ModuleNode
from satorder.render.order_svg import svg_start

DX, DY, MARGIN = 48, 80, 30
COLOUR = {SERIES: "#1f77b4", PRIME: "#d62728", "parallel": "#7f7f7f"}


def decomposition_svg(tree: ModuleNode, names: list[str], title: str = "") -> str:
    """SVG text of the tree; leaves carry item names, internal nodes their kind and factor."""
    pos: dict[int, tuple[float, float]] = {}
    depth_of: dict[int, int] = {id(tree): 0}
    order: list[ModuleNode] = []  # parents before children
    leaves = 0
    stack = [tree]
    while stack:
        node = stack.pop()
        order.append(node)
        for c in node.children:
            depth_of[id(c)] = depth_of[id(node)] + 1
        stack.extend(reversed(node.children))
    for node in order:
        if node.kind == LEAF:
            pos[id(node)] = (MARGIN + leaves * DX, MARGIN + 60 + depth_of[id(node)] * DY)
            leaves += 1
    for node in reversed(order):
        if node.kind != LEAF:
            xs = [pos[id(c)][0] for c in node.children]
            pos[id(node)] = ((min(xs) + max(xs)) / 2, MARGIN + 60 + depth_of[id(node)] * DY)
    deepest = max(depth_of.values())
    title = title or "Modular decomposition"
    width = max(MARGIN * 2 + max(leaves - 1, 1) * DX + 120, MARGIN * 2 + len(title) * 8.5)
    height = MARGIN * 2 + 60 + deepest * DY + 130
    parts = svg_start(width, height, font_size=12) + [
        f'<text x="{MARGIN}" y="{MARGIN}" font-size="14" font-weight="bold">'
        f"{escape(title)}</text>",
    ]
    for node in order:
        x, y = pos[id(node)]
        for c in node.children:
            cx, cy = pos[id(c)]
            parts.append(f'<line x1="{x:.1f}" y1="{y:.1f}" x2="{cx:.1f}" y2="{cy:.1f}" '
                         'stroke="#999" stroke-width="1"/>')
    for node in order:
        x, y = pos[id(node)]
        if node.kind == LEAF:
            parts.append(f'<circle cx="{x:.1f}" cy="{y:.1f}" r="4" fill="black"/>')
            parts.append(f'<text x="{x + 4:.1f}" y="{y + 14:.1f}" '
                         f'transform="rotate(60 {x + 4:.1f} {y + 14:.1f})">'
                         f"{escape(names[node.item])}</text>")
            continue
        k = len(node.children)
        factor = {SERIES: f"×{k}!", PRIME: "×2"}.get(node.kind, "×1")
        colour = COLOUR.get(node.kind, "black")
        parts.append(f'<circle cx="{x:.1f}" cy="{y:.1f}" r="7" fill="{colour}"/>')
        parts.append(f'<text x="{x:.1f}" y="{y - 24:.1f}" fill="{colour}" font-size="11" '
                     f'text-anchor="middle">{node.kind}</text>')
        parts.append(f'<text x="{x:.1f}" y="{y - 11:.1f}" fill="{colour}" font-size="11" '
                     f'text-anchor="middle">{factor}</text>')
    parts.append("</svg>")
    return "\n".join(parts) + "\n"
