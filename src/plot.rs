//! Figures: curves on linear or logarithmic axes, rendered to SVG or PNG.
//!
//! A figure is a list of [`Panel`]s stacked vertically. Each panel has a
//! title, two axis labels, any number of [`Series`] (curves), dashed
//! horizontal reference lines, dotted vertical marker lines with their own
//! labels, and, when it has two or more curves and reference lines, a
//! legend to the right of its plotting area naming each of them (one curve
//! alone is named by the title and the axis label).
//!
//! The title is wrapped at spaces onto at most two lines (one in a panel
//! under 300 px high) that fit inside the figure with a margin on each
//! side; what does not fit is cut with `…`.
//! Widths are measured with the embedded font and, for the SVG viewer's own
//! font, at no less than 0.6 em a character.
//!
//! The axes fit the data unless a panel fixes a range; curves that leave a
//! fixed range are cut at its edge.
//!
//! Points that cannot be drawn (a non-finite coordinate, or a coordinate
//! that is zero or negative on a logarithmic axis) are skipped; the curve
//! breaks there and each contiguous run of drawable points is drawn as its
//! own line. A run of a single point is drawn as a dot.
//!
//! Text is laid out with the DejaVu Sans metrics embedded in the binary, so
//! rendering needs no font installed on the machine. In SVG, text is emitted
//! as `<text>` elements (the viewer supplies a sans-serif font) and every
//! name, title and label is XML-escaped; control characters are replaced by
//! spaces so that the document is always well formed.
//!
//! ```
//! use zsum::plot::{render_svg, Panel, Series};
//!
//! let panel = Panel {
//!     title: "heat capacity".into(),
//!     x_label: "T / K".into(),
//!     y_label: "Cv / k".into(),
//!     log_x: true,
//!     series: vec![Series {
//!         name: "exact".into(),
//!         points: vec![(1.0, 0.1), (10.0, 0.8), (100.0, 1.0)],
//!         dashed: false,
//!         colour: None,
//!     }],
//!     ..Panel::default()
//! };
//! let svg = render_svg(&[panel], 800, 400)?;
//! assert!(svg.starts_with("<svg"));
//! // One curve: no legend, so its name is not written.
//! assert!(!svg.contains(">exact<"));
//! # Ok::<(), zsum::Error>(())
//! ```

use std::path::Path;
use std::sync::OnceLock;

use plotters::coord::ranged1d::{
    AsRangedCoord, DefaultFormatting, KeyPointHint, Ranged, ValueFormatter,
};
use plotters::coord::Shift;
use plotters::element::DashedPathElement;
use plotters::prelude::{
    BitMapBackend, Cartesian2d, ChartBuilder, ChartContext, Circle, Color, DashedLineSeries,
    DrawingArea, DrawingBackend, EmptyElement, FontDesc, FontFamily, FontStyle, IntoDrawingArea,
    IntoLogRange, LineSeries, PathElement, RGBColor, SVGBackend, ShapeStyle, Text, TextStyle,
    BLACK, WHITE,
};

use crate::error::{Error, ErrorKind, Result};
use crate::export::{write_atomic, write_atomic_bytes};

/// One curve: a name for the legend, its points `(x, y)` in drawing order,
/// and whether it is drawn dashed.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Series {
    /// The name shown in the legend (any text; it is escaped in SVG).
    pub name: String,
    /// The points `(x, y)`, joined in this order.
    pub points: Vec<(f64, f64)>,
    /// Draw the curve dashed instead of solid.
    pub dashed: bool,
    /// Its palette slot, so one curve keeps its colour across panels;
    /// default: its position in the panel.
    pub colour: Option<usize>,
}

/// One panel: axes, curves, optional reference and marker lines.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Panel {
    /// The title above the panel (wrapped onto at most two lines).
    pub title: String,
    /// The label of the x axis, e.g. `"T / K"` or `"T/θ"`.
    pub x_label: String,
    /// The label of the y axis, e.g. `"Cv / k"` or `"|relative error|"`.
    pub y_label: String,
    /// Logarithmic x axis (points with `x <= 0` are skipped).
    pub log_x: bool,
    /// Logarithmic y axis (points with `y <= 0` are skipped).
    pub log_y: bool,
    /// The curves, each in its own colour.
    pub series: Vec<Series>,
    /// Horizontal reference lines `(legend name, y)`, drawn dashed across
    /// the whole panel, e.g. `("tolerance 1%", 0.01)`. Their values are
    /// included in a fitted y range.
    pub hlines: Vec<(String, f64)>,
    /// Vertical marker lines `(label, x)`, drawn dotted from the bottom to
    /// the top of the plot with the label written beside the line (where
    /// it covers no curve, if there is such a place), e.g.
    /// `("n.b.p. 20.28 K", 20.28)`. Their values are included in a fitted
    /// x range.
    pub vlines: Vec<(String, f64)>,
    /// A fixed x range `(low, high)` instead of one fitted to the data.
    pub x_range: Option<(f64, f64)>,
    /// A fixed y range `(low, high)` instead of one fitted to the data and
    /// the reference lines; curves are cut where they leave it.
    pub y_range: Option<(f64, f64)>,
}
/// The smallest accepted figure width, in pixels.
pub const MIN_WIDTH: u32 = 320;
/// The smallest accepted panel height, in pixels.
pub const MIN_PANEL_HEIGHT: u32 = 200;
/// The largest accepted figure width or total height, in pixels.
pub const MAX_SIDE: u32 = 20_000;
/// The largest accepted figure area (width × total height), in pixels.
pub const MAX_PIXELS: u64 = 64_000_000;

/// Renders panels stacked vertically into one self-contained SVG document
/// (a `String`), `width` pixels wide and `height_per_panel` pixels high per
/// panel.
///
/// # Errors
/// [`ErrorKind::InvalidParameter`] if there are no panels, if the size is
/// outside [`MIN_WIDTH`], [`MIN_PANEL_HEIGHT`], [`MAX_SIDE`] and
/// [`MAX_PIXELS`], or if a panel has no drawable point at all (the message
/// names the panel's title).
pub fn render_svg(panels: &[Panel], width: u32, height_per_panel: u32) -> Result<String> {
    let total = check_size(panels, width, height_per_panel)?;
    let plans = plan_all(panels)?;
    ensure_fonts()?;
    let mut out = String::new();
    {
        let root = SVGBackend::with_string(&mut out, (width, total)).into_drawing_area();
        draw_figure(&root, panels, &plans)?;
        root.present().map_err(|e| draw_error("the figure", e))?;
    }
    Ok(out)
}

/// Renders panels like [`render_svg`] and writes the SVG document to `path`
/// atomically ([`write_atomic`]): the file appears complete or not at all.
///
/// # Errors
/// As [`render_svg`], plus [`ErrorKind::Io`] if the file cannot be written.
pub fn write_svg(panels: &[Panel], width: u32, height_per_panel: u32, path: &Path) -> Result<()> {
    let svg = render_svg(panels, width, height_per_panel)?;
    write_atomic(path, &svg)
}

