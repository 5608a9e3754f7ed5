//! Plots of an error map: the quantity against T for the exact sum and each
//! approximation, and |relative error| against T on log axes with the
//! tolerance line, over the decades around the tolerance.

use super::CompareReport;
use crate::classical::{Quantity, RESOLUTION};
use crate::error::{Error, Result};
use crate::export::write_atomic_bytes;
use crate::plot::{ceil_decade, decade, floor_decade, png_bytes, render_svg, Panel, Series};
use std::path::Path;

/// The width of the figure, in pixels.
pub const WIDTH: u32 = 900;
/// The height of each of its two panels, in pixels.
pub const PANEL_HEIGHT: u32 = 420;

/// The error panel shows at most this many decades below the decade of the
/// tolerance (the power of ten at or just below it).
pub const DECADES_BELOW_TOLERANCE: i32 = 4;

/// The error panel's y axis ends at 10^this at most (a relative error of
/// 1000, i.e. 100 000 %); larger errors run off its top.
pub const TOP_DECADE: i32 = 3;

/// The two panels of an error map's figure for `quantity`, with the
/// tolerance line at `tol`.
///
/// Both panels span the temperatures of the map. An approximation is drawn
/// where it is defined, broken where it is not. The values panel shows the
/// exact curve whole; approximations far outside it are cut at the edge
/// (their errors are in the second panel). The error panel runs, in whole
/// decades, from at most [`DECADES_BELOW_TOLERANCE`] decades below the
/// tolerance's decade (or from the decade of the smallest error, if that
/// is higher, but always below the tolerance) up to the decade of the
/// largest error, at most 10^[`TOP_DECADE`]; a curve with nothing in that
/// range says why in its legend name; errors at or below
/// [`RESOLUTION`], which the exact values do not
/// resolve (the table writes them `<1e-37`), are not drawn.
pub fn panels(report: &CompareReport, quantity: Quantity, tol: f64) -> Vec<Panel> {
    let x_label = if report.kelvin {
        "T / K".to_string()
    } else {
        format!("kT / {}", report.unit)
    };
    let exact = report.series(quantity, None);
    let grid: Vec<f64> = exact.iter().map(|p| p.0).collect();
    let x_range = span(&grid);
    let mut values = vec![Series {
        name: "exact".into(),
        points: exact.clone(),
        dashed: false,
        colour: Some(0),
    }];
    let mut errors = Vec::new();
    for (k, a) in report.approximation_list.iter().enumerate() {
        values.push(Series {
            name: a.name.clone(),
            points: on_grid(&grid, &report.series(quantity, Some(k))),
            dashed: true,
            colour: Some(k + 1),
        });
        let resolved = report
            .error_series(quantity, k)
            .into_iter()
            .map(|(t, e)| (t, if e > RESOLUTION { e } else { f64::NAN }))
            .collect::<Vec<_>>();
        errors.push(Series {
            name: a.name.clone(),
            points: on_grid(&grid, &resolved),
            dashed: false,
            colour: Some(k + 1),
        });
    }
    let values_range = match quantity {
        Quantity::Q => None,
        _ => values_range(&exact, &values),
    };
    let shown = |s: &Series| -> Vec<f64> {
        s.points
            .iter()
            .map(|p| p.1)
            .filter(|e| e.is_finite() && *e > RESOLUTION)
            .collect()
    };
    let (error_range, resolved_any) = error_range(errors.iter().flat_map(shown), tol);
    // A curve with nothing to show says why in the legend.
    for (k, s) in errors.iter_mut().enumerate() {
        let own = shown(s);
        let why = if report.error_series(quantity, k).is_empty() {
            "undefined on this grid".to_string()
        } else if own.is_empty() {
            format!("all at most {RESOLUTION:e}")
        } else if own.iter().all(|e| *e < error_range.0) {
            format!("all below {:e}", error_range.0)
        } else {
            continue;
        };
        s.name = format!("{} ({why})", s.name);
    }
    let percent = format!("{}", tol * 100.0);
    let error_title = if resolved_any {
        format!("relative error of {}", quantity.name())
    } else {
        format!(
            "relative error of {}: none above {RESOLUTION:e}, the smallest resolved",
            quantity.name()
        )
    };
    vec![
        Panel {
            title: format!(
                "{}, exact and approximate: {}",
                quantity.column(),
                report.model
            ),
            x_label: x_label.clone(),
            y_label: quantity.column().to_string(),
            log_x: true,
            log_y: quantity == Quantity::Q,
            series: values,
            x_range,
            y_range: values_range,
            ..Panel::default()
        },
        Panel {
            title: error_title,
            x_label,
            y_label: format!("|relative error of {}|", quantity.name()),
            log_x: true,
            log_y: true,
            series: errors,
            hlines: vec![(format!("tolerance {percent}%"), tol)],
            x_range,
            y_range: Some(error_range),
            ..Panel::default()
        },
    ]
}

