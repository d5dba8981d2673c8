"""Corrections beyond the nonrelativistic infinite-mass energy (finite mass, α², α³)."""
