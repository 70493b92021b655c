"""Large edge lists for performance work, written in seconds without building a problem:
random bipartite graphs and disjoint dense random orders.
"""

from __future__ import annotations

from satorder.generate.families import dense_blocks, planted, random_bipartite
from satorder.generate.instance import Instance
from satorder.io.files import atomic_write


# --------------------------------------------------------------------------- large edge lists
def write_random_bipartite(path: str, items: int = 50_000, pairs: int = 1_000_000,
                           seed: int = 0) -> Instance:
    """Write a random bipartite graph (``pairs`` distinct pairs across two halves of ``items``)
    as an edge list; a comparability graph with ``2^c`` answers.  Returns the instance (its
    ``n``, ``num_pairs``, ``expected_status``, ``expected_count``).

    >>> import tempfile, os
    >>> f = os.path.join(tempfile.mkdtemp(), "b.txt")
    >>> write_random_bipartite(f, items=100, pairs=300, seed=1).num_pairs
    300
    """
    inst = random_bipartite(items, seed, pairs=pairs)
    atomic_write(path, inst.to_edge_list())
    return inst


def write_dense_orders(path: str, blocks: int = 500, block_size: int = 100,
                       degree: float = 12.0, seed: int = 0, plant_hole: bool = False,
                       joins: int = 0) -> Instance:
    """Write ``blocks`` disjoint dense random graph orders of ``block_size`` items as an edge
    list (defaults: 50,000 items, about 1.6 million comparable pairs).  With ``plant_hole``,
    five new items forming an induced 5-cycle are added (``joins`` random edges tie them to
    the rest), so the graph is not a comparability graph while the blocks still are; the
    instance's ``planted`` lists the five items (as ids; ``names[i]`` is the written name).

    >>> import tempfile, os
    >>> f = os.path.join(tempfile.mkdtemp(), "d.txt")
    >>> write_dense_orders(f, blocks=3, block_size=10, plant_hole=True, seed=2).n
    35
    """
    if plant_hole:
        inst = planted(blocks * block_size + 5, seed, kind="hole", length=5, base="blocks",
                       degree=degree, joins=joins, block_size=block_size)
    else:
        inst = dense_blocks(blocks * block_size, seed, block_size=block_size, degree=degree)
    atomic_write(path, inst.to_edge_list())
    return inst
