"""Synthetic systems, one per diagram topology, with invented parameters tuned by experiment so
that each shows its feature clearly inside its temperature window. The expected reactions are
what each design was built to have; the tests check the engine finds exactly these.

Liquids use dG_fus = dH (1 - T / Tm) for each element (fusion() in synthetic.py); solids are
referred to the solid of each element (G = 0) plus a lattice stability where the structure is
not the element's own.
"""

from __future__ import annotations

from dataclasses import dataclass

from synthetic import Compound, Solution, Synthetic, fusion, ideal_two_phase


def _liquid(H_A: float, T_A: float, H_B: float, T_B: float, *L: dict[str, float]) -> Solution:
    return Solution("liquid", fusion(H_A, T_A), fusion(H_B, T_B), tuple(L))


@dataclass(frozen=True)
class Topology:
    """A designed system and what it must show: each invariant as (kind, phase names ordered by
    composition), and the kinds of two-phase special points besides pure-element ones."""

    name: str
    synthetic: Synthetic
    invariants: tuple[tuple[str, tuple[str, str, str]], ...]
    special: tuple[str, ...] = ()


#: The ideal isomorphous system: ideal liquid and ideal solid, A melts at TM_A, B at TM_B.
H_A, TM_A = 13000.0, 1400.0      # J/mol, K
H_B, TM_B = 9000.0, 1000.0


def isomorphous() -> Topology:
    """Ideal liquid and ideal solid: one lens-shaped liquid + solid field, exactly known."""
    return Topology("isomorphous", Synthetic([
        Solution("liquid", fusion(H_A, TM_A), fusion(H_B, TM_B)),
        Solution("solid", {}, {}),
    ], (800.0, 1600.0)), ())


def isomorphous_tie_line(T: float) -> tuple[float, float, float, float]:
    """(x_B, x_A of the solid; x_B, x_A of the liquid) of the isomorphous system at T (K)."""
    return ideal_two_phase(H_A * (1.0 - T / TM_A), H_B * (1.0 - T / TM_B), T)


def eutectic() -> Topology:
    """Simple eutectic: A-rich fcc, B-rich hcp, near-ideal liquid; about 703 K."""
    return Topology("eutectic", Synthetic([
        _liquid(12000.0, 1200.0, 10000.0, 1000.0),
        Solution("fcc", {}, {"a": 6000.0}, ({"a": 15000.0},)),
        Solution("hcp", {"a": 6000.0}, {}, ({"a": 15000.0},)),
    ], (600.0, 1400.0)), (("eutectic", ("fcc", "liquid", "hcp")),))


def peritectic() -> Topology:
    """Peritectic fcc + liquid -> hcp (about 1235 K): A melts at 1600 K, B at 800 K."""
    return Topology("peritectic", Synthetic([
        _liquid(15000.0, 1600.0, 8000.0, 800.0),
        Solution("fcc", {}, {"a": 8000.0}, ({"a": 12000.0},)),
        Solution("hcp", {"a": 1000.0}, {}, ({"a": 6000.0},)),
    ], (600.0, 1800.0)), (("peritectic", ("fcc", "hcp", "liquid")),))


def monotectic() -> Topology:
    """Liquid miscibility gap (symmetric, L0 = 25000 J/mol: critical point L0/2R = 1503.4 K) cut
    by the fcc liquidus: monotectic liquid -> fcc + liquid near 1365 K, eutectic near pure B."""
    return Topology("monotectic", Synthetic([
        _liquid(15000.0, 1500.0, 8000.0, 700.0, {"a": 25000.0}),
        Solution("fcc", {}, {"a": 10000.0}, ({"a": 20000.0},)),
        Solution("hcp", {"a": 15000.0}, {}, ({"a": 30000.0},)),
    ], (500.0, 1700.0)),
        (("monotectic", ("fcc", "liquid", "liquid")), ("eutectic", ("fcc", "liquid", "hcp"))), ("critical",))


def eutectoid() -> Topology:
    """All solid: bcc (stable above 1000 K for pure A, 800 K for pure B) decomposes into fcc +
    hcp near 555 K."""
    return Topology("eutectoid", Synthetic([
        Solution("fcc", {}, {"a": 6000.0}, ({"a": 15000.0},)),
        Solution("hcp", {"a": 6000.0}, {}, ({"a": 15000.0},)),
        Solution("bcc", {"a": 5000.0, "b": -5.0}, {"a": 4000.0, "b": -5.0}, ({"a": 6000.0},)),
    ], (400.0, 1200.0)), (("eutectoid", ("fcc", "bcc", "hcp")),))


def compound() -> Topology:
    """Compound AB melting congruently (about 1189 K) between two eutectics (about 1020 K and
    912 K)."""
    return Topology("compound", Synthetic([
        _liquid(12000.0, 1200.0, 10000.0, 1000.0, {"a": -5000.0}),
        Solution("fcc", {}, {"a": 6000.0}, ({"a": 15000.0},)),
        Solution("hcp", {"a": 6000.0}, {}, ({"a": 15000.0},)),
        Compound("AB", (1, 1), ("fcc", "hcp"), {"a": -9000.0}),
    ], (600.0, 1500.0)),
        (("eutectic", ("fcc", "liquid", "AB")), ("eutectic", ("AB", "liquid", "hcp"))), ("congruent",))


def minimum() -> Topology:
    """One solid solution whose mixing is less favourable than the liquid's: a congruent
    minimum of the liquidus and solidus (about 826 K)."""
    return Topology("minimum", Synthetic([
        _liquid(10000.0, 1100.0, 9000.0, 1000.0),
        Solution("fcc", {}, {}, ({"a": 8000.0},)),
    ], (700.0, 1300.0)), (), ("congruent",))


#: Retrograde solvus: G of B in fcc above hcp is RETRO_A + RETRO_B T + RETRO_C T ln T. With ideal
#: solutions the dilute solubility is exp(-dG / RT), largest where d(dG/T)/dT = 0, i.e. at
#: T = RETRO_A / RETRO_C = 1000 K: it rises up to there and falls above (retrograde).
RETRO_A, RETRO_B, RETRO_C = 20000.0, -133.2, 20.0
#: G of A in hcp above fcc (J/mol): hcp holds little A.
RETRO_HCP_A = 40000.0


def retrograde() -> Topology:
    """Two ideal solids: the B solubility of fcc peaks inside the window (retrograde solvus)."""
    return Topology("retrograde", Synthetic([
        Solution("fcc", {}, {"a": RETRO_A, "b": RETRO_B, "c": RETRO_C}),
        Solution("hcp", {"a": RETRO_HCP_A}, {}),
    ], (600.0, 1400.0)), ())


ALL = (eutectic, peritectic, monotectic, eutectoid, compound, minimum, retrograde)
