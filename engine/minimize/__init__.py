"""The global minimum of the Gibbs energy at one temperature: sampled composition grids, the lower
convex hull, Newton refinement of tie-lines, and the cached isothermal sections behind
`equilibrate`. Imports the models only.
"""
