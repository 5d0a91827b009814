"""Fitting a system's free coefficients to its measured facts (`ladle fit`).

Weighted nonlinear least squares: the residual of each measured number is
(model - measured) / u, with u its standard uncertainty, and the sum of their squares
(chi-square) is minimised over the coefficients named in [fit] free by scipy.optimize.least_squares
(trust-region reflective method: M.A. Branch, T.F. Coleman and Y. Li, SIAM J. Sci. Comput. 21
(1999) 1-23), with a finite-difference Jacobian. Each evaluation rebuilds the System from the
edited document with the loader, so every value the fit tries is a valid system file.

Uncertainties of the result: the covariance of the coefficients is (J^T J)^-1, J the Jacobian of
the weighted residuals at the solution. Where the fit's chi-square per degree of freedom exceeds
one (the measurements scatter more than their stated uncertainties), the standard uncertainties
are enlarged by the Birge ratio sqrt(chi-square / degrees of freedom) (R.T. Birge, Phys. Rev. 40
(1932) 207-227); they are never shrunk below what the stated uncertainties give.

Afterwards the fitted model is judged on its stable diagram (engine/measure.py): a measured
reaction, tie-line or boundary that the fitted model does not have makes the fit unacceptable
(its topology is wrong), as does a fit that did not converge or whose measurements do not
determine every free coefficient (a coefficient whose standard uncertainty exceeds its value, or
that is correlated with another beyond 0.99, is "not determined").

Units: temperatures in K, compositions in at% of B, coefficients in J/mol times powers of K.
"""

from __future__ import annotations

import copy
import time
from dataclasses import dataclass, replace
from typing import Callable

import numpy as np

from ..diagrams.diagram import map_diagram
from ..diagrams.mappable import unmapped_phases
from ..errors import SystemFileError
from .parameters import ParameterPath, ParameterPathError, parse_free
from .targets import Target, TargetInputError, TargetLost, make_target
from ..files.loader import load_system
from ..checking.measure import FactOutcome, describe, evaluate_all, outside_coverage
from ..models.polynomials import TemperatureOutOfRange

#: Weighted residual given to each value of a target the trial model has lost: large enough
#: that the optimiser steps back, finite so that it can.
LOST_PENALTY = 1.0e3
#: Correlations at least this large (in absolute value) are reported (common practice: 0.9).
HIGH_CORRELATION = 0.9
#: A pair of coefficients correlated beyond this (in absolute value) is not determined separately:
#: the measurements fix one combination of them, not each.
DEGENERATE_CORRELATION = 0.99
#: Relative finite-difference step on the scaled coefficients (a change of about 1e-3 J/mol).
DIFF_STEP = 1e-6
#: A combination of coefficients whose standard uncertainty exceeds this many scaled units
#: (each unit changes G by 1 kJ/mol at the reference temperature: engine/fit_parameters.py) is
#: not determined by the measurements. The limit lies far above any determined coefficient and
#: far below the finite-difference noise of a coefficient that affects no measurement.
UNDETERMINED_SCALED = 100.0

Progress = Callable[[int, float], None]


class FitInputError(ValueError):
    """The measurements file cannot be fitted as written (one line naming file, key and value)."""


@dataclass(frozen=True)
class FittedParameter:
    """One free coefficient: its dotted path, starting and fitted values, the standard
    uncertainty of the fitted value (None where the measurements do not determine it at all), and
    whether it is determined: not where its uncertainty is None or exceeds its value, or where it
    is correlated with another coefficient beyond DEGENERATE_CORRELATION."""

    path: str
    start: float
    value: float
    uncertainty: float | None
    determined: bool = True


@dataclass(frozen=True)
class FitResult:
    """The outcome of a fit.

    `system` and `document` are the fitted model; `outcomes` compare it (stable equilibria) with
    every measured fact; `chi_square` is the sum of squared weighted residuals at the solution
    (`start_chi_square` at the starting values); `uncertainty_scale` is the factor (>= 1) applied
    to the standard uncertainties; `problems` lists, one line each, why the result should not be
    used (empty for a good fit); `seconds` is the wall time.
    """

    system: object
    document: dict
    parameters: tuple[FittedParameter, ...]
    correlations: tuple[tuple[str, str, float], ...]
    outcomes: tuple[FactOutcome, ...]
    chi_square: float
    start_chi_square: float
    degrees_of_freedom: int
    uncertainty_scale: float
    converged: bool
    solver_message: str
    problems: tuple[str, ...]
    evaluations: int
    seconds: float

    @property
    def acceptable(self) -> bool:
        return self.converged and not self.problems

    @property
    def reduced_chi_square(self) -> float | None:
        return self.chi_square / self.degrees_of_freedom if self.degrees_of_freedom > 0 else None


