"""What every SVG picture shares: the document element, a title, a one-sentence caption in
plain words, and a legend that lists only what is drawn.

Colours come from the palette of Okabe & Ito ("Color Universal Design", 2002), chosen to stay
distinguishable under the common colour-vision deficiencies; every legend entry also differs
from the others by line width, dash pattern or marker shape, so that nothing depends on hue
alone and a greyscale print still reads.

>>> h = Header(400, "Demo", "Each box is an item.", [Line("covering pair")])
>>> svg = document(400, h.height + 10, h.parts)
>>> svg.startswith("<svg") and "Each box is an item." in svg and "covering pair" in svg
True
"""

from __future__ import annotations

from dataclasses import dataclass
from html import escape

FONT = "DejaVu Sans, Verdana, Arial, sans-serif"
CHAR_W = 7.0  # approximate advance of one character at 12 px

#: Okabe & Ito (2002) colours, by name
BLACK = "#000000"
ORANGE = "#E69F00"
SKY = "#56B4E9"
GREEN = "#009E73"
YELLOW = "#F0E442"
BLUE = "#0072B2"
VERMILLION = "#D55E00"
PURPLE = "#CC79A7"
GREY = "#6E6E6E"  # neutral lines: covering pairs, context edges

#: (colour, dash pattern, marker) per data series, e.g. one per back end in a plot
SERIES = [(BLUE, "", "circle"), (VERMILLION, "7,4", "square"), (GREEN, "2,3", "triangle"),
          (PURPLE, "10,3,2,3", "diamond"), (ORANGE, "4,4", "cross"), (SKY, "1,2", "circle"),
          (BLACK, "12,4", "square")]


def svg_start(width: float, height: float, font_size: int | None = None) -> list[str]:
    """Opening lines: the ``<svg>`` element and a white background."""
    size = f' font-size="{font_size}"' if font_size else ""
    return [f'<svg xmlns="http://www.w3.org/2000/svg" width="{width:.0f}" height="{height:.0f}" '
            f'viewBox="0 0 {width:.0f} {height:.0f}" font-family="{FONT}"{size}>',
            '<rect width="100%" height="100%" fill="white"/>']


def document(width: float, height: float, parts: list[str], font_size: int = 12) -> str:
    """The whole SVG text: opening element, ``parts``, closing element."""
    return "\n".join(svg_start(width, height, font_size) + parts + ["</svg>"]) + "\n"


def wrap(text: str, width: float, char_w: float = CHAR_W) -> list[str]:
    """``text`` broken at spaces into lines of at most ``width`` pixels (estimated)."""
    limit = max(20, int(width / char_w))
    lines: list[str] = []
    line = ""
    for word in text.split():
        if line and len(line) + 1 + len(word) > limit:
            lines.append(line)
            line = word
        else:
            line = f"{line} {word}" if line else word
    if line:
        lines.append(line)
    return lines


def marker(shape: str, x: float, y: float, colour: str, r: float = 4.5) -> str:
    """A filled marker centred at (x, y): circle, square, triangle, diamond or cross."""
    if shape == "square":
        return (f'<rect x="{x - r:.1f}" y="{y - r:.1f}" width="{2 * r:.1f}" height="{2 * r:.1f}" '
                f'fill="{colour}"/>')
    if shape == "triangle":
        pts = f"{x:.1f},{y - r * 1.2:.1f} {x + r * 1.1:.1f},{y + r * 0.8:.1f} " \
              f"{x - r * 1.1:.1f},{y + r * 0.8:.1f}"
        return f'<polygon points="{pts}" fill="{colour}"/>'
    if shape == "diamond":
        pts = f"{x:.1f},{y - r * 1.3:.1f} {x + r * 1.1:.1f},{y:.1f} {x:.1f},{y + r * 1.3:.1f} " \
              f"{x - r * 1.1:.1f},{y:.1f}"
        return f'<polygon points="{pts}" fill="{colour}"/>'
    if shape == "cross":
        return (f'<path d="M{x - r:.1f},{y - r:.1f} L{x + r:.1f},{y + r:.1f} M{x - r:.1f},'
                f'{y + r:.1f} L{x + r:.1f},{y - r:.1f}" stroke="{colour}" stroke-width="2.2"/>')
    return f'<circle cx="{x:.1f}" cy="{y:.1f}" r="{r:.1f}" fill="{colour}"/>'


@dataclass
class Line:
    """Legend entry: a line sample (optionally with a marker in its middle)."""

    label: str
    colour: str = GREY
    width: float = 1.5
    dash: str = ""
    marker: str = ""

    def draw(self, x: float, y: float) -> list[str]:
        dash = f' stroke-dasharray="{self.dash}"' if self.dash else ""
        out = [f'<line x1="{x:.1f}" y1="{y:.1f}" x2="{x + 30:.1f}" y2="{y:.1f}" '
               f'stroke="{self.colour}" stroke-width="{self.width}"{dash}/>']
        if self.marker:
            out.append(marker(self.marker, x + 15, y, self.colour))
        return out


@dataclass
class Box:
    """Legend entry: a small box (an item as drawn)."""

    label: str
    fill: str = "white"
    stroke: str = "#444444"
    width: float = 1.0
    dash: str = ""
    round: bool = True

    def draw(self, x: float, y: float) -> list[str]:
        dash = f' stroke-dasharray="{self.dash}"' if self.dash else ""
        rx = ' rx="4"' if self.round else ""
        return [f'<rect x="{x + 3:.1f}" y="{y - 7:.1f}" width="24" height="14"{rx} '
                f'fill="{self.fill}" stroke="{self.stroke}" stroke-width="{self.width}"{dash}/>']


@dataclass
class Mark:
    """Legend entry: a marker shape (see :func:`marker`)."""

    label: str
    shape: str = "circle"
    colour: str = BLACK
    size: float = 4.5

    def draw(self, x: float, y: float) -> list[str]:
        return [marker(self.shape, x + 15, y, self.colour, self.size)]


@dataclass
class Header:
    """Title, wrapped caption and legend at the top of a picture ``width`` pixels wide; the
    picture's own drawing starts at ``height``."""

    width: float
    title: str
    caption: str
    legend: list

    def __post_init__(self):
        w = self.width - 32
        parts = [f'<text class="title" x="16" y="26" font-size="16" font-weight="bold">'
                 f"{escape(self.title)}</text>"]
        y = 26.0
        for line in wrap(self.caption, w):
            y += 17
            parts.append(f'<text class="caption" x="16" y="{y:.0f}" font-size="12" '
                         f'fill="#333333">{escape(line)}</text>')
        y += 8
        x = 16.0
        row = y + 14
        for entry in self.legend:
            span = 30 + 8 + CHAR_W * len(entry.label) + 22
            if x > 16 and x + span > self.width - 16:
                x, row = 16.0, row + 22
            parts.append('<g class="legend">')
            parts += entry.draw(x, row)
            parts.append(f'<text x="{x + 38:.1f}" y="{row + 4:.1f}" font-size="12">'
                         f"{escape(entry.label)}</text></g>")
            x += span
        self.parts = parts
        self.height = (row + 18) if self.legend else y + 4
