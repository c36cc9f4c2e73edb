#!/usr/bin/env python3
"""Writes the seed corpus of every fuzz target into fuzz/corpus/<target>/.

Reproducible byte for byte (fixed seed, no dependencies):
    python3 fuzz/seeds.py
Layouts are those of harness/src/fuzz_checks.rs: a flag byte (bit 0 put,
bit 1 raw f64 bits, bit 2 the target's variant), then little-endian u64 words.
The CSV seeds are invented books on the NGX barley index of the fictional
Nordwind Grain Exchange, one per hostile-input class of the README.
"""

import os
import random
import struct

ROOT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "corpus")
SPECIAL = [
    float("nan"), float("inf"), -float("inf"), 0.0, -0.0, 1e308, -1e308,
    1e-308, 5e-324, 2.2250738585072014e-308, 1.7976931348623157e308, 1.0, -1.0,
]


def words(values):
    return b"".join(struct.pack("<Q", v) for v in values)


def floats(values):
    return b"".join(struct.pack("<d", v) for v in values)


def binary_seeds(rng, count_words, count):
    seeds = []
    for i in range(count):
        if i % 3 == 2:
            flags = 2 | (i & 1) | (i & 4)
            body = floats(rng.choice(SPECIAL + [rng.uniform(-2, 200)]) for _ in range(count_words))
        else:
            flags = (i & 1) | (4 if i % 5 == 0 else 0)
            body = words(rng.getrandbits(64) for _ in range(count_words))
        seeds.append(bytes([flags]) + body)
    return seeds


HEADER = "id,kind,style,spot,strike,expiry,rate,dividend_yield,vol"
CSV_SEEDS = [
    HEADER + "\nngx-1,call,,42,40,0.5,0.1,,0.2\nngx-2,put,american,40,42,0.5,0.1,0,0.3\n",
    HEADER + "\r\nngx-1,call,european,42,40,0.5,0.1,0.02,0.2\r\n",
    "\ufeff" + HEADER + "\nngx-1,CALL,,42,40,0.5,0.1,,0.2\n",
    HEADER + "\nngx-1,call,,nan,40,0.5,0.1,,0.2\nngx-2,put,,42,inf,0.5,0.1,,-inf\n",
    HEADER + "\nngx-1,call,,1e308,1e-308,0.5,0.1,,0.2\nngx-2,put,,0,-1,0,0,0,0\n",
    HEADER + "\nngx-1,call,,,40,0.5,0.1,,0.2\nngx-2,put,,abc,4 0,0.5,0.1,,x\n",
    HEADER + "\nngx-1,straddle,bermudan,42,40,0.5,0.1,,0.2\n",
    HEADER + "\nngx-1,call,,42,40,0.5,0.1,,0.2\nngx-2,put,,42,4",
    HEADER + "\nngx-1,call,,42,40,0.5,0.1,,0.2,surplus\n\n\nngx-2,put\n",
    HEADER + ",note\n\"ngx, 1\",call,,42,40,0.5,0.1,,0.2,\"two\nlines \"\"quoted\"\"\"\n",
    "kind,spot,strike,expiry,rate,premium\ncall,21,20,0.25,0.1,1.875\nput,21,20,0.25,0.1,0\n",
    "kind,style,spot,strike,expiry,rate,premium\nput,american,40,42,0.5,0.1,3\n",
    "kind,spot,strike,expiry,rate,vol,premium\ncall,1,1,1,0,0.2,0.1\n",
    "kind,spot,strike,expiry,rate\ncall,1,1,1,0\n",
    "kind,spot,strike,expiry,rate,vol,spot\ncall,1,1,1,0,0.2,1\n",
    "call,42,40,0.5,0.1,0.2\n",
    "",
    "kind,spot,strike,expiry,rate,vol,status\ncall,1,1,1,0,0.2,ok\n",
]
CSV_BYTES = [
    (HEADER + "\nngx-\xff,call,,42,40,0.5,0.1,,0.2\n").encode("latin-1"),
    b"kind,spot,strike,expiry,rate,vol,\xc0\n",
]


def write(target, seeds):
    folder = os.path.join(ROOT, target)
    os.makedirs(folder, exist_ok=True)
    for i, seed in enumerate(seeds):
        with open(os.path.join(folder, f"seed-{i:02}"), "wb") as f:
            f.write(seed)


def main():
    rng = random.Random(20240611)
    for target, count_words in [("price", 6), ("greeks", 6), ("implied_vol", 7),
                                ("american_price", 6), ("heat_step", 7 + 34)]:
        count = 12 if target == "american_price" else 30
        write(target, binary_seeds(rng, count_words, count))
    write("batch_decode", [s.encode("utf-8") for s in CSV_SEEDS] + CSV_BYTES)
    # kernel_batch: up to eight price-layout options back to back, then
    # batches on the edges of the implied-vol solver's blocks of 16.
    sizes = [1 + i % 8 for i in range(20)] + [15, 16, 17, 32, 33, 40]
    write("kernel_batch", [b"".join(binary_seeds(rng, 6, n)) for n in sizes])


if __name__ == "__main__":
    main()
