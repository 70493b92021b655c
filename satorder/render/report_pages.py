"""The report page of each command, assembled from the sections of
:class:`satorder.render.report.Report`: a header, the command's own pictures and tables, the
requirements table and the caution paragraph.

Each function takes the objects the command computed (no engine runs here except the figures
a picture needs) and returns the :class:`~satorder.render.report.Report`; the command writes it.
"""

from __future__ import annotations

from satorder.model.requirement import FEASIBLE, INFEASIBLE, UNKNOWN
from satorder.model.wording import requirement_text
from satorder.render.report import Report

SHOW_ITEMS = 40  # item names per table cell before "…"


def _names(names, items, limit=SHOW_ITEMS) -> str:
    shown = ", ".join(names[i] for i in items[:limit])
    return shown + (f", … ({len(items)} in all)" if len(items) > limit else "")


def _size(problem) -> str:
    return f"{problem.n} items, {problem.num_comparable} comparable pairs"


def _verified(ok: bool) -> str:
    return ("yes: re-checked by code that did not produce it" if ok
            else "no: the answer could not be checked")


def order_section(report: Report, problem, succ, measures=None) -> Report:
    """Pictures of an order (Hasse diagram or summary, dominance drawing) and its levels and
    covering pairs as tables."""
    from satorder.measure.figures import height
    from satorder.model.order import covering_pairs
    from satorder.render.order_svg import SUMMARY_AT, pictures

    names = problem.items
    n = len(succ)
    if n > SUMMARY_AT:
        report.text(f"{n} items are too many for a readable Hasse diagram; the picture is a "
                    "summary by level with the heaviest chains.", note=True)
    if n:
        for svg in pictures("order.svg", succ, names, measures, problem.weights).values():
            report.picture(svg)
    levels = measures.height.partition if measures is not None else height(succ).partition
    report.table(["level", "items", "count"],
                 [(k + 1, _names(names, sorted(lv)), len(lv)) for k, lv in enumerate(levels)],
                 caption="Levels: each item sits one above its highest predecessor",
                 numeric={"level", "count"}, limit=200)
    cover = sorted(covering_pairs(succ), key=lambda ab: (names[ab[0]], names[ab[1]]))
    report.table(["lower", "upper"], [(names[a], names[b]) for a, b in cover],
                 caption="Covering pairs: the lower item comes directly before the upper one",
                 limit=500, more=" (the JSON output lists the whole order)")
    return report


def solve_report(problem, answer, command: str | None = None,
                 title: str = "satorder solve") -> Report:
    """The page of ``satorder solve`` (also of ``measure`` when there is no order)."""
    names = problem.items
    facts: list[tuple[str, object]] = [("engine", answer.engine),
                                       ("verified", _verified(answer.verified))]
    if answer.feasible:
        facts += [("ordered pairs", len(answer.pairs())),
                  ("covering pairs", len(answer.covering_pairs()))]
    if answer.cost is not None:
        state = "optimal" if answer.optimal else "best found, not proven optimal"
        facts.append(("cost of unmet preferences", f"{answer.cost} ({state})"))
    r = Report(title, command).header(problem.source, _size(problem), answer.status, facts)
    if answer.feasible:
        r.section("The order", "One order that meets every requirement"
                  + (" (there may be others; satorder count says how many)." if problem.n > 1
                     else "."))
        order_section(r, problem, answer.succ)
        if answer.unmet:
            r.table(["before", "after", "weight"],
                    [(names[a], names[b], w) for a, b, w in answer.unmet],
                    caption="Preferences given up", numeric={"weight"})
    elif answer.status == INFEASIBLE:
        r.section("Why no order exists")
        if answer.core is not None:
            r.table(["row", "requirement"],
                    [(k, requirement_text(c, names)) for k, c in enumerate(answer.core, 1)],
                    caption="These requirements cannot all hold", numeric={"row"})
        if answer.chain is not None:
            rows = []
            for k, s in enumerate(answer.chain, 1):
                a, b = s.arc
                why = ("start" if s.because is None else "forced, since " +
                       requirement_text(("incomparable", s.because), names))
                rows.append((k, f"{names[a]} → {names[b]}", why))
            r.table(["step", "arc", "because"], rows, numeric={"step"},
                    caption="Forcing chain: each arc forces the next, ending in the reverse of "
                            "the first")
        r.text(f"Run satorder explain {problem.source} for a minimal core, a step-by-step "
               "derivation and repairs.", note=True)
    else:
        r.section("No answer", "No answer within the time limit; try a longer --time-limit.")
    r.requirements(problem, succ=answer.succ, core=answer.core if not answer.feasible else None,
                   unmet=answer.unmet)
    return r.caution()


