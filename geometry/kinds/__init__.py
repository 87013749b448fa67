"""One module per kind of raiser (hole, ellipse, slot, notch, window) and of outline (the bar, with its
shoulder step and lug end); geometry/registry.py lists them. geometry/kinds/base.py says what a kind
module provides."""
