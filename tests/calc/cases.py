"""Seeded inputs over every tool, for the registry-wide tests: each tool's defaults and a set
of random values inside each field's range (choices and ticks drawn from their options)."""

from __future__ import annotations

import math
import random

from calc.kernel import registry


def all_finite(obj: object) -> bool:
    """Whether every float in an answer (nested in its dicts and lists) is finite."""
    if isinstance(obj, float):
        return math.isfinite(obj)
    if isinstance(obj, dict):
        return all(all_finite(v) for v in obj.values())
    if isinstance(obj, list):
        return all(all_finite(v) for v in obj)
    return True


def random_inputs(found: registry.Tool, rng: random.Random) -> dict:
    """One set of typed inputs: about 30 % of the fields left blank, the rest in range; a
    field the chosen mode does not use is left out (it would be refused)."""
    inputs, modes = {}, found.default_modes()
    for f in found.inputs:
        if f.key in modes and rng.random() >= 0.3:
            modes[f.key] = inputs[f.key] = rng.choice(f.choices)[0]
    for f in found.inputs:
        if f.key in modes or not found.uses(f, modes) or rng.random() < 0.3:
            continue
        if f.is_flag:
            inputs[f.key] = rng.choice(["yes", "no"])
        elif f.is_choice:
            inputs[f.key] = rng.choice(f.choices)[0]
        else:
            low = f.min if f.min is not None else -100.0
            high = f.max if f.max is not None else 1000.0
            if low > 0 and high / low > 100:
                value = math.exp(rng.uniform(math.log(low), math.log(high)))
            else:
                value = rng.uniform(low, high)
            if isinstance(f.default, float) and rng.random() < 0.5:
                value = f.default * rng.uniform(0.7, 1.3)
            inputs[f.key] = repr(value)
    return inputs


def cases(per_tool: int = 40, seed: int = 20261202) -> list[tuple[str, dict]]:
    """(tool id, inputs) for every tool: its defaults, then `per_tool` seeded random sets
    (run them with examples, as the blank fields take the tools' examples)."""
    rng = random.Random(seed)
    out = []
    for tool_id, found in registry.tools().items():
        out.append((tool_id, {}))
        out += [(tool_id, random_inputs(found, rng)) for _ in range(per_tool)]
    return out
