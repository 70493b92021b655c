"""The SAT engine against the forcing algorithm, brute force over all posets, and its own CNF."""

from __future__ import annotations

import itertools
import random

import networkx as nx
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from order_reference import all_graphs, all_posets, brute_force_feasible, random_problem

from satorder import Problem, certify
from satorder.errors import InputError
from satorder.model.problem import ProblemBuilder
from satorder.pipeline.solve import solve, solve_forcing, verify
from satorder.sat.cores import find_core
from satorder.sat.engine import solve_sat
from satorder.sat.runner import resolve_solver
from satorder.sat.session import SatSession

# ---------------------------------------------------------------------- brute force


def test_poset_enumeration_matches_oeis():
    # OEIS A001035: labeled posets on n items: 1, 1, 3, 19, 219, 4231 for n = 0..5
    assert [len(all_posets(n)) for n in range(6)] == [1, 1, 3, 19, 219, 4231]




def _agree(problem: Problem, expected: bool, solver: str | None = None) -> None:
    ans = solve_sat(problem, solver=solver)
    verify(ans)  # raises CertificateError on a wrong order or a core that is not infeasible
    assert ans.verified
    assert ans.feasible == expected, (problem, ans.to_json())


# ---------------------------------------------------------------------- plain problems


@pytest.mark.parametrize("n", [2, 3, 4, 5])
def test_every_small_graph_sat_agrees_with_forcing(n):
    for g in all_graphs(n):
        p = Problem.from_networkx(g)
        f = solve_forcing(p)
        verify(f)
        _agree(p, f.feasible)


@pytest.mark.slow
def test_random_plain_graphs_sat_agrees_with_forcing():
    rnd = random.Random(3)
    for _ in range(400):
        n = rnd.randint(5, 12)
        g = nx.gnp_random_graph(n, rnd.uniform(0.2, 0.9), seed=rnd.randrange(1 << 30))
        p = Problem.from_networkx(g)
        f = solve_forcing(p)
        verify(f)
        _agree(p, f.feasible)


@settings(max_examples=150, deadline=None)
@given(st.integers(min_value=1, max_value=9).flatmap(
    lambda n: st.tuples(st.just(n), st.sets(st.tuples(st.integers(0, n - 1),
                                                      st.integers(0, n - 1))))))
def test_hypothesis_plain_sat_agrees_with_forcing(data):
    n, pairs = data
    g = nx.Graph()
    g.add_nodes_from(range(n))
    g.add_edges_from((a, b) for a, b in pairs if a != b)
    p = Problem.from_networkx(g)
    f = solve_forcing(p)
    ans = solve(p, engine="both")  # raises EngineDisagreement if the verdicts differ
    assert ans.verified and ans.feasible == f.feasible


@pytest.mark.parametrize("k", [5, 7, 9])
def test_odd_cycles_infeasible_with_verified_core(k):
    # Golumbic 1980, ch. 5: odd cycles of length >= 5 are not comparability graphs
    ans = solve(Problem.from_networkx(nx.cycle_graph(k)), engine="sat")
    assert ans.status == "infeasible" and ans.verified
    certify.check_core_infeasible(ans.problem, ans.core, minimal=True)


def test_interval_graph_complement_is_feasible():
    # Gilmore & Hoffman 1964: the complement of an interval graph is a comparability graph
    rnd = random.Random(5)
    ivs = []
    for _ in range(25):
        a = rnd.uniform(0, 10)
        ivs.append((a, a + rnd.uniform(0.2, 3)))
    g = nx.Graph()
    g.add_nodes_from(range(len(ivs)))
    for i, j in itertools.combinations(range(len(ivs)), 2):
        if ivs[i][1] < ivs[j][0] or ivs[j][1] < ivs[i][0]:
            g.add_edge(i, j)
    ans = solve(Problem.from_networkx(g), engine="sat")
    assert ans.status == "feasible" and ans.verified


def test_plain_problem_with_side_constraint_matches_forcing_plus_brute_force():
    # the forcing algorithm's verdict plus fixed/forbidden arcs: engine "both" cross-checks
    # SAT against forcing (raising on a contradiction), and brute force settles the verdict
    rnd = random.Random(11)
    for _ in range(150):
        n = rnd.randint(3, 5)
        g = nx.gnp_random_graph(n, 0.6, seed=rnd.randrange(1 << 30))
        if not g.number_of_edges():
            continue
        a, b = rnd.choice(list(g.edges()))
        c, d = rnd.sample(range(n), 2)
        p = Problem.from_networkx(g).with_requirements(
            fixed=[(a, b)], forbidden=[(c, d)] if (c, d) != (a, b) else [])
        ans = solve(p, engine="both")
        assert ans.verified and ans.feasible == brute_force_feasible(p)


def test_engine_choice_errors_are_input_errors():
    open_pairs = Problem.from_lists(comparable=[("a", "b")], incomparable=[("b", "c")])
    with pytest.raises(InputError, match="forcing engine"):
        solve(open_pairs, engine="forcing")
    with pytest.raises(InputError, match="engine both"):
        solve(open_pairs, engine="both")


# ---------------------------------------------------------------------- side constraints


