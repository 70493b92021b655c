"""One picture of each kind, and a report, drawn from the demo's invented harbour-festival
scenario (``satorder demo --pictures DIR``; ``make demo`` writes them to ``demo-output/``).

Pictures: the Hasse diagram and the dominance drawing of the plain round's order, a summary
by level of the festival's market week (240 set-up jobs, too many for a Hasse diagram), the
explanation of the round with one rule too many, the modular decomposition behind the count,
and a cactus plot timing the back ends on the scenario's problems.
"""

from __future__ import annotations

import os
import time

from satorder.io.files import atomic_write

SIDES = ["north", "south", "east", "west", "harbour", "beach"]
PLACES = ["quay", "net", "rope", "salt", "kelp", "tide", "gull", "reef", "mast", "buoy"]
JOBS = ["deliver", "build", "stock", "open"]


def market_week(fixed: bool = True):
    """The festival's market week (invented): 60 stalls in six rows, each delivered, built,
    stocked and opened in turn; a row shares one crane, which moves to the next stall once the
    last one is built.  Every pair that the crane or a stall's own jobs sequence must be
    ordered; with ``fixed`` the direction of each step is a fixed arc too."""
    from satorder.model.order import transitive_closure
    from satorder.model.problem import Problem

    names: list[str] = []
    arcs: list[tuple[int, int]] = []
    for side in SIDES:
        prev = None
        for place in PLACES:
            first = len(names)
            names += [f"{side}-{place}-{job}" for job in JOBS]
            arcs += [(first + k, first + k + 1) for k in range(len(JOBS) - 1)]
            if prev is not None:
                arcs.append((prev + 1, first))  # the crane moves on once the stall is built
            prev = first
    succ = transitive_closure(len(names), arcs)
    comparable = [(names[a], names[b]) for a in range(len(names)) for b in sorted(succ[a])]
    return Problem.from_lists(comparable=comparable, items=names,
                              fixed=[(names[a], names[b]) for a, b in arcs] if fixed else (),
                              source="market-week.json")


def _timings(problems) -> dict[str, list[float]]:
    """Solve time per back end over ``problems`` (forcing only on plain ones)."""
    from satorder.pipeline.solve import solve

    series: dict[str, list[float]] = {"forcing": [], "cadical195": [], "glucose4": []}
    for p in problems:
        for backend in series:
            if backend == "forcing" and not p.is_plain:
                continue
            t0 = time.perf_counter()
            if backend == "forcing":
                ans = solve(p, engine="forcing")
            else:
                ans = solve(p, engine="sat", solver=backend)
            if ans.verified:
                series[backend].append(time.perf_counter() - t0)
    return series


def write_gallery(folder: str, plain, rules, conflict) -> list[str]:
    """Write the pictures and a report into ``folder`` (created if missing); returns the file
    names written.  ``plain``, ``rules`` and ``conflict`` are the demo's problems of parts 1,
    2 and 3."""
    from satorder.explanation.explain import explain
    from satorder.graph.modular import modular_decomposition
    from satorder.measure.summary import measure
    from satorder.pipeline.solve import solve
    from satorder.render.cactus_svg import cactus_svg
    from satorder.render.decomposition_svg import decomposition_svg
    from satorder.render.explanation_svg import explanation_svg
    from satorder.render.order_svg import dominance_svg, hasse_svg
    from satorder.render.report_pages import measure_report
    from satorder.render.summary_svg import summary_svg

    os.makedirs(folder, exist_ok=True)
    files: dict[str, str] = {}
    ans = solve(plain)
    m = measure(ans.succ, time_limit=10.0)
    files["hasse.svg"] = hasse_svg(
        ans.succ, plain.items, m.height.witness, m.width.witness,
        f"Festival set-up: {plain.n} jobs, height {m.height.value}, width {m.width.value}")
    if m.dimension.value is not None and m.dimension.value <= 2:
        files["dominance.svg"] = dominance_svg(
            ans.succ, plain.items, m.dimension.realizer,
            f"Festival set-up as a dominance drawing (dimension {m.dimension.value})")
    week = market_week()
    week_ans = solve(week)
    files["summary.svg"] = summary_svg(
        week_ans.succ, week.items,
        title=f"Market week: {week.n} set-up jobs by level, with the longest chains")
    files["explanation.svg"] = explanation_svg(explain(conflict))
    files["decomposition.svg"] = decomposition_svg(
        modular_decomposition(plain.adj), plain.items,
        "Festival set-up: the modular decomposition behind the count")
    files["cactus.svg"] = cactus_svg(
        _timings([plain, rules, market_week(fixed=False), week]),
        "Back ends on the festival's problems (this machine, one run)")
    files["report.html"] = measure_report(
        plain, ans, m, "satorder measure demo.json --report report.html").html()
    for name, text in files.items():
        atomic_write(os.path.join(folder, name), text)
    return [os.path.join(folder, name) for name in files]
