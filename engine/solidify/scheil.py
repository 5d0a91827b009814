"""Scheil-Gulliver cooling of one alloy: complete mixing in the liquid, no diffusion in the solid
(E. Scheil, Z. Metallkd. 34 (1942) 70; G.H. Gulliver, J. Inst. Met. 9 (1913) 120).

Each layer of solid forms in equilibrium with the liquid at the interface, so the liquid's
composition runs down the liquidus from the alloy's composition, and the mass balance
d(f_L x_L) = x_S d(f_L) gives f_L = exp(-(Phi(x_L) - Phi(x_0))) along each liquidus branch
(engine/solidify_branches.py). Where the liquid reaches a peritectic point the next solid forms
on its own branch; where it reaches an invariant reaction it cannot pass (a eutectic), the rest
freezes there at constant temperature. Where the liquid runs toward a pure element or a melting
minimum, freezing ends (`last liquid`) where less than LAST_LIQUID of the alloy's atoms is liquid.

Temperatures in K, compositions as mole fraction of B, amounts as fractions of the alloy.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .branches import (CONGRUENT_OFFSET_Y, PURE_END_Y, Branch, chain_from, fractions_array, invert_hermite,
                                liquidus_branches)
from .heat import released_between
from .liquidus import LIQUID
from .records import (SAME_K, Arrest, Constituent, CoolingPath, PathError, PathStep, coverage_notes,
                            describe_reaction, molar_mass_of, reaction_products, solid_label)
from ..minimize.tangent import logit

#: Freezing "ends" in the last-liquid case when this share of the alloy's atoms is still liquid.
LAST_LIQUID = 1e-6
_SAME_X = 1e-7


@dataclass(frozen=True)
class LiquidRun:
    """Where the liquid of each of several alloys goes along `chain` (the branches it runs down,
    hot to cold). Per alloy: `last`, the index in `chain` of the branch where the liquid stops;
    `y_end`, its y there; `lnf[k]`, ln of the liquid fraction (mole fraction of the alloy's
    atoms) at the start of branch k, and `lnf_end` at the stop; `phi0`, the first branch's
    Scheil integral at the alloy's composition. `end` says how freezing ends ("last liquid",
    "window" or the kind of the invariant reaction met)."""

    chain: list[Branch]
    last: np.ndarray
    y_end: np.ndarray
    lnf: np.ndarray
    lnf_end: np.ndarray
    phi0: np.ndarray
    end: str


def start_branches(branches: tuple[Branch, ...], y0: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """For each liquid y0: the index of the branch that forms its first solid (the highest
    liquidus over it; -1 where no branch lies over it) and that liquidus temperature (K)."""
    y0 = np.asarray(y0, dtype=float)
    best = np.full(y0.shape, -1)
    top = np.full(y0.shape, -np.inf)
    for k, b in enumerate(branches):
        over = (y0 >= min(b.y[0], b.y[-1])) & (y0 <= max(b.y[0], b.y[-1]))
        if over.any():
            T = np.full(y0.shape, -np.inf)
            T[over] = b.temperature(y0[over])
            higher = T > top
            best[higher], top[higher] = k, T[higher]
    return best, np.where(best >= 0, top, np.nan)


def run_liquid(branches: tuple[Branch, ...], first: Branch, y0: np.ndarray) -> LiquidRun:
    """Follow the liquid of alloys whose liquid starts at y0 on branch `first` (see LiquidRun).
    Where the liquid runs toward a pure element or a melting minimum it never meets an
    invariant reaction: it stops where LAST_LIQUID of the alloy is still liquid."""
    chain = chain_from(branches, first)
    y0 = np.asarray(y0, dtype=float)
    n = len(chain)
    bottom = chain[-1].bottom
    runs_out = bottom.kind in ("melting", "congruent")
    phi0 = first.phi_at(y0)
    lnf = np.zeros((n,) + y0.shape)
    for k in range(1, n):
        start = phi0 if k == 1 else 0.0
        lnf[k] = lnf[k - 1] - (chain[k - 1].phi[-1] - start)
    lnf_bottom = lnf[-1] - (chain[-1].phi[-1] - (phi0 if n == 1 else 0.0))
    last = np.full(y0.shape, n - 1)
    y_end = np.full(y0.shape, float(chain[-1].y[-1]))
    lnf_end = lnf_bottom.copy()
    if runs_out:
        target = math.log(LAST_LIQUID)
        ends_of = np.vstack([lnf[1:], lnf_bottom[None]]) if n > 1 else lnf_bottom[None]
        cut = np.argmax(ends_of < target, axis=0)
        stops = (ends_of < target).any(axis=0)
        for k in range(n):
            here = stops & (cut == k)
            if here.any():
                start = phi0[here] if k == 0 else 0.0
                last[here] = k
                y_end[here] = chain[k].y_at_phi(start + lnf[k][here] - target)
                lnf_end[here] = target
    end = "last liquid" if runs_out else bottom.kind
    return LiquidRun(chain, last, y_end, lnf, lnf_end, phi0, end)


@dataclass(frozen=True)
class _Segment:
    """The liquid's run along one branch, from y_from to y_to; `lnf_from` is ln of the liquid
    fraction (mol) at y_from and `phi_from` the branch's Scheil integral there."""

    branch: Branch
    y_from: float
    y_to: float
    phi_from: float
    lnf_from: float
    name: str

    def liquid_fraction(self, y: np.ndarray) -> np.ndarray:
        """Liquid fraction (mole fraction of the alloy's atoms) with the liquid at y."""
        return np.exp(self.lnf_from - (self.branch.phi_at(y) - self.phi_from))

    @property
    def temperatures(self) -> tuple[float, float]:
        """(hot, cold) end temperatures (K)."""
        b = self.branch
        return float(b.temperature(np.array(self.y_from))), float(b.temperature(np.array(self.y_to)))


