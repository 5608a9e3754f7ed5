//! Figures: SVG well-formedness, labels and legends, typed errors, PNG.

use zsum::plot::{render_png, render_svg, write_svg, Panel, Series};
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
            hlines: vec![],
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
