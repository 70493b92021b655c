"""The cactus plot of a benchmark as SVG text, drawn without a plotting library.

For each back end the solve times of its solved runs are sorted; the k-th point is at
(k, k-th smallest time), so a point (k, t) says that k instances were each solved within t
seconds and a line further right and lower is better (the usual plot of SAT solver
competitions: common practice).  Time is on a logarithmic axis.  Each back end has its own
colour (Okabe & Ito 2002), dash pattern and marker.

>>> svg = cactus_svg({"forcing": [0.01, 0.02, 0.5], "glucose4": [0.03]})
>>> svg.count('class="series"'), "forcing (3 solved)" in svg
(2, True)
"""

from __future__ import annotations

import math
from html import escape

from satorder.render.picture import SERIES, Header, Line, document, marker

FLOOR = 1e-4  # times below this are drawn at this value (a log axis has no zero)
PLOT_W, PLOT_H = 560, 300
CAPTION = ("Each line is one back end: a point at (k, t) means that k instances were each "
           "solved within t seconds, so a line further right and lower is better.")


def _ticks(lo: float, hi: float) -> list[float]:
    return [10.0 ** e for e in range(math.floor(math.log10(lo)), math.ceil(math.log10(hi)) + 1)]


def _tick_label(t: float) -> str:
    return f"{t:g}" if t >= 1e-3 else f"1e{round(math.log10(t))}"


def cactus_svg(series: dict[str, list[float]], title: str = "Cactus plot") -> str:
    """SVG text of the cactus plot of ``series`` (back end → times of its solved runs)."""
    names = sorted(series)
    times = {b: sorted(max(t, FLOOR) for t in series[b]) for b in names}
    every = [t for b in names for t in times[b]]
    lo, hi = (min(every), max(every)) if every else (FLOOR, 1.0)
    ticks = _ticks(lo, hi if hi > lo else lo * 10)
    ylo, yhi = math.log10(ticks[0]), math.log10(ticks[-1])
    most = max((len(times[b]) for b in names), default=0)
    legend = []
    for i, b in enumerate(names):
        colour, dash, shape = SERIES[i % len(SERIES)]
        legend.append(Line(f"{b} ({len(times[b])} solved)", colour, 2.0, dash, shape))
    width = 110 + PLOT_W + 40
    head = Header(width, title, CAPTION, legend)
    x0, y0 = 90.0, head.height + 20
    height = y0 + PLOT_H + 60

    def px(k):
        return x0 + PLOT_W * (k / max(most, 1))

    def py(t):
        return y0 + PLOT_H * (1 - (math.log10(t) - ylo) / max(yhi - ylo, 1e-9))

    out = list(head.parts)
    out.append(f'<rect x="{x0}" y="{y0:.1f}" width="{PLOT_W}" height="{PLOT_H}" fill="none" '
               'stroke="#888888"/>')
    for t in ticks:
        y = py(t)
        out.append(f'<line x1="{x0}" y1="{y:.1f}" x2="{x0 + PLOT_W}" y2="{y:.1f}" '
                   'stroke="#E0E0E0"/>')
        out.append(f'<text x="{x0 - 8}" y="{y + 4:.1f}" font-size="11" text-anchor="end">'
                   f"{_tick_label(t)}</text>")
    step = max(1, math.ceil(most / 10))
    for k in range(0, most + 1, step):
        out.append(f'<text x="{px(k):.1f}" y="{y0 + PLOT_H + 16:.1f}" font-size="11" '
                   f'text-anchor="middle">{k}</text>')
    out.append(f'<text x="{x0 + PLOT_W / 2:.1f}" y="{y0 + PLOT_H + 38:.1f}" font-size="12" '
               'text-anchor="middle">instances solved</text>')
    out.append(f'<text x="24" y="{y0 + PLOT_H / 2:.1f}" font-size="12" text-anchor="middle" '
               f'transform="rotate(-90 24 {y0 + PLOT_H / 2:.1f})">time (s), log scale</text>')
    for i, b in enumerate(names):
        colour, dash, shape = SERIES[i % len(SERIES)]
        ts = times[b]
        if not ts:
            continue
        pts = []
        for k, t in enumerate(ts, 1):  # a step line: flat until the next instance is solved
            if pts:
                pts.append((px(k), pts[-1][1]))
            pts.append((px(k), py(t)))
        extra = f' stroke-dasharray="{dash}"' if dash else ""
        text = " ".join(f"{x:.1f},{y:.1f}" for x, y in pts)
        out.append(f'<g class="series"><title>{escape(b)}</title><polyline points="{text}" '
                   f'fill="none" stroke="{colour}" stroke-width="2"{extra}/>')
        mark_every = max(1, len(ts) // 25)
        for k, t in enumerate(ts, 1):
            if k % mark_every == 0 or k == len(ts):
                out.append(marker(shape, px(k), py(t), colour, 3.5))
        out.append("</g>")
    return document(width, height, out)
