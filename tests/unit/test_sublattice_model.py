"""The general phase model (engine/models/sublattice.py) against closed forms, finite differences
and today's binary classes.

Sources of the check values:
- the compound energy formalism and its end-member chemical potentials: M. Hillert, J. Alloys
  Compd. 320 (2001) 161, eqs. for G_m and for the partial Gibbs energy of an end member,
  G_I = G_m + sum_s (dG_m/dy_s,I(s) - sum_j y_sj dG_m/dy_sj); with one sublattice these are the
  chemical potentials of the elements;
- the Muggianu form of binary Redlich-Kister terms in a ternary, and the three-coefficient ternary
  term with v_i = x_i + (1 - x_i - x_j - x_k) / 3: H.L. Lukas, S.G. Fries, B. Sundman,
  Computational Thermodynamics: The Calphad Method, Cambridge (2007), section 5.6;
  Y.-M. Muggianu, M. Gambino, J.-P. Bros, J. Chim. Phys. 72 (1975) 83;
- the Gibbs-Duhem relation sum_I P_I dG_I = 0 and H = G - T dG/dT = -T^2 d(G/T)/dT
  (Gibbs-Helmholtz): any thermodynamics text, e.g. M. Hillert, Phase Equilibria, Phase Diagrams
  and Phase Transformations, 2nd ed., Cambridge (2008), chapters 1 and 3;
- finite differences: central differences with a step chosen for the expected truncation error.
"""

from __future__ import annotations

import itertools

import numpy as np
import pytest

from ladle.engine.files.loader import load_system, shipped_folder
from ladle.engine.models.phases import CompoundPhase, SolutionPhase
from ladle.engine.models.polynomials import TemperatureFunction
from ladle.engine.models.sublattice import Interaction, MagneticTerms, SublatticePhase
from ladle.engine.units import GAS_CONSTANT as R


def f(**coefficients) -> TemperatureFunction:
    """One expression a + b T + c T ln T + ... (J/mol), valid 1-6000 K."""
    return TemperatureFunction.constant_terms(coefficients, 1.0, 6000.0)


ABC = ("A", "B", "C")
# invented parameters (J/mol), chosen to exercise every term
PURE = {"A": f(a=1000.0, b=-2.0), "B": f(a=-500.0, c=0.4), "C": f(a=300.0, b=1.5)}
L_AB = (f(a=-20000.0, b=3.0), f(a=5000.0), f(a=-1200.0, b=0.5))
L_BC = (f(a=8000.0),)
L_AC = (f(a=-3000.0), f(a=-700.0))
L_ABC = (f(a=10000.0), f(a=-7000.0, b=2.0), f(a=3000.0))


def ternary_solution(magnetic: MagneticTerms | None = None) -> SublatticePhase:
    return SublatticePhase(
        name="liquid", elements=ABC, site_ratios=(1.0,), constituents=(ABC,),
        end_members={(el,): PURE[el] for el in ABC},
        interactions=(Interaction((("A", "B"),), L_AB), Interaction((("B", "C"),), L_BC),
                      Interaction((("C", "A"),), L_AC), Interaction((ABC,), L_ABC)),
        magnetic=magnetic)


# Tc and beta of A depend on temperature here (b), to exercise that part of dG/dT.
MAGNETIC = MagneticTerms(
    0.28,
    (Interaction((("A",),), (f(a=900.0, b=0.2),)), Interaction((("B",),), (f(a=-300.0),)),
     Interaction((("A", "B"),), (f(a=-400.0), f(a=100.0)))),
    (Interaction((("A",),), (f(a=2.2, b=-2e-4),)), Interaction((("B",),), (f(a=-0.5),)),
     Interaction((("A", "C"),), (f(a=-1.0),))),
    -3.0)


