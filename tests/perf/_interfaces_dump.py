"""Equivalence harness for rate_interfaces: save every result array, or compare with a save.

Run as a script (not collected by pytest)::

    python tests/perf/_interfaces_dump.py save OUT.npz
    python tests/perf/_interfaces_dump.py compare OUT.npz

The cases are bench_sleeves' parts (200 000, over several blocks of rows) and mixed batches
with edge cases: no interference, clearance, contact lost at temperature, missing or bad
inputs (NaN E, nu, expansion coefficient, friction, lengths), bonds only, absent slots, every
load path and an unknown one, with and without ``share``/``sum_stiffness``. A change meant to
speed the check up must leave every array equal bit for bit (NaN equal to NaN).
"""

from __future__ import annotations

import sys
from dataclasses import fields

import numpy as np
from bench_engine import random_parts
from bench_sleeves import interface_inputs
from twistshare.engine.core import LayerStack, rate, rate_interfaces


def _sprinkle(rng, array: np.ndarray, fraction: float, value: float) -> np.ndarray:
    array = np.array(array, dtype=float, copy=True)
    hit = rng.random(array.shape) < fraction
    array[hit] = value
    return array


def _mixed(n_parts: int, seed: int, n_layers: int = 3, absent: bool = True) -> tuple:
    """Random parts with absent slots, odd inputs and every load path."""
    rng = np.random.default_rng(seed)
    stack, duty = random_parts(n_parts, seed=seed)
    do, di, g = (np.array(a, copy=True) for a in (stack.outer_diameter, stack.inner_diameter,
                                                  stack.shear_modulus))
    if n_layers != 3:
        do = np.concatenate([do, do[:, -1:] + 2 * rng.uniform(0.002, 0.01, (n_parts, 1))], 1)
        di = np.concatenate([di, do[:, 2:3]], 1)
        g = np.concatenate([g, g[:, :1]], 1)
        do, di, g = do[:, :n_layers], di[:, :n_layers], g[:, :n_layers]
    present = np.ones(do.shape, dtype=bool)
    if absent:
        layers = rng.integers(1, n_layers + 1, n_parts)
        present = np.arange(n_layers)[np.newaxis, :] < layers[:, np.newaxis]
        do[~present] = np.nan
        di[~present] = np.nan
    stack = LayerStack.from_arrays(do, di, g, 100e6, 1.0, present)
    inputs = interface_inputs(n_parts, np.nan_to_num(do), seed=seed + 1)
    shape = do.shape
    if n_layers != 3:
        for key, value in list(inputs.items()):
            if np.ndim(value) == 2:
                extra = rng.permutation(np.asarray(value)[:, -1])[:, np.newaxis]
                inputs[key] = np.concatenate([value, extra], 1)[:, :n_layers]
    delta = np.array(inputs["interference"], copy=True)
    # Zero interference, clearance, a fit at every interface, none at all.
    kind = rng.integers(0, 6, n_parts)
    delta[kind == 0] = 0.0
    delta[kind == 1] = -np.abs(np.nan_to_num(delta[kind == 1], nan=1e-5))
    delta[kind == 2, 1:] = 5e-5
    delta[kind == 3] = np.nan
    delta[:, 0] = np.where(rng.random(n_parts) < 0.1, 1e-5, np.nan)
    inputs["interference"] = delta
    for key, fraction, value in (("youngs_modulus", 0.01, np.nan), ("poisson_ratio", 0.01, 0.6),
                                 ("poisson_ratio", 0.005, np.nan),
                                 ("expansion_coefficient", 0.02, np.nan),
                                 ("yield_strength", 0.01, np.nan), ("yield_strength", 0.01, 1e6),
                                 ("fit_length", 0.01, np.nan), ("fit_length", 0.005, -1.0),
                                 ("bond_length", 0.01, 0.0), ("bond_allowable", 0.01, -5.0),
                                 ("interference", 0.005, np.inf)):
        inputs[key] = _sprinkle(rng, inputs[key], fraction, value)
    # Large expansion differences: contact lost at temperature.
    alpha = np.array(inputs["expansion_coefficient"], copy=True)
    hot = rng.random(n_parts) < 0.1
    alpha[hot, 1:] = alpha[hot, 1:] * 4.0
    inputs["expansion_coefficient"] = alpha
    inputs["friction"] = _sprinkle(rng, np.full(shape, 0.12), 0.01, np.nan)
    inputs["factor_of_safety"] = _sprinkle(rng, np.full(shape, 1.5), 0.005, 0.0)
    temperature = np.where(rng.random(n_parts) < 0.5, rng.uniform(200.0, 500.0, n_parts), np.nan)
    inputs["operating_temperature"] = temperature
    inputs["load_path"] = rng.choice([0.0, 1.0, 2.0, 7.0], n_parts, p=[0.4, 0.3, 0.2, 0.1])
    return stack, duty, inputs


