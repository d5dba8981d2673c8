"""Expectation values of a solved state: operators, radial moments, densities."""

from twoel.properties.expectation import ExpectationValues, expectation_values

__all__ = ["ExpectationValues", "expectation_values"]
