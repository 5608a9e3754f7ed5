//! Plots of an error map: the quantity against T for the exact sum and each
//! approximation, and |relative error| against T on log axes with the
//! tolerance line.

use super::{CompareReport, Quantity};
use crate::error::{Error, ErrorKind, Result};
use crate::export::write_atomic;
use crate::plot::{render_png, render_svg, Panel, Series};
use std::path::Path;

/// The two panels of an error map's figure for `quantity`, with the
/// tolerance line at `tol`.
pub fn panels(report: &CompareReport, quantity: Quantity, tol: f64) -> Vec<Panel> {
    let x_label = if report.kelvin {
        "T / K".to_string()
    } else {
        format!("kT / {}", report.unit)
    };
    let exact = report.series(quantity, None);
    // Approximations far outside the exact curve's span would flatten it:
    // they are clipped to the span widened by half on each side (their
    // errors are in the second panel).
    let (lo, hi) = exact
        .iter()
        .map(|p| p.1)
        .filter(|y| y.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), y| {
            (a.min(y), b.max(y))
        });
    let pad = 0.5 * (hi - lo).max(hi.abs() * 1e-3);
    let keep = |y: f64| quantity == Quantity::Q || (y >= lo - pad && y <= hi + pad);
    let mut values = vec![Series {
        name: "exact".into(),
        points: exact.clone(),
        dashed: false,
        colour: Some(0),
    }];
    let mut errors = Vec::new();
    for (k, a) in report.approximation_list.iter().enumerate() {
        let points = report
            .series(quantity, Some(k))
            .into_iter()
            .map(|(x, y)| (x, if keep(y) { y } else { f64::NAN }))
            .collect();
        values.push(Series {
            name: a.name.clone(),
            points,
            dashed: true,
            colour: Some(k + 1),
        });
        errors.push(Series {
            name: a.name.clone(),
            points: report.error_series(quantity, k),
            dashed: false,
            colour: Some(k + 1),
        });
    }
    let percent = format!("{}", tol * 100.0);
    vec![
        Panel {
            title: format!(
                "{}: {} exact and approximate",
                report.model,
                quantity.column()
            ),
            x_label: x_label.clone(),
            y_label: quantity.column().to_string(),
            log_x: true,
            log_y: quantity == Quantity::Q,
            series: values,
            ..Panel::default()
        },
        Panel {
            title: format!("relative error of {}", quantity.name()),
            x_label,
            y_label: format!("|relative error of {}|", quantity.name()),
            log_x: true,
            log_y: true,
            series: errors,
            hlines: vec![(format!("tolerance {percent}%"), tol)],
            ..Panel::default()
        },
    ]
}

/// The figure as one SVG document.
pub fn render(report: &CompareReport, quantity: Quantity, tol: f64) -> Result<String> {
    render_svg(&panels(report, quantity, tol), 900, 420)
}

/// Writes the figure to `path`: SVG for `.svg`, PNG for `.png`; the file
/// appears complete or not at all (written beside it, then renamed).
pub fn write(report: &CompareReport, quantity: Quantity, tol: f64, path: &Path) -> Result<()> {
    let (width, height) = (900, 420);
    match plot_kind(path)? {
        PlotKind::Svg => write_atomic(path, &render(report, quantity, tol)?),
        PlotKind::Png => {
            let dir = match path.parent() {
                Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
                _ => std::path::PathBuf::from("."),
            };
            let name = path
                .file_name()
                .map(|n| n.to_string_lossy().to_string())
                .unwrap_or_default();
            let tmp = dir.join(format!(".{name}.zsum-tmp-{}.png", std::process::id()));
            let done =
                render_png(&panels(report, quantity, tol), width, height, &tmp).and_then(|_| {
                    std::fs::rename(&tmp, path).map_err(|e| {
                        Error::new(
                            ErrorKind::Io,
                            format!("cannot write {:?}: {e}", path.display().to_string()),
                        )
                    })
                });
            if done.is_err() {
                let _ = std::fs::remove_file(&tmp);
            }
            done
        }
    }
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
