"""Developer tools, apart from the runtime package: re-tuning the stored exponent boxes.

Nothing in the solve path imports this package."""