/// Renders panels like [`render_svg`] into a PNG image written to `path`
/// atomically ([`write_atomic_bytes`]), which must end in `.png`. Text is
/// rasterised from the embedded font.
///
/// # Errors
/// As [`render_svg`], plus [`ErrorKind::InvalidParameter`] if `path` does
/// not end in `.png`, and [`ErrorKind::Io`] if the file cannot be written.
pub fn render_png(panels: &[Panel], width: u32, height_per_panel: u32, path: &Path) -> Result<()> {
    let is_png = path
        .extension()
        .and_then(|e| e.to_str())
        .is_some_and(|e| e.eq_ignore_ascii_case("png"));
    if !is_png {
        return Err(Error::invalid(
            "PNG output path",
            path.display(),
            "the file name must end in .png",
        ));
    }
    write_atomic_bytes(path, &png_bytes(panels, width, height_per_panel)?)
}

/// Renders panels like [`render_png`] into memory: the bytes of the PNG
/// file (8-bit RGB) that [`render_png`] writes.
///
/// ```
/// use zsum::plot::{png_bytes, Panel, Series};
///
/// let panel = Panel {
///     title: "a line".into(),
///     series: vec![Series {
///         points: vec![(0.0, 0.0), (1.0, 1.0)],
///         ..Series::default()
///     }],
///     ..Panel::default()
/// };
/// let png = png_bytes(&[panel], 400, 300)?;
/// assert!(png.starts_with(b"\x89PNG\r\n\x1a\n"));
/// # Ok::<(), zsum::Error>(())
/// ```
///
/// # Errors
/// As [`render_svg`], plus [`ErrorKind::Io`] if the image cannot be
/// encoded.
pub fn png_bytes(panels: &[Panel], width: u32, height_per_panel: u32) -> Result<Vec<u8>> {
    use image::ImageEncoder;
    let (w, h, pixels) = render_rgb(panels, width, height_per_panel)?;
    let mut out = Vec::new();
    image::codecs::png::PngEncoder::new(&mut out)
        .write_image(&pixels, w, h, image::ColorType::Rgb8)
        .map_err(|e| Error::new(ErrorKind::Io, format!("cannot encode the PNG image: {e}")))?;
    Ok(out)
}

/// Renders panels like [`render_png`] into memory instead: the pixels, as
/// `(width, total height, bytes)` with three bytes (red, green, blue) per
/// pixel, row by row from the top left. They are the pixels a PNG of the
/// same panels and size holds.
///
/// # Errors
/// As [`render_svg`].
pub fn render_rgb(
    panels: &[Panel],
    width: u32,
    height_per_panel: u32,
) -> Result<(u32, u32, Vec<u8>)> {
    let total = check_size(panels, width, height_per_panel)?;
    let plans = plan_all(panels)?;
    ensure_fonts()?;
    // `check_size` bounds the area by MAX_PIXELS.
    let mut pixels = vec![255u8; width as usize * total as usize * 3];
    {
        let root = BitMapBackend::with_buffer(&mut pixels, (width, total)).into_drawing_area();
        draw_figure(&root, panels, &plans)?;
        root.present().map_err(|e| draw_error("the figure", e))?;
    }
    Ok((width, total, pixels))
}

// ---------------------------------------------------------------------------
// Style.

/// Font sizes as plotters takes them; the SVG backend writes `size / 1.24`
/// px, so every text is at least 14.5 px.
const TITLE_SIZE: f64 = 26.0;
const LABEL_SIZE: f64 = 22.0;
const TICK_SIZE: f64 = 18.0;
const LEGEND_SIZE: f64 = 18.0;

/// The series colours, readable on white (contrast at least 2.3:1) and
/// apart from the black and grey of the reference lines: any two are at
/// least 20 apart in CIEDE2000 colour difference; the first six, which
/// the figures use most, also stay at least 10 apart for red–green
/// colour-blind readers (simulated protanopia and deuteranopia) and
/// differ in lightness where their hues are close. A curve's colour is
/// its slot modulo eight.
const PALETTE: [(u8, u8, u8); 8] = [
    (0, 114, 178),   // blue
    (213, 94, 0),    // vermilion
    (0, 158, 115),   // bluish green
    (204, 121, 167), // reddish purple
    (68, 85, 17),    // dark olive
    (86, 180, 233),  // sky blue
    (136, 17, 221),  // violet
    (170, 153, 0),   // mustard
];

/// The reference-line colours, apart from the series colours.
const HLINE_PALETTE: [RGBColor; 2] = [
    RGBColor(0, 0, 0),       // black
    RGBColor(110, 110, 110), // grey
];

/// The marker-line colour (drawn dotted).
const VLINE_COLOUR: RGBColor = RGBColor(70, 70, 70);

/// The colour of palette slot `slot`.
fn series_colour(slot: usize) -> RGBColor {
    let (r, g, b) = PALETTE[slot % PALETTE.len()];
    RGBColor(r, g, b)
}

const LINE_WIDTH: u32 = 2;
const DASH: i32 = 8;
const GAP: i32 = 5;
/// Dash and gap of the dotted marker lines (drawn 1 px wide).
const DOT: i32 = 4;
const LEGEND_GLYPH: i32 = 28;

fn font(size: f64) -> TextStyle<'static> {
    TextStyle::from(FontDesc::new(
        FontFamily::SansSerif,
        size,
        FontStyle::Normal,
    ))
    .color(&BLACK)
}

fn bold_font(size: f64) -> TextStyle<'static> {
    TextStyle::from(FontDesc::new(FontFamily::SansSerif, size, FontStyle::Bold)).color(&BLACK)
}

/// Registers the embedded DejaVu Sans as plotters' "sans-serif" (once).
fn ensure_fonts() -> Result<()> {
    static REGISTERED: OnceLock<bool> = OnceLock::new();
    let ok = *REGISTERED.get_or_init(|| {
        let normal = plotters::style::register_font(
            "sans-serif",
            FontStyle::Normal,
            dejavu::sans::regular(),
        );
        let bold =
            plotters::style::register_font("sans-serif", FontStyle::Bold, dejavu::sans::bold());
        normal.is_ok() && bold.is_ok()
    });
    if ok {
        Ok(())
    } else {
        Err(Error::new(
            ErrorKind::Io,
            "the embedded font could not be loaded for text layout",
        ))
    }
}

/// Text safe for one line of SVG/XML: control characters become spaces
/// (plotters escapes `<`, `>`, `&` and quotes itself).
fn clean(text: &str) -> String {
    text.chars()
        .map(|c| if c.is_control() { ' ' } else { c })
        .collect()
}

fn draw_error(what: &str, e: impl std::fmt::Display) -> Error {
    Error::new(ErrorKind::Io, format!("cannot draw {what}: {e}"))
}

// ---------------------------------------------------------------------------
// Planning: validation, drawable runs, axis ranges and ticks.

fn check_size(panels: &[Panel], width: u32, height_per_panel: u32) -> Result<u32> {
    if panels.is_empty() {
        return Err(Error::invalid(
            "number of panels",
            0,
            "a figure needs at least one panel",
        ));
    }
    if !(MIN_WIDTH..=MAX_SIDE).contains(&width) {
        return Err(Error::invalid(
            "figure width",
            width,
            &format!("it must be between {MIN_WIDTH} and {MAX_SIDE} pixels"),
        ));
    }
    if height_per_panel < MIN_PANEL_HEIGHT {
        return Err(Error::invalid(
            "panel height",
            height_per_panel,
            &format!("it must be at least {MIN_PANEL_HEIGHT} pixels"),
        ));
    }
    let total = u64::from(height_per_panel) * panels.len() as u64;
    if total > u64::from(MAX_SIDE) || total * u64::from(width) > MAX_PIXELS {
        return Err(Error::invalid(
            "figure size",
            format!("{width} x {total} pixels"),
            &format!(
                "the total height must be at most {MAX_SIDE} pixels and the area at most \
                 {MAX_PIXELS} pixels; use fewer panels or smaller ones"
            ),
        ));
    }
    // `total <= MAX_SIDE` fits in u32.
    Ok(total as u32)
}

