"""The heat-treatment window a system's file asks for (`heat_treatment`), for one alloy's
transitions: austenitizing from the trade's lines, or solution treatment up to the lower of the
equilibrium solidus and the end of Scheil-Gulliver freezing (incipient melting of a cast
structure). Shared by `ladle transitions` and the explorer's status pane."""

from __future__ import annotations


def treatment_window(system, result, labels: dict[int, str], treatment: str | None):
    """The window (engine/diagrams/heat_treatment.py) for `result` (AlloyTransitions) with the
    trade labels `labels` (index -> name), or None where the file names no treatment. Solution
    treatment computes the alloy's Scheil path for its top (None where no path can be computed:
    the window then says its top is the equilibrium solidus)."""
    from ladle.engine.diagrams.heat_treatment import austenitizing_window, solution_window

    if treatment == "austenitizing":
        return austenitizing_window(result, labels)
    if treatment != "solution":
        return None
    scheil_end = None
    if "liquid" in system.phases:
        from ladle.engine.solidify.records import PathError

        try:
            if len(system.elements) == 2:
                from ladle.engine.solidify.scheil import ScheilCooling

                scheil_end = ScheilCooling(system, float(result.composition[1])).end_K
            else:
                from ladle.engine.solidify.alloy_scheil import alloy_scheil

                scheil_end = alloy_scheil(system, result.composition).end_K
        except PathError:
            scheil_end = None
    return solution_window(result, scheil_end)
