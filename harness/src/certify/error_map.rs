//! The error map: the closed form's price error in tolerance units over
//! standardised moneyness z = ln(F/K)/(σ√T) and total vol σ√T, as SVG.

use plotters::prelude::*;

/// Columns of the map over z.
const COLUMNS: usize = 50;
/// Rows of the map over log σ√T.
const ROWS: usize = 30;

/// One measured price: z, σ√T and the error in tolerance units.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MapPoint {
    /// ln(F/K)/(σ√T).
    pub z: f64,
    /// σ√T.
    pub total_vol: f64,
    /// Error in units of ε·(1+κ)·|V|.
    pub units: f64,
}

/// The colour of an error of `units` against `limit`: pale to dark blue up to
/// the limit, red beyond it (and for a refusal).
fn colour(units: f64, limit: f64) -> RGBColor {
    if units.is_nan() || units > limit {
        return RGBColor(200, 30, 30);
    }
    let t = (units / limit).clamp(0.0, 1.0).sqrt();
    let mix = |a: f64, b: f64| (a + (b - a) * t).round() as u8;
    RGBColor(mix(235.0, 15.0), mix(245.0, 45.0), mix(250.0, 120.0))
}

/// The binned map: worst error per cell, and the axes it covers.
struct Cells {
    z_max: f64,
    log_lo: f64,
    log_hi: f64,
    worst: Vec<Option<f64>>,
}

fn bin(points: &[MapPoint]) -> Cells {
    let finite: Vec<&MapPoint> = points
        .iter()
        .filter(|p| p.z.is_finite() && p.total_vol.is_finite() && p.total_vol > 0.0)
        .collect();
    let z_max = finite
        .iter()
        .map(|p| p.z.abs())
        .fold(1.0f64, f64::max)
        .ceil();
    let (mut lo, mut hi) = (f64::INFINITY, 0.0f64);
    for p in &finite {
        lo = lo.min(p.total_vol);
        hi = hi.max(p.total_vol);
    }
    if lo >= hi {
        (lo, hi) = (1e-3, 10.0);
    }
    let (log_lo, log_hi) = (lo.log10().floor(), hi.log10().ceil());
    let mut worst = vec![None::<f64>; COLUMNS * ROWS];
    for p in &finite {
        let col = ((p.z + z_max) / (2.0 * z_max) * COLUMNS as f64) as usize;
        let row = ((p.total_vol.log10() - log_lo) / (log_hi - log_lo) * ROWS as f64) as usize;
        let at = row.min(ROWS - 1) * COLUMNS + col.min(COLUMNS - 1);
        if let Some(cell) = worst.get_mut(at) {
            let units = if p.units.is_nan() {
                f64::INFINITY
            } else {
                p.units
            };
            *cell = Some(cell.map_or(units, |c: f64| c.max(units)));
        }
    }
    Cells {
        z_max,
        log_lo,
        log_hi,
        worst,
    }
}

type Area<'a> = DrawingArea<SVGBackend<'a>, plotters::coord::Shift>;

fn draw_legend(legend: &Area<'_>, limit: f64) -> Result<(), String> {
    let e = |x: DrawingAreaErrorKind<_>| x.to_string();
    let font = ("sans-serif", 12);
    legend
        .draw(&Text::new("units", (8, 40), ("sans-serif", 13)))
        .map_err(e)?;
    let steps = [0.0, 0.125, 0.25, 0.5, 0.75, 1.0];
    let mut y = 60;
    for f in steps {
        legend
            .draw(&Rectangle::new(
                [(8, y), (30, y + 24)],
                colour(f * limit, limit).filled(),
            ))
            .map_err(e)?;
        legend
            .draw(&Text::new(format!("{}", f * limit), (36, y + 7), font))
            .map_err(e)?;
        y += 32;
    }
    legend
        .draw(&Rectangle::new(
            [(8, y), (30, y + 24)],
            colour(f64::INFINITY, limit).filled(),
        ))
        .map_err(e)?;
    legend
        .draw(&Text::new(format!("> {limit}"), (36, y + 7), font))
        .map_err(e)?;
    legend
        .draw(&Text::new(
            "blank: no case",
            (8, y + 44),
            ("sans-serif", 11),
        ))
        .map_err(e)?;
    Ok(())
}

/// Renders the map of `points` (worst error per cell) as an SVG document.
///
/// # Errors
/// A drawing error of plotters, as text.
pub fn render(points: &[MapPoint], limit: f64, title: &str) -> Result<String, String> {
    let cells = bin(points);
    let (z_max, log_lo, log_hi) = (cells.z_max, cells.log_lo, cells.log_hi);
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (900, 560)).into_drawing_area();
        let e = |x: DrawingAreaErrorKind<_>| x.to_string();
        root.fill(&WHITE).map_err(e)?;
        let (map, legend) = root.split_horizontally(780);
        let mut chart = ChartBuilder::on(&map)
            .caption(title, ("sans-serif", 17))
            .margin(12)
            .x_label_area_size(44)
            .y_label_area_size(64)
            .build_cartesian_2d(
                -z_max..z_max,
                (10f64.powf(log_lo)..10f64.powf(log_hi)).log_scale(),
            )
            .map_err(e)?;
        chart
            .configure_mesh()
            .disable_mesh()
            .x_desc("standardised moneyness z = ln(F/K)/(σ√T)")
            .y_desc("σ√T (log scale)")
            .y_label_formatter(&|v| format!("{v:.0e}"))
            .draw()
            .map_err(e)?;
        let width = 2.0 * z_max / COLUMNS as f64;
        let height = (log_hi - log_lo) / ROWS as f64;
        let rects = cells.worst.iter().enumerate().filter_map(|(i, cell)| {
            let units = (*cell)?;
            let (row, col) = (i / COLUMNS, i % COLUMNS);
            let x0 = -z_max + col as f64 * width;
            let y0 = 10f64.powf(log_lo + row as f64 * height);
            let y1 = 10f64.powf(log_lo + (row + 1) as f64 * height);
            Some(Rectangle::new(
                [(x0, y0), (x0 + width, y1)],
                colour(units, limit).filled(),
            ))
        });
        chart.draw_series(rects).map_err(e)?;
        draw_legend(&legend, limit)?;
        root.present().map_err(e)?;
    }
    Ok(svg)
}