/// One axis: its range and tick positions.
#[derive(Debug, Clone, PartialEq)]
struct Axis {
    lo: f64,
    hi: f64,
    /// Labelled ticks.
    ticks: Vec<f64>,
    /// Extra grid lines without labels.
    minor: Vec<f64>,
    /// How the tick labels are written.
    style: LabelStyle,
}

/// How the tick labels of one axis are written.
#[derive(Debug, Clone, Copy, PartialEq)]
enum LabelStyle {
    /// Plain between 0.001 and 10⁴, `1e-5` style otherwise, per value.
    Auto,
    /// Plain with this many decimals (trailing zeros dropped), all ticks.
    Plain(usize),
    /// Scientific with this many mantissa decimals (trailing zeros
    /// dropped), all ticks.
    Sci(usize),
}

/// What a panel will draw.
#[derive(Debug, Clone)]
struct Plan {
    x: (f64, f64, bool),
    y: (f64, f64, bool),
    /// Per series: its runs of drawable points, cut at the axis ranges.
    runs: Vec<Vec<Vec<(f64, f64)>>>,
    /// Per hline: its y if drawable and within the y range.
    hlines: Vec<Option<f64>>,
    /// Per vline: its x if drawable and within the x range.
    vlines: Vec<Option<f64>>,
}

fn drawable(v: f64, log: bool) -> bool {
    v.is_finite() && (!log || v > 0.0)
}

fn plan_all(panels: &[Panel]) -> Result<Vec<Plan>> {
    panels.iter().map(plan).collect()
}

/// The runs of consecutive drawable points of `points`.
fn drawable_runs(points: &[(f64, f64)], log_x: bool, log_y: bool) -> Vec<Vec<(f64, f64)>> {
    let mut runs = Vec::new();
    let mut run = Vec::new();
    for &(x, y) in points {
        if drawable(x, log_x) && drawable(y, log_y) {
            run.push((x, y));
        } else if !run.is_empty() {
            runs.push(std::mem::take(&mut run));
        }
    }
    if !run.is_empty() {
        runs.push(run);
    }
    runs
}

fn plan(panel: &Panel) -> Result<Plan> {
    let runs: Vec<Vec<Vec<(f64, f64)>>> = panel
        .series
        .iter()
        .map(|s| drawable_runs(&s.points, panel.log_x, panel.log_y))
        .collect();
    let points = || runs.iter().flatten().flatten();
    if points().next().is_none() && (panel.x_range.is_none() || panel.y_range.is_none()) {
        return Err(Error::invalid(
            "panel",
            format!("{:?}", panel.title),
            "it has no drawable point: every point has a non-finite coordinate, or a \
             coordinate <= 0 on a logarithmic axis",
        ));
    }
    let x = axis_range(panel, true, points().map(|p| p.0))?;
    let y = axis_range(panel, false, points().map(|p| p.1))?;
    let x = (x.0, x.1, panel.log_x);
    let y = (y.0, y.1, panel.log_y);
    let within = |v: f64, (lo, hi, log): (f64, f64, bool)| drawable(v, log) && lo <= v && v <= hi;
    Ok(Plan {
        runs: runs.iter().map(|r| clip_runs(r, x, y)).collect(),
        hlines: panel
            .hlines
            .iter()
            .map(|&(_, v)| within(v, y).then_some(v))
            .collect(),
        vlines: panel
            .vlines
            .iter()
            .map(|&(_, v)| within(v, x).then_some(v))
            .collect(),
        x,
        y,
    })
}

/// The range of the x axis (`is_x`) or the y axis of `panel`: the fixed
/// one, checked, or one fitted to the data `values` along it and to the
/// drawable lines across it (marker lines for x, reference lines for y).
fn axis_range(panel: &Panel, is_x: bool, values: impl Iterator<Item = f64>) -> Result<(f64, f64)> {
    let (fixed, log, lines, axis) = if is_x {
        (panel.x_range, panel.log_x, &panel.vlines, "x")
    } else {
        (panel.y_range, panel.log_y, &panel.hlines, "y")
    };
    match fixed {
        Some(r) => fixed_range(r, log, &panel.title, axis),
        None => {
            let across = lines.iter().map(|l| l.1).filter(|&v| drawable(v, log));
            padded(min_max(values.chain(across)), log, &panel.title, axis)
        }
    }
}

/// A range given by the caller, checked.
fn fixed_range((lo, hi): (f64, f64), log: bool, title: &str, axis: &str) -> Result<(f64, f64)> {
    if lo.is_finite() && hi.is_finite() && lo < hi && (!log || lo > 0.0) {
        Ok((lo, hi))
    } else {
        Err(Error::invalid(
            &format!("fixed {axis} range of panel {title:?}"),
            format!("[{lo:e}, {hi:e}]"),
            "it must be finite with low < high, and low > 0 on a logarithmic axis",
        ))
    }
}

/// The part of the segment `p`→`q` inside the box `[x0, x1] × [y0, y1]`, as
/// the segment parameters `(t0, t1)`, `0 <= t0 <= t1 <= 1`; `None` if the
/// segment misses the box.
fn clip_segment(p: (f64, f64), q: (f64, f64), [x0, x1, y0, y1]: [f64; 4]) -> Option<(f64, f64)> {
    let (dx, dy) = (q.0 - p.0, q.1 - p.1);
    let (mut t0, mut t1) = (0.0f64, 1.0f64);
    for (step, room) in [
        (-dx, p.0 - x0),
        (dx, x1 - p.0),
        (-dy, p.1 - y0),
        (dy, y1 - p.1),
    ] {
        if step == 0.0 {
            if room < 0.0 {
                return None;
            }
        } else {
            let t = room / step;
            if step < 0.0 {
                t0 = t0.max(t);
            } else {
                t1 = t1.min(t);
            }
        }
    }
    (t0 <= t1).then_some((t0, t1))
}

