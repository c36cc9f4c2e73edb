#!/usr/bin/env python3
# requires: python3, mpmath==1.3.0
"""Reference tables for the calor option-valuation kernel.

Model: Black-Scholes-Merton with a continuous dividend yield, evaluated with
mpmath at high precision from inputs that are exact IEEE f64 values.  Every
Greek is a numerical derivative of the price function taken with mpmath.diff;
no Greek formula appears here.

    python3 reference-cases/generate.py [--out DIR] [--check]

--check regenerates into a temporary folder and compares byte for byte with
the committed tables (exit status 1 and the differing file on a mismatch).
"""

import argparse
import csv
import filecmp
import multiprocessing
import os
import sys
import tempfile
import time
from random import Random

import mpmath
from mpmath import mp, mpf

mp.dps = 60  # sampling and bookkeeping; evaluations set their own precision

INPUTS = ('spot', 'strike', 'expiry', 'rate', 'dividend_yield', 'vol')
STEP = mpmath.ldexp(1, -54)  # step of every mpmath.diff call, in natural units
GREEK_DIGITS = 84  # + dynamic range; third differences divide noise by STEP**3
FIRST_DIGITS = 80  # + dynamic range; first derivatives only
TINY, HUGE = mpf('1e-300'), mpf('1e300')
RESOLUTION = 64 * 2.0 ** -52  # implied.csv: least distance of a premium from a bound
DAY, HOUR = 1 / 365, 1 / 8760

# name, derivative orders over INPUTS, sign (theta-like Greeks are -d/dT)
GREEKS = (
    ('delta', (1, 0, 0, 0, 0, 0), 1), ('gamma', (2, 0, 0, 0, 0, 0), 1),
    ('vega', (0, 0, 0, 0, 0, 1), 1), ('theta', (0, 0, 1, 0, 0, 0), -1),
    ('rho', (0, 0, 0, 1, 0, 0), 1), ('dividend_rho', (0, 0, 0, 0, 1, 0), 1),
    ('vanna', (1, 0, 0, 0, 0, 1), 1), ('volga', (0, 0, 0, 0, 0, 2), 1),
    ('charm', (1, 0, 1, 0, 0, 0), -1), ('veta', (0, 0, 1, 0, 0, 1), -1),
    ('speed', (3, 0, 0, 0, 0, 0), 1), ('zomma', (2, 0, 0, 0, 0, 1), 1),
    ('color', (2, 0, 1, 0, 0, 0), -1), ('ultima', (0, 0, 0, 0, 0, 3), 1),
)
FIRST = {name: tuple(int(i == j) for j in range(6)) for i, name in enumerate(INPUTS)}

# name, rows, sampling ranges overriding DOMAIN, |standardised moneyness| range
DOMAIN = {'spot': (1e-3, 1e6), 'expiry': (HOUR, 50.0), 'vol': (0.001, 5.0),
          'rate': (-0.05, 0.30), 'dividend_yield': (0.0, 0.20)}
STRATA = (
    ('near_money', 740, {}, (0, 1)),
    ('wings', 740, {}, (1, 6)),
    ('deep_tails', 1520, {}, (6, 37.5)),
    ('short_expiry', 600, {'expiry': (HOUR, DAY)}, (0, 10)),
    ('long_expiry', 600, {'expiry': (20.0, 50.0)}, (0, 10)),
    ('low_vol', 600, {'vol': (0.001, 0.02)}, (0, 10)),
    ('high_vol', 600, {'vol': (1.5, 5.0)}, (0, 10)),
    ('extreme_scale', 600, {'spot': (1e-100, 1e100)}, (0, 6)),
)
EXTREME_MAX_LOG_RATIO = 3  # extreme_scale: |ln(K/S)| <= 3

GREEKS_HEADER = (('id', 'stratum', 'kind') + INPUTS + ('price',)
                 + tuple(g[0] for g in GREEKS) + ('kappa',))
