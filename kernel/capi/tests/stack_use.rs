//! Stack used per call, measured by painting (the README's "stack use" table).
//!
//! On a fresh thread: fill a large stack region with a pattern, call one entry
//! point, then count how much of the region's far end still holds the
//! pattern. The difference is the call's high-water mark, give or take the
//! few bytes by which the frames of the painting and scanning helpers differ.
//! Lives here because reading the scanned region needs `unsafe`, which only
//! this crate may use. Run in release (`--nocapture` prints the figures).
#![allow(unsafe_code)]

use std::hint::black_box;

use calor_capi::{
    calor_american_price, calor_greeks, calor_greeks_batch, calor_implied_vol, calor_price,
    calor_price_batch, CalorGreeks, CalorInputs, CALOR_PUT,
};

const REGION: usize = 64 * 1024;
const PATTERN: u8 = 0xA5;

/// Painted beyond the scanned region, so that the scan's frame (which may sit a
/// little lower than the painter's) still finds paint at its far end.
const SLACK: usize = 4096;

// A large stack array is the point here: it is the paint.
#[allow(clippy::large_stack_arrays)]
#[inline(never)]
fn paint() {
    let mut region = [PATTERN; REGION + SLACK];
    black_box(&mut region);
}

/// Painted bytes left at the far end of the `REGION` bytes below this
/// function's frame. The frame is kept small on purpose: a large one would be
/// stack-probed, and the probes write zeros over the paint.
#[inline(never)]
fn untouched() -> usize {
    let marker = 0_u8;
    let top = black_box(&raw const marker) as usize;
    (0..REGION)
        .take_while(|&i| {
            let byte = std::ptr::with_exposed_provenance::<u8>(top - REGION + i);
            // SAFETY: the bytes lie in this thread's 1 MiB stack, below the
            // live frames and inside the region `paint` wrote; they are read
            // as plain bytes with volatile loads, so nothing is assumed about
            // their (deliberately stale) contents.
            let value = unsafe { byte.read_volatile() };
            value == PATTERN
        })
        .count()
}

/// Bytes of stack `f` uses, measured on a thread with a 1 MiB stack.
fn stack_use(f: fn()) -> usize {
    std::thread::Builder::new()
        .stack_size(1 << 20)
        .spawn(move || {
            paint();
            f();
            REGION - untouched()
        })
        .expect("thread")
        .join()
        .expect("no panic")
}

fn ngx_put() -> CalorInputs {
    CalorInputs {
        kind: CALOR_PUT,
        strike: 228.0,
        expiry: 0.75,
        spot: 212.4,
        rate: 0.035,
        dividend_yield: 0.012,
    }
}

#[test]
fn stack_use_per_entry_point() {
    let cases: [(&str, fn(), usize); 7] = [
        ("baseline (empty call)", || black_box(()), 512),
        (
            "calor_price",
            || {
                let mut v = 0.0;
                black_box(calor_price(
                    &raw const *black_box(&ngx_put()),
                    0.28,
                    &raw mut v,
                ));
            },
            4096,
        ),
        (
            "calor_greeks",
            || {
                let mut g = CalorGreeks::default();
                black_box(calor_greeks(
                    &raw const *black_box(&ngx_put()),
                    0.28,
                    &raw mut g,
                ));
            },
            4096,
        ),
        (
            "calor_implied_vol",
            || {
                let mut v = 0.0;
                black_box(calor_implied_vol(
                    &raw const *black_box(&ngx_put()),
                    30.0,
                    &raw mut v,
                ));
            },
            4096,
        ),
        (
            "calor_american_price",
            || {
                let mut v = 0.0;
                black_box(calor_american_price(
                    &raw const *black_box(&ngx_put()),
                    0.28,
                    &raw mut v,
                ));
            },
            16 * 1024,
        ),
        (
            "calor_price_batch (64)",
            || {
                // On the heap, so that only the call's own stack is counted.
                let rows = vec![ngx_put(); 64];
                let vols = vec![0.28; 64];
                let (mut out, mut st) = (vec![0.0; 64], vec![0; 64]);
                black_box(calor_price_batch(
                    rows.as_ptr(),
                    vols.as_ptr(),
                    64,
                    out.as_mut_ptr(),
                    st.as_mut_ptr(),
                ));
            },
            16 * 1024,
        ),
        (
            "calor_greeks_batch (64)",
            || {
                let rows = vec![ngx_put(); 64];
                let vols = vec![0.28; 64];
                let (mut out, mut st) = (vec![CalorGreeks::default(); 64], vec![0; 64]);
                black_box(calor_greeks_batch(
                    rows.as_ptr(),
                    vols.as_ptr(),
                    64,
                    out.as_mut_ptr(),
                    st.as_mut_ptr(),
                ));
            },
            32 * 1024,
        ),
    ];
    for (name, f, bound) in cases {
        let used = stack_use(f);
        println!("stack_use: {name:<24} {used:>6} bytes");
        assert!(used <= bound, "{name}: {used} bytes > {bound}");
    }
}