/// Runs of drawable points cut where they leave the axis ranges: a line
/// that leaves ends at the edge, and one that comes back starts a new run
/// there. Lines are cut straight in the axis' own scale (logarithmic or
/// linear), as they are drawn.
fn clip_runs(
    runs: &[Vec<(f64, f64)>],
    (x0, x1, log_x): (f64, f64, bool),
    (y0, y1, log_y): (f64, f64, bool),
) -> Vec<Vec<(f64, f64)>> {
    let fwd = |v: f64, log: bool| if log { v.log10() } else { v };
    let back = |v: f64, log: bool| if log { 10f64.powf(v) } else { v };
    let scaled = |(x, y): (f64, f64)| (fwd(x, log_x), fwd(y, log_y));
    let frame = [
        fwd(x0, log_x),
        fwd(x1, log_x),
        fwd(y0, log_y),
        fwd(y1, log_y),
    ];
    let inside = |p: (f64, f64)| {
        let (x, y) = scaled(p);
        frame[0] <= x && x <= frame[1] && frame[2] <= y && y <= frame[3]
    };
    let mut out = Vec::new();
    for run in runs {
        if let [only] = run.as_slice() {
            if inside(*only) {
                out.push(vec![*only]);
            }
            continue;
        }
        let mut cur: Vec<(f64, f64)> = Vec::new();
        for pair in run.windows(2) {
            let (p, q) = (pair[0], pair[1]);
            let (sp, sq) = (scaled(p), scaled(q));
            let at = |t: f64| {
                (
                    back(sp.0 + t * (sq.0 - sp.0), log_x),
                    back(sp.1 + t * (sq.1 - sp.1), log_y),
                )
            };
            match clip_segment(sp, sq, frame) {
                None => {
                    if !cur.is_empty() {
                        out.push(std::mem::take(&mut cur));
                    }
                }
                Some((t0, t1)) => {
                    if t0 > 0.0 && !cur.is_empty() {
                        out.push(std::mem::take(&mut cur));
                    }
                    if cur.is_empty() {
                        cur.push(if t0 > 0.0 { at(t0) } else { p });
                    }
                    if t1 < 1.0 {
                        cur.push(at(t1));
                        out.push(std::mem::take(&mut cur));
                    } else {
                        cur.push(q);
                    }
                }
            }
        }
        if !cur.is_empty() {
            out.push(cur);
        }
    }
    out
}

fn min_max(values: impl Iterator<Item = f64>) -> (f64, f64) {
    values.fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
        (lo.min(v), hi.max(v))
    })
}

/// Exactly 10^e as the nearest f64.
pub(crate) fn decade(e: i32) -> f64 {
    format!("1e{e}").parse().unwrap_or(f64::NAN)
}

/// The largest `e` with `10^e <= v`, for finite `v > 0`.
pub(crate) fn floor_decade(v: f64) -> i32 {
    let mut e = v.log10().floor() as i32;
    if decade(e) > v {
        e -= 1;
    }
    if decade(e + 1) <= v {
        e += 1;
    }
    e
}

/// The smallest `e` with `10^e >= v`, for finite `v > 0`.
pub(crate) fn ceil_decade(v: f64) -> i32 {
    let mut e = v.log10().ceil() as i32;
    if decade(e) < v {
        e += 1;
    }
    if decade(e - 1) >= v {
        e -= 1;
    }
    e
}

/// The axis range for finite data `min <= max`: whole decades on a log
/// axis, a 3% margin on a linear one.
fn padded((min, max): (f64, f64), log: bool, title: &str, axis: &str) -> Result<(f64, f64)> {
    if log {
        // Here 0 < min <= max < inf.
        let e_lo = floor_decade(min);
        let mut e_hi = ceil_decade(max);
        if e_hi <= e_lo {
            e_hi = e_lo + 1;
        }
        let lo = Some(decade(e_lo)).filter(|v| *v > 0.0).unwrap_or(min);
        let hi = Some(decade(e_hi)).filter(|v| v.is_finite()).unwrap_or(max);
        if lo < hi {
            return Ok((lo, hi));
        }
    } else {
        let span = max - min;
        let mag = min.abs().max(max.abs());
        let pad = if mag == 0.0 {
            1.0
        } else {
            (span * 0.03).max(mag * 1e-6)
        };
        let mut lo = min - pad;
        let mut hi = max + pad;
        if !lo.is_finite() {
            lo = min;
        }
        if !hi.is_finite() {
            hi = max;
        }
        if lo < hi && (hi - lo).is_finite() {
            return Ok((lo, hi));
        }
    }
    Err(Error::invalid(
        &format!("{axis} range of panel {title:?}"),
        format!("[{min:e}, {max:e}]"),
        "the data must span a range that a finite axis can show",
    ))
}

/// Ticks for a logarithmic axis: decades, thinned to about `target`.
fn log_axis(lo: f64, hi: f64, target: usize) -> Axis {
    let e_lo = lo.log10().ceil() as i32;
    let e_hi = hi.log10().floor() as i32;
    let decades: Vec<i32> = (e_lo..=e_hi)
        .filter(|&e| {
            let v = decade(e);
            v >= lo && v <= hi
        })
        .collect();
    let n = decades.len();
    let step = n.div_ceil(target.max(2)).max(1);
    let mut ticks: Vec<f64> = if n < 3 {
        // Under about two decades: label 1, 2 and 5 of each decade.
        ((e_lo - 1)..=e_hi)
            .flat_map(|e| [1.0, 2.0, 5.0].map(|m| m * decade(e)))
            .filter(|v| *v >= lo && *v <= hi)
            .collect()
    } else {
        decades
            .iter()
            .filter(|&&e| (e - e_lo) as usize % step == 0)
            .map(|&e| decade(e))
            .collect()
    };
    if ticks.len() < 2 {
        ticks = vec![lo, hi];
    }
    let mut minor = Vec::new();
    if n <= 8 {
        for e in (e_lo - 1)..=e_hi {
            for m in 2..=9 {
                let v = f64::from(m) * decade(e);
                if v > lo && v < hi && !ticks.contains(&v) {
                    minor.push(v);
                }
            }
        }
    } else if step > 1 {
        minor = decades.iter().map(|&e| decade(e)).collect();
    }
    Axis {
        lo,
        hi,
        ticks,
        minor,
        style: LabelStyle::Auto,
    }
}

/// Ticks for a linear axis: multiples of 1, 2 or 5 × 10^k, about `target`.
fn linear_axis(lo: f64, hi: f64, target: usize) -> Axis {
    let fallback = Axis {
        lo,
        hi,
        ticks: vec![lo, hi],
        minor: Vec::new(),
        style: LabelStyle::Auto,
    };
    let raw = (hi - lo) / target.max(2) as f64;
    if !(raw.is_finite() && raw > 0.0) {
        return fallback;
    }
    let k = raw.log10().floor() as i32;
    let base = decade(k);
    // The nice step nearest to `raw` on a log scale.
    let mut step = base;
    for m in [2.0, 5.0, 10.0] {
        let s = m * base;
        if (s / raw).ln().abs() < (step / raw).ln().abs() {
            step = s;
        }
    }
    let k = if step >= 10.0 * base { k + 1 } else { k };
    if !(step.is_finite() && step > 0.0) {
        return fallback;
    }
    let first = (lo / step).ceil();
    let mut ticks = Vec::new();
    let mut minor = Vec::new();
    for i in 0..=(4 * target.max(2)) {
        // A tick a rounding error past the end is the end.
        let v = (first + i as f64) * step;
        if v > hi + step * 1e-9 {
            break;
        }
        let v = v.min(hi);
        // Snap tiny rounding residues to zero.
        let v = if v.abs() < step * 1e-9 { 0.0 } else { v };
        ticks.push(v);
        let half = v + step / 2.0;
        if half < hi {
            minor.push(half);
        }
        let before = v - step / 2.0;
        if i == 0 && before > lo {
            minor.push(before);
        }
    }
    if ticks.len() < 2 {
        return fallback;
    }
    // One style for all ticks, with enough digits to tell them apart.
    let top = ticks.iter().fold(0.0f64, |m, t| m.max(t.abs()));
    let style = if (1e-3..1e5).contains(&top) {
        LabelStyle::Plain(if k >= 0 { 0 } else { (-k) as usize })
    } else {
        let digits = top.log10().floor() as i32 - k;
        LabelStyle::Sci(digits.clamp(0, 6) as usize)
    };
    Axis {
        lo,
        hi,
        ticks,
        minor,
        style,
    }
}

