"""The cast-iron lines of `ladle melt` for a system whose file declares `cast_iron = true`: the
graphite (grey-iron) eutectic of a melt of the iron's silicon content, the white-iron
(cementite) eutectic beside it where the system has cementite, and the carbon equivalent from
the model beside the foundry rule CE = %C + %Si/3 (common practice)
(ladle.engine.diagrams.carbon_equivalent). Temperatures in K, compositions in wt%.
"""

from __future__ import annotations

from .. import quote
from .common import temperature_both


def cast_iron_report(system, x) -> dict | None:
    """The cast-iron figures of the alloy of mole fractions `x` (JSON-ready; wt%, K), or None
    where the system's file does not declare it a cast iron system. A eutectic the model does
    not reach is None, with the reason in "notes"."""
    from ladle.engine.diagrams.carbon_equivalent import (CEMENTITE, GRAPHITE, NotACastIron, carbon_equivalent,
                                                         eutectic_of_silicon)
    from ladle.engine.files.trade_names import trade_names
    from ladle.engine.units import mass_from_mole

    if not trade_names(system).cast_iron:
        return None
    w = dict(zip(system.elements, 100.0 * mass_from_mole(x, system.molar_mass)))
    carbon, silicon = float(w.get("C", 0.0)), float(w.get("Si", 0.0))
    report: dict = {"carbon_wt_percent": carbon, "silicon_wt_percent": silicon, "graphite_eutectic": None,
                    "cementite_eutectic": None, "carbon_equivalent": None, "notes": []}
    if GRAPHITE in system.phases:
        try:
            ce = carbon_equivalent(system, carbon, silicon)
        except NotACastIron as e:
            report["notes"].append(str(e))
        else:
            report["graphite_eutectic"] = _eutectic(ce.eutectic)
            report["carbon_equivalent"] = {
                "model_wt_percent": ce.model, "rule_wt_percent": ce.rule, "difference_wt_percent": ce.difference,
                "binary_eutectic_carbon_wt_percent": ce.binary_eutectic.carbon_wt,
                "side": "hypoeutectic" if ce.model < ce.binary_eutectic.carbon_wt else "hypereutectic"}
    if CEMENTITE in system.phases:
        try:
            report["cementite_eutectic"] = _eutectic(eutectic_of_silicon(system, silicon, CEMENTITE))
        except NotACastIron as e:
            report["notes"].append(str(e))
    return report


def _eutectic(e) -> dict:
    return {"temperature_K": e.temperature_K, "carbon_wt_percent": e.carbon_wt, "silicon_wt_percent": e.silicon_wt,
            "overtaken_by": list(e.overtaken_by)}


def cast_iron_lines(report: dict | None, unit: str) -> list[str]:
    """The text lines of `cast_iron_report` (none for None), temperatures in `unit`."""
    if report is None:
        return []
    si = quote.percent(report["silicon_wt_percent"] / 100.0)
    lines = []
    graphite, cementite, ce = report["graphite_eutectic"], report["cementite_eutectic"], report["carbon_equivalent"]
    if graphite is not None:
        lines.append(f"graphite eutectic   {temperature_both(graphite['temperature_K'], unit)}: a melt of {si} wt% Si "
                     f"is eutectic at {quote.percent(graphite['carbon_wt_percent'] / 100.0)} wt% C (grey iron)")
    if cementite is not None:
        lines.append(f"cementite eutectic  {temperature_both(cementite['temperature_K'], unit)} at "
                     f"{quote.percent(cementite['carbon_wt_percent'] / 100.0)} wt% C (white iron, metastable)")
    if ce is not None:
        lines.append(f"carbon equivalent   {ce['model_wt_percent']:.2f} wt% from the model, {ce['rule_wt_percent']:.2f} "
                     f"by the foundry rule %C + %Si/3 (difference {ce['difference_wt_percent']:+.2f}); "
                     f"{ce['side']} against the model's {ce['binary_eutectic_carbon_wt_percent']:.2f} wt% C of Fe-C")
    for name, e in (("graphite", graphite), ("cementite", cementite)):
        if e is not None and e["overtaken_by"]:
            lines.append(f"note: at the {name} eutectic's melt the model's {', '.join(e['overtaken_by'])} is more stable "
                         "than austenite: that eutectic is a metastable extrapolation of the model")
    lines += [f"note: {n}" for n in report["notes"]]
    return lines
