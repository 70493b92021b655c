"""Pictures of an order as SVG text: a layered Hasse diagram, a summary by level for large
orders, and, for dimension 2, a dominance drawing.

* **Layered Hasse diagram** (the covering pairs, lower item below).  Items sit on the level of
  the longest chain ending at them (the Mirsky levels of
  :func:`satorder.measure.figures.height`); every covering pair that skips levels bends once
  per level it passes, the order inside each level is chosen to reduce crossings and the
  positions keep long edges straight (:mod:`satorder.render.layered`, after Sugiyama, Tagawa &
  Toda 1981).  Segments between bend points lie between the bands of boxes, so no edge passes
  through a box it does not end at.  A longest chain is drawn thick in vermillion and a largest
  antichain outlined with blue dashes.
* **Summary** above :data:`SUMMARY_AT` items (:mod:`satorder.render.summary_svg`).
* **Dominance drawing** (dimension ≤ 2): item ``x`` is drawn at (position in the first order
  of the realizer, position in the second), so ``x < y`` exactly when ``y`` lies up and to the
  right of ``x`` (Dushnik & Miller 1941; Di Battista, Tamassia & Tollis 1992).

>>> svg = hasse_svg([{1, 2}, {2}, set()], ["kiln", "loom", "quay"])
>>> svg.startswith("<svg") and "loom" in svg
True
"""

from __future__ import annotations

from html import escape

from satorder.model import order as order_ops
from satorder.render.layered import layered_layout
from satorder.render.picture import (
    BLUE,
    CHAR_W,
    GREY,
    VERMILLION,
    Box,
    Header,
    Line,
    Mark,
    document,
    svg_start,
)

__all__ = ["SUMMARY_AT", "dominance_svg", "hasse_svg", "pictures", "svg_start"]

#: above this many items a Hasse diagram cannot be read; a summary by level is drawn instead
SUMMARY_AT = 150
MAX_LABEL = 18
BOX_H = 22
LEVEL_GAP = 72  # distance between the centres of two levels
LEFT = 78  # room for the level labels
CHAIN_FILL = "#FBE0CC"
ITEM_FILL = "#F4F6F8"

HASSE_CAPTION = ("Read from bottom to top: each box is an item, and a line runs up from an item "
                 "to each item that must come directly after it, so an item comes before "
                 "everything it reaches by climbing lines.")


def _label(name: str) -> str:
    return name if len(name) <= MAX_LABEL else name[: MAX_LABEL - 1] + "…"


def _levels(succ):
    from satorder.measure.figures import height

    return height(succ).partition


def hasse_svg(succ: list[set[int]], names: list[str], chain=None, antichain=None,
              title: str | None = None, caption: str | None = None) -> str:
    """SVG text of the layered Hasse diagram (see module doc)."""
    n = len(succ)
    cover = order_ops.covering_pairs(succ)
    levels = [sorted(lv) for lv in _levels(succ)] if n else []
    labels = [_label(x) for x in names]
    widths = [max(CHAR_W * len(s) + 14, 30) for s in labels]
    lay = layered_layout(levels, cover, widths)
    chain = list(chain or [])
    chain_arcs = set(zip(chain, chain[1:])) if len(chain) > 1 else set()
    chain_set = set(chain) if chain_arcs else set()
    anti = set(antichain or []) if len(antichain or []) > 1 else set()
    heading = title or f"Hasse diagram: {n} items, {len(cover)} covering pairs"
    legend = [Box("item")] + ([Line("covering pair")] if cover else [])
    if chain_arcs:
        legend.append(Line(f"a longest chain ({len(chain)} items)", VERMILLION, 3.0))
    if anti:
        legend.append(Box(f"a largest antichain ({len(anti)} items)", stroke=BLUE, width=2.4,
                          dash="5,3"))
    width = max(560.0, LEFT + lay.width + 30, 32 + CHAR_W * 1.3 * len(heading))
    head = Header(width, heading, caption or HASSE_CAPTION, legend)
    top = head.height + 14
    total_h = top + BOX_H + 16 + LEVEL_GAP * max(0, len(levels) - 1) + 12
    xoff = LEFT + (width - LEFT - 30 - lay.width) / 2

    def y_of(k):  # level 0 at the bottom
        return top + BOX_H / 2 + 8 + LEVEL_GAP * (len(levels) - 1 - k)

    out = list(head.parts)
    for k in range(len(levels)):
        y = y_of(k)
        if k % 2 == 1:  # shade every other level
            out.append(f'<rect class="band" x="0" y="{y - LEVEL_GAP / 2:.1f}" '
                       f'width="{width:.0f}" height="{LEVEL_GAP:.1f}" fill="#F2F5F9"/>')
        out.append(f'<text x="12" y="{y + 4:.1f}" font-size="11" fill="#555555">'
                   f"level {k + 1}</text>")
    for a, b in cover:
        hot = (a, b) in chain_arcs
        pts = [(lay.x[a] + xoff, y_of(lay.layer[a]) - BOX_H / 2)]
        for d in lay.paths[(a, b)]:
            yd = y_of(lay.layer[d])
            pts += [(lay.x[d] + xoff, yd + BOX_H / 2), (lay.x[d] + xoff, yd - BOX_H / 2)]
        pts.append((lay.x[b] + xoff, y_of(lay.layer[b]) + BOX_H / 2))
        colour, sw = (VERMILLION, 3.0) if hot else (GREY, 1.2)
        text = " ".join(f"{px:.1f},{py:.1f}" for px, py in pts)
        out.append(f'<polyline class="edge" data-from="{escape(names[a])}" '
                   f'data-to="{escape(names[b])}" points="{text}" fill="none" '
                   f'stroke="{colour}" stroke-width="{sw}" stroke-linejoin="round"/>')
    for v in range(n):
        cx, cy = lay.x[v] + xoff, y_of(lay.layer[v])
        fill = CHAIN_FILL if v in chain_set else ITEM_FILL
        stroke, sw, dash = (BLUE, 2.4, ' stroke-dasharray="5,3"') if v in anti else \
            ("#444444", 1, "")
        out.append(f'<g class="item"><title>{escape(names[v])}</title>'
                   f'<rect x="{cx - widths[v] / 2:.1f}" y="{cy - BOX_H / 2:.1f}" '
                   f'width="{widths[v]:.1f}" height="{BOX_H}" rx="5" fill="{fill}" '
                   f'stroke="{stroke}" stroke-width="{sw}"{dash}/>'
                   f'<text x="{cx:.1f}" y="{cy + 4:.1f}" font-size="12" text-anchor="middle">'
                   f"{escape(labels[v])}</text></g>")
    return document(width, total_h, out)


