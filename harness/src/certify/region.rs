//! The regions of the input space a certificate reports on.
//!
//! Moneyness splits every case into exactly one of near the money, wings and
//! deep tails, by z = ln(F/K)/(σ√T); the expiry and vol flags add to that, so a
//! case may fall in several regions.

use crate::cases::black::Inputs;

/// A region of the input space.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Region {
    /// Every case of the function.
    All,
    /// |z| ≤ 1.
    NearMoney,
    /// 1 < |z| ≤ 6.
    Wings,
    /// |z| > 6.
    DeepTails,
    /// Expiry below one day (1/365 year).
    ShortExpiry,
    /// Expiry above 20 years.
    LongExpiry,
    /// Vol below 2 %.
    LowVol,
    /// Vol above 150 %.
    HighVol,
}

impl Region {
    /// Every region, in report order.
    pub const EVERY: [Region; 8] = [
        Region::All,
        Region::NearMoney,
        Region::Wings,
        Region::DeepTails,
        Region::ShortExpiry,
        Region::LongExpiry,
        Region::LowVol,
        Region::HighVol,
    ];

    /// The region's name in reports (stable: report.json uses it).
    pub const fn name(self) -> &'static str {
        match self {
            Region::All => "all",
            Region::NearMoney => "near_money",
            Region::Wings => "wings",
            Region::DeepTails => "deep_tails",
            Region::ShortExpiry => "short_expiry",
            Region::LongExpiry => "long_expiry",
            Region::LowVol => "low_vol",
            Region::HighVol => "high_vol",
        }
    }

    /// What the region holds, for the report.
    pub const fn definition(self) -> &'static str {
        match self {
            Region::All => "every case",
            Region::NearMoney => "|z| ≤ 1, z = ln(F/K)/(σ√T)",
            Region::Wings => "1 < |z| ≤ 6",
            Region::DeepTails => "|z| > 6",
            Region::ShortExpiry => "expiry < 1 day (1/365 year)",
            Region::LongExpiry => "expiry > 20 years",
            Region::LowVol => "vol < 2 %",
            Region::HighVol => "vol > 150 %",
        }
    }
}

impl serde::Serialize for Region {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(self.name())
    }
}

/// The regions of one option case besides [`Region::All`]: its moneyness
/// region, then any expiry and vol flags.
pub fn regions_of(inputs: &Inputs) -> Vec<Region> {
    let z = inputs.standardised_moneyness().abs();
    let mut regions = vec![if z <= 1.0 {
        Region::NearMoney
    } else if z <= 6.0 {
        Region::Wings
    } else {
        Region::DeepTails
    }];
    if inputs.expiry < 1.0 / 365.0 {
        regions.push(Region::ShortExpiry);
    }
    if inputs.expiry > 20.0 {
        regions.push(Region::LongExpiry);
    }
    if inputs.vol < 0.02 {
        regions.push(Region::LowVol);
    }
    if inputs.vol > 1.5 {
        regions.push(Region::HighVol);
    }
    regions
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::cases::black::KindCell;

    #[test]
    fn unit_regions_flags_add_to_moneyness() {
        let inputs = Inputs {
            kind: KindCell::Call,
            spot: 100.0,
            strike: 100.0,
            expiry: 30.0,
            rate: 0.0,
            dividend_yield: 0.0,
            vol: 0.01,
        };
        assert_eq!(
            regions_of(&inputs),
            [Region::NearMoney, Region::LongExpiry, Region::LowVol]
        );
    }
}