def test_random_side_constraints_and_open_pairs_match_brute_force():
    rnd = random.Random(20261201)
    seen = {True: 0, False: 0}
    for k in range(500):
        p = random_problem(rnd, rnd.randint(2, 5))
        expected = brute_force_feasible(p)
        seen[expected] += 1
        _agree(p, expected, solver=("cadical195", "glucose4", "minisat22")[k % 3])
    assert min(seen.values()) > 40  # both verdicts well represented


@settings(max_examples=120, deadline=None)
@given(st.integers(min_value=2, max_value=4).flatmap(lambda n: st.tuples(
    st.just(n),
    st.lists(st.sampled_from(["comparable", "incomparable", "open"]),
             min_size=n * (n - 1) // 2, max_size=n * (n - 1) // 2),
    st.lists(st.tuples(st.integers(0, n - 1), st.integers(0, n - 1), st.booleans()),
             max_size=4))))
def test_hypothesis_side_constraints_match_brute_force(data):
    n, states, arcs = data
    b = ProblemBuilder("<hypothesis>")
    names = [f"i{k}" for k in range(n)]
    for x in names:
        b.item(x, "items")
    b.incomparable_list()
    for (x, y), state in zip(itertools.combinations(names, 2), states):
        if state != "open":
            getattr(b, state)(x, y, state)
    for x, y, fix in arcs:
        try:
            (b.fixed if fix else b.forbidden)(names[x], names[y], "arc")
        except InputError:
            pass  # an arc from an item to itself; clashes with the pairs are kept
    p = b.build()
    _agree(p, brute_force_feasible(p))


def test_selector_session_agrees_and_cores_are_minimal():
    rnd = random.Random(8)
    for _ in range(120):
        p = random_problem(rnd, rnd.randint(3, 5))
        expected = brute_force_feasible(p)
        with SatSession(p, selectors=True) as s:
            assert s.solve() is expected
            if expected:
                certify.check_order(p, s.order())
        if not expected:
            core, stats = find_core(p)
            assert stats["minimal"]
            certify.check_core_infeasible(p, core, minimal=True)


def test_engine_cores_are_minimal_on_random_infeasible_problems():
    # infeasible answers from solve_sat: their cores pass the independent minimality check
    # (each member dropped in turn, re-solved by the all-triples encoding in certify.py)
    rnd = random.Random(77)
    checked = 0
    while checked < 40:
        p = random_problem(rnd, rnd.randint(3, 6))
        ans = solve_sat(p)
        if ans.status != "infeasible":
            continue
        certify.check_core_infeasible(p, ans.core, minimal=True)
        # the core came from the refuted compact CNF itself, not from the slower fallback
        assert ans.stats["core"]["method"] in ("implication class conflict", "clause provenance",
                                               "requirements clashing on one pair")
        checked += 1


def test_keep_drops_the_other_requirements():
    # a<b, b<c fixed and a, c must stay unordered: infeasible; dropping any one fixes it
    p = Problem.from_lists(fixed=[("a", "b"), ("b", "c")], incomparable=[("a", "c")])
    a, b, c = (p.index[x] for x in "abc")
    wanted = [("fixed", (a, b)), ("fixed", (b, c)), ("incomparable", (min(a, c), max(a, c)))]
    with SatSession(p, selectors=True) as s:
        assert s.solve() is False
        assert set(wanted) <= set(s.core())
        assert s.solve(keep=wanted) is False
        for drop in wanted:
            assert s.solve(keep=[k for k in wanted if k != drop]) is True
            order = s.order()
            free = Problem(items=p.items, adj=[set(), set(), set()], incomparable=[set()] * 3)
            certify.check_order(free, order)  # a strict partial order
            for kind, (x, y) in wanted:
                if (kind, (x, y)) != drop:
                    assert (y in order[x]) if kind == "fixed" else (y not in order[x])
            if drop[0] == "incomparable":
                assert c in order[a]  # transitivity forces a<c once a, c may be ordered


def test_lazy_and_eager_transitivity_agree():
    rnd = random.Random(21)
    for _ in range(150):
        p = random_problem(rnd, rnd.randint(2, 6))
        verdicts = set()
        for lazy in (True, False):
            with SatSession(p, lazy=lazy) as s:
                r = s.solve()
                if r:
                    certify.check_order(p, s.order())
                verdicts.add(r)
        assert len(verdicts) == 1


# ---------------------------------------------------------------------- back ends, limits


def test_solver_names():
    assert resolve_solver(None) == "cadical195"
    assert resolve_solver("Glucose4") == "glucose4"
    with pytest.raises(InputError, match="unknown SAT solver"):
        resolve_solver("no-such-solver")


def _hard_problem() -> Problem:
    """A dense open-pair problem (generated, feasible) that needs many lazy rounds: no solver
    finishes it within a millisecond."""
    from satorder.generate.families import open_pairs
    from satorder.io.readers import problem_from_dict

    return problem_from_dict(open_pairs(200, seed=1, degree=20.0).to_dict())


@pytest.mark.parametrize("solver", ["cadical195", "glucose4"])
def test_tiny_time_limit_gives_unknown(solver):
    ans = solve(_hard_problem(), engine="sat", solver=solver, time_limit=0.001)
    assert ans.status == "unknown"
    assert not ans.verified
