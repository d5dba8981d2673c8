"""Orbital models: restricted Hartree–Fock limit, the split-shell function, correlation energies."""
