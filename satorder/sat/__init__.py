"""SAT engines: the compact CNF encoding, python-sat back ends behind one session, cores and
minimal cores, weighted preferences (MaxSAT), enumeration of answers.

May import: :mod:`satorder.model`, :mod:`satorder.graph` (implication classes),
:mod:`satorder.errors`.  Never a checker (:mod:`satorder.certify`).
"""