class ScheilCooling:
    """The Scheil-Gulliver path of the alloy with mole fraction x_B of B."""

    def __init__(self, system, x_B: float) -> None:
        if not 0.0 <= x_B <= 1.0:
            raise PathError(f"mole fraction {x_B!r} is outside 0-1")
        self.system = system
        self.x_B = x_B
        self.molar_mass = molar_mass_of(system, x_B)
        self.segments: list[_Segment] = []
        self.end = ""
        self.end_invariant = None
        self.notes: list[str] = []
        self._single = self._single_solid()
        if self._single is None:
            self._walk(liquidus_branches(system))
        else:
            self.end = self._single[2]

    # --- where the liquid goes ----------------------------------------------------------------
    def _single_solid(self) -> tuple[str, float, str] | None:
        """(solid, temperature K, end kind) for an alloy that freezes at one temperature as one
        solid: a pure element, or a compound or solution at its congruent melting point."""
        from ..diagrams.diagram import map_diagram

        y0 = logit(1.0 - self.x_B, self.x_B)
        diagram = map_diagram(self.system)
        for sp in diagram.special_points:
            if LIQUID not in sp.phases:
                continue
            solid = next(p for p in sp.phases if p != LIQUID)
            if sp.kind == "melting" and abs(y0) >= PURE_END_Y and (y0 > 0) == (sp.x_B == 1.0):
                return solid, sp.temperature_K, "melting point"
            if sp.kind == "congruent" and 0.0 < sp.x_B < 1.0 and abs(y0 - logit(1.0 - sp.x_B, sp.x_B)) <= CONGRUENT_OFFSET_Y:
                return solid, sp.temperature_K, "congruent"
        if abs(y0) >= PURE_END_Y:
            raise PathError("this pure element does not melt inside the mapped temperature window")
        return None

    def _walk(self, branches: tuple[Branch, ...]) -> None:
        y0 = np.array([logit(1.0 - self.x_B, self.x_B)])
        first, _liquidus = start_branches(branches, y0)
        if first[0] < 0:
            lo, hi = self.system.temperature_range_K
            raise PathError(f"no liquidus for this alloy inside the mapped window ({lo:.0f}-{hi:.0f} K)")
        run = run_liquid(branches, branches[int(first[0])], y0)
        end = run.chain[-1].bottom.invariant
        reaction = list(end.phases) if end is not None and run.end not in ("last liquid", "window") else []
        for k, b in enumerate(run.chain[:int(run.last[0]) + 1]):
            y_from = float(y0[0]) if k == 0 else float(b.y[0])
            label = solid_label(self.system, b.solid, float(fractions_array(b.solid_y(np.array(y_from)))[1]), reaction)
            name = f"primary {label}" if k == 0 else f"{b.top.kind} {label}"
            y_to = float(run.y_end[0]) if k == run.last[0] else float(b.y[-1])
            phi = float(run.phi0[0]) if k == 0 else 0.0
            self.segments.append(_Segment(b, y_from, y_to, phi, float(run.lnf[k][0]), name))
        self.end = run.end
        last = run.chain[-1].bottom
        if run.end == "window":
            self.notes.append("liquid is left where the liquidus leaves the mapped temperature window")
        elif run.end != "last liquid":
            self.end_invariant = last.invariant
            if run.end != "eutectic":
                self.notes.append(f"the liquid reaches a {run.end} reaction; the rest is taken to freeze there")

    # --- states ---------------------------------------------------------------------------------------
    def _steps(self, seg: _Segment, ys: np.ndarray, solids: tuple[str, ...]) -> list[PathStep]:
        """States with the liquid at each y of `ys` along segment `seg`."""
        T = seg.branch.temperature(ys)
        f_mol = seg.liquid_fraction(ys)
        x_l = fractions_array(ys)[1]
        f_mass = f_mol * molar_mass_of(self.system, x_l) / self.molar_mass
        return [PathStep(float(t), float(1.0 - fm), float(1.0 - f), float(x), (LIQUID,) + solids)
                for t, fm, f, x in zip(T, f_mass, f_mol, x_l)]

    def _solids_before(self, k: int) -> tuple[str, ...]:
        names: list[str] = []
        for seg in self.segments[:k + 1]:
            if seg.branch.solid not in names:
                names.append(seg.branch.solid)
        return tuple(names)

    def _end_solids(self) -> list[tuple[str, float]]:
        inv = self.end_invariant
        last = self.segments[-1].branch
        return [(n, x) for n, x in inv.phases if not (n == LIQUID and abs(x - last.bottom.x_liquid) < _SAME_X)]

    def state_at(self, T: float, below: bool = False) -> PathStep:
        """The state at T (K); at a plateau temperature the state before the plateau, or after
        it with `below`."""
        if self._single is not None:
            solid, Tm, _kind = self._single
            done = T < Tm - SAME_K or (below and abs(T - Tm) <= SAME_K)
            return PathStep(T, float(done), float(done), None if done else self.x_B, (solid,) if done else (LIQUID,))
        if T >= self.segments[0].temperatures[0]:
            return PathStep(T, 0.0, 0.0, self.x_B, (LIQUID,))
        if self.end_K is not None and (T < self.end_K - SAME_K or (below and abs(T - self.end_K) <= SAME_K)):
            return self._solid_state(T)
        for k, seg in enumerate(self.segments):
            t_hot, t_cold = seg.temperatures
            if t_cold <= T <= t_hot:
                b = seg.branch
                y = float(invert_hermite(b.y, b.T, b.dT, np.array(T)))
                lo, hi = sorted((seg.y_from, seg.y_to))
                return self._steps(seg, np.array([min(max(y, lo), hi)]), self._solids_before(k))[0]
        return self._solid_state(T)

    def _solid_state(self, T: float) -> PathStep:
        names = list(self._solids_before(len(self.segments) - 1))
        if self.end_invariant is not None:
            names += [n for n, _ in self._end_solids() if n not in names and n != LIQUID]
        return PathStep(T, 1.0, 1.0, None, tuple(names))

    @property
    def end_K(self) -> float | None:
        """Temperature (K) where freezing ends; None where liquid is left at the window's bottom."""
        if self._single is not None:
            return self._single[1]
        if self.end == "window":
            return None
        return self.segments[-1].temperatures[1]

    # --- the record ----------------------------------------------------------------------------------
    def path(self) -> CoolingPath:
        """The whole path as a CoolingPath."""
        if self._single is not None:
            return self._single_path()
        system, M = self.system, self.molar_mass
        steps: list[PathStep] = []
        heat = 0.0
        arrests: list[Arrest] = []
        forms: list[tuple[str, float]] = []
        constituents: list[Constituent] = []
        for k, seg in enumerate(self.segments):
            b = seg.branch
            inner = b.y[(b.direction * b.y > b.direction * seg.y_from) & (b.direction * b.y < b.direction * seg.y_to)]
            ys = [seg.y_from, *inner.tolist(), seg.y_to]
            ys = np.array(ys)
            seg_steps = self._steps(seg, ys, self._solids_before(k))
            xs = fractions_array(b.solid_y(ys))[1]
            for i, s in enumerate(seg_steps):
                if i > 0:
                    prev = seg_steps[i - 1]
                    f0, f1 = 1.0 - prev.fraction_solid_mol, 1.0 - s.fraction_solid_mol
                    before = ((LIQUID, prev.liquid_x_B, f0),)
                    after = ((LIQUID, s.liquid_x_B, f1), (b.solid, 0.5 * (xs[i - 1] + xs[i]), f0 - f1))
                    heat += released_between(system, before, after, prev.temperature_K, s.temperature_K) / M
                if i > 0 or k == 0:       # at the liquidus the alloy is still all liquid
                    phases = s.phases if steps else (LIQUID,)
                    steps.append(PathStep(s.temperature_K, s.fraction_solid, s.fraction_solid_mol, s.liquid_x_B,
                                          phases, heat))
            t_hot = seg_steps[0].temperature_K
            forms.append((b.solid, t_hot))
            kind, text = ("liquidus", f"liquidus: {b.solid} starts to form") if k == 0 else \
                ("new phase", f"{b.top.kind}: {b.solid} starts to form")
            arrests.append(Arrest(t_hot, kind, text))
            constituents.append(Constituent(seg.name, seg_steps[-1].fraction_solid - seg_steps[0].fraction_solid))
        last = steps[-1]
        if self.end_invariant is not None:
            heat = self._freeze_at_invariant(steps, arrests, forms, constituents, heat)
        elif self.end == "window":
            constituents.append(Constituent("liquid left at the bottom of the window", 1.0 - last.fraction_solid))
        else:
            constituents[-1] = Constituent(constituents[-1].name, constituents[-1].mass_fraction + 1.0 - last.fraction_solid)
            arrests.append(Arrest(last.temperature_K, "end", "the last liquid freezes"))
        notes = list(self.notes) + coverage_notes(system, steps)
        return CoolingPath("scheil", system, self.x_B, steps[0].temperature_K, self.end_K, self.end, tuple(steps),
                           tuple(forms), tuple(c for c in constituents if c.mass_fraction > 0.0), heat,
                           tuple(arrests), tuple(notes))

    def _freeze_at_invariant(self, steps, arrests, forms, constituents, heat: float) -> float:
        """The rest of the liquid freezes at the invariant reaction's temperature."""
        last = steps[-1]
        T = last.temperature_K
        solids = self._end_solids()
        f_liq = 1.0 - last.fraction_solid_mol
        (n1, x1), (n2, x2) = solids[0], solids[-1]
        x_l = last.liquid_x_B
        after = ((n1, x1, f_liq * (x2 - x_l) / (x2 - x1)), (n2, x2, f_liq * (x_l - x1) / (x2 - x1))) \
            if len(solids) == 2 else ((n1, x1, f_liq),)
        plateau = released_between(self.system, ((LIQUID, x_l, f_liq),), after, T, T) / self.molar_mass
        heat += plateau
        end = self._solid_state(T)
        steps.append(PathStep(T, 1.0, 1.0, None, end.phases, heat))
        present = {f[0] for f in forms}
        forms += [(n, T) for n, _ in solids if n not in present and n != LIQUID]
        arrests.append(Arrest(T, "plateau", f"{self.end} plateau: {describe_reaction(self.system, self.end_invariant)}",
                              plateau))
        constituents.append(Constituent(f"{self.end} {reaction_products(self.system, solids)}", 1.0 - last.fraction_solid))
        return heat

    def _single_path(self) -> CoolingPath:
        solid, T, kind = self._single
        x = self.x_B if kind == "congruent" else float(round(self.x_B))
        plateau = released_between(self.system, ((LIQUID, x, 1.0),), ((solid, x, 1.0),), T, T) / self.molar_mass
        steps = (PathStep(T, 0.0, 0.0, self.x_B, (LIQUID,)), PathStep(T, 1.0, 1.0, None, (solid,), plateau))
        arrests = (Arrest(T, "plateau", f"{kind} plateau: liquid -> {solid}", plateau),)
        return CoolingPath("scheil", self.system, self.x_B, T, T, kind, steps, ((solid, T),),
                           (Constituent(f"primary {solid}", 1.0),), plateau, arrests, ())
