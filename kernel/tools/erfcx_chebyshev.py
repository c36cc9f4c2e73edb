#!/usr/bin/env python3
# requires: python3, mpmath==1.3.0
"""Chebyshev coefficients of erfcx on [0, 8.5] for the kernel's vector path.

erfcx(x) = exp(x^2)*erfc(x) is written as g(u) with x = C*(1+t)/(1-t),
t = (b-a)/2*u + (a+b)/2, a = -1, b = (X-C)/(X+C), so that u covers [-1, 1]
as x covers [0, X].  The coefficients c_j of g(u) = c_0/2 + sum c_j T_j(u)
come from the discrete cosine transform at N Chebyshev nodes, at 40 digits;
terms beyond the printed ones are below 2e-18 (erfcx >= 0.066 on [0, X]).

    python3 kernel/tools/erfcx_chebyshev.py   # prints the Rust constant
"""
from mpmath import mp, mpf, erfc, exp, cos, pi, nstr

mp.dps = 40
C, X, N, KEEP = mpf(4), mpf('8.5'), 60, 20


def main():
    a, b = mpf(-1), (X - C) / (X + C)

    def g(u):
        t = (b - a) / 2 * u + (a + b) / 2
        x = C * (1 + t) / (1 - t)
        return exp(x * x) * erfc(x)

    vals = [g(cos(pi * (k + mpf(1) / 2) / N)) for k in range(N)]
    coef = [2 * sum(vals[k] * cos(pi * j * (k + mpf(1) / 2) / N) for k in range(N)) / N
            for j in range(N)]
    assert all(abs(c) < 2e-18 for c in coef[KEEP:])
    print(f'const ERFCX_T_HIGH: f64 = {nstr(b, 20)};')
    print(f'const ERFCX_CHEBYSHEV: [f64; {KEEP}] = [')
    for c in coef[:KEEP]:
        print(f'    {nstr(c, 20, min_fixed=-30, max_fixed=30)},')
    print('];')


if __name__ == '__main__':
    main()
