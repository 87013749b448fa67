"""stressraiser: a 2-D plane-stress finite-element checker for flat load-carrying parts."""

__version__ = "0.1.0"
