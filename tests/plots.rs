//! Figures: SVG well-formedness, labels and legends, typed errors, PNG;
//! every figure zsum makes rendered to pixels with its title inside the
//! frame; distinct colours; error panels over the decades that matter.

use num_rational::BigRational;
use std::path::Path;
use zsum::classical::{Classical, Quantity, RESOLUTION};
use zsum::exact::parse_rational;
use zsum::plot::{render_png, render_rgb, render_svg, write_svg, Panel, Series};
use zsum::report::figure::{self, PANEL_HEIGHT, WIDTH};
use zsum::report::CompareReport;
use zsum::spectrum::Spectrum;
use zsum::thermo::parse_grid;
use zsum::ErrorKind;

/// Einstein-solid heat capacity per oscillator, Cv/k at t = T/θ.
fn einstein(t: f64) -> f64 {
    let u = 1.0 / t;
    let e = u.exp();
    u * u * e / ((e - 1.0) * (e - 1.0))
}

fn log_grid(lo: f64, hi: f64, n: usize) -> Vec<f64> {
    (0..n)
        .map(|i| lo * (hi / lo).powf(i as f64 / (n - 1) as f64))
        .collect()
}

fn figure() -> Vec<Panel> {
    let ts = log_grid(0.02, 20.0, 120);
    let exact: Vec<(f64, f64)> = ts.iter().map(|&t| (t, einstein(t))).collect();
    let classical: Vec<(f64, f64)> = ts.iter().map(|&t| (t, 1.0)).collect();
    // |relative error| of the classical value; exactly 0 and NaN points are
    // skipped on the log axis, so the curve breaks there.
    let mut error: Vec<(f64, f64)> = ts
        .iter()
        .map(|&t| (t, (1.0 / einstein(t) - 1.0).abs()))
        .collect();
    error[40].1 = 0.0;
    error[41].1 = f64::NAN;
    vec![
        Panel {
            title: "Einstein solid: heat capacity".into(),
            x_label: "T/θ".into(),
            y_label: "Cv / k".into(),
            log_x: true,
            log_y: false,
            series: vec![
                Series {
                    name: "exact".into(),
                    points: exact,
                    dashed: false,
                    colour: None,
                },
                Series {
                    name: "classical".into(),
                    points: classical,
                    dashed: true,
                    colour: None,
                },
            ],
            ..Panel::default()
        },
        Panel {
            title: "classical limit: error".into(),
            x_label: "T/θ".into(),
            y_label: "|relative error|".into(),
            log_x: true,
            log_y: true,
            series: vec![Series {
                name: "classical vs exact".into(),
                points: error,
                dashed: false,
                colour: None,
            }],
            hlines: vec![("tolerance 1%".into(), 0.01)],
            ..Panel::default()
        },
    ]
}

/// The trimmed contents of every `<text>` element, after checking that the
/// document parses as XML with an `<svg>` root.
fn texts(svg: &str) -> Vec<String> {
    let doc = roxmltree::Document::parse(svg).expect("SVG must be well-formed XML");
    assert_eq!(doc.root_element().tag_name().name(), "svg");
    doc.descendants()
        .filter(|n| n.is_element() && n.tag_name().name() == "text")
        .map(|n| {
            n.descendants()
                .filter(|d| d.is_text())
                .filter_map(|d| d.text())
                .collect::<String>()
                .trim()
                .to_string()
        })
        .collect()
}

fn count(texts: &[String], wanted: &str) -> usize {
    texts.iter().filter(|t| t.as_str() == wanted).count()
}

fn check_figure_texts(svg: &str) {
    let texts = texts(svg);
    for wanted in [
        "Einstein solid: heat capacity",
        "classical limit: error",
        "exact",
        "classical",
        "classical vs exact",
        "tolerance 1%",
        "Cv / k",
        "|relative error|",
    ] {
        assert_eq!(count(&texts, wanted), 1, "{wanted:?} in {texts:?}");
    }
    // Both panels label their x axis.
    assert_eq!(count(&texts, "T/θ"), 2, "{texts:?}");
    // Decade ticks on both log x axes (0.01 ..= 100, thinned to every
    // second decade at most), and on the log y axis of the error panel,
    // which spans 1e-4 ..= 1e20 and is thinned to a few decades.
    for decade in ["0.01", "1", "100"] {
        assert!(count(&texts, decade) >= 2, "{decade} in {texts:?}");
    }
    assert_eq!(count(&texts, "1e-4"), 1, "{texts:?}");
    let big = texts
        .iter()
        .filter(|t| {
            t.strip_prefix("1e")
                .and_then(|e| e.parse::<u32>().ok())
                .is_some()
        })
        .count();
    assert!((3..=8).contains(&big), "{texts:?}");
}