def two_sublattices() -> SublatticePhase:
    """(A,B)1 (C,Va)3 with a reciprocal term and magnetic Tc and beta in site fractions."""
    ends = {("A", "C"): f(a=-30000.0, b=5.0), ("A", "Va"): f(a=1000.0), ("B", "C"): f(a=-12000.0, c=0.3),
            ("B", "Va"): f(a=-800.0, b=-1.0)}
    mag = MagneticTerms(
        0.40,
        (Interaction((("A",), ("Va",)), (f(a=1043.0),)), Interaction((("B",), ("Va",)), (f(a=-311.5),)),
         Interaction((("A", "B"), ("Va",)), (f(a=1650.0), f(a=550.0)))),
        (Interaction((("A",), ("Va",)), (f(a=2.22),)), Interaction((("B",), ("Va",)), (f(a=-0.008),))),
        -1.0)
    return SublatticePhase(
        name="interstitial", elements=ABC, site_ratios=(1.0, 3.0), constituents=(("A", "B"), ("C", "Va")),
        end_members=ends,
        interactions=(Interaction((("A", "B"), ("Va",)), (f(a=-15000.0, b=3.0), f(a=4000.0))),
                      Interaction((("A",), ("C", "Va")), (f(a=-19000.0), f(a=300.0))),
                      Interaction((("A", "B"), ("C", "Va")), (f(a=2500.0),))),
        magnetic=mag)


def ternary_on_a_sublattice() -> SublatticePhase:
    """(A,B,C)2 (Va)1: a three-coefficient ternary term beside a fixed sublattice."""
    return SublatticePhase(
        name="mixed", elements=ABC, site_ratios=(2.0, 1.0), constituents=(ABC, ("Va",)),
        end_members={(el, "Va"): PURE[el].scaled(2.0) for el in ABC},
        interactions=(Interaction((("A", "B"), ("Va",)), L_AB), Interaction((ABC, ("Va",)), L_ABC)))


def compound() -> SublatticePhase:
    return SublatticePhase(name="A3C", elements=ABC, site_ratios=(3.0, 1.0), constituents=(("A",), ("C",)),
                           end_members={("A", "C"): f(a=-40000.0, b=6.0, c=-0.2)})


MODELS = {"ternary solution": ternary_solution(), "magnetic ternary solution": ternary_solution(MAGNETIC),
          "two sublattices with vacancies": two_sublattices(), "ternary on a sublattice": ternary_on_a_sublattice(),
          "compound": compound()}


def random_sites(phase: SublatticePhase, n: int, seed: int = 1, low: float = 0.0) -> np.ndarray:
    """Random site fractions (each sublattice on its simplex), optionally kept above `low`."""
    rng = np.random.default_rng(seed)
    parts = []
    for group in phase.groups:
        y = rng.dirichlet(np.ones(len(group)), size=n)
        y = low + (1.0 - low * len(group)) * y
        parts.append(y)
    return np.concatenate(parts, axis=1)


def end_member_potentials(at, y: np.ndarray) -> tuple[list[tuple[int, ...]], np.ndarray, np.ndarray]:
    """(index combinations, P_I = prod y, G_I) of every end member (Hillert 2001)."""
    g = at.gibbs(y)
    grad = at.gradient(y)
    combos = list(itertools.product(*[list(gr) for gr in at.groups]))
    P = np.stack([np.prod(y[..., list(c)], axis=-1) for c in combos], axis=-1)
    G_I = np.stack([g + sum(grad[..., i] - (y[..., gr] * grad[..., gr]).sum(-1) for i, gr in zip(c, at.groups))
                    for c in combos], axis=-1)
    return combos, P, G_I


# --- closed forms -----------------------------------------------------------------------------------
def test_ternary_solution_matches_the_muggianu_sum_written_out():
    """G = sum x_i G_i + RT sum x_i ln x_i + sum_pairs x_i x_j sum_k L_k (x_i - x_j)^k
    + x_A x_B x_C (L_A v_A + L_B v_B + L_C v_C), v_i = x_i + (1 - x_A - x_B - x_C)/3
    (Lukas et al. 2007, section 5.6), written out here independently of the model."""
    T = 850.0
    x = random_sites(ternary_solution(), 50, seed=3)
    xa, xb, xc = x.T
    expected = sum(x[:, i] * PURE[el].value(T) for i, el in enumerate(ABC))
    expected = expected + R * T * (x * np.log(x)).sum(axis=1)
    for (i, j), L in (((0, 1), L_AB), ((1, 2), L_BC), ((2, 0), L_AC)):
        expected = expected + x[:, i] * x[:, j] * sum(Lk.value(T) * (x[:, i] - x[:, j]) ** k for k, Lk in enumerate(L))
    v = x + (1.0 - x.sum(axis=1, keepdims=True)) / 3.0
    expected = expected + xa * xb * xc * sum(L_ABC[m].value(T) * v[:, m] for m in range(3))
    got = ternary_solution().at(T).gibbs(x)
    assert np.allclose(got, expected, rtol=1e-12, atol=1e-9)


