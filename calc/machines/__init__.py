"""Machines: the machine card (its facts, bound to tool inputs), readings as records of what
calc computed for a machine, the condition quantities followed over time against their
limits, what is due next, and the visit report."""
