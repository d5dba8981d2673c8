"""Analysis over many solves: convergence studies, sweeps over Z or size, transitions."""
