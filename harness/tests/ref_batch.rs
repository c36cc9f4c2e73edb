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

/// The i-th option of a batch, for the scalar calls.
fn element(b: &OptionBatch<'_>, i: usize) -> (calor::Contract, calor::Market) {
    let contract = calor::Contract {
        kind: b.kinds[i],
        strike: b.strikes[i],
        expiry: b.expiries[i],
    };
    let market = calor::Market {
        spot: b.spots[i],
        rate: b.rates[i],
        dividend_yield: b.dividend_yields[i],
    };
    (contract, market)
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
fn prop_batch_implied_blocks_match_scalar_with_refusals() {
    // The implied-vol batch solves blocks of 16 stage by stage. Spoil some
    // elements in every block, differently, and check each element's status
    // and bits against the scalar call, in windows that cut the blocks anywhere.
    let table: Vec<ImpliedCase> = read_table(&default_dir().join("black/implied.csv")).unwrap();
    let mut cols = Columns::new(table.iter().map(ImpliedCase::inputs));
    let mut premiums: Vec<f64> = table.iter().map(|c| c.premium).collect();
    for (i, p) in premiums.iter_mut().enumerate() {
        match i % 23 {
            3 => *p = f64::NAN,
            7 => *p = -1.0,
            11 => *p = f64::MAX,
            13 => *p = 0.0,
            _ => {}
        }
    }
    for i in (19..cols.spots.len()).step_by(29) {
        cols.spots[i] = f64::INFINITY;
    }
    let n = premiums.len();
    let solve = |range: std::ops::Range<usize>| {
        let k = range.len();
        let (mut vols, mut status) = (vec![0.0; k], vec![Ok(()); k]);
        let ok = implied_vol_batch(
            &cols.batch(range.clone()),
            &premiums[range],
            &mut vols,
            &mut status,
        )
        .unwrap();
        assert_eq!(ok, status.iter().filter(|s| s.is_ok()).count());
        (vols, status)
    };
    let (vols, status) = solve(0..n);
    let all = cols.batch(0..n);
    let mut refused = 0;
    for i in 0..n {
        let (c, m) = element(&all, i);
        match calor::implied_vol(&c, &m, premiums[i]) {
            Ok(v) => assert_eq!(
                (status[i], vols[i].to_bits()),
                (Ok(()), v.to_bits()),
                "element {i}"
            ),
            Err(e) => {
                refused += 1;
                assert_eq!(status[i], Err(e), "element {i}");
                assert!(vols[i].is_nan(), "element {i}");
            }
        }
    }
    assert!(refused > n / 8, "only {refused} of {n} refused");
    for (start, len) in [
        (0, 1),
        (1, 15),
        (5, 16),
        (15, 17),
        (16, 33),
        (100, 257),
        (n - 13, 13),
    ] {
        let (v, s) = solve(start..start + len);
        for j in 0..len {
            assert_eq!(s[j], status[start + j], "status of case {}", start + j);
            assert_eq!(
                v[j].to_bits(),
                vols[start + j].to_bits(),
                "vol of case {}",
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

/// Options so small and so short-dated that gamma and the Greeks after it
/// exceed the range of f64 while price and delta do not: `greeks` refuses
/// them, `price_delta_batch` values them on either of its paths. The first
/// element takes the lane path (a fuzz finding: the scalar path refused what
/// the lane path valued), the second, at a spot of 10⁻³⁰⁰, the scalar path.
#[test]
fn edge_batch_price_delta_values_options_whose_higher_greeks_overflow() {
    let tiny = 1e-300;
    let b = OptionBatch {
        kinds: &[Kind::Call, Kind::Put],
        spots: &[2.904_355_210_078_951_7e-144, tiny],
        strikes: &[2.904_355_210_078_967e-144, tiny],
        expiries: &[7.041_429_247_086_247e-9, 1e-8],
        rates: &[7.041_529_113_171_147e-9, 0.0],
        dividend_yields: &[7.041_529_113_171_147e-9, 0.0],
    };
    let vols = [7.041_529_113_171_147e-9, 1e-8];
    let element = |i: usize| element(&b, i);
    let (mut p, mut d, mut s) = ([0.0; 2], [0.0; 2], [Ok(()); 2]);
    assert_eq!(price_delta_batch(&b, &vols, &mut p, &mut d, &mut s), Ok(2));
    for i in 0..2 {
        let (c, m) = element(i);
        assert_eq!(calor::greeks(&c, &m, vols[i]), Err(calor::Error::Overflow));
        assert!(
            p[i].is_finite() && p[i] > 0.0,
            "element {i}: price {}",
            p[i]
        );
        assert!(d[i].abs() <= 1.0, "element {i}: delta {}", d[i]);
    }
    // The scalar path's price is the scalar price. (The lane path's differs
    // from it by 4·10⁻⁴ relative for the first, within its tolerance: the
    // price's condition number there is about 2·10¹², far out of the domain.)
    let (c, m) = element(1);
    assert_eq!(
        p[1].to_bits(),
        calor::price(&c, &m, vols[1]).unwrap().to_bits()
    );
}

#[test]
fn ref_batch_near_expiry_takes_the_scalar_path() {
    // The lane formula is the two Φ terms, which cancel to about 1/t near
    // expiry; below t = σ√T/2 = 0.05 (where the kernel sums the series in t)
    // the elements take the scalar path: price as `price`, delta as `greeks`,
    // bit for bit. And `greeks`' price is `price`'s on every path.
    let cases: Vec<ImpliedCase> = read_table(&default_dir().join("black/near_expiry.csv")).unwrap();
    let columns = Columns::new(cases.iter().map(ImpliedCase::inputs));
    let vols: Vec<f64> = cases.iter().map(|c| c.vol).collect();
    let n = cases.len();
    let (mut prices, mut deltas, mut status) = (vec![0.0; n], vec![0.0; n], vec![Ok(()); n]);
    let options = columns.batch(0..n);
    let valued = price_delta_batch(&options, &vols, &mut prices, &mut deltas, &mut status);
    assert_eq!(valued, Ok(n));
    let mut scalar_path = 0;
    for (i, case) in cases.iter().enumerate() {
        let (contract, market) = element(&options, i);
        let price = calor::price(&contract, &market, case.vol).unwrap();
        let greeks = calor::greeks(&contract, &market, case.vol).unwrap();
        assert_eq!(greeks.price.to_bits(), price.to_bits(), "{}", case.id);
        if 0.5 * case.vol * case.expiry.sqrt() < 0.05 {
            scalar_path += 1;
            assert_eq!(prices[i].to_bits(), price.to_bits(), "{}", case.id);
            assert_eq!(deltas[i].to_bits(), greeks.delta.to_bits(), "{}", case.id);
        }
    }
    assert!(
        scalar_path > n / 2,
        "{scalar_path} of {n} rows below t = 0.05"
    );
}
