"""Whole diagrams and reactions: temperature scans of sections, invariant reactions, congruent and
critical points, boundaries, and one alloy's melt range. Built on `minimize`.
"""
