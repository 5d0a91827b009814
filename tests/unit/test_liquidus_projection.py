"""The liquidus projection of a ternary (engine/diagrams/liquidus_projection.py) against closed
forms, on the invented ideal ternary eutectic system of ideal_ternaries.py read as a system file
(ideal liquid, three pure-element solids; every number invented).

Closed forms (D.R. Gaskell, D.E. Laughlin, Introduction to the Thermodynamics of Materials, 6th ed.,
CRC Press (2017), ch. 10 and 13): an ideal liquid in equilibrium with pure solid i has
mu_i(liquid) = G_i(solid), i.e. dG_i + RT ln x_i = 0, so x_i = a_i(T) = exp(-dG_i(T) / RT) with
dG_i = dH_i (1 - T / Tm_i). Along the valley liquid + solid i + solid j both hold:
x_i = a_i(T), x_j = a_j(T) (the third element makes up the rest); the valley meets the side i-j
at the binary eutectic a_i + a_j = 1; the ternary eutectic, where all three solids are saturated,
solves a_A(T) + a_B(T) + a_C(T) = 1, with the liquid x_i = a_i(T_E). Roots by scipy's brentq.
"""

from __future__ import annotations

import json

import numpy as np
import pytest
from scipy.optimize import brentq

import ideal_ternaries as it
from ladle.engine.diagrams.liquidus_projection import classify, map_liquidus_projection, reaction_coefficients
from ladle.engine.files.loader import load_system

SOLIDS = {name: k for k, name in enumerate(it.SOLIDS)}


def _eutectic_K() -> float:
    return brentq(lambda T: it.saturation(T).sum() - 1.0, 400.0, 1000.0, xtol=1e-12, rtol=1e-15)


@pytest.fixture(scope="module")
def projection(tmp_path_factory):
    system = load_system(it.write_system_files(tmp_path_factory.mktemp("projection"))["ideal-eutectic"])
    return map_liquidus_projection(system, divisions=16)


def test_ternary_eutectic_against_the_closed_form(projection):
    """One invariant: liquid -> alpha + beta + gamma at sum_i a_i(T) = 1 (Gaskell and Laughlin),
    to 1e-6 K, its liquid at x_i = a_i(T_E) to 1e-6."""
    assert len(projection.invariants) == 1
    reaction = projection.invariants[0]
    T_E = _eutectic_K()
    assert reaction.kind == "eutectic"
    assert abs(reaction.temperature_K - T_E) < 1e-6
    name, x_liquid, coefficient = reaction.phases[0]
    assert name == "liquid" and coefficient == pytest.approx(-1.0)
    assert np.abs(np.array(x_liquid) - it.saturation(T_E)).max() < 1e-6
    # mass balance: liquid -> x_A alpha + x_B beta + x_C gamma (pure solids)
    for solid, x, c in reaction.phases[1:]:
        assert abs(c - x_liquid[SOLIDS[solid]]) < 1e-9 and x[SOLIDS[solid]] == pytest.approx(1.0)


def test_valleys_follow_the_doubly_saturated_liquid(projection):
    """Each valley liquid + i + j: x_i = a_i(T) and x_j = a_j(T) at every point to 1e-6; it runs
    from the binary eutectic a_i + a_j = 1 (within 0.05 K: the valley is followed to 1e-5 of the
    side) down to the ternary eutectic."""
    T_E = _eutectic_K()
    assert {v.solids for v in projection.valleys} == {("alpha", "beta"), ("alpha", "gamma"), ("beta", "gamma")}
    for valley in projection.valleys:
        i, j = (SOLIDS[s] for s in valley.solids)
        assert len(valley.points) >= 4
        for T, x in valley.points:
            a = it.saturation(T)
            assert abs(x[i] - a[i]) < 1e-6 and abs(x[j] - a[j]) < 1e-6
            assert abs(sum(x) - 1.0) < 1e-12
        temperatures = [T for T, _x in valley.points]
        binary_K = brentq(lambda T: it.saturation(T)[i] + it.saturation(T)[j] - 1.0, 400.0, 1300.0, xtol=1e-12)
        assert abs(max(temperatures) - binary_K) < 0.05
        assert abs(min(temperatures) - T_E) < 1e-6
        assert temperatures == sorted(temperatures) or temperatures == sorted(temperatures, reverse=True)


