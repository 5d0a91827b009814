"""The gold-rich side of the shipped Au-Sn model against the evaluation of H. Okamoto and
T.B. Massalski, Bull. Alloy Phase Diagrams 5 (1984) 492: (Au) holds 6.8 at% Sn at the 521 C
peritectic L + (Au) = zeta, so an alloy of 5 at% Sn is a single solid (Au) from its solidus, above
521 C, down to the solvus; zeta is a phase with a homogeneity range (about 11-16 at% Sn near
275 C). The earlier model held 2 at% Sn in (Au) at 521 C, put the zeta peritectic near 290 C and
showed 11 % liquid in Au-5 at% Sn at 450 C."""

from __future__ import annotations

from ladle.engine import find_system
from ladle.engine.checking.boundaries import boundary_temperature
from ladle.engine.diagrams.diagram import map_diagram
from ladle.engine.minimize.equilibrium import equilibrate, section_at

PERITECTIC_K = 521.0 + 273.15


def test_the_zeta_peritectic_and_the_gold_solubility():
    system = find_system("au-sn")
    peritectic = [i for i in map_diagram(system).invariants
                  if {n for n, _x in i.phases} == {"liquid", "fcc", "hcp"}]
    assert len(peritectic) == 1 and peritectic[0].kind == "peritectic"
    assert abs(peritectic[0].temperature_K - PERITECTIC_K) < 5.0
    assert abs(100 * dict(peritectic[0].phases)["fcc"] - 6.8) < 0.5
    # the old model formed its zeta stand-in from liquid + (Au) near 290 C: no reaction of (Au) there now
    assert not [i for i in map_diagram(system).invariants
                if 540 < i.temperature_K < 590 and "fcc" in {n for n, _x in i.phases}]


def test_gold_with_5_at_percent_tin_is_solid_well_above_500_C():
    system = find_system("au-sn")
    assert boundary_temperature(system, 0.05, "solidus").temperature_K > PERITECTIC_K
    assert equilibrate(system, 450.0 + 273.15, 0.05).phase_names == ("fcc",)


def test_zeta_is_a_phase_with_a_range():
    ties = section_at(find_system("au-sn"), 275.0 + 273.15).tie_lines
    low = next(t.x_B[1] for t in ties if t.phases == ("fcc", "hcp"))
    high = next(t.x_B[0] for t in ties if t.phases == ("hcp", "AuSn"))
    assert high - low > 0.05
