//! The batch entry points against the same 50-digit tables as the scalar
//! functions, and their independence from batch size and alignment.

use calor::{greeks_batch, implied_vol_batch, price_batch, price_delta_batch, Kind, OptionBatch};
use calor_harness::cases::{black::GreeksCase, black::ImpliedCase, default_dir, read_table};
use calor_harness::certify::Worst;
use calor_harness::tolerance;

/// Owned structure-of-arrays columns of a table.
struct Columns {
    kinds: Vec<Kind>,
    spots: Vec<f64>,
    strikes: Vec<f64>,
    expiries: Vec<f64>,
    rates: Vec<f64>,
    dividend_yields: Vec<f64>,
}

impl Columns {
    fn new(inputs: impl Iterator<Item = calor_harness::cases::black::Inputs>) -> Self {
        let mut c = Columns {
            kinds: vec![],
            spots: vec![],
            strikes: vec![],
            expiries: vec![],
            rates: vec![],
            dividend_yields: vec![],
        };
        for i in inputs {
            c.kinds.push(i.kind.into());
            c.spots.push(i.spot);
            c.strikes.push(i.strike);
            c.expiries.push(i.expiry);
            c.rates.push(i.rate);
            c.dividend_yields.push(i.dividend_yield);
        }
        c
    }

    fn batch(&self, range: std::ops::Range<usize>) -> OptionBatch<'_> {
        OptionBatch {
            kinds: &self.kinds[range.clone()],
            spots: &self.spots[range.clone()],
            strikes: &self.strikes[range.clone()],
            expiries: &self.expiries[range.clone()],
            rates: &self.rates[range.clone()],
            dividend_yields: &self.dividend_yields[range],
        }
    }
}

fn greeks_cases() -> Vec<GreeksCase> {
    read_table(&default_dir().join("black/greeks.csv")).unwrap()
}

#[test]
fn ref_batch_price_delta_table() {
    let cases = greeks_cases();
    let cols = Columns::new(cases.iter().map(GreeksCase::inputs));
    let vols: Vec<f64> = cases.iter().map(|c| c.vol).collect();
    let n = cases.len();
    let (mut prices, mut deltas, mut status) = (vec![0.0; n], vec![0.0; n], vec![Ok(()); n]);
    let ok = price_delta_batch(
        &cols.batch(0..n),
        &vols,
        &mut prices,
        &mut deltas,
        &mut status,
    )
    .unwrap();
    assert_eq!(ok, n, "every table case is valid");
    let mut worst_price = Worst::new("batch price", tolerance::PRICE.limit);
    let mut worst_delta = Worst::new("batch delta", tolerance::GREEK.limit);
    for (i, c) in cases.iter().enumerate() {
        let s = c.spot;
        worst_price.record(
            tolerance::units(prices[i], c.price, c.kappa, c.price.abs()),
            &c.id,
            || {
                format!(
                    "{:?} expected {:e} got {:e}",
                    c.inputs(),
                    c.price,
                    prices[i]
                )
            },
        );
        worst_delta.record(
            tolerance::units(deltas[i], c.delta, c.kappa, c.price.abs() / s),
            &c.id,
            || {
                format!(
                    "{:?} expected {:e} got {:e}",
                    c.inputs(),
                    c.delta,
                    deltas[i]
                )
            },
        );
    }
    println!("{worst_price}\n{worst_delta}");
    assert!(worst_price.passes() && worst_delta.passes());
    // The price-only entry point agrees bit for bit.
    let mut prices_only = vec![0.0; n];
    price_batch(&cols.batch(0..n), &vols, &mut prices_only, &mut status).unwrap();
    assert!(prices
        .iter()
        .zip(&prices_only)
        .all(|(a, b)| a.to_bits() == b.to_bits()));
}