fn make_axis((lo, hi, log): (f64, f64, bool), target: usize) -> Axis {
    if log {
        log_axis(lo, hi, target)
    } else {
        linear_axis(lo, hi, target)
    }
}

/// A tick label in the axis' style; zero is always `0`.
fn tick_label(v: f64, style: LabelStyle) -> String {
    fn trim(s: &str) -> &str {
        if s.contains('.') {
            s.trim_end_matches('0').trim_end_matches('.')
        } else {
            s
        }
    }
    fn sci(v: f64, decimals: usize) -> String {
        let s = format!("{:.*e}", decimals, v);
        match s.split_once('e') {
            Some((m, e)) => format!("{}e{e}", trim(m)),
            None => s,
        }
    }
    if v == 0.0 {
        return "0".to_string();
    }
    match style {
        LabelStyle::Plain(d) => trim(&format!("{:.*}", d.min(12), v)).to_string(),
        LabelStyle::Sci(d) => sci(v, d.min(12)),
        LabelStyle::Auto if (1e-3..1e4).contains(&v.abs()) => trim(&format!("{v:.6}")).to_string(),
        LabelStyle::Auto => sci(v, 3),
    }
}

// ---------------------------------------------------------------------------
// Drawing.

/// Pixels kept free above the title.
const TITLE_TOP: u32 = 8;
/// Pixels kept free left and right of the title.
const TITLE_SIDE: u32 = 14;
/// Pixels between the title's last line and the chart.
const TITLE_GAP: u32 = 12;
/// Lines a title may take; the rest is cut with `…`.
const TITLE_LINES: usize = 2;
/// Panels lower than this, in pixels, take one line of title.
const TWO_LINE_HEIGHT: u32 = 300;
/// Width assumed for one character of the SVG viewer's font, in ems (its
/// font may be wider than the embedded one).
const SVG_CHAR_EM: f64 = 0.6;

/// The width of `text` in pixels: the larger of its width in the embedded
/// font and [`SVG_CHAR_EM`] per character at the size SVG writes
/// (`size / 1.24` px).
fn text_width<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    text: &str,
    style: &TextStyle,
    size: f64,
) -> std::result::Result<u32, String> {
    let (w, _) = area
        .estimate_text_size(text, style)
        .map_err(|e| e.to_string())?;
    let svg = SVG_CHAR_EM * size / 1.24 * text.chars().count() as f64;
    Ok(w.max(svg.ceil() as u32))
}

type Measure<'a> = dyn Fn(&str) -> std::result::Result<u32, String> + 'a;

/// `text` if it is at most `room` pixels wide, else its longest start that
/// fits with `…` after it (`…` alone if none does).
fn shorten(text: &str, room: u32, width: &Measure) -> std::result::Result<String, String> {
    if width(text)? <= room {
        return Ok(text.to_string());
    }
    let chars: Vec<char> = text.chars().collect();
    // The widths of the starts grow with their length: bisect.
    let (mut lo, mut hi) = (0usize, chars.len());
    while lo < hi {
        let mid = (lo + hi).div_ceil(2);
        let head: String = chars[..mid].iter().collect();
        if width(&format!("{}…", head.trim_end()))? <= room {
            lo = mid;
        } else {
            hi = mid - 1;
        }
    }
    let head: String = chars[..lo].iter().collect();
    Ok(format!("{}…", head.trim_end()))
}

/// `text` broken at spaces into at most `max_lines` lines each at most
/// `room` pixels wide; a word wider than a line is broken between
/// characters, and the last line is cut with `…` if the text goes on.
fn wrap(
    text: &str,
    room: u32,
    max_lines: usize,
    width: &Measure,
) -> std::result::Result<Vec<String>, String> {
    let mut lines: Vec<String> = Vec::new();
    let mut cur = String::new();
    for word in text.split_whitespace() {
        let joined = if cur.is_empty() {
            word.to_string()
        } else {
            format!("{cur} {word}")
        };
        if width(&joined)? <= room {
            cur = joined;
            continue;
        }
        if !cur.is_empty() {
            lines.push(std::mem::take(&mut cur));
        }
        for c in word.chars() {
            let longer = format!("{cur}{c}");
            if cur.is_empty() || width(&longer)? <= room {
                cur = longer;
            } else {
                lines.push(std::mem::replace(&mut cur, c.to_string()));
            }
            if lines.len() > max_lines {
                break;
            }
        }
        // Past the last line the rest is cut anyway.
        if lines.len() > max_lines {
            break;
        }
    }
    if !cur.is_empty() {
        lines.push(cur);
    }
    if lines.len() > max_lines {
        let rest = lines.split_off(max_lines - 1).join(" ");
        // Force the cut: the last line must end in `…`.
        let mut last = shorten(&rest, room, width)?;
        if !last.ends_with('…') {
            last = shorten(&format!("{rest} …"), room, width)?;
        }
        lines.push(last);
    }
    Ok(lines)
}

/// Draws the title of a panel at the top of `area`, wrapped to fit with
/// [`TITLE_SIDE`] pixels free on each side, and returns the area below it.
fn draw_title<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    title: &str,
) -> std::result::Result<DrawingArea<DB, Shift>, String> {
    let style = bold_font(TITLE_SIZE);
    let (w, h) = area.dim_in_pixel();
    let room = w.saturating_sub(2 * TITLE_SIDE);
    let measure = |t: &str| text_width(area, t, &style, TITLE_SIZE);
    // A low panel keeps its height for the chart.
    let max_lines = if h >= TWO_LINE_HEIGHT { TITLE_LINES } else { 1 };
    let lines = wrap(title, room, max_lines, &measure)?;
    // The embedded font's tallest glyphs rise about 0.16 size above the
    // top anchor and its descenders reach 0.71 size below it; an SVG
    // viewer's reach 0.81 size below.
    let lift = (0.16 * TITLE_SIZE).ceil() as u32;
    let pitch = (1.2 * TITLE_SIZE).round() as u32;
    let reach = (0.82 * TITLE_SIZE).ceil() as u32;
    let anchored = style.pos(plotters::style::text_anchor::Pos::new(
        plotters::style::text_anchor::HPos::Center,
        plotters::style::text_anchor::VPos::Top,
    ));
    let mut band = TITLE_TOP;
    for (i, line) in lines.iter().enumerate() {
        let top = TITLE_TOP + lift + i as u32 * pitch;
        area.draw(&Text::new(
            line.clone(),
            ((w / 2) as i32, top as i32),
            anchored.clone(),
        ))
        .map_err(|e| e.to_string())?;
        band = top + reach + TITLE_GAP;
    }
    Ok(area.split_vertically(band).1)
}