def measure_report(problem, answer, m, command: str | None = None) -> Report:
    """The page of ``satorder measure`` (``m``: the :class:`~satorder.measure.summary.Measures`
    of the order found)."""
    names = problem.items
    dim = m.dimension
    dim_text = (str(dim.value) if dim.status == "exact" else f"between {dim.lower} and "
                f"{dim.upper}")
    r = Report("satorder measure", command).header(
        problem.source, _size(problem), answer.status,
        [("height", m.height.value), ("width", m.width.value), ("dimension", dim_text),
         ("verified", _verified(m.verified))])
    rows = [("height", m.height.value, "chain: " + " < ".join(names[i] for i in
                                                              m.height.witness[:SHOW_ITEMS])),
            ("width", m.width.value, "antichain: " + _names(names, m.width.witness)),
            ("dimension", dim_text, f"realizer of {len(dim.realizer)} linear orders"
             if dim.realizer is not None else "; ".join(dim.notes) or "bounds only"),
            ("covering pairs", len(m.hasse), "the lines of the Hasse diagram"),
            ("linear extension", "", _names(names, m.linear_extension))]
    if m.weighted_chain is not None:
        rows.append(("max-weight chain", m.weighted_chain.value,
                     " < ".join(names[i] for i in m.weighted_chain.witness)))
        rows.append(("max-weight antichain", m.weighted_antichain.value,
                     _names(names, m.weighted_antichain.witness)))
    r.section("Figures of the order", "Each figure comes with a witness that an independent "
              "check has confirmed.")
    r.table(["figure", "value", "witness"], rows)
    r.section("Pictures and levels")
    order_section(r, problem, answer.succ, m)
    r.requirements(problem, succ=answer.succ, unmet=answer.unmet)
    return r.caution()


def explain_report(expl, command: str | None = None) -> Report:
    """The page of ``satorder explain``."""
    from satorder.explanation.derivation import describe
    from satorder.explanation.repairs import repair_text
    from satorder.render.explanation_svg import MAX_ITEMS, explanation_svg

    p = expl.problem
    names = p.items
    facts = [("verified", _verified(expl.verified))]
    if expl.core is not None:
        facts.append(("core", f"{len(expl.core)} requirements"))
    r = Report("satorder explain", command).header(p.source, _size(p), expl.status, facts)
    core = expl.core or []
    if expl.status == FEASIBLE:
        r.section("Nothing to explain", "An order meeting every requirement exists; satorder "
                  "solve shows one.")
    elif expl.status != INFEASIBLE:
        r.section("No verdict", "No verdict within the limits.")
    else:
        r.section("Why no order exists", f"These {len(core)} requirements cannot all hold (on "
                  "their own, every other pair left open); drop any one and the rest can.")
        r.table(["row", "requirement"],
                [(k, requirement_text(c, names)) for k, c in enumerate(core, 1)],
                caption="Minimal core (the derivation cites these rows)", numeric={"row"})
        if len(expl.involved_items()) <= MAX_ITEMS:
            r.picture(explanation_svg(expl))
        if expl.obstruction is not None:
            r.text(f"Obstruction: the comparable pairs alone admit no order. The "
                   f"{len(expl.obstruction)} items {_names(names, expl.obstruction)} induce a "
                   "subgraph with no transitive orientation; leave out any one and one exists.")
        if expl.steps is not None:
            rows = []
            for st in expl.steps:
                claim, why = describe(st, core, names)
                rows.append((st.number, "\u2003" * st.depth + claim, why))
            r.table(["step", "claim", "because"], rows, numeric={"step"}, limit=500,
                    caption="Derivation: each step cites earlier steps and core rows (cases "
                            "indented); replayed by the independent checker")
        if expl.smallest is not None and expl.smallest.get("proved"):
            r.text(f"Smallest core: {expl.smallest['size']} requirements, proven minimum "
                   f"({expl.smallest['scope']}).")
        if expl.repairs:
            r.table(["#", "repair", "then"],
                    [(k, repair_text(rep.drop, names),
                      "an order exists (checked)" if rep.verified else rep.note or "unchecked")
                     for k, rep in enumerate(expl.repairs, 1)],
                    caption="Repairs: minimal sets of requirements to drop", numeric={"#"})
    for note in expl.notes:
        r.text(f"Note: {note}", note=True)
    r.requirements(p, core=core or None)
    return r.caution()


def count_report(res, command: str | None = None) -> Report:
    """The page of ``satorder count``."""
    from satorder.pipeline.count import APPROXIMATE, DECOMPOSITION

    p = res.problem
    status = FEASIBLE if res.count > 0 else INFEASIBLE if res.exact else UNKNOWN
    how = {DECOMPOSITION: "modular decomposition", APPROXIMATE: "approximate model counting "
           "(ApproxMC)"}.get(res.method, "SAT enumeration")
    if res.method == APPROXIMATE:
        count = f"about {res.count:,} ({res.to_json()['guarantee']})"
    else:
        count = f"{res.count:,}" + ("" if res.exact else f" at least (stopped: {res.reason})")
    r = Report("satorder count", command).header(
        p.source, _size(p), status, [("answers", count), ("method", how),
                                     ("verified", _verified(res.verified))])
    clash = res.stats.get("clash")
    if clash:
        from satorder.model.requirement import Requirement

        words = "; ".join(requirement_text(Requirement.from_json(c, p.index), p.items)
                          for c in clash)
        r.section("How many orders", f"No order meets every requirement: two requirements "
                  f"clash on one pair — {words}. satorder explain shows repairs.")
    else:
        r.section("How many orders",
                  f"{count} orders meet every requirement, counted by {how}.")
    nodes = res.stats.get("nodes")
    if nodes:
        r.table(["node kind", "count"], sorted(nodes.items()), numeric={"count"},
                caption="Nodes of the modular decomposition")
    checks = res.stats.get("checks", [])
    if checks:
        r.table(["check"], [(c,) for c in checks], caption="Cross-checks by a second engine")
    if res.method == DECOMPOSITION and 0 < p.n <= 300:
        from satorder.graph.modular import modular_decomposition
        from satorder.render.decomposition_svg import decomposition_svg

        r.picture(decomposition_svg(modular_decomposition(p.adj), p.items,
                                    "Modular decomposition of the comparable pairs"))
    if p.prefer:
        r.text("Preferences rank answers but rule none out, so they are not counted.",
               note=True)
    r.requirements(p)
    return r.caution()


