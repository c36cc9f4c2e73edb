/* calor.h: the C ABI of the calor option-valuation kernel.
 *
 * Written by hand and checked against kernel/capi/src/lib.rs by
 * kernel/capi/tests/header_sync.rs: every function, struct and constant there
 * is declared here with the same parameters, fields and values, and nothing
 * else is. Edit both together.
 *
 * Every function returns an int32_t status: CALOR_OK (0) or a CALOR_ERR_*
 * code; calor_status_message turns a code into a static message. Results go
 * to caller-owned out pointers. Nothing is allocated, nothing panics or
 * aborts: pointers are checked for null and alignment, lengths for range.
 * A non-null pointer must point to as many valid elements as the call says;
 * an output array may be the same array as an input array (in place).
 *
 * Link: libcalor_capi.a -lm -lpthread -ldl (or libcalor_capi.so).
 */
#ifndef CALOR_H
#define CALOR_H

#include <stddef.h>
#include <stdint.h>

#ifdef __cplusplus
extern "C" {
#endif

/* Status codes: one per kind of calor::Error, then the ABI's own. */
#define CALOR_OK 0
#define CALOR_ERR_NOT_FINITE 1
#define CALOR_ERR_NOT_POSITIVE 2
#define CALOR_ERR_NEGATIVE 3
#define CALOR_ERR_SINGULAR_AT_STRIKE 4
#define CALOR_ERR_PREMIUM_BELOW_INTRINSIC 5
#define CALOR_ERR_PREMIUM_ABOVE_MAXIMUM 6
#define CALOR_ERR_OVERFLOW 7
#define CALOR_ERR_INVALID_GRID 8
#define CALOR_ERR_UNSTABLE_STEP 9
#define CALOR_ERR_LENGTH_MISMATCH 10 /* never from the C batches: one len */
#define CALOR_ERR_BAD_POINTER 100
#define CALOR_ERR_BAD_KIND 101
#define CALOR_ERR_BAD_LENGTH 102
#define CALOR_ERR_BATCH_INCOMPLETE 103
/* A kernel error this version of the ABI does not know yet. */
#define CALOR_ERR_UNKNOWN 255

/* CalorInputs.kind. */
#define CALOR_CALL 0
#define CALOR_PUT 1

/* One vanilla option and its market; rates continuously compounded per year,
 * expiry in years. */
typedef struct CalorInputs {
    int32_t kind;
    double strike;
    double expiry;
    double spot;
    double rate;
    double dividend_yield;
} CalorInputs;

/* Price and the fourteen Greeks as raw partial derivatives (vega per 1.00 of
 * vol, theta per year); the conventions of calor::Greeks. */
typedef struct CalorGreeks {
    double price;
    double delta;
    double gamma;
    double vega;
    double theta;
    double rho;
    double dividend_rho;
    double vanna;
    double volga;
    double charm;
    double veta;
    double speed;
    double zomma;
    double color;
    double ultima;
} CalorGreeks;

/* Price and delta, the output of calor_price_delta_batch. */
typedef struct CalorPriceDelta {
    double price;
    double delta;
} CalorPriceDelta;

/* A static NUL-terminated message for a status code; never NULL, never freed. */
const char *calor_status_message(int32_t code);

/* European price. On a kernel error *price is NaN. */
int32_t calor_price(const CalorInputs *inputs, double vol, double *price);

/* All fifteen values. On a kernel error every field is NaN. */
int32_t calor_greeks(const CalorInputs *inputs, double vol, CalorGreeks *greeks);

/* Implied volatility of a European premium. On a kernel error *vol is NaN. */
int32_t calor_implied_vol(const CalorInputs *inputs, double premium, double *vol);

/* American price on the kernel's default grid (about 12 KB of stack). */
int32_t calor_american_price(const CalorInputs *inputs, double vol, double *price);

/* Batches: element i from inputs[i] and the i-th scalar argument, status in
 * statuses[i]. Return CALOR_OK if every element succeeded,
 * CALOR_ERR_BATCH_INCOMPLETE if some failed (their outputs are NaN), or a
 * pointer or length error with nothing written. With len 0 the pointers may
 * be NULL. Each wraps the kernel's batch function of the same name, in chunks
 * of 32 elements copied to the stack, so an output may alias an input. */
int32_t calor_price_batch(const CalorInputs *inputs, const double *vols, size_t len,
                          double *prices, int32_t *statuses);
int32_t calor_price_delta_batch(const CalorInputs *inputs, const double *vols, size_t len,
                                CalorPriceDelta *out, int32_t *statuses);
int32_t calor_greeks_batch(const CalorInputs *inputs, const double *vols, size_t len,
                           CalorGreeks *greeks, int32_t *statuses);
int32_t calor_implied_vol_batch(const CalorInputs *inputs, const double *premiums,
                                size_t len, double *vols, int32_t *statuses);

#ifdef __cplusplus
}
#endif

#endif /* CALOR_H */