IMPLIED_HEADER = ('id', 'stratum', 'kind') + INPUTS + ('premium', 'price', 'vega', 'kappa')
TEXTBOOK_HEADER = ('id', 'quantity', 'kind') + INPUTS + (
    'premium', 'scale', 'printed', 'printed_decimals', 'recomputed', 'source', 'citation')


# ----------------------------------------------------------------- model

def normal_cdf(z):
    """Phi(z) = erfc(-z/sqrt 2)/2; for z > 0 as 1 - Phi(-z), the tail computed
    only to the digits that survive next to 1 (far faster, equally accurate)."""
    if z <= 0:
        return mp.erfc(-z / mp.sqrt(2)) / 2
    with mp.workprec(max(mp.prec + 20 - int(z * z * 0.72), 53)):  # tail < 2**(-0.72 z^2)
        tail = mp.erfc(z / mp.sqrt(2)) / 2
    return 1 - tail


def d1_sd(S, K, T, r, q, v):
    sd = v * mp.sqrt(T)
    return (mp.log(S / K) + (r - q + v * v / 2) * T) / sd, sd


def terms(kind, S, K, T, r, q, v):
    """The two terms (a, b) of the price a - b."""
    d1, sd = d1_sd(S, K, T, r, q, v)
    d2 = d1 - sd
    fs, fk = S * mp.exp(-q * T), K * mp.exp(-r * T)
    if kind == 'call':
        return fs * normal_cdf(d1), fk * normal_cdf(d2)
    return fk * normal_cdf(-d2), fs * normal_cdf(-d1)


def price(kind, *x):
    a, b = terms(kind, *x)
    return a - b


class Valuation:
    """Price and numerical derivatives of one option at exact f64 inputs.

    mpmath.diff differentiates g(u) = V(x + c*u) at u = 0 with the step STEP,
    where c holds the natural scale of each input (the change over which the
    price's derivatives change by a factor of order one), so that truncation
    (about STEP**2) and rounding noise (about 10**-digits / STEP**n) are the same
    small fraction of every result; the derivative of V is that of g over c**n.
    The price is evaluated at `digits` plus the number of digits by which its
    larger term exceeds the smallest natural size of the results: the smaller of
    the call and put price, and the normal-density term S e^(-qT) n(d1) that
    all the higher Greeks carry (deep in the money, or at a huge vol*sqrt(T),
    the Greeks are tiny next to the price).  Evaluations are memoised.
    """

    def __init__(self, kind, inputs, digits):
        self.kind, self.x = kind, [mpf(v) for v in inputs]
        S, K, T, r, q, v = self.x
        with mp.workdps(40):
            self.floor = min(price('call', *self.x), price('put', *self.x))
            d1, sd = d1_sd(*self.x)
            density = S * mp.exp(-q * T - d1 * d1 / 2) / mp.sqrt(2 * mp.pi)
            if self.floor > 0:
                size = min(self.floor, density)
                digits += max(0, int(mp.log10(max(terms(kind, *self.x)) / size)) + 1)
            # log-derivatives of the tail normal_cdf(d) are about |d| per unit of d
            dm = max(1, abs(d1), abs(d1 - sd))
            drift = (abs(mp.log(S / K)) + abs(r - q + v * v / 2) * T) / sd
            spot = min(1, sd / dm) * S
            rate = 1 / (dm * mp.sqrt(T) / v + T)
            self.unit = (spot, spot * K / S, T / (dm * drift + (abs(r) + q) * T + 1),
                         rate, rate, min(1, 1 / (dm * (dm + sd))) * v)
        self.digits, self.memo = digits, {}

    def bumped(self, *u):
        if u not in self.memo:
            with mp.workdps(self.digits):
                y = [xi + ci * ui for xi, ci, ui in zip(self.x, self.unit, u)]
                self.memo[u] = price(self.kind, *y)
        return self.memo[u]

    def value(self):
        return self.bumped(*[mpf(0)] * 6)

    def derivative(self, orders):
        with mp.workdps(self.digits):
            d = mpmath.diff(self.bumped, [mpf(0)] * 6, list(orders), h=STEP)
            for ci, n in zip(self.unit, orders):
                d /= ci ** n
        return d

    def kappa(self):
        total = sum(abs(xi * self.derivative(FIRST[n])) for xi, n in zip(self.x, INPUTS))
        return total / abs(self.value())