#[test]
fn two_panel_figure_is_well_formed_and_labelled() {
    let svg = render_svg(&figure(), 900, 420).unwrap();
    check_figure_texts(&svg);
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let root = doc.root_element();
    assert_eq!(root.attribute("width"), Some("900"));
    assert_eq!(root.attribute("height"), Some("840"));
    // Text is at least 14 px.
    for node in doc.descendants().filter(|n| n.has_tag_name("text")) {
        let size: f64 = node.attribute("font-size").unwrap().parse().unwrap();
        assert!(size >= 14.0, "font-size {size}");
    }
    // Distinct stroke colours: two curves in the first panel (the second
    // panel reuses the first colour), and the reference line in its own.
    let mut strokes: Vec<&str> = doc
        .descendants()
        .filter(|n| n.has_tag_name("polyline") || n.has_tag_name("line"))
        .filter(|n| n.attribute("stroke-width") == Some("2"))
        .filter_map(|n| n.attribute("stroke"))
        .collect();
    strokes.sort_unstable();
    strokes.dedup();
    assert_eq!(strokes.len(), 3, "{strokes:?}");
}

#[test]
fn figure_written_to_a_file_parses_back() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("figure.svg");
    write_svg(&figure(), 800, 400, &path).unwrap();
    let svg = std::fs::read_to_string(&path).unwrap();
    check_figure_texts(&svg);
    assert_eq!(svg, render_svg(&figure(), 800, 400).unwrap());
}

#[test]
fn panel_without_drawable_points_is_a_typed_error() {
    let mut panels = figure();
    panels[1].title = "nothing to draw".into();
    panels[1].series = vec![Series {
        name: "bad".into(),
        points: vec![
            (1.0, 0.0),
            (2.0, -1.0),
            (f64::NAN, 1.0),
            (3.0, f64::INFINITY),
        ],
        dashed: false,
        colour: None,
    }];
    let err = render_svg(&panels, 800, 400).unwrap_err();
    assert_eq!(err.kind(), ErrorKind::InvalidParameter);
    assert!(
        err.message().contains("nothing to draw"),
        "{}",
        err.message()
    );

    // An x value <= 0 is not drawable on a log x axis either, and a
    // reference line alone does not make a panel drawable.
    let only_hline = Panel {
        title: "only a reference line".into(),
        log_x: true,
        series: vec![Series {
            name: "x <= 0".into(),
            points: vec![(0.0, 1.0), (-1.0, 2.0)],
            dashed: false,
            colour: None,
        }],
        hlines: vec![("tolerance".into(), 0.5)],
        ..Panel::default()
    };
    let err = render_svg(&[only_hline], 800, 400).unwrap_err();
    assert!(
        err.message().contains("only a reference line"),
        "{}",
        err.message()
    );
}

#[test]
fn bad_sizes_are_typed_errors() {
    let panels = figure();
    for (w, h) in [(0, 400), (800, 0), (100_000, 400), (800, 15_000)] {
        let err = render_svg(&panels, w, h).unwrap_err();
        assert_eq!(err.kind(), ErrorKind::InvalidParameter, "{w} x {h}");
    }
    assert_eq!(
        render_svg(&[], 800, 400).unwrap_err().kind(),
        ErrorKind::InvalidParameter
    );
}

#[test]
fn markup_in_names_stays_well_formed() {
    let nasty = "a<b & c>d \"q\" 'θ' </text>\u{1}";
    let panel = Panel {
        title: format!("title {nasty}"),
        x_label: "T <x> & θ".into(),
        y_label: "y & <y>".into(),
        log_x: false,
        log_y: false,
        series: vec![Series {
            name: nasty.into(),
            points: vec![(0.0, 1.0), (1.0, 2.0), (2.0, f64::NAN), (3.0, 3.0)],
            dashed: false,
            colour: None,
        }],
        hlines: vec![("<&>".into(), 1.5)],
        ..Panel::default()
    };
    let svg = render_svg(&[panel], 800, 400).unwrap();
    let texts = texts(&svg);
    let cleaned = "a<b & c>d \"q\" 'θ' </text> ";
    assert_eq!(count(&texts, cleaned.trim()), 1, "{texts:?}");
    assert_eq!(
        count(&texts, format!("title {cleaned}").trim()),
        1,
        "{texts:?}"
    );
    assert_eq!(count(&texts, "T <x> & θ"), 1, "{texts:?}");
    assert_eq!(count(&texts, "y & <y>"), 1, "{texts:?}");
    assert_eq!(count(&texts, "<&>"), 1, "{texts:?}");
}

