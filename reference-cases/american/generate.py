#!/usr/bin/env python3
# requires: python3 (3.11), numpy==2.4.6
"""American option references for the calor grid pricer, by an independent method.

Method: a Cox-Ross-Rubinstein binomial tree whose last step uses the
Black-Scholes-Merton value instead of the payoff (the "BBS" tree), with
two-point Richardson extrapolation R(N) = 2*P(2N) - P(N) (the BBSR method).
The reference is R(N) with N = 10,000 (trees of 10,000 and 20,000 steps); the
estimated reference error is |R(N) - R(N/2)|, the change of the extrapolated
value over one refinement.  The finite-difference grid under test shares no
code and no discretisation with this tree.

Sources (from memory): J. C. Cox, S. A. Ross, M. Rubinstein, "Option pricing:
a simplified approach", J. Financial Economics 7 (1979) 229-263 (the tree);
M. Broadie & J. Detemple, "American option valuation: new bounds,
approximations, and a comparison of existing methods", Rev. Financial Studies
9 (1996) 1211-1250 (the Black-Scholes last step and the extrapolation).

Before writing anything the script checks its plain tree against the printed
tree values of the reference notes (ids A01-A05, A08-A10) and stops if one
disagrees.

    python3 reference-cases/american/generate.py [--out DIR] [--check]

--check regenerates into a temporary folder and compares with the committed
tables cell by cell (exit status 1 and the differing cell on a mismatch): the
inputs and step counts must be identical, the two computed columns agree
within CHECK_TOLERANCE (numpy picks its SIMD loops by CPU, so the last of the
15 printed digits moves between hosts).
"""

import argparse
import csv
import math
import os
import sys
import tempfile
import time
from random import Random

import numpy as np

SEED = 20240611
ROWS = 60
STEPS = 10_000  # the extrapolation uses trees of STEPS and 2*STEPS steps
HERE = os.path.dirname(os.path.abspath(__file__))
TABLES = ('references.csv', 'published.csv')
HEADER = ('id', 'kind', 'spot', 'strike', 'expiry', 'rate', 'dividend_yield', 'vol',
          'reference', 'reference_error', 'steps')
# Relative tolerance of --check on the computed columns.  reference: 1e-12,
# a hundred units of its 15th printed digit and three orders below the
# smallest relative reference_error of the table (1.2e-9); reference_error:
# 1e-3, one unit of its 4th printed digit.  Every other cell must match.
CHECK_TOLERANCE = {'reference': 1e-12, 'reference_error': 1e-3}

# The box the default grid promises its accuracy on.
BOX = {'moneyness': (0.8, 1.25), 'expiry': (0.1, 2.0), 'vol': (0.10, 0.60),
       'rate': (0.02, 0.08), 'dividend_yield': (0.0, 0.03)}


def plain_tree(kind, spot, strike, expiry, rate, vol, steps, american=True,
               up=None, down=None, prob_digits=None):
    """A textbook CRR tree in plain Python (small step counts only).

    up/down override the CRR factors exp(+-vol*sqrt(dt)); prob_digits rounds the
    risk-neutral probability the way a printed example may have done.
    """
    dt = expiry / steps
    u = up if up is not None else math.exp(vol * math.sqrt(dt))
    d = down if down is not None else 1.0 / u
    p = (math.exp(rate * dt) - d) / (u - d)
    if prob_digits is not None:
        p = round(p, prob_digits)
    disc = math.exp(-rate * dt)
    sign = 1.0 if kind == 'call' else -1.0
    values = [max(sign * (spot * u ** j * d ** (steps - j) - strike), 0.0)
              for j in range(steps + 1)]
    for i in range(steps - 1, -1, -1):
        for j in range(i + 1):
            cont = disc * (p * values[j + 1] + (1.0 - p) * values[j])
            exercise = sign * (spot * u ** j * d ** (i - j) - strike)
            values[j] = max(cont, exercise) if american else cont
    return values[0]