def fmt(value):
    return mpmath.nstr(value, 30, min_fixed=1, max_fixed=0, strip_zeros=False)


def representable(values):
    return all(TINY <= abs(v) <= HUGE for v in values)


# -------------------------------------------------------------- sampling

def log_uniform(rng, lo, hi):
    a, b = mp.log(lo), mp.log(hi)
    return float(mp.exp(a + rng.random() * (b - a)))


def draw(rng, ranges, moneyness):
    """One candidate (kind, inputs) of a stratum, or None when out of range."""
    kind = 'call' if rng.random() < 0.5 else 'put'
    spot = log_uniform(rng, *ranges.get('spot', DOMAIN['spot']))
    expiry = log_uniform(rng, *ranges.get('expiry', DOMAIN['expiry']))
    vol = log_uniform(rng, *ranges.get('vol', DOMAIN['vol']))
    lo, hi = DOMAIN['rate']
    rate = lo + (hi - lo) * rng.random()
    lo, hi = DOMAIN['dividend_yield']
    dividend_yield = lo + (hi - lo) * rng.random()
    lo, hi = moneyness
    z = (lo + (hi - lo) * rng.random()) * (1 if rng.random() < 0.5 else -1)
    # x = ln(F/K) = z*vol*sqrt(T): solve for the strike, then round it to f64
    S, T, r, q, v = (mpf(a) for a in (spot, expiry, rate, dividend_yield, vol))
    strike = float(S * mp.exp((r - q) * T - z * v * mp.sqrt(T)))
    if not 1e-300 <= strike <= 1e300:
        return None
    if 'spot' in ranges and abs(mp.log(strike / S)) > EXTREME_MAX_LOG_RATIO:  # extreme_scale
        return None
    z = (mp.log(S / strike) + (r - q) * T) / (v * mp.sqrt(T))
    if not lo <= abs(z) <= hi:
        return None
    return kind, (spot, strike, expiry, rate, dividend_yield, vol)


def greeks_row(kind, inputs):
    val = Valuation(kind, inputs, GREEK_DIGITS)
    if not val.floor >= TINY:
        return None
    values = [val.value()] + [sign * val.derivative(orders) for _, orders, sign in GREEKS]
    values.append(val.kappa())
    return [fmt(v) for v in values] if representable(values) else None


def implied_row(kind, inputs):
    val = Valuation(kind, inputs, FIRST_DIGITS)
    if not val.floor >= TINY:
        return None
    value = val.value()
    premium = float(value)
    S, K, T, r, q, _ = val.x
    with mp.workdps(val.digits):
        fs, fk = S * mp.exp(-q * T), K * mp.exp(-r * T)
        lower, upper = (max(0, fs - fk), fs) if kind == 'call' else (max(0, fk - fs), fk)
    # The bounds can only be evaluated in f64 to a few ulps of the discounted legs,
    # so a premium within RESOLUTION of a bound, relative to the legs, cannot be told
    # from the bound; such premiums are not sampled. (An out-of-the-money premium
    # has lower = 0 and keeps its full relative precision however small it is.)
    legs = max(fs, fk)
    near_lower = lower > 0 and premium - lower <= RESOLUTION * legs
    if near_lower or upper - premium <= RESOLUTION * upper or premium < 1e-300:
        return None
    values = [value, val.derivative(FIRST['vol']), val.kappa()]
    return [repr(premium)] + [fmt(v) for v in values] if representable(values) else None


