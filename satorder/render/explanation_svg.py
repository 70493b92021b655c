"""A picture of an explanation as SVG text: the items involved, the core highlighted.

Items of the core (and of the obstruction) sit on a circle, in the order of a walk along the
core's comparable pairs, so a cycle-shaped obstruction appears as a polygon.  Drawn (colours of
Okabe & Ito 2002, each kind with its own line width or dash pattern as well):

* every other comparable pair among these items (thin grey: the induced subgraph);
* core pairs that must be ordered (thick solid blue), that must stay unordered (dashed
  vermillion), fixed arcs (long-dashed green arrows), forbidden arcs (dotted purple arrows,
  bent and crossed out at the middle);
* obstruction items filled orange.

The legend lists only the kinds that are drawn.  Below the drawing the core's requirements are
listed as numbered rows (counted from 1, as ``explain`` prints and the derivation cites them),
worded by :func:`satorder.model.wording.requirement_text`; each line of the drawing carries the
same words as its tooltip (an SVG ``<title>``).

>>> from satorder import Problem
>>> from satorder.explanation.explain import explain
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("c", "d"), ("d", "e"), ("e", "a")])
>>> svg = explanation_svg(explain(p))
>>> svg.startswith("<svg") and ">c<" in svg
True
"""

from __future__ import annotations

import math
from html import escape

from satorder.model.requirement import INFEASIBLE, Kind, Requirement
from satorder.model.wording import requirement_text
from satorder.render.picture import (
    BLUE,
    GREEN,
    ORANGE,
    PURPLE,
    VERMILLION,
    Header,
    Line,
    Mark,
    document,
)

MAX_ITEMS = 80
LISTED_ROWS = 12  # core rows listed under the drawing before "… and k more"
ROW_H = 17
COLOURS = {
    "graph": "#A0A0A0",
    "comparable": BLUE,
    "incomparable": VERMILLION,
    "fixed": GREEN,
    "forbidden": PURPLE,
    "obstruction": ORANGE,
}
STYLE = {  # (width, dash) per kind: readable without colour
    "graph": (1.5, ""),
    "comparable": (4.0, ""),
    "incomparable": (2.5, "7,5"),
    "fixed": (3.0, "14,5"),
    "forbidden": (2.5, "2,4"),
}
LEGEND = {  # each kind in the one wording, over two items a and b
    "comparable": "core, " + requirement_text(("comparable", (0, 1)), "ab"),
    "incomparable": "core, " + requirement_text(("incomparable", (0, 1)), "ab"),
    "fixed": "core, " + requirement_text(("fixed", (0, 1)), "ab") + " (arrow a → b)",
    "forbidden": "core, " + requirement_text(("forbidden", (0, 1)), "ab")
                 + " (arrow a → b, crossed out)",
    "graph": "other comparable pair",
}
CAPTION = ("These requirements cannot all hold at once, and dropping any one of them makes the "
           "rest possible; each line is one requirement between the two items it joins, "
           "numbered and worded below the drawing.")


def _walk_order(items: list[int], core: list[Requirement]) -> list[int]:
    """Items in the order of depth-first walks along core comparable pairs (and fixed arcs)."""
    nb: dict[int, list[int]] = {v: [] for v in items}
    for kind, (a, b) in core:
        if kind in (Kind.COMPARABLE, Kind.FIXED) and a in nb and b in nb:
            nb[a].append(b)
            nb[b].append(a)
    seen: set[int] = set()
    out: list[int] = []
    for start in sorted(items, key=lambda v: (not nb[v], v)):
        stack = [start]
        while stack:
            v = stack.pop()
            if v in seen:
                continue
            seen.add(v)
            out.append(v)
            stack.extend(sorted((u for u in nb[v] if u not in seen), reverse=True))
    return out