DOMINANCE_CAPTION = ("Each dot is an item placed by its positions in two orderings; an item comes "
                     "before another exactly when the other lies above and to the right of it.")


def dominance_svg(succ: list[set[int]], names: list[str], realizer: list[list[int]],
                  title: str | None = None) -> str:
    """SVG text of the dominance drawing from a realizer of at most two linear orders."""
    n = len(succ)
    if len(realizer) > 2:
        raise ValueError("a dominance drawing needs a realizer of at most two orders")
    l1 = realizer[0] if realizer else []
    l2 = realizer[-1] if realizer else []
    p1 = {x: i for i, x in enumerate(l1)}
    p2 = {x: i for i, x in enumerate(l2)}
    cell = 22 if n <= 60 else 16
    labels = [_label(x) for x in names]
    extra = max([CHAR_W * 0.85 * len(s) for s in labels] + [0]) + 20
    heading = title or f"Dominance drawing: {n} items"
    width = max(70 + n * cell + extra, 520.0)
    cover = order_ops.covering_pairs(succ)
    legend = [Mark("item", "circle", BLUE, 4)]
    if cover:
        legend.append(Line("covering pair"))
    head = Header(width, heading, DOMINANCE_CAPTION, legend)
    margin_l, margin_t = 70, head.height + 14
    height = margin_t + n * cell + 60

    def xy(x):
        return margin_l + (p1[x] + 0.5) * cell, margin_t + (n - p2[x] - 0.5) * cell

    out = list(head.parts)
    x0, y0, side = margin_l, margin_t, n * cell
    out.append(f'<rect x="{x0}" y="{y0:.1f}" width="{side}" height="{side}" fill="none" '
               'stroke="#C8CED6"/>')
    out.append(f'<text x="{x0 + side / 2:.0f}" y="{y0 + side + 36:.0f}" font-size="12" '
               'text-anchor="middle" fill="#333333">position in the first ordering →</text>')
    out.append(f'<text x="{x0 - 30:.0f}" y="{y0 + side / 2:.0f}" font-size="12" fill="#333333" '
               f'text-anchor="middle" transform="rotate(-90 {x0 - 30:.0f} {y0 + side / 2:.0f})">'
               'position in the second ordering →</text>')
    for a, b in cover:
        (xa, ya), (xb, yb) = xy(a), xy(b)
        out.append(f'<line class="edge" x1="{xa:.1f}" y1="{ya:.1f}" x2="{xb:.1f}" y2="{yb:.1f}" '
                   f'stroke="{GREY}" stroke-opacity="0.8"/>')
    fs = 11 if cell >= 20 else 10
    for x in range(n):
        cx, cy = xy(x)
        out.append(f'<g class="item"><title>{escape(names[x])}</title><circle cx="{cx:.1f}" '
                   f'cy="{cy:.1f}" r="4" fill="{BLUE}"/><text x="{cx + 6:.1f}" y="{cy - 3:.1f}" '
                   f'font-size="{fs}">{escape(labels[x])}</text></g>')
    return document(width, height, out)


def pictures(path: str, succ: list[set[int]], names: list[str], measures=None,
             weights: dict[int, int] | None = None) -> dict[str, str]:
    """SVG texts to write, keyed by file name: the Hasse diagram at ``path`` (a summary by
    level above :data:`SUMMARY_AT` items) and, when the order has dimension ≤ 2, the dominance
    drawing beside it (``NAME-dominance.svg``).

    Without ``measures`` the figures needed are computed here (dimension with a short time
    limit).
    """
    import os

    from satorder.measure.figures import height, width

    n = len(succ)
    if n > SUMMARY_AT:
        from satorder.render.summary_svg import summary_svg

        return {path: summary_svg(succ, names, weights)}
    if measures is None:
        from satorder.measure.dimension import dimension

        h, w = height(succ), width(succ)
        dim = dimension(succ, time_limit=10.0)
    else:
        h, w, dim = measures.height, measures.width, measures.dimension
    title = (f"Hasse diagram: {n} items, height {h.value}, width {w.value}, "
             + (f"dimension {dim.value}" if dim.value is not None
                else f"dimension {dim.lower}–{dim.upper}"))
    files = {path: hasse_svg(succ, names, h.witness, w.witness, title)}
    if dim.value is not None and dim.value <= 2 and n > 0:
        stem, ext = os.path.splitext(path)
        files[f"{stem}-dominance{ext or '.svg'}"] = dominance_svg(
            succ, names, dim.realizer, f"Dominance drawing: {n} items, dimension {dim.value}")
    return files