fn draw_figure<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    panels: &[Panel],
    plans: &[Plan],
) -> Result<()> {
    root.fill(&WHITE)
        .map_err(|e| draw_error("the background", e))?;
    let areas = root.split_evenly((panels.len(), 1));
    let (width, height) = areas.first().map_or((0, 0), |a| a.dim_in_pixel());

    // First pass: legends and y ticks of every panel, measured, so that all
    // panels share one plotting width and their axes line up.
    let legend_font = font(LEGEND_SIZE);
    let tick_font = font(TICK_SIZE);
    // About one labelled tick per 70 px of height.
    let y_target = (height as usize / 70).clamp(2, 8);
    let mut prepared = Vec::with_capacity(panels.len());
    let mut text_w = 0u32;
    let mut y_tick_w = 0u32;
    // The legend takes at most two fifths of the width; a longer name is
    // cut with `…`.
    let legend_max = width * 2 / 5;
    let name_room = legend_max.saturating_sub(LEGEND_GLYPH as u32 + 30);
    for (panel, plan) in panels.iter().zip(plans) {
        let what = format!("panel {:?}", panel.title);
        let mut entries = legend_entries(panel);
        for entry in &mut entries {
            let measure = |t: &str| text_width(root, t, &legend_font, LEGEND_SIZE);
            entry.name =
                shorten(&entry.name, name_room, &measure).map_err(|e| draw_error(&what, e))?;
            let w = measure(&entry.name).map_err(|e| draw_error(&what, e))?;
            text_w = text_w.max(w);
        }
        let y_axis = make_axis(plan.y, y_target);
        for &t in &y_axis.ticks {
            let (w, _) = root
                .estimate_text_size(&tick_label(t, y_axis.style), &tick_font)
                .map_err(|e| draw_error(&format!("panel {:?}", panel.title), e))?;
            y_tick_w = y_tick_w.max(w);
        }
        prepared.push((entries, y_axis));
    }
    let any_legend = prepared.iter().any(|(entries, _)| !entries.is_empty());
    let layout = Layout {
        legend_w: if any_legend {
            (text_w + LEGEND_GLYPH as u32 + 30).min(legend_max)
        } else {
            0
        },
        y_area: y_tick_w + (LABEL_SIZE * 1.2) as u32 + 20,
        x_area: (TICK_SIZE + LABEL_SIZE * 1.2) as u32 + 16,
    };

    for (((area, panel), plan), (entries, y_axis)) in
        areas.iter().zip(panels).zip(plans).zip(prepared)
    {
        draw_panel(area, panel, plan, &layout, &entries, &y_axis)?;
    }
    Ok(())
}

/// Sizes shared by all panels of a figure, in pixels.
struct Layout {
    legend_w: u32,
    y_area: u32,
    x_area: u32,
}

/// One legend entry: name, colour, dashed.
struct Entry {
    name: String,
    color: RGBColor,
    dashed: bool,
}

/// The legend entries of a panel: its series, then its reference lines,
/// each in the colour it is drawn with; none if there would be only one
/// (the title and the axis label name a lone curve).
fn legend_entries(panel: &Panel) -> Vec<Entry> {
    let mut entries: Vec<Entry> = panel
        .series
        .iter()
        .enumerate()
        .map(|(i, s)| Entry {
            name: clean(&s.name),
            color: series_colour(s.colour.unwrap_or(i)),
            dashed: s.dashed,
        })
        .collect();
    entries.extend(panel.hlines.iter().enumerate().map(|(j, (name, _))| Entry {
        name: clean(name),
        color: HLINE_PALETTE[j % HLINE_PALETTE.len()],
        dashed: true,
    }));
    if entries.len() < 2 {
        entries.clear();
    }
    entries
}

fn draw_panel<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    panel: &Panel,
    plan: &Plan,
    layout: &Layout,
    entries: &[Entry],
    y_axis: &Axis,
) -> Result<()> {
    let what = format!("panel {:?}", panel.title);
    let err = |e: &dyn std::fmt::Display| draw_error(&what, e);
    let body = draw_title(area, &clean(&panel.title)).map_err(|e| err(&e))?;
    let (body_w, _) = body.dim_in_pixel();
    let (plot_area, legend_area) = body.split_horizontally(body_w.saturating_sub(layout.legend_w));

    let plot_w = body_w.saturating_sub(layout.legend_w + layout.y_area);
    // About one labelled tick per 120 px of width; decade labels are short,
    // so a log axis takes one per 75 px.
    let per_tick = if panel.log_x { 75 } else { 120 };
    let x_axis = make_axis(plan.x, (plot_w as usize / per_tick).clamp(2, 12));
    let x_range = x_axis.lo..x_axis.hi;
    let y_range = y_axis.lo..y_axis.hi;
    let chart = ChartSetup {
        panel,
        plan,
        x_axis: &x_axis,
        y_axis,
        x_area: layout.x_area,
        y_area: layout.y_area,
        what: &what,
    };
    match (panel.log_x, panel.log_y) {
        (false, false) => chart.draw(
            &plot_area,
            ticked(x_range, &x_axis),
            ticked(y_range, y_axis),
        )?,
        (true, false) => chart.draw(
            &plot_area,
            ticked(x_range.log_scale(), &x_axis),
            ticked(y_range, y_axis),
        )?,
        (false, true) => chart.draw(
            &plot_area,
            ticked(x_range, &x_axis),
            ticked(y_range.log_scale(), y_axis),
        )?,
        (true, true) => chart.draw(
            &plot_area,
            ticked(x_range.log_scale(), &x_axis),
            ticked(y_range.log_scale(), y_axis),
        )?,
    }

    draw_legend(&legend_area, entries, &font(LEGEND_SIZE)).map_err(|e| err(&e))
}

/// A plotters coordinate (linear or logarithmic) with our own tick
/// positions: labelled ticks as bold points, grid-only ones as light points.
struct Ticked<R> {
    inner: R,
    ticks: Vec<f64>,
    minor: Vec<f64>,
}

fn ticked<A: AsRangedCoord<Value = f64>>(spec: A, axis: &Axis) -> Ticked<A::CoordDescType> {
    Ticked {
        inner: A::CoordDescType::from(spec),
        ticks: axis.ticks.clone(),
        minor: axis.minor.clone(),
    }
}

impl<R: Ranged<ValueType = f64>> Ranged for Ticked<R> {
    type FormatOption = DefaultFormatting;
    type ValueType = f64;

    fn map(&self, value: &f64, limit: (i32, i32)) -> i32 {
        self.inner.map(value, limit)
    }

    fn key_points<Hint: KeyPointHint>(&self, hint: Hint) -> Vec<f64> {
        if hint.weight().allow_light_points() {
            self.minor.clone()
        } else {
            self.ticks.clone()
        }
    }

    fn range(&self) -> std::ops::Range<f64> {
        self.inner.range()
    }

    fn axis_pixel_range(&self, limit: (i32, i32)) -> std::ops::Range<i32> {
        self.inner.axis_pixel_range(limit)
    }
}

/// Everything a chart needs besides its coordinate types.
struct ChartSetup<'a> {
    panel: &'a Panel,
    plan: &'a Plan,
    x_axis: &'a Axis,
    y_axis: &'a Axis,
    x_area: u32,
    y_area: u32,
    what: &'a str,
}