# near_expiry.csv: a fixed grid near the money, where t = vol*sqrt(T)/2 is small
# and the two Phi terms of the central formula cancel to about 1/t.  The strike
# puts x = ln(F/K) at z*vol*sqrt(T) for each z, on both sides of the forward.
NEAR_EXPIRY_EXPIRIES = (HOUR, 4 * HOUR, DAY, 7 * DAY, 0.25)
NEAR_EXPIRY_VOLS = (0.005, 0.05, 0.2, 0.5)
NEAR_EXPIRY_Z = (0.0, 0.25, -0.25, 1.0, -1.0, 1.9, -1.9)
NEAR_EXPIRY_CARRIES = ((0.0, 0.0), (0.05, 0.02))


# ... then random options over the same region, drawn where the grid's rows
# are sparse: t up to 0.3, |z| up to 2.2 (beyond about 2 the erfcx wing
# begins), strikes on both sides, half of them with carry.
NEAR_EXPIRY_SAMPLED = 2440
NEAR_EXPIRY_SAMPLED_VOLS = (0.005, 1.2)
NEAR_EXPIRY_SAMPLED_Z = 2.2
NEAR_EXPIRY_SAMPLED_CARRY = ((0.0, 0.1), (0.0, 0.05))


def near_expiry_sampled_rows():
    rng, rows = Random('calor-near-expiry-1'), []
    while len(rows) < NEAR_EXPIRY_SAMPLED:
        kind = 'call' if rng.random() < 0.5 else 'put'
        T = log_uniform(rng, HOUR, NEAR_EXPIRY_EXPIRIES[-1])
        v = log_uniform(rng, *NEAR_EXPIRY_SAMPLED_VOLS)
        z = NEAR_EXPIRY_SAMPLED_Z * (2.0 * rng.random() - 1.0)
        (r_lo, r_hi), (q_lo, q_hi) = NEAR_EXPIRY_SAMPLED_CARRY
        r = r_lo + (r_hi - r_lo) * rng.random()
        q = q_lo + (q_hi - q_lo) * rng.random()
        if rng.random() < 0.5:
            r, q = 0.0, 0.0
        S = 100.0
        strike = float(mpf(S) * mp.exp((mpf(r) - mpf(q)) * mpf(T)
                                       - mpf(z) * mpf(v) * mp.sqrt(mpf(T))))
        inputs = (S, strike, T, r, q, v)
        row = implied_row(kind, inputs)
        if row:
            rows.append(['near_expiry_sampled', kind] + [repr(a) for a in inputs] + row)
    return rows


def near_expiry_rows():
    rows = []
    for T in NEAR_EXPIRY_EXPIRIES:
        for v in NEAR_EXPIRY_VOLS:
            for z in NEAR_EXPIRY_Z:
                for r, q in NEAR_EXPIRY_CARRIES:
                    S = 100.0
                    strike = float(mpf(S) * mp.exp((mpf(r) - mpf(q)) * mpf(T)
                                                   - mpf(z) * mpf(v) * mp.sqrt(mpf(T))))
                    for kind in ('call', 'put'):
                        inputs = (S, strike, T, r, q, v)
                        row = implied_row(kind, inputs)
                        if row:
                            rows.append(['near_expiry', kind] + [repr(a) for a in inputs] + row)
    rows.extend(near_expiry_sampled_rows())
    return [[f'n{i:05d}'] + r for i, r in enumerate(rows, 1)]


def sample_stratum(job):
    """Rows of one stratum; each stratum has its own seeded generator, so strata can
    be computed in any order or in parallel and the file is still the same."""
    seed, make_row, (name, count, ranges, moneyness) = job
    rng, tries, rows = Random(f'{seed}-{name}'), 0, []
    for _ in range(count):
        while True:
            tries += 1
            case = draw(rng, ranges, moneyness)
            row = case and make_row(*case)
            if row:
                break
        kind, inputs = case
        rows.append([name, kind] + [repr(v) for v in inputs] + row)
    return name, tries, rows


