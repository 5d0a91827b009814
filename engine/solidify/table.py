"""Melt ranges and Scheil ends of many alloys of one system at once (heat lists).

Binary systems (`CompositionTable`, all alloys together with numpy):

Everything comes from the system's traced liquidus branches (engine/solidify_branches.py),
computed once per system, evaluated for all alloys together with numpy:

- liquidus: the highest branch over the alloy's composition;
- solidus: the lowest temperature where liquid appears on heating: where a branch's solid
  composition equals the alloy's (the solidus curve), or an invariant reaction with liquid whose
  solids bracket the alloy, or a pure element's or congruent composition's melting point;
- the eutectic constituent at equilibrium: the lever rule just above a eutectic-type reaction;
- Scheil end temperature and eutectic constituent: the liquid's run of engine/solidify_scheil.py.

The branch interpolation is exact to about 1e-5 K in temperature (see solidify_branches); the
heat-list benchmark (tests/benchmarks/batch_bench.py) measures the agreement with the one-alloy
computations.

Systems of three or more elements (`evaluate_alloys`, one alloy at a time): the liquidus and
solidus from the alloy's transition scan (engine/diagrams/alloy_transitions.py), the Scheil end
and the eutectic constituents (binary and ternary eutectics, ...: every constituent of two or
more solids forming together) from its Scheil path (engine/solidify/alloy_scheil.py); seconds per alloy, so that a heat list
of such alloys is worth spreading over every core or a cluster.

Temperatures in K, compositions as mole fraction of B (binary) or of every element, constituents
as mass fractions of the alloy.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from ..diagrams.diagram import map_diagram
from .branches import (CONGRUENT_OFFSET_Y, PURE_END_Y, fractions_array, hermite_at, invert_hermite,
                                liquidus_branches, logit_array)
from .liquidus import LIQUID
from .records import molar_mass_of
from .scheil import run_liquid, start_branches


@dataclass(frozen=True)
class HeatResults:
    """Per alloy (arrays of one length; NaN where there is no answer inside the mapped window):
    liquidus and solidus (K), the equilibrium eutectic constituent (mass fraction; 0 where the
    alloy does not end freezing at a eutectic), the Scheil end temperature (K) and the Scheil
    eutectic constituent (mass fraction, or NaN without --scheil); `scheil_left_range` is True
    where the Scheil path stopped because its liquid left the range the model covers (systems
    of three or more elements; None where no path can leave it)."""

    liquidus_K: np.ndarray
    solidus_K: np.ndarray
    eutectic_equilibrium: np.ndarray
    scheil_end_K: np.ndarray
    eutectic_scheil: np.ndarray
    scheil_left_range: np.ndarray | None = None

    @property
    def freezing_range_K(self) -> np.ndarray:
        return self.liquidus_K - self.solidus_K


@dataclass(frozen=True)
class _Plateau:
    """An invariant reaction with liquid: temperature (K), its solids' x_B range, the liquid's
    x_B, and whether the liquid lies between the solids (a eutectic-type reaction)."""

    temperature_K: float
    low: float
    high: float
    liquid: float
    eutectic_type: bool


class CompositionTable:
    """Heat-list answers for `system`; build once (cached by `composition_table`)."""

    def __init__(self, system) -> None:
        self.system = system
        self.branches = liquidus_branches(system)
        diagram = map_diagram(system)
        self.plateaus = []
        for inv in diagram.invariants:
            names = [n for n, _ in inv.phases]
            if LIQUID not in names:
                continue
            solids = [x for n, x in inv.phases if n != LIQUID]
            liquid = next(x for n, x in inv.phases if n == LIQUID)
            self.plateaus.append(_Plateau(inv.temperature_K, min(solids), max(solids), liquid, names[1] == LIQUID))
        # one temperature freezing: pure elements, congruent compositions (x_B, T)
        self.single = [(sp.x_B, sp.temperature_K) for sp in diagram.special_points
                       if sp.kind in ("melting", "congruent") and LIQUID in sp.phases]
        self.solid_runs = [run for b in self.branches if not b.is_compound for run in _monotone_runs(b)]

    # --- equilibrium -----------------------------------------------------------------------------
    def _single_at(self, y: np.ndarray) -> np.ndarray:
        """Melting temperature (K) of alloys that freeze at one temperature, else NaN."""
        out = np.full(y.shape, np.nan)
        for x, T in self.single:
            if x in (0.0, 1.0):
                at = (y <= -PURE_END_Y) if x == 0.0 else (y >= PURE_END_Y)
            else:
                at = np.abs(y - logit_array(x)) <= CONGRUENT_OFFSET_Y
            out[at] = T
        return out

    def melt_ranges(self, x_B: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """(liquidus K, solidus K, equilibrium eutectic mass fraction) of each alloy x_B."""
        x_B = np.asarray(x_B, dtype=float)
        y = logit_array(x_B)
        single = self._single_at(y)
        _first, liquidus = start_branches(self.branches, y)
        liquidus = np.where(np.isnan(single), liquidus, single)
        solidus = np.where(np.isnan(single), np.inf, single)
        for run_y, run_T, run_dT, run_ys, run_dys in self.solid_runs:
            y_liq = invert_hermite(run_y, run_ys, run_dys, y)        # the liquid at the solidus curve
            found = ~np.isnan(y_liq)
            if found.any():
                solidus[found] = np.minimum(solidus[found], hermite_at(run_y, run_T, run_dT, y_liq[found]))
        eutectic = np.zeros(x_B.shape)
        for p in self.plateaus:
            wins = (x_B >= p.low - 1e-12) & (x_B <= p.high + 1e-12) & (p.temperature_K <= solidus)
            solidus[wins] = p.temperature_K
            eutectic[wins] = 0.0
            if p.eutectic_type:        # the lever rule just above the reaction, in moles, then mass
                near = np.where(x_B < p.liquid, p.low, p.high)
                f_mol = np.clip((x_B - near) / (p.liquid - near), 0.0, 1.0)
                mass = f_mol * molar_mass_of(self.system, p.liquid) / molar_mass_of(self.system, x_B)
                eutectic[wins] = mass[wins]
        solidus = np.where(np.isinf(solidus), np.nan, solidus)
        return liquidus, solidus, np.where(np.isnan(solidus), np.nan, eutectic)

    # --- Scheil --------------------------------------------------------------------------------
    def scheil_ends(self, x_B: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(Scheil end temperature K, Scheil eutectic mass fraction) of each alloy x_B."""
        x_B = np.asarray(x_B, dtype=float)
        y = logit_array(x_B)
        single = self._single_at(y)
        end = np.where(np.isnan(single), np.nan, single)
        eutectic = np.where(np.isnan(single), np.nan, 0.0)
        first, _liquidus = start_branches(self.branches, y)
        for k in np.unique(first[(first >= 0) & np.isnan(single)]):
            group = (first == k) & np.isnan(single)
            run = run_liquid(self.branches, self.branches[int(k)], y[group])
            if run.end == "window":
                continue
            if run.end == "last liquid":
                T = np.empty(run.last.shape)
                for j, b in enumerate(run.chain):
                    T[run.last == j] = b.temperature(run.y_end[run.last == j])
                end[group], eutectic[group] = T, 0.0
                continue
            x_end = fractions_array(run.y_end)[1]
            end[group] = run.chain[-1].T[-1]
            eutectic[group] = np.exp(run.lnf_end) * molar_mass_of(self.system, x_end) / molar_mass_of(self.system, x_B[group])
        return end, eutectic

    def evaluate(self, x_B: np.ndarray, scheil: bool) -> HeatResults:
        """Everything a heat list reports, for each alloy x_B (mole fraction of B)."""
        liquidus, solidus, eutectic = self.melt_ranges(x_B)
        if scheil:
            end, eutectic_scheil = self.scheil_ends(x_B)
        else:
            end = eutectic_scheil = np.full(np.shape(x_B), np.nan)
        return HeatResults(liquidus, solidus, eutectic, end, eutectic_scheil)


