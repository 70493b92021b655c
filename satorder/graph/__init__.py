"""Graph engines for plain problems: Γ forcing and implication classes, transitive orientation,
modular decomposition, minimal obstructions, and their compiled kernels.

May import: :mod:`satorder.model`, :mod:`satorder.errors`.  Never a checker
(:mod:`satorder.certify`) and never the SAT engines.
"""
