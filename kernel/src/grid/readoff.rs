//! Reading price, delta, gamma and the exercise boundary off a finished grid.

use super::march::Layout;
use super::transform::Transform;

/// Price, delta and gamma at the spot node, from central differences in x.
///
/// # Formula
/// With V± the values one node either side of the spot in x and h the node
/// spacing, V_x = (V₊ − V₋)/(2h), V_xx = (V₊ − 2V + V₋)/h², delta = V_x/S and
/// gamma = (V_xx − V_x)/S²; each is second-order accurate in h.
pub(crate) fn greeks_at_spot(t: &Transform, layout: &Layout, u: &[f64]) -> Option<[f64; 3]> {
    let j = layout.spot_node;
    let value = |i: usize| Some(t.option_value(*u.get(i)?, layout.y(i)));
    let (below, here, above) = (value(j.checked_sub(1)?)?, value(j)?, value(j + 1)?);
    // Node j + 1 is one step up in y, which is one step down in x for a put.
    let (minus, plus) = if t.omega > 0.0 {
        (below, above)
    } else {
        (above, below)
    };
    let h = layout.spacing;
    let vx = (plus - minus) / (2.0 * h);
    let vxx = (plus - 2.0 * here + minus) / (h * h);
    let spot = t.strike * libm::exp(t.x_spot);
    Some([here, vx / spot, (vxx - vx) / (spot * spot)])
}

/// The spot level where exercise starts at the valuation date, if the grid has one.
///
/// Exercised nodes hold exactly the projected floor. Between the last
/// exercised node and the first continuation node the gap u − floor grows like
/// the square of the distance to the boundary (smooth pasting), so its square
/// root is interpolated linearly from the first two continuation nodes.
///
/// # Accuracy
/// The discrete contact set ends on a node, so the estimate is good to about
/// one node spacing in ln S (first order in h), not to the price's accuracy.
pub(crate) fn exercise_boundary(
    t: &Transform,
    layout: &Layout,
    u: &[f64],
    floor: &[f64],
) -> Option<f64> {
    let scale = libm::exp(-t.beta * t.tau_max);
    let gap = |j: usize| Some(*u.get(j)? - scale * *floor.get(j)?);
    // The end node carries a Dirichlet value, not a projection: start one inside.
    let inner = layout.nodes.checked_sub(2)?;
    if gap(inner)? > 0.0 {
        return None;
    }
    let mut first = inner;
    while gap(first)? <= 0.0 {
        first = first.checked_sub(1)?;
    }
    let (near, far) = (
        libm::sqrt(gap(first)?),
        libm::sqrt(gap(first.checked_sub(1)?)?),
    );
    let h = layout.spacing;
    let offset = if far > near {
        (near * h / (far - near)).min(h)
    } else {
        0.5 * h
    };
    let y = layout.y(first) + offset;
    Some(t.strike * libm::exp(t.x(y)))
}