# id, printed value, printed digits after the point, tree call
PUBLISHED = (
    ('A01', 4.49, 2, lambda: plain_tree('put', 50.0, 50.0, 5 / 12, 0.1, 0.4, 5)),
    ('A02', 4.263, 3, lambda: plain_tree('put', 50.0, 50.0, 5 / 12, 0.1, 0.4, 30)),
    ('A03', 4.272, 3, lambda: plain_tree('put', 50.0, 50.0, 5 / 12, 0.1, 0.4, 50)),
    ('A04', 4.278, 3, lambda: plain_tree('put', 50.0, 50.0, 5 / 12, 0.1, 0.4, 100)),
    ('A05', 4.283, 3, lambda: plain_tree('put', 50.0, 50.0, 5 / 12, 0.1, 0.4, 500)),
    # The book rounds p to 0.6282; its printed digits hold for that tree only.
    ('A08', 5.0894, 4, lambda: plain_tree('put', 50.0, 52.0, 2.0, 0.05, 0.0, 2, up=1.2,
                                          down=0.8, prob_digits=4)),
    ('A09', 4.1923, 4, lambda: plain_tree('put', 50.0, 52.0, 2.0, 0.05, 0.0, 2, False,
                                          up=1.2, down=0.8, prob_digits=4)),
    ('A10', 7.43, 2, lambda: plain_tree('put', 50.0, 52.0, 2.0, 0.05, 0.3, 2)),
)
# The exact (unrounded-p) trees of A08/A09, as recomputed in the notes.
EXACT_TWO_STEP = (
    ('A08', 5.089632474198, lambda: plain_tree('put', 50.0, 52.0, 2.0, 0.05, 0.0, 2,
                                               up=1.2, down=0.8)),
    ('A09', 4.192654280603, lambda: plain_tree('put', 50.0, 52.0, 2.0, 0.05, 0.0, 2,
                                               False, up=1.2, down=0.8)),
)


def validate_plain_tree():
    """Stops the script unless the plain tree prints the published digits."""
    for ident, printed, digits, tree in PUBLISHED:
        value = tree()
        if round(value, digits) != printed:
            sys.exit(f'{ident}: tree gives {value!r}, the source prints {printed}')
    for ident, recomputed, tree in EXACT_TWO_STEP:
        if abs(tree() - recomputed) > 1e-11:
            sys.exit(f'{ident}: exact tree gives {tree()!r}, the notes recompute {recomputed}')


def black_value(sign, spots, strike, tau, rate, dividend_yield, vol):
    """Black-Scholes-Merton values for an array of spots (sign +1 call, -1 put)."""
    s = vol * math.sqrt(tau)
    d1 = (np.log(spots / strike) + (rate - dividend_yield + 0.5 * vol * vol) * tau) / s
    d2 = d1 - s
    cdf = np.frompyfunc(lambda z: 0.5 * math.erfc(-z / math.sqrt(2.0)), 1, 1)
    n1 = cdf(sign * d1).astype(float)
    n2 = cdf(sign * d2).astype(float)
    return sign * (spots * math.exp(-dividend_yield * tau) * n1
                   - strike * math.exp(-rate * tau) * n2)


def bbs_tree(kind, spot, strike, expiry, rate, dividend_yield, vol, steps):
    """American value on a CRR tree with the Black-Scholes value at the last step."""
    dt = expiry / steps
    log_up = vol * math.sqrt(dt)
    up = math.exp(log_up)
    prob = (math.exp((rate - dividend_yield) * dt) - 1.0 / up) / (up - 1.0 / up)
    disc = math.exp(-rate * dt)
    p_up, p_down = disc * prob, disc * (1.0 - prob)
    sign = 1.0 if kind == 'call' else -1.0
    # Node (i, j) sits at level 2j - i; index level + steps in these arrays.
    spots = spot * np.exp(log_up * np.arange(-steps, steps + 1, dtype=float))
    exercise = np.maximum(sign * (spots - strike), 0.0)
    last = spots[1:2 * steps:2]
    values = np.maximum(black_value(sign, last, strike, dt, rate, dividend_yield, vol),
                        exercise[1:2 * steps:2])
    for i in range(steps - 2, -1, -1):
        values = p_up * values[1:] + p_down * values[:-1]
        np.maximum(values, exercise[steps - i:steps + i + 1:2], out=values)
    return float(values[0])


