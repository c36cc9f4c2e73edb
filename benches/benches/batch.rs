//! Throughput of `calor batch` end to end in memory: CSV bytes in, CSV bytes
//! out, through the harness's streaming loop (decode, value on the rayon pool,
//! encode), on 65,536 invented European rows with vol given (NGX barley
//! index options of the fictional Nordwind Grain Exchange). The output buffer
//! is kept from one pass to the next, as a file's page cache is: a new one
//! each pass would time the growth of a 24 MB vector and the kernel's zeroing
//! of its fresh pages, which a file-to-file run does not pay.
//!
//! Run with `cargo bench -p calor-benches --bench batch`; set
//! `RAYON_NUM_THREADS=1` for the per-core figure. The target is
//! 1 million rows per second per core.

use std::fmt::Write as _;
use std::hint::black_box;

use calor_harness::batch::{Format, Started};
use criterion::{criterion_group, criterion_main, Criterion, Throughput};

const ROWS: usize = 65_536;

/// A deterministic book: spot 30–60, strikes 35–55, expiries to 2 years.
fn book() -> Vec<u8> {
    let mut text = String::from("id,kind,spot,strike,expiry,rate,dividend_yield,vol\n");
    let mut state = 0x2545_f491_4f6c_dd1d_u64;
    let mut next = || {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        (state >> 11) as f64 / (1u64 << 53) as f64
    };
    for i in 0..ROWS {
        let kind = if i % 2 == 0 { "call" } else { "put" };
        let _ = writeln!(
            text,
            "ngx-{i},{kind},{:.4},{:.2},{:.4},{:.4},{:.4},{:.4}",
            30.0 + 30.0 * next(),
            35.0 + 20.0 * next(),
            0.05 + 1.95 * next(),
            0.08 * next(),
            0.03 * next(),
            0.1 + 0.5 * next(),
        );
    }
    text.into_bytes()
}

fn batch(c: &mut Criterion) {
    let input = book();
    let mut group = c.benchmark_group("batch");
    group.throughput(Throughput::Elements(ROWS as u64));
    group.sample_size(10);
    for (name, format) in [("csv", Format::Csv), ("jsonl", Format::Jsonl)] {
        let mut out = Vec::new();
        group.bench_function(name, |b| {
            b.iter(|| {
                out.clear();
                Started::new(black_box(&input[..]))
                    .and_then(|started| started.finish(&mut out, format))
                    .map(|summary| (out.len(), summary))
            });
        });
    }
    group.finish();
}

criterion_group!(benches, batch);
criterion_main!(benches);