#[test]
fn png_is_written_with_the_requested_size() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("figure.png");
    render_png(&figure(), 640, 300, &path).unwrap();
    let bytes = std::fs::read(&path).unwrap();
    assert_eq!(&bytes[..8], b"\x89PNG\r\n\x1a\n");
    assert_eq!(&bytes[12..16], b"IHDR");
    let width = u32::from_be_bytes(bytes[16..20].try_into().unwrap());
    let height = u32::from_be_bytes(bytes[20..24].try_into().unwrap());
    assert_eq!((width, height), (640, 600));

    let err = render_png(&figure(), 640, 300, &dir.path().join("figure.jpg")).unwrap_err();
    assert_eq!(err.kind(), ErrorKind::InvalidParameter);
}

// ---------------------------------------------------------------------------
// Titles measured in pixels; colours; legends; fixed ranges.

/// A rendered raster: width, height, RGB bytes.
struct Raster {
    w: usize,
    h: usize,
    px: Vec<u8>,
}

impl Raster {
    fn of(panels: &[Panel], width: u32, panel_height: u32) -> Raster {
        let (w, h, px) = render_rgb(panels, width, panel_height).unwrap();
        assert_eq!(px.len(), w as usize * h as usize * 3);
        Raster {
            w: w as usize,
            h: h as usize,
            px,
        }
    }

    fn rgb(&self, x: usize, y: usize) -> (u8, u8, u8) {
        let i = 3 * (y * self.w + x);
        (self.px[i], self.px[i + 1], self.px[i + 2])
    }

    /// Text or line, not background or grid (grid lines are 205 and 238).
    fn ink(&self, x: usize, y: usize) -> bool {
        let (r, g, b) = self.rgb(x, y);
        r.min(g).min(b) < 190
    }

    fn black(&self, x: usize, y: usize) -> bool {
        let (r, g, b) = self.rgb(x, y);
        r.max(g).max(b) < 60
    }

    /// The top row of the plotting area of the panel in rows `rows`: where
    /// the longest vertical black line (the y axis) starts, allowing gaps
    /// of a few pixels where curves cross it.
    fn plot_top(&self, rows: std::ops::Range<usize>) -> usize {
        // (length, first row) of the best line so far.
        let mut best = (0, rows.start);
        for x in 0..self.w {
            let mut line: Option<(usize, usize)> = None; // (first, last) black row
            for y in rows.clone() {
                if !self.black(x, y) {
                    continue;
                }
                line = match line {
                    Some((first, last)) if y - last <= 5 => Some((first, y)),
                    _ => Some((y, y)),
                };
                let (first, last) = line.unwrap();
                if last - first + 1 > best.0 {
                    best = (last - first + 1, first);
                }
            }
        }
        assert!(best.0 > 50, "no y axis found in rows {rows:?}: {best:?}");
        best.1
    }

    /// The bounding box `(x0, x1, y0, y1)` of the ink above the chart of
    /// the panel in rows `rows` (its title); the chart's top tick label
    /// reaches at most 12 px above the plotting area.
    fn title_box(&self, rows: std::ops::Range<usize>) -> Option<(usize, usize, usize, usize)> {
        let chart = self.plot_top(rows.clone());
        let mut bbox: Option<(usize, usize, usize, usize)> = None;
        for y in rows.start..chart.saturating_sub(12) {
            for x in 0..self.w {
                if self.ink(x, y) {
                    let b = bbox.get_or_insert((x, x, y, y));
                    *b = (b.0.min(x), b.1.max(x), b.2.min(y), b.3.max(y));
                }
            }
        }
        bbox
    }
}