def write_sampled(path, header, prefix, seed, make_row):
    rows, start = [], time.time()
    jobs = [(seed, make_row, stratum) for stratum in STRATA]
    with multiprocessing.Pool(min(len(jobs), os.cpu_count() or 1)) as pool:
        for name, tries, stratum_rows in pool.imap(sample_stratum, jobs):
            rows.extend(stratum_rows)
            print(f'{os.path.basename(path)}: {name}: {len(stratum_rows)} rows from {tries} '
                  f'draws ({time.time() - start:.0f} s)', file=sys.stderr)
    write_csv(path, header, [[f'{prefix}{i:05d}'] + r for i, r in enumerate(rows, 1)])


def write_csv(path, header, rows):
    os.makedirs(os.path.dirname(path), exist_ok=True)
    with open(path, 'w', newline='', encoding='utf-8') as f:
        out = csv.writer(f, lineterminator='\n')
        out.writerow(header)
        out.writerows(rows)


# -------------------------------------------------------------- textbook

HULL = 'J.C. Hull, Options, Futures, and Other Derivatives, 9th ed. (Pearson, 2015)'
HAUG = 'E.G. Haug, The Complete Guide to Option Pricing Formulas, 2nd ed. (McGraw-Hill, 2007)'
MCD = 'R.L. McDonald, Derivatives Markets, 3rd ed. (Pearson, 2013)'
H19 = HULL + ', Ch. 19 running example'

