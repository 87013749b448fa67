"""Net sections, nominal and peak stresses, Kt, handbook cases, design and fatigue checks."""
