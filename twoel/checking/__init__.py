"""The checker of energies printed by other programs: input rows (``rows``) and verdicts
(``verdicts``)."""