def test_primary_fields_are_the_three_solids(projection):
    """Each solid's field holds the corner of its element (the liquid next to pure A freezes to
    alpha first)."""
    assert {f.phase for f in projection.fields} == set(it.SOLIDS)
    for f in projection.fields:
        assert int(np.argmax(f.middle)) == SOLIDS[f.phase]


def test_json_keys(projection):
    js = json.loads(json.dumps(projection.to_json()))
    assert set(js) == {"system", "elements", "invariants", "valleys", "primary_fields", "warnings"}
    reaction = js["invariants"][0]
    assert set(reaction) == {"kind", "temperature_K", "reaction", "phases"}
    assert reaction["reaction"] == "liquid -> alpha + beta + gamma"
    assert [p["name"] for p in reaction["phases"]] == ["liquid", "alpha", "beta", "gamma"]
    assert set(reaction["phases"][0]) == {"name", "mole_fraction", "reaction_coefficient"}
    assert set(reaction["phases"][0]["mole_fraction"]) == {"Pb", "Sn", "Bi"}
    assert set(js["valleys"][0]) == {"phases", "liquid"}
    assert set(js["valleys"][0]["liquid"][0]) == {"temperature_K", "mole_fraction"}


# --- with a compound: a quasi-peritectic and a eutectic --------------------------------------------
#: Invented: the eutectic system with a compound delta = AB (Pb and Sn of the file), formed from
#: pure alpha and beta with -600 J per mole of atoms; it melts incongruently on the A-B side.
DELTA_FORMATION = -600.0
COMPOUND_FILE = it.EUTECTIC_FILE + f"""
[phase.delta]
model = "compound"
formula = "PbSn"
reference = {{ Pb = "fcc", Sn = "bct" }}
formation = {{ a = {DELTA_FORMATION} }}
"""


def _with_delta(saturated: tuple[int, int], delta: tuple[float, float, float], formation: float,
                bracket: tuple[float, float] = (540.0, 620.0)) -> tuple[float, np.ndarray]:
    """The invariant where the liquid is saturated with the pure solids `saturated` and with a
    compound delta of mole fractions `delta` formed from the pure solids with `formation` (J per
    mole of atoms): x_i = a_i(T) for the two, the third element the rest, and delta's saturation
    sum_m delta_m (dG_m + RT ln x_m) = formation (mu_m of the ideal liquid against pure solid m,
    Gaskell and Laughlin ch. 10); one root in T by brentq."""
    n = np.array(delta)

    def liquid(T: float) -> np.ndarray:
        a = it.saturation(T)
        x = np.zeros(3)
        x[list(saturated)] = a[list(saturated)]
        x[3 - sum(saturated)] = 1.0 - a[list(saturated)].sum()
        return x

    def excess(T: float) -> float:
        x = liquid(T)
        return float(n @ (it.fusion_gibbs(T) + it.R * T * np.log(x))) - formation

    T = brentq(excess, *bracket, xtol=1e-12, rtol=1e-15)
    return T, liquid(T)


def _crossing(p, q, r, s) -> bool:
    """Whether the segments p-q and r-s cross (compositions; B and C as plane coordinates)."""
    def side(a, b, c) -> float:
        return (b[1] - a[1]) * (c[2] - a[2]) - (b[2] - a[2]) * (c[1] - a[1])
    return side(p, q, r) * side(p, q, s) < 0.0 and side(r, s, p) * side(r, s, q) < 0.0


@pytest.fixture(scope="module")
def with_compound(tmp_path_factory):
    path = tmp_path_factory.mktemp("compound") / "with-delta.toml"
    path.write_text(COMPOUND_FILE)
    return map_liquidus_projection(load_system(path), divisions=12)


def test_quasi_peritectic_and_eutectic_with_a_compound(with_compound):
    """liquid + alpha -> delta + gamma (the liquid saturated with alpha, gamma and delta) above
    liquid -> delta + beta + gamma, each to 1e-6 K and its liquid to 1e-6 against the closed form."""
    assert [r.kind for r in with_compound.invariants] == ["quasi-peritectic", "eutectic"]
    for reaction, saturated in zip(with_compound.invariants, ((0, 2), (1, 2))):
        T, x = _with_delta(saturated, (0.5, 0.5, 0.0), DELTA_FORMATION)
        assert abs(reaction.temperature_K - T) < 1e-6
        assert np.abs(np.array(reaction.phases[0][1]) - x).max() < 1e-6
    upper = with_compound.invariants[0]
    assert upper.equation() == "liquid + alpha -> delta + gamma"
    x = {n: np.array(xs) for n, xs, _c in upper.phases}
    assert _crossing(x["liquid"], x["alpha"], x["delta"], x["gamma"])     # the tie-lines that swap cross
    c = np.array([k for _n, _x, k in upper.phases])
    assert np.abs(c @ np.array([xs for _n, xs, _k in upper.phases])).max() < 1e-12


