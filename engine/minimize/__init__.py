"""The global minimum of the Gibbs energy at one temperature, behind `equilibrate`
(equilibrium.py). Binaries of solutions and compounds: sampled composition grids, the lower convex
hull, Newton refinement of tie-lines and cached isothermal sections (grid, hull, tangent, newton,
section). Any number of elements and any site-fraction phases: the lowest combination of the
phases' samples by the simplex method (lowest_combination), Newton's method on the full
equilibrium conditions (multiphase_newton), the driving-force check that completes the phase set
(global_minimum), and a sample cloud for restricted phases (site_sampling). Imports the models only.
"""