class _Objective:
    """The weighted residuals as a function of the scaled coefficients."""

    def __init__(self, system, paths: list[ParameterPath], scales: np.ndarray, targets: list[Target],
                 progress: Progress | None) -> None:
        self.system = system
        self.doc = copy.deepcopy(system.document)
        self.paths = paths
        self.scales = scales
        self.targets = targets
        self.measured = np.array([q.measured for t in targets for q in t.quantities])
        self.uncertainty = np.array([q.uncertainty for t in targets for q in t.quantities])
        self.progress = progress
        self.evaluations = 0
        self.lost: list[tuple[Target, str]] = []

    def document(self, p: np.ndarray) -> dict:
        for path, v, s in zip(self.paths, p, self.scales):
            path.set(self.doc, float(v) * s)
        return self.doc

    def build(self, p: np.ndarray):
        return fitting_view(load_system(self.system.path, name=self.system.name, document=self.document(p)))

    def __call__(self, p: np.ndarray) -> np.ndarray:
        self.evaluations += 1
        self.lost = []
        try:
            system = self.build(p)
        except (SystemFileError, TemperatureOutOfRange) as e:
            self.lost = [(t, str(e)) for t in self.targets]
            system = None
        out = []
        for t in self.targets:
            n = len(t.quantities)
            if system is None:
                out += [LOST_PENALTY] * n
                continue
            try:
                out += t.values(system)
            except TargetLost as e:
                self.lost.append((t, str(e)))
                out += [None] * n
        r = np.array([LOST_PENALTY if v is None else (v - m) / u
                      for v, m, u in zip(out, self.measured, self.uncertainty)], dtype=float)
        if self.progress is not None:
            self.progress(self.evaluations, float(r @ r))
        return r


def fitting_view(system):
    """The system as its fit sees it: covering the compositions of `[fit] facts_at_percent` where
    the file gives them (a file that others build on, fitted to facts of their ranges too), so that
    facts there are measured and its diagram is mapped over them."""
    return system if system.fit_covers is None else replace(system, covers=system.fit_covers)


def _prepare(system) -> tuple[list[ParameterPath], list[Target]]:
    """Free parameters and targets of a measurements file, each checked (FitInputError)."""
    name = system.path.name
    if not system.fit_free:
        raise FitInputError(f"{name}: fit.free: missing; name the coefficients to fit, such as [fit] free = [\"liquid.L.0.a\"]")
    if not system.measured:
        raise FitInputError(f"{name}: measured: the file holds no [[measured]] facts to fit to")
    try:
        paths = parse_free(system.fit_free, copy.deepcopy(system.document))
    except ParameterPathError as e:
        raise FitInputError(f"{name}: {e}") from None
    for f in system.measured:
        reason = outside_coverage(system, f)
        if reason is not None:
            raise FitInputError(f"{name}: measured[{f.index}]: {reason}")
    binary = len(system.elements) == 2
    point_equilibria = binary and bool(unmapped_phases(system))
    if point_equilibria and any(f.kind == "invariant" for f in system.measured):
        raise FitInputError(f"{name}: measured: an invariant of a binary with sublattice phases is not fitted (its "
                            "diagram is not traced); give its liquidus, solidus or tie-line ends instead")
    diagram = map_diagram(system) if binary and not point_equilibria and any(f.kind == "invariant" for f in system.measured) else None
    try:
        targets = [make_target(f, diagram, tuple(system.elements), point_equilibria) for f in system.measured]
    except TargetInputError as e:
        raise FitInputError(f"{name}: {e}") from None
    m = sum(len(t.quantities) for t in targets)
    if m < len(paths):
        raise FitInputError(f"{name}: {len(paths)} free coefficients but only {m} measured values; "
                            f"free fewer coefficients or add measurements")
    return paths, targets


