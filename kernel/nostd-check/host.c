/* A C host for the no_std check: links libcalor_nostd_check.a and calls it.
 * Exit 0 when a valid input gives a finite checksum and a refused one NaN. */
#include <math.h>
#include <stdio.h>

double calor_check(int put, double spot, double strike, double expiry,
                   double rate, double dividend_yield, double vol);

int main(void) {
    double ok = calor_check(0, 42.0, 40.0, 0.5, 0.1, 0.0, 0.2);
    double refused = calor_check(1, -1.0, 40.0, 0.5, 0.1, 0.0, 0.2);
    printf("calor_check: valid input %.12g, refused input %g\n", ok, refused);
    return (isfinite(ok) && isnan(refused)) ? 0 : 1;
}