@pytest.mark.parametrize("fixed", ["Va", "C"])
def test_all_sublattices_but_one_fixed_reduce_to_a_substitutional_solution(fixed):
    """(A,B)1 (X)3 with end members G(i:X) = G_i + 3 G_X and the same interactions is the
    substitutional solution plus 3 G_X per formula unit (Hillert 2001: a sublattice with one
    constituent contributes no entropy); with X = Va exactly the solution."""
    T = 640.0
    GX = f() if fixed == "Va" else f(a=-2500.0, b=1.0)
    solution = SublatticePhase(name="s", elements=ABC, site_ratios=(1.0,), constituents=(("A", "B"),),
                               end_members={("A",): PURE["A"], ("B",): PURE["B"]},
                               interactions=(Interaction((("A", "B"),), L_AB),), magnetic=None)
    lattice = SublatticePhase(
        name="l", elements=ABC, site_ratios=(1.0, 3.0), constituents=(("A", "B"), (fixed,)),
        end_members={("A", fixed): PURE["A"].plus(GX.scaled(3.0)), ("B", fixed): PURE["B"].plus(GX.scaled(3.0))},
        interactions=(Interaction((("A", "B"), (fixed,)), L_AB),))
    y = random_sites(solution, 200, seed=5)
    y = np.concatenate([y, [[1e-12, 1.0 - 1e-12], [0.5, 0.5]]])
    g_solution = solution.at(T).gibbs(y)
    g_lattice = lattice.at(T).gibbs(np.concatenate([y, np.ones((len(y), 1))], axis=1)) - 3.0 * GX.value(T)
    assert np.allclose(g_lattice, g_solution, rtol=1e-10, atol=1e-10 * np.abs(g_solution).max())
    mu_solution = solution.at(T).gradient(y)
    mu_lattice = lattice.at(T).gradient(np.concatenate([y, np.ones((len(y), 1))], axis=1))[:, :2] - 3.0 * GX.value(T)
    assert np.allclose(mu_lattice, mu_solution, rtol=1e-10, atol=1e-6)


def test_ideal_mixing_entropy_per_formula_unit_counts_sites():
    """An ideal (A,B)2 (C,Va)1 phase with zero end-member energies: G = RT (2 sum y ln y on the
    first sublattice + sum y ln y on the second), the configurational entropy of the compound energy
    formalism (Sundman and Agren 1981)."""
    zero = f()
    phase = SublatticePhase(name="ideal", elements=ABC, site_ratios=(2.0, 1.0), constituents=(("A", "B"), ("C", "Va")),
                            end_members={c: zero for c in itertools.product(("A", "B"), ("C", "Va"))})
    y = random_sites(phase, 20, seed=9)
    T = 1000.0
    expected = R * T * (2.0 * (y[:, :2] * np.log(y[:, :2])).sum(1) + (y[:, 2:] * np.log(y[:, 2:])).sum(1))
    assert np.allclose(phase.at(T).gibbs(y), expected, rtol=1e-13, atol=1e-9)


# --- derivatives ------------------------------------------------------------------------------------
@pytest.mark.parametrize("name", list(MODELS))
def test_gradient_and_hessian_match_finite_differences(name):
    """Central differences, step 1e-6: truncation ~ h^2 |G'''| and rounding ~ eps |G| / h, both
    below 1e-4 of the derivatives' scale here."""
    phase = MODELS[name]
    for T in (350.0, 900.0, 1600.0):       # below and above the Curie temperatures of the magnetic models
        at = phase.at(T)
        y = random_sites(phase, 6, seed=int(T), low=1e-3)
        grad, hess = at.gradient(y), at.hessian(y)
        h = 1e-6
        for i in range(phase.n_vars):
            step = np.zeros(phase.n_vars)
            step[i] = h
            fd_grad = (at.gibbs(y + step) - at.gibbs(y - step)) / (2 * h)
            fd_hess = (at.gradient(y + step) - at.gradient(y - step)) / (2 * h)
            assert np.allclose(grad[:, i], fd_grad, rtol=1e-6, atol=1e-4 * R * T), (name, T, i)
            assert np.allclose(hess[:, :, i], fd_hess, rtol=1e-5, atol=1e-3 * R * T), (name, T, i)
        assert np.allclose(hess, np.swapaxes(hess, -1, -2), rtol=1e-12, atol=1e-9)
        together = at.derivatives(y)
        for a, b in zip(together, (at.gibbs(y), grad, hess)):
            assert np.array_equal(a, b)