def bench_report(rows, backends, summary, series, problems, unverified, timeout,
                 sources, command: str | None = None) -> Report:
    """The page of ``satorder bench``: summary per back end, cactus plot, every row."""
    from satorder.render.cactus_svg import cactus_svg

    instances = len({row["instance"] for row in rows})
    status = "all verdicts agree" if not problems else \
        f"{len(problems)} disagreements or failed checks"
    r = Report("satorder bench", command).header(
        ", ".join(sources), f"{instances} instances × {len(backends)} back ends = "
        f"{len(rows)} runs", status, [("timeout per run", f"{timeout:g} s")])
    r.section("Summary per back end", "Median over solved runs; total over all runs, a timeout "
              "counting its full limit.")
    r.table(["back end", "runs", "solved", "timeouts", "failed", "skipped", "median s",
             "total s"],
            [(b, s["runs"], s["solved"], s["timeouts"], s["failed"], s["skipped"],
              s["median_seconds"], s["total_seconds"])
             for b in backends if (s := summary.get(b)) is not None],
            numeric={"runs", "solved", "timeouts", "failed", "skipped", "median s", "total s"})
    r.picture(cactus_svg({b: series.get(b, []) for b in backends},
                         "Cactus plot: instances solved within a time"))
    if problems or unverified:
        r.table(["finding"], [(m,) for m in problems] + [(f"unverified: {m}",)
                                                         for m in unverified],
                caption="Disagreements, failed checks and unverified verdicts")
    r.section("Every run")
    r.table(["instance", "back end", "status", "seconds", "verified", "items",
             "comparable pairs", "peak MB"],
            [(row["instance"], row["backend"], row.get("status"), row.get("seconds"),
              "yes" if row.get("verified") else "no", row.get("item_count"),
              row.get("comparable_pairs"), row.get("peak_mb"))
             for row in sorted(rows, key=lambda x: (x["instance"], x["backend"]))],
            numeric={"seconds", "items", "comparable pairs", "peak MB"}, limit=5000)
    return r.caution()


def settled_report(res, command: str | None = None) -> Report:
    """The page of ``satorder settled``: the settled pairs, the free pairs with their shares."""
    from satorder.render.settled_text import answers_text

    p = res.problem
    names = p.items
    c = res.counts()
    facts = [("answers", answers_text(res)), ("method", res.method),
             ("settled pairs", c["settled_before"] + c["settled_unordered"]),
             ("free pairs", c["free"]), ("verified", _verified(res.verified))]
    r = Report("satorder settled", command).header(p.source, _size(p), res.status, facts)
    if res.status == FEASIBLE:
        import heapq

        shown = 2000  # rows of the table; the first ones in this order, found without sorting
        rows = heapq.nsmallest(shown, res.pairs(), key=lambda t: (
            not t[5], -max(t[2:5]), names[t[0]], names[t[1]]))
        r.section("What the evidence settles", "A pair is settled when every answer gives "
                  "it the same relation; the others are free, and their shares say in what "
                  "part of the answers each relation holds.")
        r.table(["a", "b", "a before b", "b before a", "unordered", "settled"],
                [(names[a], names[b], x, y, z, "yes" if s else "no")
                 for a, b, x, y, z, s in rows],
                caption="Every pair that may be ordered, settled pairs first",
                numeric={"a before b", "b before a", "unordered"}, limit=shown)
        total = sum(c.values())
        if total > shown:
            r.text(f"… and {total - shown:,} more pairs not shown (the JSON output lists every "
                   "pair).", note=True)
        if res.checks:
            r.table(["check"], [(t,) for t in res.checks],
                    caption="Checks by code that did not compute the shares")
    elif res.status == INFEASIBLE:
        r.section("No answer", f"No order meets every requirement. Run satorder explain "
                  f"{p.source} for a minimal core and a derivation.")
    else:
        r.section("No verdict", "No verdict within the time limit; try a longer --time-limit.")
    for note in res.notes:
        r.text(f"Note: {note}", note=True)
    r.requirements(p, core=res.answer.core if res.answer is not None else None)
    return r.caution()