/// Every panel's title lies inside the image, at least 8 px from the left
/// and right edges and 4 px from the top of its panel, on at most two
/// lines; in the SVG too, with each line's width taken at 0.6 em a
/// character.
fn check_titles(panels: &[Panel], width: u32, panel_height: u32, what: &str) {
    let raster = Raster::of(panels, width, panel_height);
    let ph = panel_height as usize;
    assert_eq!((raster.w, raster.h), (width as usize, ph * panels.len()));
    for (i, panel) in panels.iter().enumerate() {
        let rows = i * ph..(i + 1) * ph;
        let (x0, x1, y0, y1) = raster
            .title_box(rows.clone())
            .unwrap_or_else(|| panic!("{what}: no title drawn for {:?}", panel.title));
        assert!(
            x0 >= 8 && x1 + 8 < raster.w && y0 >= rows.start + 4,
            "{what}: title {:?} at x {x0}..={x1}, y {y0}..={y1} of {}x{}",
            panel.title,
            raster.w,
            raster.h
        );
        // Two lines of 26 px type at most, one in a low panel.
        let lines = if panel_height >= 300 { 2 } else { 1 };
        assert!(
            y1 - y0 < (lines - 1) * 31 + 26,
            "{what}: {:?}: {y0}..{y1}",
            panel.title
        );
    }
    let svg = render_svg(panels, width, panel_height).unwrap();
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let titles: Vec<_> = doc
        .descendants()
        .filter(|n| n.has_tag_name("text") && n.attribute("font-weight") == Some("bold"))
        .collect();
    assert!(titles.len() >= panels.len(), "{what}");
    for t in titles {
        let num = |a: &str| -> f64 { t.attribute(a).unwrap().parse().unwrap() };
        let text = t.text().unwrap_or("").trim();
        let half = 0.6 * num("font-size") * text.chars().count() as f64 / 2.0;
        let (x, y) = (num("x"), num("y"));
        assert_eq!(t.attribute("text-anchor"), Some("middle"));
        assert!(
            x - half >= 8.0
                && x + half <= f64::from(width) - 8.0
                && y % f64::from(panel_height) >= 4.0,
            "{what}: SVG title {text:?} at x {x} ± {half}, y {y}"
        );
    }
}

#[test]
fn titles_too_long_for_two_lines_are_cut_inside_the_frame() {
    let mut panels = figure();
    panels[0].title = "a title with words ".repeat(30);
    panels[1].title = "x".repeat(400);
    check_titles(&panels, 640, 300, "long titles");
    // In low panels the title takes one line (the y labels are made short
    // so as not to reach up beside it).
    let mut low = panels.clone();
    for p in &mut low {
        p.y_label = "y".into();
    }
    check_titles(&low, 320, 200, "long titles, small");
    let small = texts(&render_svg(&low, 320, 200).unwrap());
    let title_lines: Vec<&String> = small
        .iter()
        .filter(|t| t.starts_with("a title") || t.starts_with("xxx"))
        .collect();
    assert_eq!(title_lines.len(), 2, "{small:?}");
    assert!(title_lines.iter().all(|t| t.ends_with('…')), "{small:?}");
    let svg = render_svg(&panels, 640, 300).unwrap();
    let texts = texts(&svg);
    assert!(texts.iter().any(|t| t.starts_with("a title")), "{texts:?}");
    assert!(
        texts
            .iter()
            .any(|t| t.starts_with("with words") && t.ends_with('…')),
        "{texts:?}"
    );
    assert!(
        texts
            .iter()
            .any(|t| t.starts_with("xxx") && t.ends_with('…')),
        "{texts:?}"
    );
}

/// Linear RGB of an sRGB colour.
fn linear((r, g, b): (u8, u8, u8)) -> [f64; 3] {
    [r, g, b].map(|c| {
        let c = f64::from(c) / 255.0;
        if c <= 0.04045 {
            c / 12.92
        } else {
            ((c + 0.055) / 1.055).powf(2.4)
        }
    })
}

/// Linear RGB as a reader with full protanopia (`Some(true)`) or
/// deuteranopia (`Some(false)`) sees it (the simulation matrices of
/// Machado, Oliveira and Fernandes 2009, severity 1), or unchanged.
fn seen(rgb: [f64; 3], protan: Option<bool>) -> [f64; 3] {
    let m = match protan {
        None => return rgb,
        Some(true) => [
            [0.152286, 1.052583, -0.204868],
            [0.114503, 0.786281, 0.099216],
            [-0.003882, -0.048116, 1.051998],
        ],
        Some(false) => [
            [0.367322, 0.860646, -0.227968],
            [0.280085, 0.672501, 0.047413],
            [-0.011820, 0.042940, 0.968881],
        ],
    };
    m.map(|row| (row[0] * rgb[0] + row[1] * rgb[1] + row[2] * rgb[2]).clamp(0.0, 1.0))
}