@pytest.mark.parametrize("name", list(MODELS))
def test_enthalpy_from_gibbs_dT_matches_gibbs_helmholtz(name):
    """H = G - T dG/dT equals -T^2 d(G/T)/dT by central differences (step 1e-3 K)."""
    phase = MODELS[name]
    y = random_sites(phase, 8, seed=2, low=1e-4)
    for T in (400.0, 1043.0 * 0.9, 1300.0):
        at = phase.at(T)
        H = at.gibbs(y) - T * at.gibbs_dT(y)
        h = 1e-3
        fd = -T * T * (phase.at(T + h).gibbs(y) / (T + h) - phase.at(T - h).gibbs(y) / (T - h)) / (2 * h)
        assert np.allclose(H, fd, rtol=1e-7, atol=1e-4), (name, T)


@pytest.mark.parametrize("name", list(MODELS))
def test_gibbs_duhem_for_end_member_potentials(name):
    """G = sum_I P_I G_I exactly, and sum_I P_I dG_I = 0 along any change of site fractions
    (Hillert 2001; with one sublattice the Gibbs-Duhem relation sum x_i dmu_i = 0)."""
    phase = MODELS[name]
    T = 720.0
    at = phase.at(T)
    y = random_sites(phase, 10, seed=4, low=1e-3)
    _, P, G_I = end_member_potentials(at, y)
    assert np.allclose((P * G_I).sum(-1), at.gibbs(y), rtol=1e-11, atol=1e-7)
    direction = random_sites(phase, 10, seed=8, low=1e-3) - y        # stays on every sublattice's simplex
    h = 1e-6
    dG_I = (end_member_potentials(at, y + h * direction)[2] - end_member_potentials(at, y - h * direction)[2]) / (2 * h)
    scale = np.abs(dG_I).max(axis=-1) + R * T
    assert np.all(np.abs((P * dG_I).sum(-1)) <= 1e-6 * scale)


def test_logarithms_are_safe_at_zero_and_finite_near_it():
    at = ternary_solution(MAGNETIC).at(500.0)
    assert np.isfinite(at.gibbs(np.array([1.0, 0.0, 0.0])))
    y = np.array([1.0 - 2e-300, 1e-300, 1e-300])
    assert np.all(np.isfinite(at.gradient(y)))


# --- samples -----------------------------------------------------------------------------------------
def test_samples_are_dense_near_corners_and_consistent():
    phase = ternary_solution(MAGNETIC)
    at = phase.at(800.0)
    Y, X, G = at.samples()
    assert 500 <= len(Y) <= 4000                                  # a few thousand at most (the contract)
    assert np.allclose(Y.sum(axis=1), 1.0) and np.all(Y >= 0.0)
    assert np.allclose(X, Y)                                     # one site per formula unit: x = y
    assert np.allclose(G, at.gibbs(Y))
    smallest = Y[Y > 0].min()
    assert smallest <= 1.01e-6
    near_A = Y[(Y[:, 0] > 1 - 1e-3)]
    assert len(near_A) >= 20                                     # dense near each pure constituent
    assert at.samples() is at.samples() and phase.at(800.0) is at   # computed once per temperature


def test_samples_of_a_sublattice_phase_give_mole_fractions_per_atom():
    phase = two_sublattices()
    Y, X, G = phase.at(900.0).samples()
    atoms = Y @ phase.element_matrix
    assert np.allclose(X, atoms / atoms.sum(axis=1, keepdims=True))
    assert np.allclose(G, phase.at(900.0).gibbs(Y) / atoms.sum(axis=1))
    assert X[:, 2].max() == pytest.approx(0.75, abs=1e-5)       # (A,B)1 C3: at most 3/4 C
    assert 0 < X[X[:, 2] > 0, 2].min() <= 1e-5                   # dilute carbon sampled


@pytest.mark.parametrize("n", [4, 6, 12])
def test_samples_of_many_constituents_keep_corners_and_dilute_edges(n):
    elements = tuple(f"E{chr(97 + i)}" for i in range(n))
    phase = SublatticePhase(name="many", elements=elements, site_ratios=(1.0,), constituents=(elements,),
                            end_members={(el,): f(a=100.0 * i) for i, el in enumerate(elements)})
    Y, X, G = phase.at(900.0).samples()
    assert len(Y) <= 4100 and np.allclose(Y.sum(axis=1), 1.0)
    for i in range(n):
        assert np.any(Y[:, i] == 1.0)                                    # every pure constituent
        assert 0 < Y[Y[:, i] > 0, i].min() <= 1e-5                       # and dilute amounts of it
    assert np.all(np.isfinite(G))