/// The x range of a grid of temperatures: from the lowest to the highest,
/// or a factor 2 around a single one.
fn span(grid: &[f64]) -> Option<(f64, f64)> {
    let ok: Vec<f64> = grid
        .iter()
        .copied()
        .filter(|t| t.is_finite() && *t > 0.0)
        .collect();
    let lo = ok.iter().copied().fold(f64::INFINITY, f64::min);
    let hi = ok.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    if lo < hi {
        Some((lo, hi))
    } else if lo.is_finite() {
        Some((lo / 2.0, hi * 2.0)).filter(|(a, b)| a < b && b.is_finite())
    } else {
        None
    }
}

/// `points`, taken in order at the temperatures of `grid` where they occur,
/// with a gap (NaN) at every temperature where they do not, so that a curve
/// breaks where an approximation is undefined.
fn on_grid(grid: &[f64], points: &[(f64, f64)]) -> Vec<(f64, f64)> {
    let mut next = points.iter().peekable();
    grid.iter()
        .map(|&t| match next.peek() {
            Some(&&(pt, v)) if pt == t => {
                next.next();
                (t, v)
            }
            _ => (t, f64::NAN),
        })
        .collect()
}

/// The values panel's y range: every curve, but not beyond the exact
/// curve's span widened by half of it on each side; a 3% margin.
fn values_range(exact: &[(f64, f64)], all: &[Series]) -> Option<(f64, f64)> {
    let finite = |points: &[(f64, f64)]| -> Vec<f64> {
        points
            .iter()
            .map(|p| p.1)
            .filter(|y| y.is_finite())
            .collect()
    };
    let bounds = |ys: &[f64]| {
        ys.iter()
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &y| {
                (a.min(y), b.max(y))
            })
    };
    let (lo, hi) = bounds(&finite(exact));
    let pad = 0.5 * (hi - lo).max(hi.abs().max(lo.abs()) * 1e-3);
    let (window_lo, window_hi) = (lo - pad, hi + pad);
    let everything: Vec<f64> = all.iter().flat_map(|s| finite(&s.points)).collect();
    let (all_lo, all_hi) = bounds(&everything);
    let (lo, hi) = (all_lo.max(window_lo), all_hi.min(window_hi));
    let margin = 0.03 * (hi - lo);
    let range = (lo - margin, hi + margin);
    (range.0 < range.1 && range.0.is_finite() && range.1.is_finite()).then_some(range)
}

/// The error panel's y range for the resolved errors `shown` (each above
/// [`RESOLUTION`]) and the tolerance `tol`, in whole decades; and whether
/// any error was resolved.
fn error_range(shown: impl Iterator<Item = f64>, tol: f64) -> ((f64, f64), bool) {
    let (min, max) = shown.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), e| {
        (a.min(e), b.max(e))
    });
    let any = min <= max;
    // The decade of the tolerance: 10^t <= tol < 10^(t + 1).
    let t = floor_decade(tol);
    let below = if decade(t) < tol { t } else { t - 1 };
    // Above the noise floor where the tolerance allows it.
    let floor = floor_decade(RESOLUTION) + 1;
    let deepest = (t - DECADES_BELOW_TOLERANCE).max(floor.min(below));
    let lo = if any {
        floor_decade(min).clamp(deepest, below)
    } else {
        deepest
    };
    let top = TOP_DECADE.max(t + 1);
    let hi = if any {
        ceil_decade(max).clamp(t + 1, top)
    } else {
        t + 1
    };
    ((decade(lo), decade(hi)), any)
}

/// The figure as one SVG document.
pub fn render(report: &CompareReport, quantity: Quantity, tol: f64) -> Result<String> {
    render_svg(&panels(report, quantity, tol), WIDTH, PANEL_HEIGHT)
}

/// Writes the figure to `path`: SVG for `.svg`, PNG for `.png`; the file
/// appears complete or not at all ([`write_atomic_bytes`]: written beside
/// it, synced, then renamed), and a replaced file keeps its permission bits.
pub fn write(report: &CompareReport, quantity: Quantity, tol: f64, path: &Path) -> Result<()> {
    let bytes = match plot_kind(path)? {
        PlotKind::Svg => render(report, quantity, tol)?.into_bytes(),
        PlotKind::Png => png_bytes(&panels(report, quantity, tol), WIDTH, PANEL_HEIGHT)?,
    };
    write_atomic_bytes(path, &bytes)
}

/// A plot file's format, from its extension.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PlotKind {
    /// `.svg`.
    Svg,
    /// `.png`.
    Png,
}

/// The format `path` asks for; other extensions are refused.
pub fn plot_kind(path: &Path) -> Result<PlotKind> {
    match path
        .extension()
        .map(|e| e.to_string_lossy().to_ascii_lowercase())
        .as_deref()
    {
        Some("svg") => Ok(PlotKind::Svg),
        Some("png") => Ok(PlotKind::Png),
        _ => Err(Error::invalid(
            "plot path",
            path.display(),
            "its name must end in .svg or .png",
        )),
    }
}
