"""Scheil-Gulliver cooling of an alloy of any number of elements: complete mixing in the liquid,
no diffusion in the solid (E. Scheil, Z. Metallkd. 34 (1942) 70; G.H. Gulliver, J. Inst. Met. 9
(1913) 120), computed stepwise from point equilibria of the remaining liquid as in H.L. Lukas,
S.G. Fries and B. Sundman, Computational Thermodynamics: The Calphad Method, Cambridge (2007).

The liquid (f_L moles of atoms per mole of alloy, composition x_L) is followed down in
temperature. The mass balance d(f_L x_L) = x_S d(f_L) (x_S: the solid forming at that moment)
is integrated one step of h K at a time with the trapezoid rule: the solid that forms in the
step is taken as half the solid forming at the step's start and half the solid in equilibrium
with the liquid at its end, found by a point equilibrium of the composition
z* = (f_L x_L - D/2 x_S,start) / (f_L - D/2) at T - h, with D (the step's solid) solved from the
linear dependence of that equilibrium's solid amount on D (two point equilibria: D = 0, which
is the first-order step, and D from it; the liquid at the solved D is interpolated between
them, linear in D as the lever rule is). Where one solid forms, from a stage's second step on,
the solid of the step is then taken from the quadratic through the solid's compositions at the
step's end, at its start and at the previous step's start (in the amount frozen: the
Adams-Moulton formula of order three for unequal steps, E. Hairer, S.P. Norsett, G. Wanner,
Solving Ordinary Differential Equations I, 2nd ed., Springer (1993), section III.5), the liquid
taking the difference; that difference, the trapezoid step's own error, sets the next step
(with a local error of order h^4, steps of a few K reach the accuracy for which the trapezoid
needed steps under 1 K), and the step's heat is weighted the same way. Elsewhere (a stage's
first step; several solids forming together, whose mean composition in the liquid's
equilibrium is not what forms) the step is the trapezoid step, and its difference from the
first-order step sets the next. Mass balance is exact at every step: the solid of a step is
what leaves the liquid.

Where the stable phases of the liquid's equilibrium change (a new solid starts to form, one
stops, or no liquid is left) within a step, the step is halved until it is at most EVENT_STEP_K
long, and the change is then narrowed to EVENT_TOLERANCE_K (a solid splitting into two of its
structure: SPLIT_TOLERANCE_K) (engine/diagrams/phase_change.py). Freezing ends where
the liquid freezes at once into several solids (an invariant reaction: `eutectic` with two,
`ternary eutectic` with three, ...), where it freezes into one solid (`last liquid`), at the
bottom of the window, or where the remaining liquid leaves the range of compositions the model
covers (System.covered; end `outside covered range`): the path is not followed outside it, and
a note says where and how much liquid was left. Constituents are named by what forms together.

Temperatures in K, compositions in mole fractions of every element, amounts as fractions of
the alloy, heats in J per gram of alloy (H = G - T dG/dT of each phase from its model).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..diagrams.isopleth import covered_range_words
from ..diagrams.phase_change import narrow_change, phase_set
from ..minimize.equilibrium import equilibrate
from .alloy_records import (LIQUID, AlloyConstituent, AlloyPath, AlloyStep, forming_together, labelled, molar_mass,
                            phase_enthalpy, solid_enthalpy)
from .records import Arrest, PathError

#: Phase changes are bracketed to this width (K).
EVENT_TOLERANCE_K = 1e-7
#: A solid that splits into two of its own structure (a carat gold's fcc opening its miscibility
#: gap) is bracketed to this width (K) instead: no amount or driving force falls to zero there,
#: and the minimiser's near-tie places the split only to about a millikelvin (measured on
#: 14ct-1N: the split's driving force turns negative 1.1e-3 K above where it is reported), so
#: a narrower bracket pins that artefact, at about 28 point equilibria for the gold.
SPLIT_TOLERANCE_K = 1e-3
#: Target of the first-order step's local deviation from the trapezoid step (mole fraction), for a
#: stage's first step.
STEP_TOLERANCE = 2e-4
#: Target of the trapezoid step's local deviation from the third-order step (mole fraction in the
#: liquid), for every later step.
THIRD_ORDER_TOLERANCE = 3e-5
_FIRST_STEP_K = 2.0
#: A change of the liquid's phases is narrowed inside a step of at most this many K; longer steps
#: that meet one are halved first (the change is placed for the liquid at the step's start).
EVENT_STEP_K = 4.0
_MAX_STEP_K = 20.0
_MIN_STEP_K = 1e-5
_LIQUID_SEARCH_STEP_K = 50.0
#: Where the liquid leaves the covered range, the last step inside ends within this many K of it.
RANGE_STEP_K = 0.05
_MAX_STEPS = 5000
#: The path's `end` where the remaining liquid leaves the range of compositions the model covers.
OUTSIDE_RANGE = "outside covered range"
#: How many of its last point equilibria a path remembers.
_REMEMBERED = 8
#: Freezing ends when less than this share of the alloy's atoms is liquid.
LAST_LIQUID = 1e-6


def _equilibrium(system, T: float, x: np.ndarray, near=None):
    """Point equilibrium at T (K) of mole fractions x (every element); `near`, an equilibrium at
    a nearby temperature and composition (the path's last), starts the minimiser from its phases
    (the answer is checked as from any start)."""
    if len(x) == 2:
        return equilibrate(system, T, float(x[1]))
    return equilibrate(system, T, x, near=near)


def _split(eq):
    """(the liquid's share or None, the solid shares) of a point equilibrium."""
    liquid = next((p for p in eq.phases if p.name == LIQUID), None)
    return liquid, [p for p in eq.phases if p.name != LIQUID]


def _solid_amount(eq) -> float:
    return sum(p.amount_mol for p in eq.phases if p.name != LIQUID)


def _mean_x(shares) -> np.ndarray:
    total = sum(p.amount_mol for p in shares)
    return sum(p.amount_mol * np.asarray(p.x, dtype=float) for p in shares) / total


def _blend_x(blend) -> np.ndarray:
    """Mole fractions of a blend ((weight, share), ...) of point-equilibrium phase shares."""
    return sum(w * np.asarray(p.x, dtype=float) for w, p in blend)


@dataclass
class _State:
    """The liquid at T (K): f_L moles of atoms per mole of alloy; the liquid as a blend of phase
    shares of point equilibria ((weight, share), weights summing to 1: one share, or two where a
    step interpolates between two equilibria), less `shift` (mole fractions: the third-order
    step's correction, None for none); the solids forming with it (shares, None before a
    stage's first step), the phase set of the liquid's equilibrium and a point equilibrium near
    T with that phase set (where the next step's minimiser starts). Within a stage after its
    first step: `solid_x`, the mole fractions of the solid forming at T (interpolated as the
    liquid is), and `behind`, (the moles of solid of the step that ended at T, the mole
    fractions of the solid forming at that step's start, the temperature there in K, the solids
    forming there)."""

    T: float
    f_L: float
    liquid: tuple[tuple[float, object], ...]
    forming: list | None
    key: tuple[str, ...]
    eq: object
    shift: np.ndarray | None = None
    solid_x: np.ndarray | None = None
    behind: tuple[float, np.ndarray, float, list] | None = None

    @property
    def x_L(self) -> np.ndarray:
        x = _blend_x(self.liquid)
        return x if self.shift is None else x - self.shift

    def liquid_enthalpy(self, system, T: float) -> float:
        """The liquid's enthalpy (J per mole of atoms) at T (K), blended as its composition."""
        return sum(w * phase_enthalpy(system, p, T) for w, p in self.liquid)


@dataclass
class _Stage:
    """Solid formed while one set of solids forms together: its name, moles of atoms, moles of
    each element and mass (g per mole of alloy)."""

    name: str
    mol: float = 0.0
    elements: np.ndarray | None = None
    mass: float = 0.0

    def add(self, moles: float, x: np.ndarray, mass: float) -> None:
        self.mol += moles
        self.elements = moles * x if self.elements is None else self.elements + moles * x
        self.mass += mass


def _third_order_weights(h1: float, h2: float) -> tuple[float, float, float]:
    """The weights (before, start, end) that give the mean over a step of a quantity of the solid
    forming (its mole fractions, the temperature it forms at) from the quadratic through three
    nodes spaced h1 (the previous step) and h2 (this step) in moles frozen: the three-node
    Adams-Moulton formula for unequal steps (Hairer, Norsett and Wanner 1993, section III.5),
    -1/12, 8/12, 5/12 for equal steps. The trapezoid's are (0, 1/2, 1/2)."""
    w_end = (2.0 * h2 + 3.0 * h1) / (6.0 * (h1 + h2))
    w_before = -h2 * h2 / (6.0 * h1 * (h1 + h2))
    return w_before, 1.0 - w_end - w_before, w_end


class AlloyScheil:
    """The Scheil-Gulliver path of the alloy with mole fractions `x` (every element, summing to 1)."""

    def __init__(self, system, x) -> None:
        self.system = system
        self.x = np.asarray(x, dtype=float)
        self.M = molar_mass(system, self.x)
        self.steps: list[AlloyStep] = []
        self.arrests: list[Arrest] = []
        self.forms: list[tuple[str, float]] = []
        self.stages: list[_Stage] = []
        self.current: _Stage | None = None
        self.heat = 0.0                       # J per mole of alloy
        self.end_K: float | None = None
        self.end = "window"
        self.left_range = False               # whether the liquid left the covered range at the path's end
        self.calls = 0
        self.unconverged: list[float] = []     # temperatures (K) of point equilibria that did not converge
        self.recent: dict[tuple[float, bytes], object] = {}   # the last point equilibria, by (T, x)

    # --- point equilibria --------------------------------------------------------------------
    def _eq(self, T: float, x: np.ndarray, near=None):
        """The point equilibrium at T (K) of x; the last few are remembered (an event's
        narrowing asks again for the step's own equilibrium and its last probe)."""
        key = (float(T), np.asarray(x, dtype=float).tobytes())
        eq = self.recent.get(key)
        if eq is not None:
            return eq
        self.calls += 1
        eq = _equilibrium(self.system, T, x, near)
        if not eq.converged:
            self.unconverged.append(T)
        self.recent[key] = eq
        if len(self.recent) > _REMEMBERED:
            del self.recent[next(iter(self.recent))]
        return eq

    def _probe(self, T_top: float, x: np.ndarray, start):
        """probe(offset): the point equilibrium of x at T_top - offset (K), for narrowing a change,
        started from `start`, the equilibrium on the side the change begins from. (Starting from
        the nearest probe tried instead took about 3 % more probes over the shipped alloys: within
        1e-7 K of an invariant two phase sets tie within the minimiser's tolerance, and a start
        from the far side tips such probes over, so the narrowing falls back to bisection.)"""
        def probe(offset: float):
            return self._eq(T_top - offset, x, near=start)
        return probe

    # --- the path ----------------------------------------------------------------------------
    def path(self) -> AlloyPath:
        lo, _hi = self.system.temperature_range_K
        state, below = self._liquidus()
        self._record(state)
        self.liquidus_K = state.T
        self._change(state, below)
        h = _FIRST_STEP_K
        change_below = None         # a temperature (K) above which the liquid's phases are known to change
        for _ in range(_MAX_STEPS):
            if state.f_L <= LAST_LIQUID or self.end_K is not None or self.left_range:
                break
            if change_below is not None:
                h = min(h, state.T - change_below)
            if state.T - h < lo:
                h = state.T - lo
                if h <= EVENT_TOLERANCE_K:
                    break
            step = self._step(state, h)
            if step is None:                              # the phase set changes within the step
                if h > EVENT_STEP_K:
                    change_below, h = state.T - h, 0.5 * h
                    continue
                state = self._event(state, h)
                change_below, h = None, _FIRST_STEP_K
                continue
            new, error, order = step
            if error > 4.0 and h > _MIN_STEP_K:
                h *= 0.3
                continue
            if not self.system.covered(new.x_L):
                if h > RANGE_STEP_K:
                    h = max(0.3 * h, 0.5 * RANGE_STEP_K)
                else:
                    self.left_range = True
                continue
            self._accept(state, new, h)
            state = new
            if change_below is not None and state.T - change_below <= EVENT_TOLERANCE_K:
                change_below = None     # the liquid moved on: where its phases change is not known
            h = min(_MAX_STEP_K, max(_MIN_STEP_K, h * min(2.0, max(0.3, 0.9 * max(error, 1e-30) ** (-1.0 / order)))))
        else:
            raise PathError("the Scheil path did not reach the end of freezing in its step limit")
        if self.end_K is None and state.f_L <= LAST_LIQUID:
            self._finish_last_liquid(state)
        return self._result(state)

    def _liquidus(self):
        """(the all-liquid state at the liquidus, the point equilibrium just below it)."""
        system = self.system
        lo, top = system.temperature_range_K
        ceiling = system.model_range_K[1]
        T = min(top, ceiling)
        eq = self._eq(T, self.x)
        while phase_set(eq) != (LIQUID,):
            if T >= ceiling:
                raise PathError(f"the alloy is not all liquid at the top of the models' range ({ceiling:.0f} K)")
            T = min(T + _LIQUID_SEARCH_STEP_K, ceiling)
            eq = self._eq(T, self.x)
        below = self._eq(lo, self.x)
        if phase_set(below) == (LIQUID,):
            raise PathError(f"no liquidus for this alloy inside the window ({lo:.0f}-{top:.0f} K)")
        near, _far, hot, below = narrow_change(self._probe(T, self.x, eq), 0.0, T - lo, (LIQUID,),
                                               eq, below, EVENT_TOLERANCE_K, self.system)
        T_hot = T - near
        return _State(T_hot, 1.0, ((1.0, _split(hot)[0]),), None, (LIQUID,), hot), below

    def _step(self, state: _State, h: float):
        """(the state h K lower, its error estimate as a share of its tolerance, the power of h
        the estimate grows with), or None where the phase set changes."""
        T1 = state.T - h
        x_L, f_L = state.x_L, state.f_L
        first = self._eq(T1, x_L, near=state.eq)
        if phase_set(first) != state.key:
            return None
        d0 = f_L * _solid_amount(first)
        start = state.forming if state.forming else _split(first)[1]
        x_start = state.solid_x if state.solid_x is not None else _mean_x(start)

        def trapezoid(d: float):
            """The equilibrium at T1 of the liquid less half the step's solid d at the step's
            start composition, and that liquid's amount."""
            m = f_L - 0.5 * d
            z = (f_L * x_L - 0.5 * d * x_start) / m
            if np.any(z < 0.0):
                return None
            eq = self._eq(T1, z / z.sum(), near=first)
            return (eq, m) if phase_set(eq) == state.key else None

        first_liquid, first_solids = _split(first)
        f_first = f_L * (1.0 - _solid_amount(first))
        guess = trapezoid(d0) if d0 > 0.0 else None
        if guess is not None:
            eq, m = guess
            s1 = m * _solid_amount(eq)
            denominator = 3.0 * d0 - 2.0 * s1
            d = 2.0 * d0 * d0 / denominator if denominator > 0.0 else 2.0 * s1
            t = d / d0
            trial = ((1.0 - t, first_liquid), (t, _split(eq)[0]))
            if 0.0 < t < 2.0 and np.all(_blend_x(trial) >= 0.0):
                new = _State(T1, f_L - d, trial, _split(eq)[1], state.key, eq)
                if len(first_solids) == 1:      # one solid: its composition is smooth in the amount frozen
                    new.solid_x = (1.0 - t) * _mean_x(first_solids) + t * _mean_x(new.forming)
                    new.behind = (d, x_start, state.T, start)
                    if state.behind is not None:
                        w_before, w_start, w_end = _third_order_weights(state.behind[0], d)
                        excess = w_before * state.behind[1] + (w_start - 0.5) * x_start + (w_end - 0.5) * new.solid_x
                        new.shift = d * excess / new.f_L
                        if np.all(new.x_L >= 0.0):
                            return new, float(np.max(np.abs(new.shift))) / THIRD_ORDER_TOLERANCE, 3
                        new.shift = None
                        return new, np.inf, 3
                error = abs(d - d0) + float(np.max(np.abs(_blend_x(trial) - np.asarray(first_liquid.x))))
                return new, error / STEP_TOLERANCE, 2
        return _State(T1, f_first, ((1.0, first_liquid),), first_solids, state.key, first), 0.0, 2

    def _accept(self, old: _State, new: _State, h: float) -> None:
        """Book the solid of one step: its stage, its mass and the heat released."""
        system = self.system
        d = old.f_L - new.f_L
        if d <= 0.0:
            self._record(new)
            return
        x_solid = (old.f_L * old.x_L - new.f_L * new.x_L) / d
        mass = old.f_L * molar_mass(system, old.x_L) - new.f_L * molar_mass(system, new.x_L)
        self.current.add(d, x_solid, mass)
        start = old.forming if old.forming else new.forming
        if new.shift is None:                   # the trapezoid: half the solid as at either end
            T_mid = old.T - 0.5 * h
            h_solid = 0.5 * (solid_enthalpy(system, start, x_solid, T_mid)
                             + solid_enthalpy(system, new.forming, x_solid, T_mid))
        else:                                   # weighted as the third-order step weighs the solid
            w_before, w_start, w_end = _third_order_weights(old.behind[0], d)
            T_mid = w_before * old.behind[2] + w_start * old.T + w_end * new.T
            h_solid = (w_before * solid_enthalpy(system, old.behind[3], x_solid, T_mid)
                       + w_start * solid_enthalpy(system, start, x_solid, T_mid)
                       + w_end * solid_enthalpy(system, new.forming, x_solid, T_mid))
        self.heat += (old.f_L * old.liquid_enthalpy(system, T_mid) - new.f_L * new.liquid_enthalpy(system, T_mid)
                      - d * h_solid)
        self._record(new)

    def _event(self, state: _State, h: float) -> _State:
        """Narrow the change of phases within a step of h K below `state`, move there, and start
        the next stage (or end freezing)."""
        probe = self._probe(state.T, state.x_L, state.eq)
        far = probe(h)
        far_key = phase_set(far)
        gained = {n for n in far_key if far_key.count(n) > state.key.count(n)}
        splits = bool(gained) and gained <= set(state.key)
        lo, _hi, _above, below = narrow_change(probe, 0.0, h, state.key, None, far,
                                                 SPLIT_TOLERANCE_K if splits else EVENT_TOLERANCE_K, self.system)
        if lo > 0.0:
            step = self._step(state, lo)
            if step is not None and not self.system.covered(step[0].x_L):
                self.left_range = True           # the main loop narrows where the liquid leaves the range
                return state
            if step is not None:
                new, error, order = step
                if order == 3 and error > 4.0:        # the correction is not to be trusted this close
                    new.shift = None
                self._accept(state, new, lo)
                state = new
        self._change(state, below)
        return state

    def _change(self, state: _State, below) -> None:
        """The liquid's phases change just below state.T: start the next stage, or freeze the
        rest of the liquid there."""
        liquid, solids = _split(below)
        T = state.T
        known = {n for n, _ in self.forms}
        order = {n: k for k, (n, _) in enumerate(self.forms)}
        solids = sorted(solids, key=lambda p: order.get(p.name, len(order)))
        names = labelled(self.system, solids)
        if liquid is None:
            self._freeze_rest(state, solids, names)
            return
        before = [n for n in state.key if n != LIQUID]
        new = [n for n in names if n not in known]
        self.forms += [(n, T) for n in new]
        if not self.stages:
            kind = "primary" if len(solids) == 1 else forming_together(len(solids))
            self.arrests.append(Arrest(T, "liquidus", f"liquidus: {' + '.join(names)} start{'s' if len(names) == 1 else ''} to form"))
        else:
            kind = forming_together(len(solids)) if len(solids) > 1 else "peritectic"
            gone = [n for n in before if n not in {p.name for p in solids}]
            what = [f"{n} starts to form" for n in new] + [f"{n} stops forming" for n in gone]
            self.arrests.append(Arrest(T, "new phase", f"{kind}: {', '.join(what) or 'the solids change'}"))
        self._start_stage(f"{kind} {' + '.join(names)}")
        state.key, state.forming, state.eq = phase_set(below), solids, below
        state.solid_x, state.behind = None, None

    def _start_stage(self, name: str) -> None:
        """Solid formed from now on belongs to the constituent `name` (one per name)."""
        self.current = next((s for s in self.stages if s.name == name), None)
        if self.current is None:
            self.current = _Stage(name)
            self.stages.append(self.current)

    def _freeze_rest(self, state: _State, solids, names) -> None:
        """No liquid is left just below state.T: the rest freezes there at once."""
        system = self.system
        T = state.T
        f_L = state.f_L
        plateau = f_L * (state.liquid_enthalpy(system, T) - solid_enthalpy(system, solids, state.x_L, T))
        self.heat += plateau
        mass = f_L * molar_mass(system, state.x_L)
        if len(solids) > 1:
            self.end = forming_together(len(solids))
            self._start_stage(f"{self.end} {' + '.join(names)}")
            self.arrests.append(Arrest(T, "plateau", f"{self.end} plateau: liquid -> {' + '.join(names)}",
                                       float(plateau / self.M)))
        else:
            self.end = "last liquid"
            if not self.stages:
                self.end = "melting point" if float(np.max(self.x)) > 1.0 - 1e-12 else "congruent"
                self._start_stage(f"primary {names[0]}")
                self.forms.append((names[0], T))
                self.arrests.append(Arrest(T, "plateau", f"{self.end} plateau: liquid -> {names[0]}", plateau / self.M))
            else:
                self.arrests.append(Arrest(T, "end", "the last liquid freezes"))
        self.forms += [(n, T) for n in names if n not in {f for f, _ in self.forms}]
        self.current.add(f_L, state.x_L, mass)
        self.end_K = T
        state.f_L = 0.0
        self.steps.append(AlloyStep(T, 1.0, 1.0, None, tuple(names), self.heat / self.M))

    def _finish_last_liquid(self, state: _State) -> None:
        """The liquid left is below LAST_LIQUID: it joins the last stage."""
        self.current.add(state.f_L, state.x_L, state.f_L * molar_mass(self.system, state.x_L))
        self.end, self.end_K = "last liquid", state.T
        self.arrests.append(Arrest(state.T, "end", "the last liquid freezes"))
        solids = tuple(n for n in state.key if n != LIQUID)
        state.f_L = 0.0
        self.steps.append(AlloyStep(state.T, 1.0, 1.0, None, solids, self.heat / self.M))

    def _record(self, state: _State) -> None:
        f_mass = state.f_L * molar_mass(self.system, state.x_L) / self.M
        solids = tuple(n for n in state.key if n != LIQUID)
        self.steps.append(AlloyStep(state.T, 1.0 - f_mass, 1.0 - state.f_L, tuple(float(v) for v in state.x_L),
                                    (LIQUID,) + solids, self.heat / self.M))

    def _result(self, state: _State) -> AlloyPath:
        notes: list[str] = []
        if self.unconverged:
            notes.append(f"{len(self.unconverged)} point equilibria between {min(self.unconverged):.1f} and "
                         f"{max(self.unconverged):.1f} K did not converge: treat the path there with suspicion")
        constituents = [AlloyConstituent(s.name, float(s.mass / self.M), float(s.mol), tuple(float(v) for v in s.elements / s.mol))
                        for s in self.stages if s.mol > 0.0]
        if self.end_K is None:
            f_mass = state.f_L * molar_mass(self.system, state.x_L) / self.M
            where = "where it leaves the covered range" if self.left_range else "at the bottom of the window"
            constituents.append(AlloyConstituent(f"liquid left {where}", f_mass, state.f_L,
                                                 tuple(float(v) for v in state.x_L)))
            if self.left_range:
                self.end = OUTSIDE_RANGE
                notes.append(f"the remaining liquid ({100 * f_mass:.3g} mass % of the alloy) leaves the range this model "
                             f"covers ({covered_range_words(self.system)}) at the path's last temperature: the Scheil "
                             "path is not followed further")
            else:
                notes.append("liquid is left at the bottom of the window")
        return AlloyPath("scheil", self.system, tuple(float(v) for v in self.x), self.liquidus_K, self.end_K,
                         self.end, tuple(self.steps), tuple(self.forms), tuple(constituents), self.heat / self.M,
                         tuple(self.arrests), tuple(notes))


def alloy_scheil(system, x) -> AlloyPath:
    """The Scheil-Gulliver path of the alloy with mole fractions `x` (every element of `system`,
    summing to 1), from its liquidus to the end of freezing. Raises PathError (a ValueError)
    with one line where no path can be computed."""
    x = np.asarray(x, dtype=float)
    if x.shape != (len(system.elements),) or np.any(x < 0.0) or abs(x.sum() - 1.0) > 1e-9:
        raise PathError(f"expected {len(system.elements)} non-negative mole fractions summing to 1")
    return AlloyScheil(system, x).path()
