"""Tables of measured facts against the model, shared by `ladle check` and `ladle fit`."""

from __future__ import annotations

from .. import quote


def _value(value: float | None, unit: str) -> str:
    if value is None:
        return "none"
    if unit == "K":
        return quote.temperature(value, "C", 2)
    if unit == "J/mol":
        return f"{value:.0f} J/mol"
    if unit == "ratio":
        return f"{value:.3g}"
    return f"{value:.2f} at%"


def _signed(value: float | None, unit: str, reference: float | None = None) -> str:
    """The difference model - reference; for a ratio, the model's value as a multiple of the reference."""
    if value is None:
        return "-"
    if unit == "ratio" and reference:
        return f"x{(value + reference) / reference:.3g}"
    text = f"{value:+.0f} {unit}" if unit == "J/mol" else f"{value:+.2f} {unit}"
    return text[1:] if float(text.split()[0]) == 0.0 else text   # never "-0.00"


def _spread(value: float | None, unit: str, factor: float | None = None, at_most: bool = False) -> str:
    if at_most:
        return "at most"
    relative = f"x{factor:g}" if factor is not None else ""
    if value is None:
        return relative or "none given"
    return f"{value:g} {unit}" + (f", {relative}" if relative else "")


def comparison_rows(outcome, spread_name: str, weighted: bool) -> list[str]:
    """Aligned rows of one fact's comparisons: quantity, model, reference, difference, spread and
    either the weighted residual (`weighted`, for fits) or whether it lies within the spread."""
    last = "residual" if weighted else ""
    rows = [("quantity", "model", "reference", "difference", spread_name, last)]
    for c in outcome.comparisons:
        if weighted:
            mark = f"{c.difference / c.spread:+.2f}" if c.model is not None and c.spread else "-"
        else:
            mark = "ok" if c.within else ("no" if c.model is not None else "")
        rows.append((c.quantity, _value(c.model, c.unit), _value(c.reference, c.unit),
                     _signed(c.difference, c.unit, c.reference), _spread(c.spread, c.unit, c.factor, c.at_most), mark))
    widths = [max(len(r[i]) for r in rows) for i in range(6)]
    return ["  ".join(f"{cell:<{w}}" if i == 0 else f"{cell:>{w}}" for i, (cell, w) in enumerate(zip(r, widths))).rstrip()
            for r in rows]


def fact_blocks(system, outcomes, list_name: str, spread_name: str, weighted: bool) -> list[str]:
    """One block per fact: verdict (PASS/FAIL for checks; for measurements LOST where the model
    has no such feature, WRONG where it has one of another kind), label, problem, comparison rows
    and source."""
    from ladle.engine.checking.measure import describe

    lines = []
    for o in outcomes:
        if weighted:   # a fit's measurements have uncertainties, not pass marks
            lost = any(c.model is None for c in o.comparisons) or not o.comparisons
            verdict = "    " if not o.problem else ("LOST" if lost else "WRONG")
        else:
            verdict = "PASS" if o.passed else "FAIL"
        kind = f" (model: {o.model_reaction})" if o.model_reaction and o.model_reaction != o.fact.reaction else ""
        lines.append(f"{verdict}  {list_name}[{o.fact.index}]: {describe(o.fact, system)}{kind}")
        if o.problem:
            lines.append(f"      {o.problem}")
        if o.comparisons:
            lines += ["      " + r for r in comparison_rows(o, spread_name, weighted)]
        lines.append(f"      source: {o.fact.source}")
        lines.append("")
    return lines


UNITS_NOTE = ("Temperatures in C; differences, tolerances and uncertainties in K (1 K = 1 C of difference), "
              "at% or J per mole of atoms; a distribution coefficient's difference is the model's value "
              "as a multiple of the reference.")


def outcome_json(system, outcome, spread_name: str, list_name: str | None = None) -> dict:
    """One fact's outcome as JSON (temperatures in K, compositions in at%, enthalpies in J/mol);
    `spread_name` names the spread: "tolerance" (checks, judged within or not) or "uncertainty"
    (measurements, with the weighted residual difference / uncertainty). With `list_name`
    ("check" or "measured") the fact also says which list it is from, its role (independent
    check, fit target, pure-element data) and `independent`: true or false."""
    from ladle.engine.checking.measure import INDEPENDENT, describe, fact_role

    f = outcome.fact

    def judged(c) -> dict:
        if spread_name == "tolerance":
            return {"within": c.within}
        return {"residual": c.difference / c.spread if c.model is not None and c.spread else None}

    role = {} if list_name is None else {"list": list_name, "role": fact_role(f, list_name),
                                         "independent": fact_role(f, list_name) == INDEPENDENT}
    return {
        **role, "index": f.index, "kind": f.kind, "label": describe(f, system), "passed": outcome.passed,
        "problem": outcome.problem, "model_reaction": outcome.model_reaction, "source": f.source,
        "comparisons": [{"quantity": c.quantity, "unit": c.unit, "model": c.model, "reference": c.reference,
                         "difference": c.difference, spread_name: c.spread,
                         **({"tolerance_factor": c.factor} if c.factor is not None else {}),
                         **({"at_most": True} if c.at_most else {}), **judged(c)}
                        for c in outcome.comparisons],
    }