# id, quantity, kind, S, K, T, r, carry, vol or premium, per day, printed, source, citation
# carry: ('q', y) dividend yield, ('b', b) cost of carry (q = r - b), ('rf', y) foreign rate
TEXTBOOK = (
    ('E01', 'price', 'call', '42', '40', '0.5', '0.1', None, '0.2', False, '4.76', HULL + ', Ch. 15 (BSM model), Example 15.6 (same example in 7th/8th eds. as Ex. 13.6/14.6)', 'memory'),
    ('E02', 'price', 'put', '42', '40', '0.5', '0.1', None, '0.2', False, '0.81', HULL + ', Example 15.6', 'memory'),
    ('E05', 'price', 'call', '930', '900', '2/12', '0.08', ('q', '0.03'), '0.2', False, '51.83', HULL + ', Ch. 17 (options on stock indices), Example 17.1', 'memory'),
    ('E06', 'price', 'put', '20', '20', '4/12', '0.09', ('b', '0'), '0.25', False, '1.12', HULL + ", Ch. 18 (futures options), Black's-model worked example (crude-oil futures put)", 'memory'),
    ('E07', 'price', 'call', '40', '40', '0.5', '0.09', None, '0.3', False, '3.67', HULL + ', Ch. 15 (dividends), worked example (Example 15.10 in 9th ed., from memory)', 'memory'),
    ('E08', 'price', 'call', '49', '50', '20/52', '0.05', None, '0.2', False, '2.40', HULL + ', Ch. 19 (The Greek Letters), running example: BSM value about $240,000 for 100,000 calls', 'verified'),
    ('E09', 'price', 'call', '60', '65', '0.25', '0.08', None, '0.3', False, '2.1334', HAUG + ', Ch. 1, Black-Scholes (1973) worked example', 'memory'),
    ('E10', 'price', 'put', '100', '95', '0.5', '0.1', ('q', '0.05'), '0.2', False, '2.4648', HAUG + ', Ch. 1, Merton (1973) stock-index worked example', 'memory'),
    ('E11', 'price', 'call', '19', '19', '0.75', '0.1', ('b', '0'), '0.28', False, '1.7011', HAUG + ', Ch. 1, Black (1976) futures worked example', 'memory'),
    ('E12', 'price', 'put', '19', '19', '0.75', '0.1', ('b', '0'), '0.28', False, '1.7011', HAUG + ', Ch. 1, Black (1976) futures worked example (put)', 'memory'),
    ('E13', 'price', 'call', '1.56', '1.60', '0.5', '0.06', ('rf', '0.08'), '0.12', False, '0.0291', HAUG + ', Ch. 1, Garman-Kohlhagen (1983) currency worked example', 'memory'),
    ('E14', 'price', 'put', '75', '70', '0.5', '0.1', ('b', '0.05'), '0.35', False, '4.0870', HAUG + ', Ch. 1, generalized Black-Scholes-Merton worked example (put)', 'memory'),
    ('E15', 'price', 'call', '41', '40', '0.25', '0.08', None, '0.3', False, '3.399', MCD + ', Ch. 12, Example 12.1', 'memory'),
    ('E16', 'price', 'call', '0.92', '0.9', '1', '0.06', ('rf', '0.032'), '0.1', False, '0.0606', MCD + ', Ch. 12, currency-option worked example', 'memory'),
    ('G01', 'delta', 'call', '105', '100', '0.5', '0.1', ('b', '0'), '0.36', False, '0.5946', HAUG + ', Ch. 2, delta worked example (futures option)', 'memory'),
    ('G02', 'delta', 'put', '105', '100', '0.5', '0.1', ('b', '0'), '0.36', False, '-0.3566', HAUG + ', Ch. 2, delta worked example (put)', 'memory'),
    ('G03', 'gamma', 'call', '55', '60', '0.75', '0.1', ('b', '0.1'), '0.3', False, '0.0278', HAUG + ', Ch. 2, gamma worked example', 'memory'),
    ('G04', 'vega', 'call', '55', '60', '0.75', '0.1', ('b', '0.1'), '0.3', False, '18.9358', HAUG + ', Ch. 2, vega worked example', 'memory'),
    ('G05', 'theta', 'put', '430', '405', '0.0833', '0.07', ('b', '0.02'), '0.2', False, '-31.1924', HAUG + ', Ch. 2, theta worked example (index put)', 'memory'),
    ('G06', 'theta', 'put', '430', '405', '0.0833', '0.07', ('b', '0.02'), '0.2', True, '-0.0855', HAUG + ', Ch. 2, theta worked example, per calendar day', 'memory'),
    ('G07', 'rho', 'call', '72', '75', '1', '0.09', ('b', '0.09'), '0.19', False, '38.7325', HAUG + ', Ch. 2, rho worked example', 'memory'),
    ('G08', 'dividend_rho', 'put', '500', '490', '0.25', '0.08', ('b', '0.03'), '0.15', False, '42.2254', HAUG + ', Ch. 2, phi / rho-2 (dividend-yield sensitivity) worked example (put)', 'memory'),
    ('G09', 'carry_rho', 'call', '500', '490', '0.25', '0.08', ('b', '0.03'), '0.15', False, '81.2219', HAUG + ', Ch. 2, cost-of-carry sensitivity worked example (call)', 'memory'),
    ('G10', 'delta', 'call', '49', '50', '20/52', '0.05', None, '0.2', False, '0.522', H19 + ', delta', 'memory'),
    ('G11', 'theta', 'call', '49', '50', '20/52', '0.05', None, '0.2', False, '-4.31', H19 + ', theta per year', 'memory'),
    ('G12', 'theta', 'call', '49', '50', '20/52', '0.05', None, '0.2', True, '-0.0118', H19 + ', theta per calendar day', 'memory'),
    ('G13', 'gamma', 'call', '49', '50', '20/52', '0.05', None, '0.2', False, '0.066', H19 + ', gamma', 'memory'),
    ('G14', 'vega', 'call', '49', '50', '20/52', '0.05', None, '0.2', False, '12.1', H19 + ', vega', 'memory'),
    ('G15', 'rho', 'call', '49', '50', '20/52', '0.05', None, '0.2', False, '8.91', H19 + ', rho', 'memory'),
    ('I01', 'implied_vol', 'call', '21', '20', '0.25', '0.1', None, '1.875', False, '0.235', HULL + ", Ch. 15, section 'Implied volatilities' text example", 'memory'),
)
# E07: dividends of 0.5 at 2/12 and 5/12; escrowed model, spot less their PV at r
E07_DIVIDENDS = (('2/12', '0.5'), ('5/12', '0.5'))


