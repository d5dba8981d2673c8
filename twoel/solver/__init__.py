"""The solve path: generalized eigenproblem, nonlinear optimization, precision refinement, and
the orchestration :func:`twoel.solver.pipeline.solve` behind :func:`twoel.solve`."""