def test_compound_has_one_point():
    Y, X, G = compound().at(700.0).samples()
    assert Y.shape == (1, 2) and np.allclose(X, [[0.75, 0.0, 0.25]])
    assert G[0] == pytest.approx(f(a=-40000.0, b=6.0, c=-0.2).value(700.0) / 4.0, rel=1e-14)


# --- definitions -----------------------------------------------------------------------------------
@pytest.mark.parametrize("change,words", [
    (dict(constituents=(("A", "Zn"),)), "neither an element"),
    (dict(end_members={("A",): PURE["A"]}), "end member B has no Gibbs energy"),
    (dict(site_ratios=(1.0, 2.0)), "one site ratio per sublattice"),
    (dict(site_ratios=(-1.0,)), "positive"),
    (dict(interactions=(Interaction((("A", "C"),), L_AB),)), "must name distinct constituents it holds"),
    (dict(interactions=(Interaction((("A",),), (f(a=1.0), f(a=2.0))),)), "allows one coefficient"),
])
def test_bad_definitions_are_refused_in_one_line(change, words):
    base = dict(name="p", elements=ABC, site_ratios=(1.0,), constituents=(("A", "B"),),
                end_members={("A",): PURE["A"], ("B",): PURE["B"]})
    with pytest.raises(ValueError) as err:
        SublatticePhase(**{**base, **change})
    assert words in str(err.value) and "\n" not in str(err.value)


# --- the general form of every shipped binary phase -------------------------------------------------
def _shipped():
    return [p for p in sorted(shipped_folder().glob("*.toml")) if p.name != "elements.toml"]


@pytest.mark.parametrize("path", _shipped(), ids=lambda p: p.stem)
def test_general_model_of_every_shipped_binary_phase_agrees_with_the_binary_class(path):
    """G, chemical potentials and dG/dT to 1e-9 relative at sampled compositions and temperatures
    (today's binary classes are the reference)."""
    system = load_system(path)
    lo, hi = system.temperature_range_K
    x_b = np.concatenate([[1e-9, 1e-6, 1e-3], np.linspace(0.01, 0.99, 23), [1 - 1e-3, 1 - 1e-6]])
    x_a = 1.0 - x_b
    for name, phase in system.phases.items():
        model = system.models[name]
        for T in np.linspace(lo, hi, 5):
            at = model.at(T)
            if isinstance(phase, SolutionPhase):
                ref = phase.at(T)
                y = np.stack([x_a, x_b], axis=1)
                scale = np.maximum(np.abs(ref.gibbs(x_a, x_b)), R * T)
                assert np.all(np.abs(at.gibbs(y) - ref.gibbs(x_a, x_b)) <= 1e-9 * scale), (name, T)
                grad = at.gradient(y)
                g = at.gibbs(y)
                mu = g[:, None] + grad - (y * grad).sum(axis=1, keepdims=True)
                for i, mu_ref in enumerate(ref.potentials(x_a, x_b)):
                    assert np.all(np.abs(mu[:, i] - mu_ref) <= 1e-9 * np.maximum(np.abs(mu_ref), R * T)), (name, T, i)
                dT = ref.gibbs_dT(x_a, x_b)
                assert np.all(np.abs(at.gibbs_dT(y) - dT) <= 1e-9 * np.maximum(np.abs(dT), R)), (name, T)
            elif isinstance(phase, SublatticePhase):
                continue                      # no binary class to agree with (interstitial phases of Fe-C)
            else:
                assert isinstance(phase, CompoundPhase)
                one = np.ones(model.n_vars)
                atoms = (one @ model.element_matrix).sum()
                assert atoms == pytest.approx(1.0, rel=1e-15)
                assert at.gibbs(one) == pytest.approx(phase.gibbs(T), rel=1e-9, abs=1e-9 * R * T), (name, T)
                assert at.gibbs_dT(one) == pytest.approx(phase.gibbs_dT(T), rel=1e-9, abs=1e-9 * R), (name, T)
                assert np.allclose(one @ model.element_matrix, phase.x, rtol=0, atol=1e-15)