/// CIE L*a*b* (D65) of linear RGB.
fn lab([r, g, b]: [f64; 3]) -> [f64; 3] {
    let x = (0.4124 * r + 0.3576 * g + 0.1805 * b) / 0.95047;
    let y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
    let z = (0.0193 * r + 0.1192 * g + 0.9505 * b) / 1.08883;
    let f = |t: f64| {
        if t > 0.008856 {
            t.cbrt()
        } else {
            7.787 * t + 16.0 / 116.0
        }
    };
    [
        116.0 * f(y) - 16.0,
        500.0 * (f(x) - f(y)),
        200.0 * (f(y) - f(z)),
    ]
}

/// The CIEDE2000 colour difference of two L*a*b* colours.
fn ciede2000([l1, a1, b1]: [f64; 3], [l2, a2, b2]: [f64; 3]) -> f64 {
    let (rad, deg) = (f64::to_radians, f64::to_degrees);
    let c_bar = (a1.hypot(b1) + a2.hypot(b2)) / 2.0;
    let g = 0.5 * (1.0 - (c_bar.powi(7) / (c_bar.powi(7) + 25f64.powi(7))).sqrt());
    let (a1, a2) = ((1.0 + g) * a1, (1.0 + g) * a2);
    let (c1, c2) = (a1.hypot(b1), a2.hypot(b2));
    let hue = |b: f64, a: f64| deg(b.atan2(a)).rem_euclid(360.0);
    let (h1, h2) = (hue(b1, a1), hue(b2, a2));
    let mut dh = h2 - h1;
    if c1 * c2 == 0.0 {
        dh = 0.0;
    } else if dh > 180.0 {
        dh -= 360.0;
    } else if dh < -180.0 {
        dh += 360.0;
    }
    let big_dh = 2.0 * (c1 * c2).sqrt() * rad(dh / 2.0).sin();
    let (l_bar, c_bar) = ((l1 + l2) / 2.0, (c1 + c2) / 2.0);
    let h_bar = if c1 * c2 == 0.0 {
        h1 + h2
    } else if (h1 - h2).abs() <= 180.0 {
        (h1 + h2) / 2.0
    } else if h1 + h2 < 360.0 {
        (h1 + h2 + 360.0) / 2.0
    } else {
        (h1 + h2 - 360.0) / 2.0
    };
    let t = 1.0 - 0.17 * rad(h_bar - 30.0).cos()
        + 0.24 * rad(2.0 * h_bar).cos()
        + 0.32 * rad(3.0 * h_bar + 6.0).cos()
        - 0.20 * rad(4.0 * h_bar - 63.0).cos();
    let d_theta = 30.0 * (-((h_bar - 275.0) / 25.0).powi(2)).exp();
    let r_c = 2.0 * (c_bar.powi(7) / (c_bar.powi(7) + 25f64.powi(7))).sqrt();
    let s_l = 1.0 + 0.015 * (l_bar - 50.0).powi(2) / (20.0 + (l_bar - 50.0).powi(2)).sqrt();
    let s_c = 1.0 + 0.045 * c_bar;
    let s_h = 1.0 + 0.015 * c_bar * t;
    let r_t = -rad(2.0 * d_theta).sin() * r_c;
    let (dl, dc, dh) = ((l2 - l1) / s_l, (c2 - c1) / s_c, big_dh / s_h);
    (dl * dl + dc * dc + dh * dh + r_t * dc * dh).sqrt()
}

#[test]
fn colour_difference_matches_published_pairs() {
    // Test pairs of Sharma, Wu and Dalal (2005).
    for (p, q, de) in [
        ([50.0, 2.6772, -79.7751], [50.0, 0.0, -82.7485], 2.0425),
        ([50.0, 2.5, 0.0], [73.0, 25.0, -18.0], 27.1492),
        (
            [22.7233, 20.0904, -46.694],
            [23.0331, 14.973, -42.5619],
            2.0373,
        ),
    ] {
        assert!((ciede2000(p, q) - de).abs() < 1e-3, "{p:?} {q:?}");
    }
}

fn hex(s: &str) -> (u8, u8, u8) {
    let v = |i: usize| u8::from_str_radix(&s[i..i + 2], 16).unwrap();
    (v(1), v(3), v(5))
}