#[test]
fn ref_batch_greeks_and_implied_match_scalar() {
    let cases = greeks_cases();
    let cols = Columns::new(cases.iter().map(GreeksCase::inputs));
    let vols: Vec<f64> = cases.iter().map(|c| c.vol).collect();
    let n = cases.len();
    let mut out = vec![calor::Greeks::default(); n];
    let mut status = vec![Ok(()); n];
    greeks_batch(&cols.batch(0..n), &vols, &mut out, &mut status).unwrap();
    for (c, g) in cases.iter().zip(&out) {
        let i = c.inputs();
        assert_eq!(
            *g,
            calor::greeks(&i.contract(), &i.market(), i.vol).unwrap()
        );
    }
    let implied: Vec<ImpliedCase> = read_table(&default_dir().join("black/implied.csv")).unwrap();
    let cols = Columns::new(implied.iter().map(ImpliedCase::inputs));
    let premiums: Vec<f64> = implied.iter().map(|c| c.premium).collect();
    let m = implied.len();
    let (mut got, mut status) = (vec![0.0; m], vec![Ok(()); m]);
    implied_vol_batch(&cols.batch(0..m), &premiums, &mut got, &mut status).unwrap();
    for (c, v) in implied.iter().zip(&got) {
        let i = c.inputs();
        assert_eq!(
            *v,
            calor::implied_vol(&i.contract(), &i.market(), c.premium).unwrap()
        );
    }
}

#[test]
fn prop_batch_bits_independent_of_size_and_offset() {
    let cases = greeks_cases();
    let cols = Columns::new(cases.iter().map(GreeksCase::inputs));
    let vols: Vec<f64> = cases.iter().map(|c| c.vol).collect();
    let n = cases.len();
    let full = |range: std::ops::Range<usize>| {
        let k = range.len();
        let (mut p, mut d, mut s) = (vec![0.0; k], vec![0.0; k], vec![Ok(()); k]);
        price_delta_batch(
            &cols.batch(range.clone()),
            &vols[range],
            &mut p,
            &mut d,
            &mut s,
        )
        .unwrap();
        (p, d)
    };
    let (p_all, d_all) = full(0..n);
    // Windows of many sizes at many offsets, including odd ones that break any
    // chunk or vector alignment.
    for (start, len) in [
        (0, 1),
        (1, 7),
        (3, 8),
        (5, 9),
        (17, 31),
        (100, 257),
        (1001, 999),
        (n - 13, 13),
    ] {
        let (p, d) = full(start..start + len);
        for j in 0..len {
            assert_eq!(
                p[j].to_bits(),
                p_all[start + j].to_bits(),
                "price of case {} differs",
                start + j
            );
            assert_eq!(
                d[j].to_bits(),
                d_all[start + j].to_bits(),
                "delta of case {} differs",
                start + j
            );
        }
    }
}

#[test]
fn edge_batch_bad_elements_and_lengths() {
    let b = OptionBatch {
        kinds: &[Kind::Call, Kind::Put, Kind::Call],
        spots: &[100.0, -1.0, 100.0],
        strikes: &[100.0, 100.0, 100.0],
        expiries: &[1.0, 1.0, 1.0],
        rates: &[0.01, 0.01, f64::NAN],
        dividend_yields: &[0.0, 0.0, 0.0],
    };
    let (mut p, mut s) = ([0.0; 3], [Ok(()); 3]);
    assert_eq!(price_batch(&b, &[0.2; 3], &mut p, &mut s), Ok(1));
    assert!(s[0].is_ok() && p[0] > 0.0);
    assert_eq!(
        s[1],
        Err(calor::Error::NotPositive {
            field: calor::Field::Spot
        })
    );
    assert_eq!(
        s[2],
        Err(calor::Error::NotFinite {
            field: calor::Field::Rate
        })
    );
    assert!(p[1].is_nan() && p[2].is_nan());
    assert_eq!(
        price_batch(&b, &[0.2; 2], &mut p, &mut s),
        Err(calor::Error::LengthMismatch {
            field: calor::Field::Vol
        })
    );
    let (mut short, mut s3) = ([0.0; 2], [Ok(()); 3]);
    assert_eq!(
        price_batch(&b, &[0.2; 3], &mut short, &mut s3),
        Err(calor::Error::LengthMismatch {
            field: calor::Field::Output
        })
    );
}