def _covariance(jac: np.ndarray, scales: np.ndarray, paths: list[ParameterPath]) -> tuple[np.ndarray, list[str]]:
    """Covariance of the coefficients (their own units) from the Jacobian of the weighted
    residuals in scaled coefficients, and the paths the measurements do not determine."""
    _u, s, vt = np.linalg.svd(jac, full_matrices=False)
    good = s > 1.0 / UNDETERMINED_SCALED
    undetermined = []
    if not good.all():
        null = vt[~good]
        undetermined = [p.text for k, p in enumerate(paths) if np.max(np.abs(null[:, k])) > 1e-3]
    inv = np.where(good, 1.0 / np.where(good, s, 1.0) ** 2, 0.0)
    cov = (vt.T * inv) @ vt
    return cov * np.outer(scales, scales), undetermined


def fit(system, progress: Progress | None = None, max_steps: int | None = None) -> FitResult:
    """Fit the coefficients named in `system.fit_free` to `system.measured`.

    `progress(evaluations, chi_square)` is called after every evaluation of the model;
    `max_steps` bounds the optimiser's trial points (default: scipy's 100 per coefficient).
    Raises FitInputError for a file that cannot be fitted as written.
    """
    from scipy.optimize import least_squares

    started = time.perf_counter()
    system = fitting_view(system)
    paths, targets = _prepare(system)
    T_ref = 0.5 * sum(system.temperature_range_K)
    scales = np.array([p.scale(T_ref) for p in paths])
    start_doc = copy.deepcopy(system.document)
    starts = np.array([p.get(start_doc) for p in paths])
    objective = _Objective(system, paths, scales, targets, progress)
    x0 = starts / scales
    r0 = objective(x0)
    if objective.lost:
        t, why = objective.lost[0]
        raise FitInputError(f"{system.path.name}: measured[{t.fact.index}] ({describe(t.fact, system)}): "
                            f"the starting model has none: {why}; change the starting values")
    result = least_squares(objective, x0, method="trf", diff_step=DIFF_STEP, max_nfev=max_steps)
    r = objective(result.x)
    lost = list(objective.lost)
    document = copy.deepcopy(objective.document(result.x))
    fitted = fitting_view(load_system(system.path, name=system.name, document=document))
    outcomes = tuple(evaluate_all(fitted, fitted.measured))

    chi2 = float(r @ r)
    dof = len(r) - len(paths)
    scale = max(1.0, float(np.sqrt(chi2 / dof))) if dof > 0 else 1.0
    cov, undetermined = _covariance(result.jac, scales, paths)
    cov *= scale**2
    sd = np.sqrt(np.clip(np.diag(cov), 0.0, None))
    values = result.x * scales
    correlations = []
    for i in range(len(paths)):
        for j in range(i + 1, len(paths)):
            if sd[i] > 0 and sd[j] > 0 and paths[i].text not in undetermined and paths[j].text not in undetermined:
                c = float(cov[i, j] / (sd[i] * sd[j]))
                if abs(c) >= HIGH_CORRELATION:
                    correlations.append((paths[i].text, paths[j].text, c))
    loose = [p.text for p, v, u in zip(paths, values, sd) if p.text not in undetermined and u > abs(v)]
    degenerate = list(dict.fromkeys(n for a, b, c in correlations if abs(c) > DEGENERATE_CORRELATION for n in (a, b)))
    params = tuple(FittedParameter(p.text, float(s0), float(v), None if p.text in undetermined else float(u),
                                   p.text not in undetermined + loose + degenerate)
                   for p, s0, v, u in zip(paths, starts, values, sd))

    problems = []
    if undetermined:
        problems.append(f"the measurements do not determine {', '.join(undetermined)} (separately); "
                        f"free fewer coefficients or add measurements that depend on them")
    if loose:
        problems.append(f"not determined: the standard uncertainty of {', '.join(loose)} exceeds its value; "
                        f"free fewer coefficients or add measurements that depend on them")
    if degenerate:
        problems.append(f"not determined: {', '.join(degenerate)} are correlated beyond {DEGENERATE_CORRELATION} "
                        f"(the measurements fix a combination, not each); free fewer coefficients or add measurements")
    for t, why in lost:
        problems.append(f"measured[{t.fact.index}] ({describe(t.fact, system)}): the fitted model has none: {why}")
    for o in outcomes:
        if o.problem is not None:
            problems.append(f"measured[{o.fact.index}] ({describe(o.fact, fitted)}): {o.problem}")
    converged = bool(result.status > 0)
    return FitResult(fitted, document, params, tuple(correlations), outcomes, chi2, float(r0 @ r0), dof, scale,
                     converged, str(result.message), tuple(dict.fromkeys(problems)), objective.evaluations,
                     time.perf_counter() - started)
