"""The system document a fit writes: the fitted coefficients in place, the measurements kept,
the source extended, and a [fit_report] table with the fit's figures.

[fit_report] holds: the input file's name, the date, whether the fit converged and is acceptable
(with the problems otherwise), chi-square at the start and at the solution, degrees of freedom,
the factor applied to the uncertainties, and three sub-tables: `parameters` (start, value and
standard uncertainty of each free coefficient), `correlations` (pairs at or above the reported
threshold) and `residuals` (for every measured number: measured value, model value, standard
uncertainty and the weighted residual (model - measured) / uncertainty). Temperatures in K,
compositions in at%, coefficients in J/mol times powers of K.
"""

from __future__ import annotations

import copy
import datetime

from .fit import HIGH_CORRELATION, FitResult

METHOD = ("weighted nonlinear least squares (scipy.optimize.least_squares, trust-region reflective); "
          "standard uncertainties from (J^T J)^-1 of the weighted residuals, enlarged by the Birge ratio "
          "where chi-square per degree of freedom exceeds 1")


def report_table(result: FitResult, input_name: str, today: datetime.date) -> dict:
    """The [fit_report] table of a fit result (TOML-ready: no None values)."""
    table: dict = {
        "input": input_name,
        "written": today.isoformat(),
        "method": METHOD,
        "converged": result.converged,
        "acceptable": result.acceptable,
        "problems": list(result.problems),
        "evaluations": result.evaluations,
        "start_chi_square": result.start_chi_square,
        "chi_square": result.chi_square,
        "degrees_of_freedom": result.degrees_of_freedom,
        "uncertainty_scale": result.uncertainty_scale,
    }
    if result.reduced_chi_square is not None:
        table["reduced_chi_square"] = result.reduced_chi_square
    params = {}
    for p in result.parameters:
        entry = {"start": p.start, "value": p.value}
        if p.uncertainty is not None:
            entry["uncertainty"] = p.uncertainty
        if not p.determined:
            entry["determined"] = False
        params[p.path] = entry
    table["parameters"] = params
    table["correlations"] = {"threshold": HIGH_CORRELATION,
                             **{f"{a} ~ {b}": r for a, b, r in result.correlations}}
    residuals = {}
    for o in result.outcomes:
        for c in o.comparisons:
            entry = {"unit": c.unit, "measured": c.reference}
            if c.model is not None and c.spread:
                entry["model"] = c.model
                entry["uncertainty"] = c.spread
                entry["residual"] = (c.model - c.reference) / c.spread
            residuals[f"measured[{o.fact.index}] {c.quantity}"] = entry
    table["residuals"] = residuals
    return table


def fitted_document(result: FitResult, input_name: str, today: datetime.date | None = None) -> dict:
    """The document to write: the fitted model with its source extended and a [fit_report]."""
    today = today or datetime.date.today()
    doc = copy.deepcopy(result.document)
    names = ", ".join(p.path for p in result.parameters)
    doc["source"] = (f"{doc['source'].rstrip()} Coefficients {names} fitted with `ladle fit` (weighted least "
                     f"squares) to the [[measured]] facts of this file, from {input_name}, on {today.isoformat()}.")
    doc["fit_report"] = report_table(result, input_name, today)
    return doc