def _monotone_runs(branch) -> list[tuple[np.ndarray, ...]]:
    """The branch's points split where its solid composition turns back, as (y, T, dT/dy,
    y_S, dy_S/dy) arrays of points along which y_S is monotone."""
    step = np.sign(np.diff(branch.ys))
    cuts = [0] + [i + 1 for i in range(1, len(step)) if step[i] != step[i - 1] and step[i] != 0] + [len(branch.y) - 1]
    runs = []
    for a, b in zip(cuts[:-1], cuts[1:]):
        if b > a:
            sl = slice(a, b + 1)
            runs.append((branch.y[sl], branch.T[sl], branch.dT[sl], branch.ys[sl], branch.dys[sl]))
    return runs


@lru_cache(maxsize=8)
def composition_table(system) -> CompositionTable:
    """The heat-list table of `system`, built once per system."""
    return CompositionTable(system)


def evaluate_alloys(system, x: np.ndarray, scheil: bool) -> tuple[HeatResults, list[str | None]]:
    """Heat-list answers for alloys of any number of elements, one per row of `x` (mole
    fractions of every element in the system's order), and for each the reason (one line) it
    could not be computed, or None. The equilibrium eutectic constituent is not computed (NaN)."""
    from ..diagrams.alloy_transitions import alloy_transitions
    from .alloy_scheil import OUTSIDE_RANGE, alloy_scheil

    n = len(x)
    out = {name: np.full(n, np.nan) for name in ("liquidus", "solidus", "end", "eutectic")}
    left_range = np.zeros(n, dtype=bool)
    problems: list[str | None] = [None] * n
    for k, alloy in enumerate(np.asarray(x, dtype=float)):
        try:
            scan = alloy_transitions(system, alloy)
            out["liquidus"][k] = np.nan if scan.liquidus_K is None else scan.liquidus_K
            out["solidus"][k] = np.nan if scan.solidus_K is None else scan.solidus_K
            if scheil:
                path = alloy_scheil(system, alloy)
                out["end"][k] = np.nan if path.end_K is None else path.end_K
                left_range[k] = path.end == OUTSIDE_RANGE
                out["eutectic"][k] = sum(c.mass_fraction for c in path.constituents if "eutectic" in c.name)
        except ValueError as e:             # PathError and TemperatureOutOfRange among them
            problems[k] = str(e).splitlines()[0] if str(e) else type(e).__name__
    if not scheil:
        out["eutectic"][:] = np.nan
    return (HeatResults(out["liquidus"], out["solidus"], np.full(n, np.nan), out["end"], out["eutectic"], left_range),
            problems)