def reference(kind, *inputs):
    """BBSR at STEPS and its change from STEPS/2: (value, estimated error)."""
    half, full, double = (bbs_tree(kind, *inputs, n) for n in (STEPS // 2, STEPS, 2 * STEPS))
    coarse = 2.0 * full - half
    fine = 2.0 * double - full
    return fine, abs(fine - coarse)


def draw(rng, index):
    """One case of the box: puts on even rows, calls (with a dividend) on odd rows."""
    lo, hi = BOX['moneyness']
    moneyness = math.exp(rng.uniform(math.log(lo), math.log(hi)))
    strike = round(math.exp(rng.uniform(math.log(20.0), math.log(500.0))), 2)
    spot = round(strike * moneyness, 2)
    expiry = round(rng.uniform(*BOX['expiry']), 4)
    vol = round(rng.uniform(*BOX['vol']), 4)
    rate = round(rng.uniform(*BOX['rate']), 4)
    dividend_yield = round(rng.uniform(*BOX['dividend_yield']), 4)
    kind = 'put' if index % 2 == 0 else 'call'
    if kind == 'put' and index % 6 == 0:
        dividend_yield = 0.0
    if kind == 'call':
        # Without a dividend an American call is European; keep the yield
        # large enough that early exercise is in play.
        dividend_yield = max(dividend_yield, 0.005)
    return kind, (spot, strike, expiry, rate, dividend_yield, vol)


def corners():
    """The 16 corners of the box in moneyness, expiry, vol and rate.

    Puts and calls by the parity of the corner, so each kind meets both ends
    of every range; high-vol puts and all calls take the largest dividend yield.
    """
    strike = 100.0
    for index in range(16):
        bits = [(index >> b) & 1 for b in range(4)]
        moneyness, expiry, vol, rate = (BOX[name][bit] for name, bit in
                                        zip(('moneyness', 'expiry', 'vol', 'rate'), bits))
        kind = 'put' if sum(bits) % 2 == 0 else 'call'
        dividend_yield = BOX['dividend_yield'][1] if kind == 'call' or bits[2] else 0.0
        yield f'corner{index:02d}', kind, (round(strike * moneyness, 2), strike, expiry, rate,
                                           dividend_yield, vol)


def row(ident, kind, inputs):
    value, error = reference(kind, *inputs)
    fields = (ident, kind, *(repr(float(x)) for x in inputs), f'{value:.15g}',
              f'{error:.3e}', str(STEPS))
    return ','.join(fields)


def write(path, rows):
    with open(path, 'w', newline='\n', encoding='ascii') as out:
        out.write(','.join(HEADER) + '\n')
        for line in rows:
            out.write(line + '\n')


def generate(out):
    validate_plain_tree()
    started = time.monotonic()
    rng = Random(SEED)
    rows = []
    for index in range(ROWS):
        kind, inputs = draw(rng, index)
        rows.append(row(f'am{index:03d}', kind, inputs))
    for ident, kind, inputs in corners():
        rows.append(row(ident, kind, inputs))
    write(os.path.join(out, 'references.csv'), rows)
    # The converged value of the ladder A01-A05 (notes: about 4.2842).
    write(os.path.join(out, 'published.csv'),
          [row('hull_put_converged', 'put', (50.0, 50.0, 5 / 12, 0.1, 0.0, 0.4))])
    print(f'{len(rows) + 1} references in {time.monotonic() - started:.0f} s', file=sys.stderr)


def main():
    parser = argparse.ArgumentParser(description=__doc__.split('\n', 1)[0])
    parser.add_argument('--out', default=HERE, help='folder of the tables (default: beside this script)')
    parser.add_argument('--check', action='store_true',
                        help='regenerate into a temporary folder and compare with --out')
    args = parser.parse_args()
    if not args.check:
        generate(args.out)
        return 0
    with tempfile.TemporaryDirectory() as tmp:
        generate(tmp)
        bad = 0
        for t in TABLES:
            why = table_difference(os.path.join(tmp, t), os.path.join(args.out, t))
            if why:
                bad += 1
                print(f'differs from a fresh generation: {os.path.join(args.out, t)}: {why}',
                      file=sys.stderr)
    return 1 if bad else 0


def table_difference(fresh, committed):
    """The first disagreement of two tables beyond CHECK_TOLERANCE, or None."""
    if not os.path.exists(committed):
        return 'missing'
    with open(fresh, newline='') as f, open(committed, newline='') as g:
        new, old = list(csv.reader(f)), list(csv.reader(g))
    if new[:1] != old[:1]:
        return 'another header'
    if len(new) != len(old):
        return f'{len(old)} lines, fresh {len(new)}'
    for line, (a, b) in enumerate(zip(new[1:], old[1:]), start=2):
        if len(a) != len(b):
            return f'line {line}: {len(b)} cells, fresh {len(a)}'
        for name, x, y in zip(new[0], a, b):
            tol = CHECK_TOLERANCE.get(name)
            same = x == y if tol is None else (
                abs(float(x) - float(y)) <= tol * max(abs(float(x)), abs(float(y))))
            if not same:
                return f'line {line}, {name}: committed {y}, fresh {x}'
    return None


if __name__ == '__main__':
    sys.exit(main())