def cases() -> dict[str, tuple]:
    """name: (stack, inputs, use the rating's share)."""
    out = {}
    stack, duty = random_parts(200_000)
    out["bench"] = (stack, duty, interface_inputs(200_000, stack.outer_diameter), True)
    out["bench_noshare"] = (*out["bench"][:3], False)
    stack, duty, inputs = _mixed(150_000, 11)
    out["mixed"] = (stack, duty, inputs, True)
    out["mixed_noshare"] = (stack, duty, inputs, False)
    stack, duty, inputs = _mixed(30_000, 12, absent=False)
    out["mixed_full"] = (stack, duty, inputs, True)
    stack, duty, inputs = _mixed(30_000, 13, n_layers=4)
    out["four_layers"] = (stack, duty, inputs, True)
    stack, duty, inputs = _mixed(30_000, 14, n_layers=4, absent=False)
    out["four_full"] = (stack, duty, inputs, True)
    stack, duty, inputs = _mixed(20_000, 15, n_layers=2, absent=False)
    out["two_layers"] = (stack, duty, inputs, True)
    stack, duty, inputs = _mixed(20_000, 16)
    out["bonds_only"] = (stack, duty, dict(inputs, interference=np.nan), True)
    stack, duty, inputs = _mixed(20_000, 17, absent=False)
    inputs = dict(inputs, load_path=0.0, operating_temperature=353.15)
    out["uniform_path_hot"] = (stack, duty, inputs, True)
    stack, duty = random_parts(70_000, seed=18)
    inputs = interface_inputs(70_000, stack.outer_diameter, seed=19)
    inputs["interference"] = np.array(inputs["interference"])
    inputs["interference"][:, 2] = 3e-5  # every part with two fits
    inputs["expansion_coefficient"] = np.array(inputs["expansion_coefficient"])
    inputs["expansion_coefficient"][:, 2] *= 3.0  # many contacts lost
    out["two_fits_hot"] = (stack, duty, inputs, True)
    return out


def run() -> dict[str, np.ndarray]:
    arrays = {}
    for name, (stack, duty, inputs, given) in cases().items():
        extra = {}
        if given:
            rating = rate(stack, duty)
            extra = dict(share=rating.share, sum_stiffness=rating.sum_gj)
        result = rate_interfaces(stack, **inputs, **extra)
        for item in fields(result):
            arrays[f"{name}__{item.name}"] = np.asarray(getattr(result, item.name))
    return arrays


def main(argv: list[str]) -> int:
    mode, path = argv
    arrays = run()
    if mode == "save":
        np.savez_compressed(path, **arrays)
        print(f"saved {len(arrays)} arrays to {path}")
        return 0
    saved = np.load(path)
    bad = [key for key in saved.files
           if key not in arrays or arrays[key].dtype != saved[key].dtype
           or arrays[key].shape != saved[key].shape
           or not np.array_equal(arrays[key], saved[key], equal_nan=True)]
    bad += [key for key in arrays if key not in saved.files]
    # Bit for bit: also the sign of zeros and the NaN payloads.
    for key in saved.files:
        if key in bad or saved[key].dtype != np.float64:
            continue
        if not np.array_equal(arrays[key].view(np.uint64), saved[key].view(np.uint64)):
            bad.append(key + " (bits)")
    print(f"compared {len(saved.files)} arrays: {'all equal' if not bad else 'DIFFER: ' + ', '.join(bad)}")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
