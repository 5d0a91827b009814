"""The model's value of every measured or checked fact (melting points, invariants, liquidus,
solidus, boundaries, enthalpies), and the cached pass counts. Built on `diagrams` and
`solidify` (a eutectic of three elements is checked on its Scheil path).
"""
