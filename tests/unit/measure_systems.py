"""Small invented system files for the measuring and fitting tests (not real alloys: the
elements are called A and B and every number is invented for the tests).

- `ideal_text`: ideal liquid and ideal fcc solid, pure-element lattice stabilities in the simple
  form dG = dH (1 - T / Tm): complete solid solubility, with the closed-form boundaries of
  D.R. Gaskell, Introduction to the Thermodynamics of Materials, 5th ed. (2008), chapter on
  binary phase diagrams of ideal solutions.
- `eutectic_text`: liquid, an A-rich fcc and a B-rich bcc solid, each a regular solution
  (Redlich-Kister L[0] = a + b T): a simple eutectic.
"""

from __future__ import annotations

from pathlib import Path

#: The invented melting points (K) and enthalpies of fusion (J/mol) of A and B.
MELT_A_K, FUSION_A = 1000.0, 12000.0
MELT_B_K, FUSION_B = 1200.0, 15000.0

#: The "true" interaction coefficients of the invented eutectic (J/mol, J/(mol K)).
EUTECTIC_TRUE = {"liquid.L.0.a": -4000.0, "liquid.L.0.b": 1.5, "fcc.L.0.a": 12000.0, "bcc.L.0.a": 13000.0}


def _simple(dH: float, Tm: float) -> str:
    return f"[ {{ upto = 4000, a = {dH!r}, b = {-dH / Tm!r} }} ]"


def ideal_text(extra: str = "") -> str:
    """An ideal isomorphous system A-B; `extra` is appended (facts, [fit])."""
    return f'''
elements = ["A", "B"]
molar_mass = {{ A = 50.0, B = 100.0 }}
source = "Invented for the tests"
temperature_range_K = [700, 1400]

[phase.liquid]
model = "solution"
G.A = {_simple(FUSION_A, MELT_A_K)}
G.B = {_simple(FUSION_B, MELT_B_K)}

[phase.fcc]
model = "solution"
G.A = [ {{ upto = 4000 }} ]
G.B = [ {{ upto = 4000 }} ]
''' + extra


def eutectic_text(values: dict[str, float] | None = None, extra: str = "", covers: str = "") -> str:
    """The invented simple eutectic, with interaction coefficients `values` (default the true
    ones); `extra` is appended; `covers` may hold a covers_at_percent line."""
    v = dict(EUTECTIC_TRUE, **(values or {}))
    return f'''
elements = ["A", "B"]
molar_mass = {{ A = 50.0, B = 100.0 }}
source = "Invented for the tests"
temperature_range_K = [500, 1400]
{covers}

[phase.liquid]
model = "solution"
G.A = {_simple(FUSION_A, MELT_A_K)}
G.B = {_simple(FUSION_B, MELT_B_K)}
L = [ {{ a = {v["liquid.L.0.a"]!r}, b = {v["liquid.L.0.b"]!r} }} ]

[phase.fcc]
model = "solution"
G.A = [ {{ upto = 4000 }} ]
G.B = [ {{ upto = 4000, a = 4000.0, b = -1.0 }} ]
L = [ {{ a = {v["fcc.L.0.a"]!r} }} ]

[phase.bcc]
model = "solution"
G.A = [ {{ upto = 4000, a = 3000.0, b = -0.5 }} ]
G.B = [ {{ upto = 4000 }} ]
L = [ {{ a = {v["bcc.L.0.a"]!r} }} ]
''' + extra


def write(folder: Path, text: str, name: str = "a-b.toml") -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path