impl ChartSetup<'_> {
    fn draw<DB, X, Y>(&self, area: &DrawingArea<DB, Shift>, x: X, y: Y) -> Result<()>
    where
        DB: DrawingBackend,
        X: Ranged<ValueType = f64> + ValueFormatter<f64>,
        Y: Ranged<ValueType = f64> + ValueFormatter<f64>,
    {
        let err = |e: &dyn std::fmt::Display| draw_error(self.what, e);
        let mut chart = ChartBuilder::on(area)
            .margin_top(10)
            .margin_left(10)
            .margin_right(20)
            .margin_bottom(10)
            .x_label_area_size(self.x_area)
            .y_label_area_size(self.y_area)
            .build_cartesian_2d(x, y)
            .map_err(|e| err(&e))?;

        let x_label = clean(&self.panel.x_label);
        let y_label = clean(&self.panel.y_label);
        let xd = self.x_axis.style;
        let yd = self.y_axis.style;
        let x_fmt = move |v: &f64| tick_label(*v, xd);
        let y_fmt = move |v: &f64| tick_label(*v, yd);
        chart
            .configure_mesh()
            .x_desc(x_label)
            .y_desc(y_label)
            .label_style(font(TICK_SIZE))
            .axis_desc_style(font(LABEL_SIZE))
            .x_label_formatter(&x_fmt)
            .y_label_formatter(&y_fmt)
            .bold_line_style(RGBColor(205, 205, 205))
            .light_line_style(RGBColor(238, 238, 238))
            .axis_style(BLACK)
            .draw()
            .map_err(|e| err(&e))?;

        for (i, (series, runs)) in self.panel.series.iter().zip(&self.plan.runs).enumerate() {
            let style = line_style(series_colour(series.colour.unwrap_or(i)));
            for run in runs {
                if run.len() == 1 {
                    chart.draw_series(std::iter::once(Circle::new(
                        run[0],
                        LINE_WIDTH + 2,
                        style.filled(),
                    )))
                } else if series.dashed {
                    chart.draw_series(DashedLineSeries::new(run.iter().copied(), DASH, GAP, style))
                } else {
                    chart.draw_series(LineSeries::new(run.iter().copied(), style))
                }
                .map_err(|e| err(&e))?;
            }
        }
        for (j, y) in self.plan.hlines.iter().enumerate() {
            if let Some(y) = *y {
                let style = line_style(HLINE_PALETTE[j % HLINE_PALETTE.len()]);
                let ends = [(self.x_axis.lo, y), (self.x_axis.hi, y)];
                chart
                    .draw_series(DashedLineSeries::new(ends, DASH, GAP, style))
                    .map_err(|e| err(&e))?;
            }
        }
        for ((label, _), x) in self.panel.vlines.iter().zip(&self.plan.vlines) {
            if let Some(x) = *x {
                let ends = [(x, self.y_axis.lo), (x, self.y_axis.hi)];
                chart
                    .draw_series(DashedLineSeries::new(
                        ends,
                        DOT,
                        DOT,
                        ShapeStyle {
                            stroke_width: 1,
                            ..line_style(VLINE_COLOUR)
                        },
                    ))
                    .map_err(|e| err(&e))?;
                self.draw_marker_label(&chart, x, &clean(label))?;
            }
        }
        Ok(())
    }

    /// Writes a marker line's label beside it, at the first place where it
    /// lies inside the plot and covers no curve or reference line: across
    /// or along the line (reading upwards), right or left of it, at the
    /// top of the plot, then at the bottom; at the first place inside the
    /// plot if none is free.
    fn draw_marker_label<DB, X, Y>(
        &self,
        chart: &ChartContext<DB, Cartesian2d<X, Y>>,
        x: f64,
        label: &str,
    ) -> Result<()>
    where
        DB: DrawingBackend,
        X: Ranged<ValueType = f64> + ValueFormatter<f64>,
        Y: Ranged<ValueType = f64> + ValueFormatter<f64>,
    {
        let err = |e: &dyn std::fmt::Display| draw_error(self.what, e);
        let style = font(TICK_SIZE).color(&VLINE_COLOUR);
        let area = chart.plotting_area().strip_coord_spec();
        let long = f64::from(text_width(&area, label, &style, TICK_SIZE).map_err(|e| err(&e))?);
        let short = (TICK_SIZE * 0.98).ceil();
        let px = |p: (f64, f64)| {
            let (a, b) = chart.backend_coord(&p);
            (f64::from(a), f64::from(b))
        };
        let (line_x, top) = px((x, self.y_axis.hi));
        let bottom = px((x, self.y_axis.lo)).1;
        let (left, right) = (
            px((self.x_axis.lo, self.y_axis.lo)).0,
            px((self.x_axis.hi, self.y_axis.lo)).0,
        );
        let (gap, pad) = (6.0, 3.0);
        // Candidate boxes [x0, x1, y0, y1] in pixels, and whether the
        // label is turned to read upwards along the line.
        let mut candidates = Vec::new();
        for at_top in [true, false] {
            for upright in [false, true] {
                let (w, h) = if upright {
                    (short, long)
                } else {
                    (long, short)
                };
                let y0 = if at_top {
                    top + pad + 2.0
                } else {
                    bottom - pad - 2.0 - h
                };
                for x0 in [line_x + gap, line_x - gap - w] {
                    candidates.push(([x0, x0 + w, y0, y0 + h], upright));
                }
            }
        }
        let inside = |b: &[f64; 4]| {
            b[0] - pad >= left && b[1] + pad <= right && b[2] - pad >= top && b[3] + pad <= bottom
        };
        let mut segments: Vec<((f64, f64), (f64, f64))> = Vec::new();
        for run in self.plan.runs.iter().flatten() {
            let pts: Vec<(f64, f64)> = run.iter().map(|&p| px(p)).collect();
            segments.extend(pts.windows(2).map(|s| (s[0], s[1])));
            if let [only] = pts.as_slice() {
                segments.push((*only, *only));
            }
        }
        for y in self.plan.hlines.iter().flatten() {
            segments.push((px((self.x_axis.lo, *y)), px((self.x_axis.hi, *y))));
        }
        let free = |b: &[f64; 4]| {
            let frame = [b[0] - pad, b[1] + pad, b[2] - pad, b[3] + pad];
            segments
                .iter()
                .all(|&(p, q)| clip_segment(p, q, frame).is_none())
        };
        let place = candidates
            .iter()
            .find(|(b, _)| inside(b) && free(b))
            .or_else(|| candidates.iter().find(|(b, _)| inside(b)))
            .unwrap_or(&candidates[0]);
        let &([x0, _, y0, y1], upright) = place;
        // Offsets from the top of the line, in whole pixels.
        let at = |v: f64, from: f64| (v - from).round() as i32;
        let (bx0, by0, by1) = (at(x0, line_x), at(y0, top), at(y1, top));
        let lift = (0.16 * TICK_SIZE).round() as i32;
        let mut text_style = style.pos(plotters::style::text_anchor::Pos::new(
            plotters::style::text_anchor::HPos::Left,
            plotters::style::text_anchor::VPos::Top,
        ));
        let anchor = if upright {
            text_style = text_style.transform(plotters::style::FontTransform::Rotate270);
            (bx0 + lift, by1)
        } else {
            (bx0, by0 + lift)
        };
        let text = EmptyElement::at((x, self.y_axis.hi))
            + Text::new(label.to_string(), anchor, text_style);
        let drawing = chart.plotting_area();
        drawing.draw(&text).map_err(|e| err(&e))
    }
}

fn line_style(color: RGBColor) -> ShapeStyle {
    ShapeStyle {
        color: color.to_rgba(),
        filled: false,
        stroke_width: LINE_WIDTH,
    }
}