#[test]
fn eight_curves_get_eight_distinct_colours_readable_on_white() {
    let ts = log_grid(1.0, 100.0, 20);
    let series: Vec<Series> = (0..8)
        .map(|k| Series {
            name: format!("curve {k}"),
            points: ts.iter().map(|&t| (t, k as f64 + t.ln())).collect(),
            dashed: k % 2 == 1,
            colour: None,
        })
        .collect();
    let panel = Panel {
        title: "eight curves".into(),
        log_x: true,
        series,
        ..Panel::default()
    };
    let svg = render_svg(&[panel], 900, 420).unwrap();
    let doc = roxmltree::Document::parse(&svg).unwrap();
    // The legend names the curves in order, each after its glyph: take the
    // stroke of the last line drawn before each name.
    let mut colours = Vec::new();
    let mut last = None;
    for n in doc.descendants() {
        if (n.has_tag_name("polyline") || n.has_tag_name("line"))
            && n.attribute("stroke-width") == Some("2")
        {
            last = n.attribute("stroke");
        }
        if n.has_tag_name("text") && n.text().unwrap_or("").trim().starts_with("curve ") {
            colours.push(hex(last.unwrap()));
        }
    }
    assert_eq!(colours.len(), 8);
    let luminance = |c| {
        let [r, g, b] = linear(c);
        0.2126 * r + 0.7152 * g + 0.0722 * b
    };
    let references = [(0, 0, 0), (110, 110, 110)];
    for (i, &a) in colours.iter().enumerate() {
        let contrast = 1.05 / (luminance(a) + 0.05);
        assert!(contrast >= 2.3, "colour {i} {a:?}: contrast {contrast:.2}");
        for r in references {
            let de = ciede2000(lab(linear(a)), lab(linear(r)));
            assert!(de >= 20.0, "colour {i} {a:?} near reference {r:?}: {de:.1}");
        }
        for (j, &b) in colours.iter().enumerate().skip(i + 1) {
            for protan in [None, Some(true), Some(false)] {
                let de = ciede2000(lab(seen(linear(a), protan)), lab(seen(linear(b), protan)));
                let least = match protan {
                    None => 20.0,
                    Some(_) if j < 6 => 10.0,
                    Some(_) => 0.0,
                };
                assert!(
                    de >= least,
                    "colours {i} {a:?} and {j} {b:?} ({protan:?}): ΔE00 {de:.1}"
                );
            }
        }
    }
}

#[test]
fn a_lone_curve_has_no_legend() {
    let mut panel = figure().remove(0);
    panel.series.truncate(1);
    let lone = texts(&render_svg(std::slice::from_ref(&panel), 800, 400).unwrap());
    assert_eq!(count(&lone, "exact"), 0, "{lone:?}");
    // A second entry, here a reference line, brings the legend back.
    panel.hlines.push(("limit".into(), 1.0));
    let texts = texts(&render_svg(&[panel], 800, 400).unwrap());
    assert_eq!(count(&texts, "exact"), 1, "{texts:?}");
    assert_eq!(count(&texts, "limit"), 1, "{texts:?}");
}

#[test]
fn fixed_ranges_cut_curves_and_bad_ones_are_typed_errors() {
    let mut panel = figure().remove(0);
    panel.y_range = Some((0.2, 0.6));
    let svg = render_svg(std::slice::from_ref(&panel), 800, 400).unwrap();
    let texts = texts(&svg);
    for tick in ["0.2", "0.4", "0.6"] {
        assert_eq!(count(&texts, tick), 1, "{texts:?}");
    }
    assert_eq!(count(&texts, "0.8"), 0, "{texts:?}");
    for (range, log) in [
        ((1.0, 0.5), false),
        ((0.0, 1.0), true),
        ((f64::NAN, 1.0), false),
    ] {
        let mut bad = panel.clone();
        bad.y_range = Some(range);
        bad.log_y = log;
        let err = render_svg(&[bad], 800, 400).unwrap_err();
        assert_eq!(err.kind(), ErrorKind::InvalidParameter);
        assert!(
            err.message().contains("Einstein solid"),
            "{}",
            err.message()
        );
    }
}

// ---------------------------------------------------------------------------
// The compare figures.

fn r(s: &str) -> BigRational {
    parse_rational(s).unwrap()
}

/// An error map of `spectrum` over `grid` (kelvin unless `kelvin` is
/// false), Cv, every approximation.
fn map(spectrum: &dyn Spectrum, grid: &str, kelvin: bool) -> CompareReport {
    let c = Classical::new(spectrum).unwrap();
    let all: Vec<usize> = (0..c.approximations().len()).collect();
    CompareReport::build(
        &c,
        &all,
        &parse_grid("--T", grid).unwrap(),
        kelvin,
        8,
        &zsum::budget::Meter::unlimited(),
    )
    .unwrap()
}

