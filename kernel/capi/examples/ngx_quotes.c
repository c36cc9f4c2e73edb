/* A quoting loop on an invented market, through calor's C ABI.
 *
 * The scenario is invented: the fictional Nordwind Grain Exchange (NGX) lists
 * options on its NGX barley index. This program reprices a three-month chain
 * of nine strikes (calls and puts) on one batch call, backs implied vols out
 * of a few invented premiums, prices one American put, and shows how a
 * refused input comes back. Numbers are printed with fixed formats so that
 * .ci/run can compare the output with ngx_quotes.expected.
 *
 * Build (from the repository root, after cargo build -p calor-capi --release):
 *   cc -std=c99 -Wall -Wextra -Werror -Ikernel/capi/include \
 *      kernel/capi/examples/ngx_quotes.c target/release/libcalor_capi.a \
 *      -lm -lpthread -ldl -o target/ngx_quotes
 */
#include <stdio.h>

#include "calor.h"

#define STRIKES 9

/* The invented NGX barley index and its market. */
static const double SPOT = 212.40;
static const double RATE = 0.035;
static const double STORAGE_YIELD = 0.012; /* quoted as a dividend yield */
static const double EXPIRY = 0.25;

/* A skew quoted by the invented desk: vol per strike. */
static double desk_vol(double strike) {
    double moneyness = strike / SPOT - 1.0;
    return 0.26 - 0.30 * moneyness + 0.50 * moneyness * moneyness;
}

static int report(const char *what, int32_t status) {
    if (status != CALOR_OK) {
        printf("%s: status %d (%s)\n", what, (int)status, calor_status_message(status));
    }
    return status != CALOR_OK;
}

int main(void) {
    CalorInputs chain[2 * STRIKES];
    double vols[2 * STRIKES];
    CalorGreeks greeks[2 * STRIKES];
    int32_t statuses[2 * STRIKES];
    int failures = 0;

    for (int i = 0; i < STRIKES; ++i) {
        double strike = 180.0 + 8.0 * i;
        for (int put = 0; put < 2; ++put) {
            CalorInputs row = {put ? CALOR_PUT : CALOR_CALL, strike, EXPIRY,
                               SPOT, RATE, STORAGE_YIELD};
            chain[2 * i + put] = row;
            vols[2 * i + put] = desk_vol(strike);
        }
    }

    printf("NGX barley index (invented), spot %.2f, expiry %.2f y, rate %.3f, yield %.3f\n",
           SPOT, EXPIRY, RATE, STORAGE_YIELD);
    failures += report("greeks batch",
                       calor_greeks_batch(chain, vols, 2 * STRIKES, greeks, statuses));
    printf("%8s %7s %11s %9s %11s %9s %9s\n", "strike", "vol", "call", "c.delta",
           "put", "p.delta", "gamma");
    for (int i = 0; i < STRIKES; ++i) {
        const CalorGreeks *call = &greeks[2 * i];
        const CalorGreeks *put = &greeks[2 * i + 1];
        printf("%8.2f %7.4f %11.6f %9.6f %11.6f %9.6f %9.6f\n", chain[2 * i].strike,
               vols[2 * i], call->price, call->delta, put->price, put->delta, put->gamma);
    }

    /* Invented premiums seen on the screen: call 196, call 212, put 228, put 244. */
    const int quoted[4] = {4, 8, 13, 17};
    const double premiums[4] = {19.10, 10.95, 18.40, 33.20};
    printf("\n%8s %4s %10s %9s %12s\n", "strike", "kind", "premium", "implied", "repriced");
    for (int q = 0; q < 4; ++q) {
        const CalorInputs *row = &chain[quoted[q]];
        double vol = 0.0;
        double repriced = 0.0;
        failures += report("implied vol", calor_implied_vol(row, premiums[q], &vol));
        failures += report("price", calor_price(row, vol, &repriced));
        printf("%8.2f %4s %10.4f %9.6f %12.8f\n", row->strike,
               row->kind == CALOR_PUT ? "put" : "call", premiums[q], vol, repriced);
    }

    CalorInputs american = {CALOR_PUT, 228.0, 0.75, SPOT, RATE, STORAGE_YIELD};
    double american_value = 0.0;
    double european_value = 0.0;
    failures += report("american", calor_american_price(&american, 0.28, &american_value));
    failures += report("european", calor_price(&american, 0.28, &european_value));
    printf("\nAmerican put 228.00, 0.75 y, vol 0.28: %.6f (European %.6f, early exercise %.6f)\n",
           american_value, european_value, american_value - european_value);

    /* A premium under the intrinsic value is refused with a status, not a crash. */
    double refused = 0.0;
    int32_t status = calor_implied_vol(&chain[17], 1.00, &refused);
    printf("\nput 244.00 at premium 1.00: status %d, %s\n", (int)status,
           calor_status_message(status));
    status = calor_price(NULL, 0.2, &refused);
    printf("null inputs: status %d, %s\n", (int)status, calor_status_message(status));

    return failures == 0 ? 0 : 1;
}