def test_a_short_valley_between_two_invariants(with_compound):
    """liquid + delta + gamma runs from the quasi-peritectic down to the eutectic; on it the liquid
    holds x_C = a_C(T) (saturated with pure gamma)."""
    valley = next(v for v in with_compound.valleys if v.solids == ("delta", "gamma"))
    temperatures = [T for T, _x in valley.points]
    assert len(temperatures) >= 4
    assert max(temperatures) == pytest.approx(with_compound.invariants[0].temperature_K, abs=1e-9)
    assert min(temperatures) == pytest.approx(with_compound.invariants[1].temperature_K, abs=1e-9)
    for T, x in valley.points:
        assert abs(x[2] - it.saturation(T)[2]) < 1e-6


TERNARY_COMPOUND_FILE = it.EUTECTIC_FILE + """
[phase.delta]
model = "compound"
formula = "PbSnBi"
reference = { Pb = "fcc", Sn = "bct", Bi = "rhombohedral" }
formation = { a = -400.0 }
"""


def test_a_valley_with_a_saddle_between_two_quasi_peritectics(tmp_path):
    """Invented: a ternary compound delta = ABC (-400 J per mole of atoms from the pure solids).
    Liquid + alpha + delta rises from both liquid + alpha -> beta + delta and liquid + alpha ->
    delta + gamma to a maximum between them; along it (Gaskell and Laughlin, ch. 10) the liquid
    holds x_A = a_A(T) and delta's saturation mu_A + mu_B + mu_C = 3 G_f with mu_A = 0, i.e.
    dG_B + dG_C + RT ln(x_B x_C) = 3 G_f, at every point to 1e-6 (J/mol: 1e-6 RT)."""
    path = tmp_path / "ternary-compound.toml"
    path.write_text(TERNARY_COMPOUND_FILE)
    projection = map_liquidus_projection(load_system(path), divisions=12)
    assert [r.equation() for r in projection.invariants] == [
        "liquid + alpha -> beta + delta", "liquid + alpha -> delta + gamma", "liquid -> delta + beta + gamma"]
    valley = next(v for v in projection.valleys if v.solids == ("alpha", "delta"))
    temperatures = [T for T, _x in valley.points]
    assert len(temperatures) >= 6
    top = int(np.argmax(temperatures))
    assert 0 < top < len(temperatures) - 1                               # a maximum inside the valley
    assert max(temperatures) > projection.invariants[0].temperature_K + 0.01  # measured 0.067 K above
    for T, x in valley.points:
        d = it.fusion_gibbs(T)
        assert abs(x[0] - it.saturation(T)[0]) < 1e-6
        assert abs((d[1] + d[2] + it.R * T * np.log(x[1] * x[2]) - 3 * -400.0) / (it.R * T)) < 1e-6


def test_a_peritectic_forming_a_ternary_compound(tmp_path):
    """Invented: delta = A2B2C (-300 J per mole of atoms from the pure solids) forms by liquid +
    alpha + beta -> delta, then liquid + alpha -> delta + gamma and liquid -> delta + beta + gamma;
    each invariant to 1e-6 K and its liquid to 1e-6 against the closed form."""
    path = tmp_path / "a2b2c.toml"
    path.write_text(TERNARY_COMPOUND_FILE.replace('"PbSnBi"', '"Pb2Sn2Bi"').replace("-400.0", "-300.0"))
    projection = map_liquidus_projection(load_system(path), divisions=12)
    assert [(r.kind, r.equation()) for r in projection.invariants] == [
        ("peritectic", "liquid + alpha + beta -> delta"), ("quasi-peritectic", "liquid + alpha -> delta + gamma"),
        ("eutectic", "liquid -> delta + beta + gamma")]
    for reaction, saturated in zip(projection.invariants, ((0, 1), (0, 2), (1, 2))):
        T, x = _with_delta(saturated, (0.4, 0.4, 0.2), -300.0)
        assert abs(reaction.temperature_K - T) < 1e-6
        assert np.abs(np.array(reaction.phases[0][1]) - x).max() < 1e-6