def explanation_svg(expl, title: str | None = None) -> str:
    """SVG text picturing ``expl`` (an :class:`~satorder.explanation.explain.Explanation`)."""
    p = expl.problem
    names = p.items
    core = expl.core or []
    ob = set(expl.obstruction or ())
    items = expl.involved_items()
    if len(items) > MAX_ITEMS:
        raise ValueError(f"{len(items)} items are too many to draw legibly (limit {MAX_ITEMS})")
    order = _walk_order(items, core)
    k = max(len(order), 1)
    radius = max(120.0, 34.0 * k / math.pi)
    width = max(760.0, 2 * (150.0 + radius))
    core_pairs = {frozenset(r.pair) for r in core}
    chosen = set(items)
    context = [(a, b) for a in items for b in p.adj[a]
               if a < b and b in chosen and frozenset((a, b)) not in core_pairs]
    kinds = {r.kind for r in core}
    legend = [Line(LEGEND[key], COLOURS[key], STYLE[key][0], STYLE[key][1],
                   "triangle" if key == "fixed" else "cross" if key == "forbidden" else "")
              for key in ("comparable", "incomparable", "fixed", "forbidden") if key in kinds]
    if context:
        legend.append(Line(LEGEND["graph"], COLOURS["graph"], *STYLE["graph"]))
    if ob:
        legend.append(Mark(f"obstruction: these {len(ob)} items' comparable pairs admit no "
                           "order", "circle", COLOURS["obstruction"], 7))
    heading = title or (
        f"Why no order exists: a minimal core of {len(core)} requirements"
        if expl.status == INFEASIBLE else f"Status: {expl.status}"
    )
    head = Header(width, heading, CAPTION, legend)
    cx, cy = width / 2, head.height + 40 + radius
    rows = [f"{k}. {requirement_text(r, names)}" for k, r in enumerate(core, 1)]
    if len(rows) > LISTED_ROWS:
        rows = rows[:LISTED_ROWS - 1] + [f"… and {len(core) - LISTED_ROWS + 1} more "
                                         "(explain lists them all)"]
    list_top = cy + radius + 50
    height = list_top + (ROW_H * len(rows) + 16 if rows else 0)
    pos = {}
    for i, v in enumerate(order):
        ang = -math.pi / 2 + 2 * math.pi * i / k
        pos[v] = (cx + radius * math.cos(ang), cy + radius * math.sin(ang))

    out = list(head.parts) + ["<defs>"]
    for key in ("fixed", "forbidden"):
        out.append(
            f'<marker id="arrow-{key}" viewBox="0 0 10 10" refX="10" refY="5" '
            f'markerUnits="userSpaceOnUse" markerWidth="13" markerHeight="13" '
            f'orient="auto-start-reverse">'
            f'<path d="M0,0 L10,5 L0,10 z" fill="{COLOURS[key]}"/></marker>'
        )
    out.append("</defs>")

    def tip(r) -> str:
        return f"<title>{escape(requirement_text(r, names))}</title>"

    def line(a, b, kind, marker="", shorten=0.0, title="", bend=0.0):
        """A line from a to b, or with ``bend`` a quadratic curve bowing that many pixels to
        the left of the direction a → b (so two requirements on one pair stay apart)."""
        (x1, y1), (x2, y2) = pos[a], pos[b]
        dx, dy = x2 - x1, y2 - y1
        d = math.hypot(dx, dy) or 1.0
        if shorten:
            x1, y1 = x1 + dx * shorten / d, y1 + dy * shorten / d
            x2, y2 = x2 - dx * shorten / d, y2 - dy * shorten / d
        w, dash = STYLE[kind]
        extra = f' stroke-dasharray="{dash}"' if dash else ""
        extra += f' marker-end="url(#{marker})"' if marker else ""
        if not bend:
            end = f">{title}</line>" if title else "/>"
            out.append(f'<line class="{kind}" x1="{x1:.1f}" y1="{y1:.1f}" x2="{x2:.1f}" '
                       f'y2="{y2:.1f}" stroke="{COLOURS[kind]}" stroke-width="{w}"{extra}{end}')
            return (x1 + x2) / 2, (y1 + y2) / 2
        qx, qy = (x1 + x2) / 2 - dy * bend / d, (y1 + y2) / 2 + dx * bend / d
        out.append(f'<path class="{kind}" d="M{x1:.1f},{y1:.1f} Q{qx:.1f},{qy:.1f} '
                   f'{x2:.1f},{y2:.1f}" fill="none" stroke="{COLOURS[kind]}" '
                   f'stroke-width="{w}"{extra}>{title}</path>')
        return (x1 + 2 * qx + x2) / 4, (y1 + 2 * qy + y2) / 4

    for a, b in context:
        line(a, b, "graph")
    sharing: dict[frozenset, list[Requirement]] = {}
    for r in core:
        sharing.setdefault(frozenset(r.pair), []).append(r)
    for r in core:
        kind, (a, b) = r.kind.value, r.pair
        (x1, y1), (x2, y2) = pos[a], pos[b]
        same = sharing[frozenset(r.pair)]
        if len(same) > 1:  # requirements on one pair bow apart, each to its own side
            bend = (same.index(r) - (len(same) - 1) / 2) * 60.0
            bend = min(abs(bend), 0.35 * math.hypot(x2 - x1, y2 - y1)) * (1 if bend > 0 else -1)
            bend = bend if a < b else -bend  # measured from the lower id, whatever the arc
        elif kind == Kind.FORBIDDEN:  # bent, so it stays visible beside other lines
            bend = min(45.0, 0.3 * math.hypot(x2 - x1, y2 - y1))
        else:
            bend = 0.0
        if kind in (Kind.COMPARABLE, Kind.INCOMPARABLE):
            line(a, b, kind, title=tip(r), bend=bend)
        elif kind == Kind.FIXED:
            line(a, b, kind, marker="arrow-fixed", shorten=17, title=tip(r), bend=bend)
        else:
            mx, my = line(a, b, kind, marker="arrow-forbidden", shorten=16, title=tip(r),
                          bend=bend)
            out.append(f'<text x="{mx:.1f}" y="{my + 8:.1f}" text-anchor="middle" '
                       f'font-size="24" font-weight="bold" fill="{COLOURS[kind]}">✕</text>')
    for v in order:
        x, y = pos[v]
        fill = COLOURS["obstruction"] if v in ob else "white"
        out.append(f'<circle cx="{x:.1f}" cy="{y:.1f}" r="14" fill="{fill}" stroke="#333333" '
                   'stroke-width="1.5"/>')
        dx, dy = x - cx, y - cy
        d = math.hypot(dx, dy) or 1.0
        lx, ly = x + 24 * dx / d, y + 24 * dy / d + 4
        anchor = "start" if dx > 5 else ("end" if dx < -5 else "middle")
        out.append(f'<text x="{lx:.1f}" y="{ly:.1f}" text-anchor="{anchor}">'
                   f"{escape(names[v])}</text>")
    for k, text in enumerate(rows):
        out.append(f'<text class="core-row" x="16" y="{list_top + ROW_H * k:.0f}">'
                   f"{escape(text)}</text>")
    return document(width, height, out, font_size=13)
