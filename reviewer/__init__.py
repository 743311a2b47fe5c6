"""Bridge Reviewer: design review of low-voltage H-bridges and inverters before layout.

``import reviewer`` stays light: the engine, the views and the interface load on use.
"""

__version__ = "0.1.0"
