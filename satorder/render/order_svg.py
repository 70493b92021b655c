"""Pictures of an order as SVG text: a layered Hasse diagram and, for dimension 2, a dominance
drawing.

* **Layered Hasse diagram** (the covering pairs, lower item below).  Items sit on the level of
  the longest chain ending at them (the Mirsky levels of :func:`satorder.measure.figures.height`);
  the
  order inside each level is improved by barycentre sweeps (Sugiyama, Tagawa & Toda 1981), and
  a wide level wraps onto several rows of its band.  A longest chain is drawn in orange and a
  largest antichain outlined in blue.
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

#: more items than this make an unreadable picture; the CLI refuses to draw them
DRAW_LIMIT = 2000

FONT = "DejaVu Sans, Verdana, Arial, sans-serif"


def svg_start(width: float, height: float, font_size: int | None = None) -> list[str]:
    """Opening lines shared by every picture: the ``<svg>`` element and a white background."""
    size = f' font-size="{font_size}"' if font_size else ""
    return [f'<svg xmlns="http://www.w3.org/2000/svg" width="{width:.0f}" height="{height:.0f}" '
            f'viewBox="0 0 {width:.0f} {height:.0f}" font-family="{FONT}"{size}>',
            '<rect width="100%" height="100%" fill="white"/>']
CHAR_W = 7.0  # approximate advance of one character at 12 px
MAX_LABEL = 18
ROW_ITEMS = 28  # items per row before a level wraps
MAX_WIDTH = 2000  # picture width (px) that a level wraps to stay within


def _label(name: str) -> str:
    return name if len(name) <= MAX_LABEL else name[: MAX_LABEL - 1] + "…"


def _levels(succ):
    from satorder.measure.figures import height

    return height(succ).partition


def _layer_order(levels, cover):
    """Barycentre sweeps: each item moves towards the mean slot of its neighbours in the level
    below (upward sweep) or above (downward sweep)."""
    up: dict[int, list[int]] = {}
    down: dict[int, list[int]] = {}
    for a, b in cover:
        up.setdefault(a, []).append(b)
        down.setdefault(b, []).append(a)
    rows = [sorted(lv) for lv in levels]
    slot = {}

    def place():
        for r in rows:
            width = len(r)
            for i, x in enumerate(r):
                slot[x] = (i + 0.5) / width

    place()
    for sweep in range(8):
        order = range(1, len(rows)) if sweep % 2 == 0 else range(len(rows) - 2, -1, -1)
        nbr = down if sweep % 2 == 0 else up
        for k in order:
            def key(x, nbr=nbr):
                ns = nbr.get(x)
                return sum(slot[y] for y in ns) / len(ns) if ns else slot[x]

            rows[k].sort(key=key)
            width = len(rows[k])
            for i, x in enumerate(rows[k]):
                slot[x] = (i + 0.5) / width
    return rows


def hasse_svg(succ: list[set[int]], names: list[str], chain=None, antichain=None,
              title: str | None = None) -> str:
    """SVG text of the layered Hasse diagram (see module doc)."""
    n = len(succ)
    cover = order_ops.covering_pairs(succ)
    rows = _layer_order(_levels(succ), cover) if n else []
    labels = [_label(x) for x in names]
    box_w = max([CHAR_W * len(s) + 14 for s in labels] + [30])
    col = box_w + 14
    box_h, sub_gap, level_gap = 22, 34, 64
    per_row = max(1, min(ROW_ITEMS, int((MAX_WIDTH - 120) // col),
                         max((len(r) for r in rows), default=1)))
    width = max(520, per_row * col + 120)
    left = 90
    # vertical layout: level 0 at the bottom
    bands = [(len(r) + per_row - 1) // per_row for r in rows]
    total_h = (sum((b - 1) * sub_gap for b in bands) + level_gap * max(0, len(rows) - 1)
               + 80 + 50 + box_h)
    pos = {}
    y_base = total_h - 50
    level_y = []
    for k, r in enumerate(rows):
        level_y.append(y_base)
        for j, x in enumerate(r):
            sub, i = divmod(j, per_row)
            in_row = min(per_row, len(r) - sub * per_row)
            x0 = left + (width - left - 30 - in_row * col) / 2 + i * col + col / 2
            pos[x] = (x0, y_base - sub * sub_gap)
        y_base -= (bands[k] - 1) * sub_gap + level_gap
    chain_set = set(chain or [])
    chain_arcs = set(zip(chain or [], (chain or [])[1:]))
    anti = set(antichain or [])
    out = svg_start(width, total_h)
    heading = title or f"Hasse diagram: {n} items, {len(cover)} covering pairs"
    out.append(f'<text x="16" y="26" font-size="16" font-weight="bold">{escape(heading)}</text>')
    out.append('<text x="16" y="46" font-size="12" fill="#444">lower items below; '
               '<tspan fill="#d9480f" font-weight="bold">orange</tspan>: a longest chain; '
               '<tspan fill="#1c5fb8" font-weight="bold">blue outline</tspan>: a largest '
               'antichain</text>')
    for k, y in enumerate(level_y):
        top = y - (bands[k] - 1) * sub_gap - box_h / 2 - 8
        if k % 2 == 1:  # shade every other level so wrapped rows read as one level
            out.append(f'<rect x="0" y="{top:.1f}" width="{width:.0f}" '
                       f'height="{y + box_h / 2 + 8 - top:.1f}" fill="#f3f6fa"/>')
        out.append(f'<text x="12" y="{y + 4:.0f}" font-size="11" fill="#888">level {k + 1}</text>')
    for a, b in cover:
        (x1, y1), (x2, y2) = pos[a], pos[b]
        hot = (a, b) in chain_arcs
        out.append(f'<line x1="{x1:.1f}" y1="{y1 - box_h / 2:.1f}" x2="{x2:.1f}" '
                   f'y2="{y2 + box_h / 2:.1f}" stroke="{"#d9480f" if hot else "#7b8794"}" '
                   f'stroke-width="{2.4 if hot else 1}" stroke-opacity="{1 if hot else 0.6}"/>')
    for x in range(n):
        cx, cy = pos[x]
        fill = "#ffe8d6" if x in chain_set else "#f4f6f8"
        stroke, sw = ("#1c5fb8", 2.2) if x in anti else ("#52606d", 1)
        out.append(f'<g><title>{escape(names[x])}</title>'
                   f'<rect x="{cx - box_w / 2:.1f}" y="{cy - box_h / 2:.1f}" width="{box_w:.0f}" '
                   f'height="{box_h}" rx="5" fill="{fill}" stroke="{stroke}" '
                   f'stroke-width="{sw}"/>'
                   f'<text x="{cx:.1f}" y="{cy + 4:.1f}" font-size="12" text-anchor="middle">'
                   f'{escape(labels[x])}</text></g>')
    out.append("</svg>")
    return "\n".join(out) + "\n"


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
    margin_l, margin_b, margin_t = 70, 60, 70
    labels = [_label(x) for x in names]
    extra = max([CHAR_W * 0.85 * len(s) for s in labels] + [0]) + 20
    width = margin_l + n * cell + extra
    height = margin_t + n * cell + margin_b
    width = max(width, 480)

    def xy(x):
        return margin_l + (p1[x] + 0.5) * cell, margin_t + (n - p2[x] - 0.5) * cell

    out = svg_start(width, height)
    heading = title or f"Dominance drawing: {n} items"
    out.append(f'<text x="16" y="26" font-size="16" font-weight="bold">{escape(heading)}</text>')
    out.append('<text x="16" y="46" font-size="12" fill="#444">x &lt; y exactly when y lies up '
               'and to the right of x; lines are covering pairs</text>')
    x0, y0, side = margin_l, margin_t, n * cell
    out.append(f'<rect x="{x0}" y="{y0}" width="{side}" height="{side}" fill="none" '
               'stroke="#cbd2d9"/>')
    out.append(f'<text x="{x0 + side / 2:.0f}" y="{y0 + side + 36:.0f}" font-size="12" '
               'text-anchor="middle" fill="#444">position in the first linear order →</text>')
    out.append(f'<text x="{x0 - 30:.0f}" y="{y0 + side / 2:.0f}" font-size="12" fill="#444" '
               f'text-anchor="middle" transform="rotate(-90 {x0 - 30:.0f} {y0 + side / 2:.0f})">'
               'position in the second linear order →</text>')
    for a, b in order_ops.covering_pairs(succ):
        (xa, ya), (xb, yb) = xy(a), xy(b)
        out.append(f'<line x1="{xa:.1f}" y1="{ya:.1f}" x2="{xb:.1f}" y2="{yb:.1f}" '
                   'stroke="#7b8794" stroke-opacity="0.7"/>')
    fs = 11 if cell >= 20 else 10
    for x in range(n):
        cx, cy = xy(x)
        out.append(f'<g><title>{escape(names[x])}</title><circle cx="{cx:.1f}" cy="{cy:.1f}" '
                   f'r="4" fill="#1c5fb8"/><text x="{cx + 6:.1f}" y="{cy - 3:.1f}" '
                   f'font-size="{fs}">{escape(labels[x])}</text></g>')
    out.append("</svg>")
    return "\n".join(out) + "\n"


def pictures(path: str, succ: list[set[int]], names: list[str], measures=None) -> dict[str, str]:
    """SVG texts to write, keyed by file name: the Hasse diagram at ``path`` and, when the
    order has dimension ≤ 2, the dominance drawing beside it (``NAME-dominance.svg``).

    Without ``measures`` the figures needed are computed here (dimension with a short time
    limit).  Raises ``ValueError`` above :data:`DRAW_LIMIT` items.
    """
    import os

    from satorder.measure.figures import height, width

    n = len(succ)
    if n > DRAW_LIMIT:
        raise ValueError(f"{n} items are too many to draw legibly (limit {DRAW_LIMIT})")
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
