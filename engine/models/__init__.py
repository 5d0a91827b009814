"""The phase models: pure-element Gibbs energies as temperature polynomials, the magnetic term,
the general phase model of the compound energy formalism (any number of elements and sublattices),
the binary classes of solution phases and stoichiometric compounds, and the System that holds them. The bottom layer:
imports nothing else of the engine but `errors` and `units`.
"""
