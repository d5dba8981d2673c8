"""Developer tools (re-tuning the stored exponent boxes): not part of the runtime package API.

Nothing in twoel imports this package (the solve path, the command line and the report never
do); run the tools as ``python -m twoel.tools.tune_boxes ...``."""