/// Renders the compare figure of `report` to a PNG with the CLI's writer
/// and checks the file's size, then its title box in pixels.
fn check_compare_figure(report: &CompareReport, dir: &Path, name: &str) {
    let path = dir.join(format!("{name}.png"));
    figure::write(report, Quantity::Cv, 0.01, &path).unwrap();
    let bytes = std::fs::read(&path).unwrap();
    assert_eq!(&bytes[..8], b"\x89PNG\r\n\x1a\n", "{name}");
    let w = u32::from_be_bytes(bytes[16..20].try_into().unwrap());
    let h = u32::from_be_bytes(bytes[20..24].try_into().unwrap());
    assert_eq!((w, h), (WIDTH, 2 * PANEL_HEIGHT), "{name}");
    let panels = figure::panels(report, Quantity::Cv, 0.01);
    check_titles(&panels, WIDTH, PANEL_HEIGHT, name);
    // One approximation keeps one colour across the two panels.
    for (k, s) in panels[1].series.iter().enumerate() {
        assert_eq!(panels[0].series[k + 1].colour, s.colour, "{name}");
    }
}

#[test]
fn compare_figures_of_every_model_kind_keep_their_titles_inside() {
    use zsum::models::diatomic::{ParityWeights, RovibDiatomic};
    use zsum::models::oscillator::{AnharmonicOscillator, HarmonicModes};
    use zsum::models::rotor::{LinearRotor, SphericalTop, SymmetricTop, TopShape};
    use zsum::models::ParticleInBox;
    use zsum::units::EnergyUnit;
    let dir = tempfile::tempdir().unwrap();
    let cm = || EnergyUnit::parse("cm-1").unwrap();
    let boxed = ParticleInBox::new(vec![r("1")]).unwrap();
    check_compare_figure(&map(&boxed, "log:0.1:100:10", false), dir.path(), "box");
    let rotor = LinearRotor::rigid(r("1"), cm()).unwrap();
    check_compare_figure(&map(&rotor, "log:0.1:100:12", true), dir.path(), "rotor");
    let top = SymmetricTop::rigid(TopShape::Prolate, r("5"), r("1"), EnergyUnit::Kelvin).unwrap();
    check_compare_figure(&map(&top, "log:0.2:20:5", true), dir.path(), "top");
    let sph = SphericalTop::new(r("1"), r("0"), EnergyUnit::Kelvin).unwrap();
    check_compare_figure(&map(&sph, "log:0.1:100:8", true), dir.path(), "spherical");
    // The long description that ran off both sides.
    let ho = HarmonicModes::one_d(r("1000"), false, cm()).unwrap();
    check_compare_figure(&map(&ho, "log:10:10000:12", true), dir.path(), "oscillator");
    let modes = HarmonicModes::new(
        vec![(r("1000"), 1), (r("667"), 2), (r("2349"), 1)],
        true,
        cm(),
    )
    .unwrap();
    check_compare_figure(&map(&modes, "log:50:5000:6", true), dir.path(), "modes");
    let vib = AnharmonicOscillator::new(r("4401"), r("121"), r("0"), cm()).unwrap();
    let h2 = RovibDiatomic::new(
        vib,
        r("60.85"),
        r("3.06"),
        r("0"),
        ParityWeights::from_nuclear_spin(1, false),
    )
    .unwrap();
    check_compare_figure(&map(&h2, "log:50:2000:6", true), dir.path(), "diatomic");
    let system = zsum::system::System::read(Path::new(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/systems/nitrogen_rovib.toml"
    )))
    .unwrap();
    check_compare_figure(
        &map(&system.product, "log:20:200:5", true),
        dir.path(),
        "system",
    );
}

/// A harmonic oscillator of θ = 1 K from 0.05 K to 10^9 K: errors from
/// above 10^6 down to well below what 40 exact digits resolve.
fn oscillator_map() -> CompareReport {
    use zsum::models::oscillator::HarmonicModes;
    let ho = HarmonicModes::one_d(r("1"), false, zsum::units::EnergyUnit::Kelvin).unwrap();
    map(&ho, "log:0.05:1000000000:12", true)
}

