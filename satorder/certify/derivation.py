"""Independent replay of a printed derivation (the checker for ``satorder explain``).

Works on the JSON the CLI prints — item *names*, a ``core`` list of requirements and a
``derivation`` list of steps — and shares no code with the module that builds derivations.
Every step must follow by one rule from earlier steps that are still in scope and from core
requirements it cites by index; the last step must be a contradiction outside every case.
Rules (Γ forcing: Golumbic, *Algorithmic Graph Theory and Perfect Graphs*, 1980, ch. 5):

* ``fixed``: a cited fixed requirement (a, b) gives ``a < b``.
* ``assume``: a cited comparable requirement {a, b}; opens a case supposing ``a < b``.
* ``other way``: cites the case's opening step and the contradiction that ends it (the step
  just before) and the same comparable requirement; gives ``b < a`` and closes the case.
* ``forcing``: from ``a < b`` with comparable {b, c} and unordered {a, c} gives ``c < b``; or
  with comparable {a, c} and unordered {b, c} gives ``a < c``.
* ``transitivity``: ``a < b`` and ``b < c`` give ``a < c``.
* ``antisymmetry``: ``a < b`` and ``b < a`` give a contradiction.
* ``unordered`` / ``forbidden``: ``a < b`` with a cited unordered requirement {a, b} /
  forbidden requirement (a, b) gives a contradiction.

Soundness of each rule in a strict partial order is elementary; forcing is the one-line case
analysis "if b < c then a < c by transitivity, which the unordered pair {a, c} rules out".

>>> core = [{"kind": "fixed", "pair": ["a", "b"]}, {"kind": "incomparable", "pair": ["a", "b"]}]
>>> check_derivation(core, [
...     {"step": 1, "rule": "fixed", "arc": ["a", "b"], "steps": [], "requirements": [0],
...      "depth": 0},
...     {"step": 2, "rule": "unordered", "arc": None, "steps": [1], "requirements": [1],
...      "depth": 0}])
"""

from __future__ import annotations

from satorder.errors import CertificateError

RULES = ("fixed", "assume", "other way", "forcing", "transitivity", "antisymmetry",
         "unordered", "forbidden")


def _fail(number, message):
    raise CertificateError(f"derivation step {number}: {message}")


def check_derivation(core: list[dict], derivation: list[dict]) -> None:
    """Raise :class:`~satorder.errors.CertificateError` unless ``derivation`` proves that the
    requirements in ``core`` admit no strict partial order."""
    if not derivation:
        raise CertificateError("derivation is empty")
    facts: dict[int, tuple | None] = {}  # visible step number -> arc (None: contradiction)
    cases: list[int] = []  # open cases: the number of each case's 'assume' step

    def requirement(number, step, pos, kind):
        reqs = step.get("requirements") or []
        if pos >= len(reqs):
            _fail(number, f"needs a cited {kind} requirement")
        k = reqs[pos]
        if not isinstance(k, int) or not 0 <= k < len(core):
            _fail(number, f"cites requirement {k!r}, which is not in the core")
        r = core[k]
        if r.get("kind") != kind:
            _fail(number, f"cites requirement {k} as {kind}, but it is {r.get('kind')}")
        return tuple(r["pair"])

    def premise(number, step, pos):
        used = step.get("steps") or []
        if pos >= len(used):
            _fail(number, "cites too few earlier steps")
        k = used[pos]
        if k not in facts:
            _fail(number, f"cites step {k!r}, which is not an earlier step still in scope")
        return k, facts[k]

    def arc_of(number, step, pos):
        k, arc = premise(number, step, pos)
        if arc is None:
            _fail(number, f"cites step {k}, a contradiction, as an arc")
        return arc

    for expected, step in enumerate(derivation, 1):
        number = step.get("step")
        if number != expected:
            raise CertificateError(f"derivation steps are not numbered 1, 2, ...: {number!r}")
        rule = step.get("rule")
        if rule not in RULES:
            _fail(number, f"unknown rule {rule!r}")
        arc = step.get("arc")
        arc = None if arc is None else tuple(arc)
        if arc is not None and (len(arc) != 2 or arc[0] == arc[1]):
            _fail(number, f"{arc!r} is not an arc between two items")
        depth = step.get("depth")
        want_depth = len(cases) + 1 if rule == "assume" else len(cases)
        if rule == "other way":
            want_depth = len(cases) - 1
        if depth != want_depth:
            _fail(number, f"depth {depth!r} does not match the open cases ({want_depth})")
        contradiction = rule in ("antisymmetry", "unordered", "forbidden")
        if contradiction != (arc is None):
            _fail(number, "a contradiction has no arc, every other step has one")

        if rule == "fixed":
            if requirement(number, step, 0, "fixed") != arc:
                _fail(number, "the arc is not the cited fixed arc")
        elif rule == "assume":
            if set(requirement(number, step, 0, "comparable")) != set(arc):
                _fail(number, "the supposed arc is not on the cited comparable pair")
        elif rule == "other way":
            if not cases:
                _fail(number, "closes a case, but none is open")
            opened = cases[-1]
            k, supposed = premise(number, step, 0)
            if k != opened:
                _fail(number, f"must cite step {opened}, which opened the innermost case")
            k2, end = premise(number, step, 1)
            if end is not None or k2 != number - 1:
                _fail(number, "must cite the contradiction that ends the case (previous step)")
            pair = requirement(number, step, 0, "comparable")
            if set(pair) != set(supposed) or arc != (supposed[1], supposed[0]):
                _fail(number, "the arc must be the reverse of the refuted case on its pair")
        elif rule == "forcing":
            a, b = arc_of(number, step, 0)
            comp = set(requirement(number, step, 0, "comparable"))
            inc = set(requirement(number, step, 1, "incomparable"))
            into = [(c, b) for c in comp - {b} if comp == {b, c} and inc == {a, c}]
            out = [(a, c) for c in comp - {a} if comp == {a, c} and inc == {b, c}]
            if arc not in into + out:
                _fail(number, "the arc does not follow by forcing from the cited step and pairs")
        elif rule == "transitivity":
            a, b = arc_of(number, step, 0)
            b2, c = arc_of(number, step, 1)
            if b != b2 or arc != (a, c):
                _fail(number, "the arc does not follow by transitivity from the cited steps")
        elif rule == "antisymmetry":
            a, b = arc_of(number, step, 0)
            if arc_of(number, step, 1) != (b, a):
                _fail(number, "the cited steps do not order one pair both ways")
        elif rule == "unordered":
            a, b = arc_of(number, step, 0)
            if set(requirement(number, step, 0, "incomparable")) != {a, b}:
                _fail(number, "the cited step does not order the cited unordered pair")
        elif rule == "forbidden":
            a, b = arc_of(number, step, 0)
            if requirement(number, step, 0, "forbidden") != (a, b):
                _fail(number, "the cited step is not the cited forbidden arc")

        if rule == "other way":
            opened = cases.pop()
            for k in [k for k in facts if k >= opened]:
                del facts[k]
        if rule == "assume":
            cases.append(number)
        facts[number] = arc

    last = derivation[-1]
    if last.get("arc") is not None or cases:
        raise CertificateError("the derivation does not end in a contradiction outside all cases")
