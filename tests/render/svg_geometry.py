"""Geometry of a drawn Hasse diagram read back from its SVG text, independent of the layout
code: item boxes (``<rect>`` inside a ``<g>`` titled with the item's name), edges (every
``<line>`` or ``<polyline>`` of class ``edge``), segments crossing boxes and edge crossings.

Intersection tests are the usual orientation (cross product) tests for segments and the
Liang–Barsky clipping test for a segment against a rectangle (Liang & Barsky, "A new concept and
method for line clipping", ACM Trans. Graphics 3(1), 1984).
"""

from __future__ import annotations

import xml.etree.ElementTree as ET

NS = "{http://www.w3.org/2000/svg}"
EPS = 1e-6


def parse(svg: str):
    """``(boxes, edges)``: boxes as ``{name: (x0, y0, x1, y1)}``, edges as lists of points."""
    root = ET.fromstring(svg)
    boxes = {}
    for g in root.iter(f"{NS}g"):
        title, rect = g.find(f"{NS}title"), g.find(f"{NS}rect")
        if title is None or rect is None:
            continue
        x, y = float(rect.get("x")), float(rect.get("y"))
        boxes[title.text] = (x, y, x + float(rect.get("width")), y + float(rect.get("height")))
    edges = []
    for el in root.iter():
        if "edge" not in (el.get("class") or "").split():
            continue
        if el.tag == f"{NS}line":
            edges.append([(float(el.get("x1")), float(el.get("y1"))),
                          (float(el.get("x2")), float(el.get("y2")))])
        elif el.tag == f"{NS}polyline":
            pts = el.get("points").replace(",", " ").split()
            edges.append([(float(pts[i]), float(pts[i + 1])) for i in range(0, len(pts), 2)])
    return boxes, edges


def inside(p, box, tol=0.5) -> bool:
    x0, y0, x1, y1 = box
    return x0 - tol <= p[0] <= x1 + tol and y0 - tol <= p[1] <= y1 + tol


def segment_hits_box(p, q, box, shrink=0.5) -> bool:
    """True when segment pq passes through the interior of ``box`` (shrunk by ``shrink`` on
    every side, so touching the border does not count)."""
    x0, y0, x1, y1 = box[0] + shrink, box[1] + shrink, box[2] - shrink, box[3] - shrink
    dx, dy = q[0] - p[0], q[1] - p[1]
    t0, t1 = 0.0, 1.0
    for pk, qk in ((-dx, p[0] - x0), (dx, x1 - p[0]), (-dy, p[1] - y0), (dy, y1 - p[1])):
        if abs(pk) < EPS:
            if qk < 0:
                return False
            continue
        t = qk / pk
        if pk < 0:
            t0 = max(t0, t)
        else:
            t1 = min(t1, t)
        if t0 > t1:
            return False
    return True


def end_boxes(edge, boxes):
    """Names of the boxes holding the first and the last point of ``edge``."""
    first = [k for k, b in boxes.items() if inside(edge[0], b)]
    last = [k for k, b in boxes.items() if inside(edge[-1], b)]
    return first, last


def boxes_crossed(edge, boxes, ends) -> list[str]:
    """Boxes other than ``ends`` that a segment of ``edge`` passes through."""
    hit = []
    for name, box in boxes.items():
        if name in ends:
            continue
        if any(segment_hits_box(p, q, box) for p, q in zip(edge, edge[1:])):
            hit.append(name)
    return hit


def _orient(a, b, c) -> float:
    return (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])


def proper_cross(p1, p2, q1, q2) -> bool:
    """Segments p1p2 and q1q2 cross at a point inside both (sharing an end does not count)."""
    d1, d2 = _orient(q1, q2, p1), _orient(q1, q2, p2)
    d3, d4 = _orient(p1, p2, q1), _orient(p1, p2, q2)
    return ((d1 > EPS and d2 < -EPS) or (d1 < -EPS and d2 > EPS)) and \
        ((d3 > EPS and d4 < -EPS) or (d3 < -EPS and d4 > EPS))


def count_crossings(edges) -> int:
    """Number of points where two edges cross (pairs of segments of different edges crossing
    properly), found by sorting the segments by their lowest y."""
    segs = []
    for k, e in enumerate(edges):
        for p, q in zip(e, e[1:]):
            segs.append((min(p[1], q[1]), max(p[1], q[1]), min(p[0], q[0]), max(p[0], q[0]),
                         k, p, q))
    segs.sort()
    total = 0
    for i, (_, yhi, xlo, xhi, k, p, q) in enumerate(segs):
        for j in range(i + 1, len(segs)):
            ylo2, _, xlo2, xhi2, k2, p2, q2 = segs[j]
            if ylo2 > yhi:
                break
            if k2 != k and xlo2 <= xhi and xlo <= xhi2 and proper_cross(p, q, p2, q2):
                total += 1
    return total