# --- kinds, from the mass balance of four compositions and the sign of the reaction's heat ----------
# The geometry (which phase lies inside the triangle or quadrilateral of the others) is the
# classical one of four-phase reactions in ternaries: F.N. Rhines, Phase Diagrams in Metallurgy,
# McGraw-Hill (1956), ch. on ternary four-phase equilibria (recalled from memory). Enthalpies
# (J/mol) are invented; only their order matters: the reaction on cooling gives off heat.
def _kind(x, H) -> tuple[str, np.ndarray]:
    names = ("liquid", "s1", "s2", "s3")
    c = reaction_coefficients(np.array(x, dtype=float), np.array(H, dtype=float))
    return classify([(n, tuple(xi), float(ci)) for n, xi, ci in zip(names, x, c)]), c


CORNERS = [(1.0, 0, 0), (0, 1.0, 0), (0, 0, 1.0)]


def test_liquid_inside_the_solids_triangle_is_a_eutectic():
    kind, c = _kind([(0.2, 0.3, 0.5), *CORNERS], [10000.0, 0.0, 0.0, 0.0])
    assert kind == "eutectic"
    assert np.allclose(c, [-1.0, 0.2, 0.3, 0.5])          # lever rule: liquid -> its own composition in solids


def test_solid_inside_the_triangle_of_liquid_and_two_solids_is_a_peritectic():
    """s3 = 0.25 liquid + 0.375 s1 + 0.375 s2 (mass balance worked by hand)."""
    kind, c = _kind([(0.1, 0.1, 0.8), (1.0, 0, 0), (0, 1.0, 0), (0.4, 0.4, 0.2)], [10000.0, 0.0, 0.0, -5000.0])
    assert kind == "peritectic"
    assert np.allclose(c, [-0.25, -0.375, -0.375, 1.0])


def test_crossing_tie_lines_are_a_quasi_peritectic():
    """The segments liquid-s1 and s2-s3 cross: liquid + s1 -> s2 + s3."""
    kind, c = _kind([(0.1, 0.1, 0.8), (1.0, 0, 0), (0.3, 0.7, 0), (0.5, 0, 0.5)], [10000.0, 0.0, -1000.0, -1000.0])
    assert kind == "quasi-peritectic"
    assert c[0] < 0 and c[1] < 0 and c[2] > 0 and c[3] > 0
    assert abs(c[:2].sum() + 1.0) < 1e-12 and abs(c.sum()) < 1e-12


def test_a_liquid_formed_on_cooling_is_named_so():
    kind, _c = _kind([(0.2, 0.3, 0.5), *CORNERS], [-10000.0, 0.0, 0.0, 0.0])
    assert kind == "liquid-forming"


def test_only_ternaries_have_a_projection():
    system = it.eutectic_system()
    system.elements = ("A", "B")
    with pytest.raises(ValueError, match="three elements"):
        map_liquidus_projection(system)


def test_agrees_with_the_general_minimiser_with_solid_solutions(tmp_path):
    """A consistency check against another part of ladle (not an outside value): on the shipped
    lead-tin binary with bismuth added ideally (solid solutions fcc and bct), an alloy of an
    invariant's or a valley's liquid composition is all liquid 0.05 K above that temperature and,
    0.05 K below, holds the solids of the reaction (the global minimiser, `equilibrate`)."""
    from ladle.engine.minimize.equilibrium import equilibrate

    system = load_system(it.write_system_files(tmp_path)["pb-sn-bi"])
    projection = map_liquidus_projection(system, divisions=12)
    assert [r.equation() for r in projection.invariants] == ["liquid -> fcc + bct + rhombohedral"]
    checks = [(r.temperature_K, r.phases[0][1], {n for n, _x, _c in r.phases} - {"liquid"}) for r in projection.invariants]
    checks += [(*v.points[len(v.points) // 2], {"liquid", *v.solids}) for v in projection.valleys]
    assert len(checks) == 4
    for T, x, below in checks:
        assert equilibrate(system, T + 0.05, np.array(x)).phase_names == ("liquid",)
        assert set(equilibrate(system, T - 0.05, np.array(x)).phase_names) == below