def decimal_value(text):
    """Exact rational from the notes ('2/12', '0.08') to working precision."""
    num, _, den = text.partition('/')
    return mpf(num) / mpf(den or 1)


def textbook_row(row):
    ident, quantity, kind, s, k, t, r, carry, last, per_day, printed, source, citation = row
    spot, strike, expiry, rate = (float(decimal_value(a)) for a in (s, k, t, r))
    if ident == 'E07':
        spot = float(decimal_value(s) - sum(
            decimal_value(d) * mp.exp(-decimal_value(r) * decimal_value(when))
            for when, d in E07_DIVIDENDS))
    kind_of_carry, value = carry or ('q', '0')
    q = decimal_value(r) - decimal_value(value) if kind_of_carry == 'b' else decimal_value(value)
    dividend_yield = float(q)
    scale = DAY if per_day else 1.0
    if quantity == 'implied_vol':
        premium, vol = float(decimal_value(last)), ''
        x = [mpf(a) for a in (spot, strike, expiry, rate, dividend_yield)]
        with mp.workdps(60):
            ours = mpmath.findroot(lambda v: price(kind, *x, v) - premium, mpf('0.2'))
    else:
        premium, vol = '', float(decimal_value(last))
        val = Valuation(kind, (spot, strike, expiry, rate, dividend_yield, vol), GREEK_DIGITS)
        if quantity == 'price':
            ours = val.value()
        else:
            # carry_rho is dV/db at fixed r, and q = r - b
            name, sign = ('dividend_rho', -1) if quantity == 'carry_rho' else (quantity, 1)
            orders, greek_sign = next((o, g) for n, o, g in GREEKS if n == name)
            ours = sign * greek_sign * val.derivative(orders) * mpf(scale)
    decimals = len(printed.partition('.')[2])
    inputs = [repr(a) if a != '' else '' for a in
              (spot, strike, expiry, rate, dividend_yield, vol, premium, scale)]
    return [ident, quantity, kind] + inputs + [printed, decimals, fmt(ours), source, citation]


# ------------------------------------------------------------------ main

def generate(out):
    start = time.time()
    write_sampled(os.path.join(out, 'black', 'greeks.csv'), GREEKS_HEADER, 'g',
                  'calor-greeks-1', greeks_row)
    write_sampled(os.path.join(out, 'black', 'implied.csv'), IMPLIED_HEADER, 'i',
                  'calor-implied-1', implied_row)
    write_csv(os.path.join(out, 'black', 'near_expiry.csv'), IMPLIED_HEADER, near_expiry_rows())
    write_csv(os.path.join(out, 'textbook', 'european.csv'), TEXTBOOK_HEADER,
              [textbook_row(row) for row in TEXTBOOK])
    print(f'european.csv: {len(TEXTBOOK)} rows; total {time.time() - start:.0f} s',
          file=sys.stderr)


TABLES = ('black/greeks.csv', 'black/implied.csv', 'black/near_expiry.csv',
          'textbook/european.csv')


def main():
    if mpmath.__version__ != '1.3.0':
        print(f'warning: tables were made with mpmath 1.3.0, this is {mpmath.__version__}',
              file=sys.stderr)
    here = os.path.dirname(os.path.abspath(__file__))
    parser = argparse.ArgumentParser(description=__doc__.split('\n\n')[0])
    parser.add_argument('--out', default=here, help='output folder (default: this folder)')
    parser.add_argument('--check', action='store_true',
                        help='regenerate into a temporary folder and compare with --out')
    args = parser.parse_args()
    if not args.check:
        generate(args.out)
        return 0
    with tempfile.TemporaryDirectory() as tmp:
        generate(tmp)
        bad = [t for t in TABLES if not os.path.exists(os.path.join(args.out, t)) or
               not filecmp.cmp(os.path.join(tmp, t), os.path.join(args.out, t), shallow=False)]
    for t in bad:
        print(f'differs from a fresh generation: {os.path.join(args.out, t)}', file=sys.stderr)
    return 1 if bad else 0


if __name__ == '__main__':
    sys.exit(main())
