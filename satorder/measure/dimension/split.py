"""Series and parallel splitting of an order (disjoint and linear sums), and the padding and
joining of the parts' realizers (Dushnik & Miller 1941; Hiraguchi 1951 for the n/2 bound).
"""

from __future__ import annotations

from satorder.measure.dimension.result import Part


def _components(items: list[int], succ, pred, mark: list[int], tag: int) -> list[list[int]]:
    """Connected components of the comparability graph induced on ``items``
    (``mark[x] == tag`` exactly for members)."""
    seen = set()
    comps = []
    for x in items:
        if x in seen:
            continue
        seen.add(x)
        comp = [x]
        stack = [x]
        while stack:
            v = stack.pop()
            for nb in (succ[v], pred[v]):
                for u in nb:
                    if mark[u] == tag and u not in seen:
                        seen.add(u)
                        comp.append(u)
                        stack.append(u)
        comps.append(comp)
    return comps


def _co_components(items: list[int], succ, pred, mark: list[int], tag: int) -> list[list[int]]:
    """Connected components of the complement of the induced comparability graph, without
    building it: each step keeps only the unvisited items adjacent to the current one."""
    unvisited = set(items)
    comps = []
    while unvisited:
        x = unvisited.pop()
        comp = [x]
        stack = [x]
        while stack:
            v = stack.pop()
            keep = {u for u in succ[v] if u in unvisited}
            keep.update(u for u in pred[v] if u in unvisited)
            found = unvisited - keep
            unvisited = keep
            comp.extend(found)
            stack.extend(found)
        comps.append(comp)
    return comps


def _hiraguchi(n: int) -> int:
    return n if n <= 1 else max(2, n // 2)


def _local(succ, items):
    """Sub-order on ``items`` with local ids 0..k-1 (successor sets restricted)."""
    index = {x: i for i, x in enumerate(items)}
    return [{index[y] for y in succ[x] if y in index} for x in items]


def _is_module(succ, pred, group, member) -> bool:
    """Every item of the part outside ``group`` is above all of it, below all, or unrelated
    to all (so ``group`` can be realized on its own and substituted)."""
    inside = set(group)
    first = group[0]
    up = {y for y in succ[first] if y in member and y not in inside}
    down = {y for y in pred[first] if y in member and y not in inside}
    for x in group[1:]:
        if {y for y in succ[x] if y in member and y not in inside} != up:
            return False
        if {y for y in pred[x] if y in member and y not in inside} != down:
            return False
    return True


def _pad(realizer, d):
    return realizer + [realizer[-1]] * (d - len(realizer))


def _join(node):
    parts: list[Part] = [c["part"] for c in node["children"]]
    parallel = node["kind"] == "parallel"
    least = 2 if parallel else 1
    lower = max([least] + [p.lower for p in parts])
    upper = max([least] + [p.upper for p in parts])
    wit = max((p for p in parts if p.witness is not None), key=lambda p: p.witness_lower,
              default=None)
    realizer = None
    if all(p.realizer is not None for p in parts):
        d = max([least] + [len(p.realizer) for p in parts])
        rs = [_pad(p.realizer, d) for p in parts]
        realizer = []
        for i in range(d):
            seq = rs[::-1] if (parallel and i == 1) else rs
            realizer.append([x for r in seq for x in r[i]])
        upper = d
    node["part"] = Part(lower, upper, realizer,
                         None if wit is None else wit.witness,
                         None if wit is None else wit.witness_lower,
                         None if wit is None else wit.witness_pairs)
    node.pop("children")
