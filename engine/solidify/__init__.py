"""How alloys freeze: the equilibrium (lever rule) and Scheil-Gulliver paths, their latent heat,
arrests and constituents, and heat lists of many alloys at once. Built on `diagrams`.
The entry point is `solidify.paths.solidify`.
"""