/// The legend: one row per entry, a line glyph then the name, at the top of
/// the area to the right of the axes.
fn draw_legend<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    entries: &[Entry],
    text: &TextStyle,
) -> std::result::Result<(), String> {
    let row = (LEGEND_SIZE * 1.25).round() as i32;
    let x0 = 4;
    let mut y = 14 + row / 2;
    for entry in entries {
        let style = line_style(entry.color);
        let glyph = vec![(x0, y), (x0 + LEGEND_GLYPH, y)];
        if entry.dashed {
            area.draw(&DashedPathElement::new(glyph, 6, 4, style))
                .map_err(|e| e.to_string())?;
        } else {
            area.draw(&PathElement::new(glyph, style))
                .map_err(|e| e.to_string())?;
        }
        let label = Text::new(
            entry.name.clone(),
            (x0 + LEGEND_GLYPH + 8, y),
            text.pos(plotters::style::text_anchor::Pos::new(
                plotters::style::text_anchor::HPos::Left,
                plotters::style::text_anchor::VPos::Center,
            )),
        );
        area.draw(&label).map_err(|e| e.to_string())?;
        y += row;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tick_labels_are_short() {
        use LabelStyle::*;
        assert_eq!(tick_label(0.0, Plain(1)), "0");
        assert_eq!(tick_label(0.30000000000000004, Plain(1)), "0.3");
        assert_eq!(tick_label(2.5, Plain(1)), "2.5");
        assert_eq!(tick_label(-0.0005, Plain(4)), "-0.0005");
        assert_eq!(tick_label(1.5e-5, Sci(1)), "1.5e-5");
        assert_eq!(tick_label(2e7, Sci(1)), "2e7");
        assert_eq!(tick_label(1e-5, Auto), "1e-5");
        assert_eq!(tick_label(decade(12), Auto), "1e12");
        assert_eq!(tick_label(decade(4), Auto), "1e4");
        assert_eq!(tick_label(100.0, Auto), "100");
        assert_eq!(tick_label(0.001, Auto), "0.001");
    }

    #[test]
    fn linear_ticks_share_one_style() {
        let axis = linear_axis(-0.0011, 0.0011, 5);
        assert_eq!(axis.style, LabelStyle::Plain(4));
        let labels: Vec<String> = axis
            .ticks
            .iter()
            .map(|t| tick_label(*t, axis.style))
            .collect();
        assert_eq!(labels, ["-0.001", "-0.0005", "0", "0.0005", "0.001"]);
        let axis = linear_axis(1.0e-6, 1.9e-6, 4);
        assert!(matches!(axis.style, LabelStyle::Sci(_)));
        let labels: Vec<String> = axis
            .ticks
            .iter()
            .map(|t| tick_label(*t, axis.style))
            .collect();
        assert_eq!(labels, ["1e-6", "1.2e-6", "1.4e-6", "1.6e-6", "1.8e-6"]);
    }

    #[test]
    fn log_range_is_whole_decades() {
        assert_eq!(padded((0.02, 30.0), true, "t", "x").unwrap(), (0.01, 100.0));
        assert_eq!(padded((1.0, 1.0), true, "t", "x").unwrap(), (1.0, 10.0));
        let (lo, hi) = padded((5e-324, 5e-324), true, "t", "x").unwrap();
        assert!(lo > 0.0 && lo < hi);
        let (lo, hi) = padded((1e308, f64::MAX), true, "t", "x").unwrap();
        assert!(lo < hi && hi.is_finite());
    }

    #[test]
    fn linear_range_has_margin_and_ticks() {
        let (lo, hi) = padded((0.0, 1.0), false, "t", "y").unwrap();
        assert!(lo < 0.0 && hi > 1.0);
        let axis = linear_axis(lo, hi, 5);
        assert!(axis.ticks.contains(&0.0) && axis.ticks.contains(&1.0));
        let (lo, hi) = padded((f64::MAX, f64::MAX), false, "t", "y").unwrap();
        assert!(lo < hi);
        assert!(padded((-f64::MAX, f64::MAX), false, "t", "y").is_err());
    }

    #[test]
    fn short_log_axes_label_one_two_five() {
        let axis = log_axis(10.0, 400.0, 6);
        assert_eq!(axis.ticks, [10.0, 20.0, 50.0, 100.0, 200.0]);
        assert!(axis.minor.contains(&30.0) && !axis.minor.contains(&20.0));
        let axis = log_axis(1e-6, 1e3, 6);
        assert_eq!(axis.ticks.len(), 5, "{:?}", axis.ticks);
    }

    #[test]
    fn runs_are_cut_at_the_edges_of_a_range() {
        // Up through the top of [0, 10] × [0, 1] and back down.
        let run = vec![(0.0, 0.5), (2.0, 1.5), (4.0, 1.5), (6.0, 0.5)];
        let runs = clip_runs(&[run], (0.0, 10.0, false), (0.0, 1.0, false));
        assert_eq!(
            runs,
            [vec![(0.0, 0.5), (1.0, 1.0)], vec![(5.0, 1.0), (6.0, 0.5)]]
        );
        // On a log axis the cut is straight in log y: from 1e-2 to 1e2
        // leaves [1e-3, 1] at x halfway.
        let runs = clip_runs(
            &[vec![(0.0, 1e-2), (1.0, 1e2)], vec![(3.0, 5.0)]],
            (0.0, 4.0, false),
            (1e-3, 1.0, true),
        );
        assert_eq!(runs.len(), 1);
        let (x, y) = runs[0][1];
        assert!(
            (x - 0.5).abs() < 1e-12 && (y - 1.0).abs() < 1e-12,
            "{runs:?}"
        );
        // A run wholly outside is dropped; one wholly inside is kept as is.
        let inside = vec![(1.0, 0.1), (2.0, 0.9)];
        let runs = clip_runs(
            &[inside.clone(), vec![(1.0, 2.0), (2.0, 3.0)]],
            (0.0, 10.0, false),
            (0.0, 1.0, false),
        );
        assert_eq!(runs, [inside]);
    }

    /// Ten pixels a character.
    fn tens(t: &str) -> std::result::Result<u32, String> {
        Ok(10 * t.chars().count() as u32)
    }

    #[test]
    fn text_is_wrapped_and_cut_to_fit() {
        assert_eq!(
            wrap("one two three", 80, 2, &tens).unwrap(),
            ["one two", "three"]
        );
        assert_eq!(
            wrap("one two three", 200, 2, &tens).unwrap(),
            ["one two three"]
        );
        let lines = wrap("aaa bbb ccc ddd eee", 70, 2, &tens).unwrap();
        assert_eq!(lines, ["aaa bbb", "ccc dd…"]);
        // A word longer than a line is broken between characters.
        let lines = wrap("abcdefghij", 40, 3, &tens).unwrap();
        assert_eq!(lines, ["abcd", "efgh", "ij"]);
        let lines = wrap("abcdefghijklmn", 40, 2, &tens).unwrap();
        assert_eq!(lines, ["abcd", "efg…"]);
        assert_eq!(shorten("abcdef", 40, &tens).unwrap(), "abc…");
        assert_eq!(shorten("abc", 40, &tens).unwrap(), "abc");
        assert!(wrap("", 40, 2, &tens).unwrap().is_empty());
    }

    #[test]
    fn log_ticks_thin_out_over_many_decades() {
        let axis = log_axis(1e-300, 1e300, 6);
        assert!(axis.ticks.len() >= 2 && axis.ticks.len() <= 8);
        assert!(axis.ticks.iter().all(|t| *t >= 1e-300 && *t <= 1e300));
    }
}
