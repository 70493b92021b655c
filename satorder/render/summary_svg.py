"""A summary picture of an order too large for a readable Hasse diagram: each level (Mirsky's
partition into antichains by the longest chain ending at an item, as in the Hasse diagram) is a
band whose bar shows how many items it holds, and the heaviest chains run up through the levels
with their items named.

The chains are found one after another, each the heaviest chain among the items the earlier
ones left (item weight from the problem's ``weights``, else 1, so the first chain is a longest
one); each is a longest path by dynamic programming over a topological order.

>>> succ = [set(range(i + 1, 200)) if i < 100 else set() for i in range(200)]
>>> svg = summary_svg(succ, [f"crate-{i}" for i in range(200)])
>>> "crate-99" in svg and "level 100" in svg
True
"""

from __future__ import annotations

from html import escape

from satorder.render.picture import SERIES, SKY, Box, Header, Line, document, marker

CHAINS = 3
BAR_W = 320
COLUMN = 190  # width of one chain's column of names


def heaviest_chains(succ: list[set[int]], levels: list[list[int]], weights=None,
                    k: int = CHAINS) -> list[list[int]]:
    """Up to ``k`` disjoint chains, each the heaviest among the items left by the earlier ones
    (items listed from the bottom up)."""
    n = len(succ)
    topo = [v for lv in levels for v in lv]
    used = [False] * n
    chains = []
    for _ in range(k):
        best = [0] * n
        nxt = [-1] * n
        for v in reversed(topo):  # heaviest chain starting at v and going up
            if used[v]:
                continue
            top, arg = 0, -1
            for u in succ[v]:
                if not used[u] and best[u] > top:
                    top, arg = best[u], u
            best[v] = (weights.get(v, 1) if weights else 1) + top
            nxt[v] = arg
        start = max((v for v in range(n) if not used[v]), key=lambda v: best[v], default=None)
        if start is None:
            break
        chain = []
        while start != -1:
            chain.append(start)
            used[start] = True
            start = nxt[start]
        chains.append(chain)
    return chains


def summary_svg(succ: list[set[int]], names: list[str], weights: dict[int, int] | None = None,
                title: str | None = None) -> str:
    """SVG text of the summary picture (see module doc)."""
    from satorder.measure.figures import height

    n = len(succ)
    levels = [sorted(lv) for lv in height(succ).partition]
    chains = heaviest_chains(succ, levels, weights)
    level_of = {v: k for k, lv in enumerate(levels) for v in lv}
    widest = max((len(lv) for lv in levels), default=1)
    band = max(4.0, min(22.0, 1600.0 / max(1, len(levels))))
    named = band >= 11
    left, bar_x = 16.0, 96.0
    chain_x0 = bar_x + BAR_W + 90
    width = max(760.0, chain_x0 + COLUMN * len(chains) + 20)
    word = "heaviest" if weights else "longest"
    heading = title or f"Summary of an order of {n} items in {len(levels)} levels"
    caption = (f"{n} items are too many for a readable Hasse diagram, so each level is a band "
               f"whose bar shows how many items it holds, and the {len(chains)} {word} chains "
               f"(each avoiding the items of the ones before) climb through the levels"
               + (" with their items named." if named else "."))
    legend = [Box("level: bar length = number of items", fill=SKY, stroke=SKY, round=False)]
    for i, ch in enumerate(chains):
        colour, dash, shape = SERIES[i % len(SERIES)]
        w = sum(weights.get(v, 1) for v in ch) if weights else None
        label = f"chain {i + 1}: {len(ch)} items" + (f", weight {w}" if w is not None else "")
        legend.append(Line(label, colour, 2.2, dash, shape))
    head = Header(width, heading, caption, legend)
    top = head.height + 30
    height_px = top + band * len(levels) + 20

    def y_of(k):  # level 1 at the bottom
        return top + band * (len(levels) - 1 - k) + band / 2

    out = list(head.parts)
    for i in range(len(chains)):
        out.append(f'<text x="{chain_x0 + i * COLUMN:.0f}" y="{top - 10:.0f}" font-size="12" '
                   f'font-weight="bold">chain {i + 1}</text>')
    fs = min(12.0, max(7.0, band - 3))
    step = 1 if band >= 10 else max(1, int(10 // band))
    for k, lv in enumerate(levels):
        y = y_of(k)
        if k % 2 == 1:
            out.append(f'<rect class="band" x="0" y="{y - band / 2:.1f}" width="{width:.0f}" '
                       f'height="{band:.1f}" fill="#F2F5F9"/>')
        w = max(1.0, BAR_W * len(lv) / widest)
        out.append(f'<rect class="bar" x="{bar_x}" y="{y - band * 0.35:.1f}" width="{w:.1f}" '
                   f'height="{band * 0.7:.1f}" fill="{SKY}"><title>level {k + 1}: {len(lv)} '
                   f'items</title></rect>')
        if k % step == 0 or k == len(levels) - 1:
            out.append(f'<text x="{left}" y="{y + fs / 3:.1f}" font-size="{fs:.0f}" '
                       f'fill="#555555">level {k + 1}</text>')
            out.append(f'<text x="{bar_x + w + 6:.1f}" y="{y + fs / 3:.1f}" '
                       f'font-size="{fs:.0f}">{len(lv)}</text>')
    for i, ch in enumerate(chains):
        colour, dash, shape = SERIES[i % len(SERIES)]
        x = chain_x0 + i * COLUMN
        pts = " ".join(f"{x:.1f},{y_of(level_of[v]):.1f}" for v in ch)
        extra = f' stroke-dasharray="{dash}"' if dash else ""
        out.append(f'<polyline class="chain" points="{pts}" fill="none" stroke="{colour}" '
                   f'stroke-width="2.2"{extra}/>')
        for j, v in enumerate(ch):
            y = y_of(level_of[v])
            out.append(marker(shape, x, y, colour, min(4.5, band / 2.5)))
            if named or j in (0, len(ch) - 1):
                label = names[v] if len(names[v]) <= 22 else names[v][:21] + "…"
                out.append(f'<text x="{x + 8:.1f}" y="{y + fs / 3:.1f}" font-size="{fs:.0f}">'
                           f"<title>{escape(names[v])}</title>{escape(label)}</text>")
    return document(width, height_px, out)
