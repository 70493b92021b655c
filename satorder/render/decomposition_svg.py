"""The modular decomposition tree as an SVG picture, each node labelled with its share of the
answer count (series: k!, prime: 2, parallel: 1).

Layout: leaves left to right in tree order, one row per depth, every internal node centred
over its children.  Node kinds differ by shape as well as colour (Okabe & Ito 2002): series a
blue square, prime a vermillion diamond, parallel a grey circle, items small black dots.  The
legend lists only the kinds present.

>>> from satorder.graph.modular import modular_decomposition
>>> svg = decomposition_svg(modular_decomposition([{1}, {0}, set()]), ["kiln", "loom", "quay"])
>>> svg.startswith("<svg") and "parallel" in svg and "quay" in svg
True
"""

from __future__ import annotations

from html import escape

from satorder.graph.modular import LEAF, PRIME, SERIES, ModuleNode
from satorder.render.picture import BLUE, VERMILLION, Header, Mark, document, marker

DX, DY, MARGIN = 48, 80, 30
COLOUR = {SERIES: BLUE, PRIME: VERMILLION, "parallel": "#6E6E6E"}
SHAPE = {SERIES: "square", PRIME: "diamond", "parallel": "circle"}
LEGEND = {SERIES: "series: its parts in any order (×k!)",
          PRIME: "prime: one of two orientations (×2)",
          "parallel": "parallel: parts side by side (×1)"}
CAPTION = ("Each leaf is an item and each inner node a group of items that every item outside "
           "treats alike; the number of orders is the product of the factors written at the "
           "inner nodes, before any fixed or forbidden arcs.")


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
    kinds = {node.kind for node in order if node.kind != LEAF}
    title = title or "Modular decomposition"
    width = max(MARGIN * 2 + (sum(1 for nd in order if nd.kind == LEAF) - 1) * DX + 120,
                MARGIN * 2 + len(title) * 9.5, 620)
    legend = [Mark(LEGEND[k], SHAPE[k], COLOUR[k], 6) for k in (SERIES, PRIME, "parallel")
              if k in kinds] + [Mark("item", "circle", "#000000", 4)]
    head = Header(width, title, CAPTION, legend)
    top = head.height + 50
    for node in order:
        if node.kind == LEAF:
            pos[id(node)] = (MARGIN + leaves * DX, top + depth_of[id(node)] * DY)
            leaves += 1
    for node in reversed(order):
        if node.kind != LEAF:
            xs = [pos[id(c)][0] for c in node.children]
            pos[id(node)] = ((min(xs) + max(xs)) / 2, top + depth_of[id(node)] * DY)
    deepest = max(depth_of.values())
    height = top + deepest * DY + 130
    parts = list(head.parts)
    for node in order:
        x, y = pos[id(node)]
        for c in node.children:
            cx, cy = pos[id(c)]
            parts.append(f'<line x1="{x:.1f}" y1="{y:.1f}" x2="{cx:.1f}" y2="{cy:.1f}" '
                         'stroke="#999999" stroke-width="1"/>')
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
        parts.append(marker(SHAPE.get(node.kind, "circle"), x, y, colour, 7))
        parts.append(f'<text x="{x:.1f}" y="{y - 24:.1f}" fill="{colour}" font-size="11" '
                     f'text-anchor="middle">{node.kind}</text>')
        parts.append(f'<text x="{x:.1f}" y="{y - 11:.1f}" fill="{colour}" font-size="11" '
                     f'text-anchor="middle">{factor}</text>')
    return document(width, height, parts)