#[test]
fn error_panels_show_the_tolerance_and_not_the_noise_floor() {
    let report = oscillator_map();
    // The map has errors at the floor and far above 1.
    let raw: Vec<f64> = (0..report.approximation_list.len())
        .flat_map(|k| report.error_series(Quantity::Cv, k))
        .map(|p| p.1)
        .collect();
    assert!(raw.iter().any(|e| *e <= RESOLUTION), "{raw:?}");
    assert!(raw.iter().any(|e| *e > 1e6), "{raw:?}");
    for tol in [0.01, 0.05, 1e-6, 1e-30] {
        let panels = figure::panels(&report, Quantity::Cv, tol);
        let errors = &panels[1];
        let (lo, hi) = errors.y_range.unwrap();
        assert!(lo < tol && tol < hi, "tol {tol}: [{lo:e}, {hi:e}]");
        assert!(lo > RESOLUTION, "tol {tol}: [{lo:e}, {hi:e}]");
        // At most 4 decades below the tolerance's decade, at least one
        // below the tolerance; the top at most 10^3.
        let tol_decade = 10f64.powf(tol.log10().floor());
        assert!(
            lo >= tol_decade * 0.99e-4 && lo <= tol / 9.99,
            "tol {tol}: {lo:e}"
        );
        assert!(hi <= 1.0001e3, "tol {tol}: {hi:e}");
        // No point at or below the floor is drawn.
        for s in &errors.series {
            assert!(
                s.points.iter().all(|p| p.1.is_nan() || p.1 > RESOLUTION),
                "{}",
                s.name
            );
        }
        // Both panels span the same temperatures.
        assert_eq!(panels[0].x_range, Some((0.05, 1e9)));
        assert_eq!(errors.x_range, panels[0].x_range);
        check_titles(&panels, 640, 300, &format!("tol {tol}"));
    }
}

#[test]
fn an_error_panel_with_nothing_resolved_says_so() {
    use zsum::models::oscillator::HarmonicModes;
    let ho = HarmonicModes::one_d(r("1"), false, zsum::units::EnergyUnit::Kelvin).unwrap();
    let c = Classical::new(&ho).unwrap();
    let order4 = c.find("order4").unwrap();
    let grid = parse_grid("--T", "log:100000000:1000000000:3").unwrap();
    let report = CompareReport::build(
        &c,
        &[order4],
        &grid,
        true,
        8,
        &zsum::budget::Meter::unlimited(),
    )
    .unwrap();
    let panels = figure::panels(&report, Quantity::Cv, 0.01);
    assert!(
        panels[1].title.contains("none above 1e-37"),
        "{}",
        panels[1].title
    );
    assert_eq!(panels[1].series[0].name, "order4 (all at most 1e-37)");
    let texts = texts(&render_svg(&panels, 640, 300).unwrap());
    assert_eq!(count(&texts, "tolerance 1%"), 1, "{texts:?}");
}

// ---------------------------------------------------------------------------
// The report's figures.

#[test]
fn report_figures_keep_their_titles_inside_and_mark_the_boiling_point() {
    use zsum::report::liquefier::{figures, FIGURE_SIZE};
    let dir = tempfile::tempdir().unwrap();
    for (i, panels) in figures().unwrap().iter().enumerate() {
        let what = format!("report figure {i}");
        render_png(
            panels,
            FIGURE_SIZE.0,
            FIGURE_SIZE.1,
            &dir.path().join(format!("{i}.png")),
        )
        .unwrap();
        check_titles(panels, FIGURE_SIZE.0, FIGURE_SIZE.1, &what);
        let texts = texts(&render_svg(panels, FIGURE_SIZE.0, FIGURE_SIZE.1).unwrap());
        assert_eq!(count(&texts, "n.b.p. 20.28 K"), 1, "{what}: {texts:?}");
        for p in panels {
            assert_eq!(p.vlines, [("n.b.p. 20.28 K".to_string(), 20.28)], "{what}");
            // 10–30 K takes at least a quarter of the T axis.
            let (lo, hi) = p.x_range.unwrap();
            assert!(
                p.log_x && lo <= 10.0 && (30.0f64 / lo).ln() / (hi / lo).ln() > 0.25,
                "{what}"
            );
            // Points at least every 2 K between 10 and 30 K.
            let near: Vec<f64> = p.series[0]
                .points
                .iter()
                .map(|q| q.0)
                .filter(|t| (10.0..=30.0).contains(t))
                .collect();
            assert!(
                near.windows(2).all(|w| w[1] - w[0] <= 2.0) && near.len() >= 10,
                "{what}: {near:?}"
            );
        }
    }
}
