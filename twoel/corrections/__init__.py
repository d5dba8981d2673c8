"""Corrections that connect nonrelativistic energies with measured spectra (finite nuclear
mass, Breit–Pauli and QED terms).  Modules are added one per correction."""
