//! Figures fit for a design review, checked on the rendered SVG as a reader would see them:
//! distinct tick labels on narrow ranges, small files for long transients, a colour-blind-safe
//! palette of our own.
use tickwork::report::plot::svg::{self, PALETTE};
use tickwork::report::plot::{Band, Kind, Plot, RefLine};

/// Every `<text>` of a rendered figure, in document order.
fn texts(svg: &str) -> Vec<String> {
    let doc = roxmltree::Document::parse(svg).expect("well-formed SVG");
    doc.descendants()
        .filter(|n| n.tag_name().name() == "text")
        .map(|n| n.text().unwrap_or("").trim().to_string())
        .collect()
}

fn line(x: Vec<f64>, y: Vec<f64>) -> Plot {
    let mut p = Plot::new(Kind::Line);
    p.title = "test".into();
    p.x = x;
    p.ys = vec![y];
    p.x_label = "time".into();
    p.x_unit = "s".into();
    p.y_label = "period".into();
    p.y_unit = "s".into();
    p
}

#[test]
fn narrow_ranges_have_distinct_tick_labels() {
    // A trimmed oscillator: the period moves by a fraction of a nanosecond around 30.5 µs,
    // the frequency by hertz around 32.76 kHz (both ranges as in the issue's plots).
    let x: Vec<f64> = (0..50).map(|k| 1e-3 + k as f64 * 1e-5).collect();
    for (y, unit) in [
        (x.iter().map(|t| 30.5e-6 + 0.3e-9 * (t * 4e3).sin()).collect::<Vec<f64>>(), "s"),
        (x.iter().map(|t| 32765.0 + 4.0 * (t * 4e3).sin()).collect(), "Hz"),
    ] {
        let mut p = line(x.clone(), y);
        p.y_unit = unit.into();
        let t = texts(&svg::render(&p).unwrap());
        let mut sorted = t.clone();
        sorted.sort();
        let before = sorted.len();
        sorted.dedup();
        assert_eq!(sorted.len(), before, "a text repeats: {t:?}");
        assert!(t.len() > 10, "{t:?}");
    }
}

#[test]
fn a_long_transient_stays_small() {
    // 20 000 cycles of a triangle wave at 40 points per cycle: 800 001 points. Unthinned
    // this was a file of several megabytes in one line; thinned per half-pixel column it
    // must stay below 300 kB and parse.
    let n = 20_000 * 40;
    let x: Vec<f64> = (0..=n).map(|k| k as f64 * 1e-8).collect();
    let y: Vec<f64> = (0..=n).map(|k| 0.6 + 0.6 * (((k % 40) as f64 - 20.0).abs() / 20.0)).collect();
    let mut p = line(x, y);
    p.y_unit = "V".into();
    let s = svg::render(&p).unwrap();
    assert!(s.len() < 300_000, "{} bytes", s.len());
    let longest = s.lines().map(str::len).max().unwrap_or(0);
    assert!(longest < 200_000, "a line of {longest} characters");
    roxmltree::Document::parse(&s).expect("well-formed SVG");
    // Peaks survive thinning: the y axis still spans 0.6 … 1.2 V, as the data does.
    let t = texts(&s);
    assert!(t.iter().any(|l| l == "1.2") && t.iter().any(|l| l == "0.6"), "{t:?}");
}

/// sRGB (0–255) to CIE L*a*b* (D65), after a colour-vision simulation matrix applied in
/// linear RGB (IEC 61966-2-1 for sRGB; CIE 15 for L*a*b*).
fn lab(c: [u8; 3], m: &[[f64; 3]; 3]) -> [f64; 3] {
    let lin = |v: u8| {
        let v = v as f64 / 255.0;
        if v <= 0.04045 { v / 12.92 } else { ((v + 0.055) / 1.055).powf(2.4) }
    };
    let l = [lin(c[0]), lin(c[1]), lin(c[2])];
    let s: Vec<f64> = (0..3).map(|i| (m[i][0] * l[0] + m[i][1] * l[1] + m[i][2] * l[2]).clamp(0.0, 1.0)).collect();
    let (x, y, z) = (
        0.4124 * s[0] + 0.3576 * s[1] + 0.1805 * s[2],
        0.2126 * s[0] + 0.7152 * s[1] + 0.0722 * s[2],
        0.0193 * s[0] + 0.1192 * s[1] + 0.9505 * s[2],
    );
    let f =
        |t: f64| if t > (6.0f64 / 29.0).powi(3) { t.cbrt() } else { t / (3.0 * (6.0f64 / 29.0).powi(2)) + 4.0 / 29.0 };
    let (fx, fy, fz) = (f(x / 0.95047), f(y), f(z / 1.08883));
    [116.0 * fy - 16.0, 500.0 * (fx - fy), 200.0 * (fy - fz)]
}

fn delta_e(a: [f64; 3], b: [f64; 3]) -> f64 {
    ((a[0] - b[0]).powi(2) + (a[1] - b[1]).powi(2) + (a[2] - b[2]).powi(2)).sqrt()
}

#[test]
fn palette_is_colour_blind_safe() {
    // Colour-vision deficiency at severity 1.0, Machado, Oliveira and Fernandes, "A
    // physiologically-based model for simulation of color vision deficiency", IEEE TVCG 15
    // (2009), table of matrices (values from memory). tests/reference/palette_cvd.py gives
    // the same minima: pairs 35.2 (normal), 34.5 (protan, deutan), 32.7 (tritan); against
    // white 37.8 at the least (tritan).
    let sims: [(&str, [[f64; 3]; 3]); 4] = [
        ("normal", [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]]),
        ("protan", [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]]),
        ("deutan", [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.011820, 0.042940, 0.968881]]),
        ("tritan", [[1.255528, -0.076749, -0.178779], [-0.078411, 0.930809, 0.147602], [0.004733, 0.691367, 0.303900]]),
    ];
    let rgb: Vec<[u8; 3]> = PALETTE.iter().map(|c| [c.0, c.1, c.2]).collect();
    for (name, m) in &sims {
        let labs: Vec<[f64; 3]> = rgb.iter().map(|c| lab(*c, m)).collect();
        let white = lab([255, 255, 255], m);
        for i in 0..labs.len() {
            assert!(delta_e(labs[i], white) >= 37.5, "{name}: colour {i} too close to white");
            for j in i + 1..labs.len() {
                let d = delta_e(labs[i], labs[j]);
                assert!(d >= 32.5, "{name}: colours {i} and {j} only ΔE {d:.1} apart");
            }
        }
    }
}

#[test]
fn palette_order_is_our_own() {
    // The first colours of widely used default orders (hex values from memory): a plotting
    // library's ten-colour default, the Okabe–Ito set, a grammar-of-graphics hue wheel, a
    // qualitative "bright" scheme, a web charting default. No position of ours may be within
    // ΔE 15 of theirs, and the first two together must not be a blue followed by an orange.
    let defaults: [[u32; 3]; 5] = [
        [0x1f77b4, 0xff7f0e, 0x2ca02c],
        [0xe69f00, 0x56b4e9, 0x009e73],
        [0xf8766d, 0x00ba38, 0x619cff],
        [0x4477aa, 0xee6677, 0x228833],
        [0x636efa, 0xef553b, 0x00cc96],
    ];
    let id = [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]];
    let hex = |h: u32| [(h >> 16) as u8, (h >> 8) as u8, h as u8];
    for d in &defaults {
        for (k, h) in d.iter().enumerate() {
            let ours = [PALETTE[k].0, PALETTE[k].1, PALETTE[k].2];
            let e = delta_e(lab(ours, &id), lab(hex(*h), &id));
            assert!(e >= 15.0, "colour {k} is ΔE {e:.1} from {h:06x}");
        }
    }
    let hue = |c: [u8; 3]| {
        let l = lab(c, &id);
        l[2].atan2(l[1]).to_degrees().rem_euclid(360.0)
    };
    let (h0, h1) = (hue([PALETTE[0].0, PALETTE[0].1, PALETTE[0].2]), hue([PALETTE[1].0, PALETTE[1].1, PALETTE[1].2]));
    let blue = |h: f64| (220.0..320.0).contains(&h);
    let orange = |h: f64| (40.0..80.0).contains(&h);
    assert!(!(blue(h0) && orange(h1)), "hues {h0:.0}° then {h1:.0}°");
}

#[test]
fn non_finite_points_are_refused_as_show_and_table_refuse_them() {
    let mut p = line(vec![1.0, 2.0, 3.0], vec![1.0, f64::NAN, 3.0]);
    assert!(svg::render(&p).unwrap_err().contains("element 1 of 'y' is NaN"), "{:?}", svg::render(&p));
    p.ys = vec![vec![1.0, 2.0, 3.0], vec![1.0, 2.0, f64::INFINITY]];
    assert!(svg::render(&p).unwrap_err().contains("element 2 of series 2 of 'y' is infinite"));
}

/// A text's box in viewBox units: (x0, y0, x1, y1), from its anchor, baseline shift and the
/// width the layout measures (rotated texts are left out: None).
fn text_box(n: roxmltree::Node) -> Option<(f64, f64, f64, f64)> {
    if n.attribute("transform").is_some() {
        return None;
    }
    let num = |k: &str| n.attribute(k).and_then(|v| v.parse::<f64>().ok());
    let (x, y, fs) = (num("x")?, num("y")?, num("font-size")?);
    let t = n.text().unwrap_or("").trim();
    if t.is_empty() {
        return None;
    }
    // Font sizes are in viewBox units; the measure takes pixels of the figure.
    let scale = svg::S as f64;
    let w = svg::text_width(t, fs / scale) * scale;
    let x0 = match n.attribute("text-anchor") {
        Some("end") => x - w,
        Some("middle") => x - w / 2.0,
        _ => x,
    };
    let y0 = match n.attribute("dy") {
        Some("0.76em") => y,
        Some("-0.5ex") => y - 1.0 * fs,
        _ => y - 0.5 * fs,
    };
    // Glyph boxes are a little inside the em box: shrink by 10 % of the size all round.
    Some((x0 + 0.1 * fs, y0 + 0.1 * fs, x0 + w - 0.1 * fs, y0 + fs - 0.1 * fs))
}

/// Pairs of texts whose boxes overlap.
fn overlapping_texts(svg: &str) -> Vec<(String, String)> {
    let doc = roxmltree::Document::parse(svg).unwrap();
    let boxes: Vec<(String, (f64, f64, f64, f64))> = doc
        .descendants()
        .filter(|n| n.tag_name().name() == "text")
        .filter_map(|n| text_box(n).map(|b| (n.text().unwrap_or("").trim().to_string(), b)))
        .collect();
    let mut bad = Vec::new();
    for i in 0..boxes.len() {
        for j in i + 1..boxes.len() {
            let (a, b) = (boxes[i].1, boxes[j].1);
            if a.0 < b.2 && b.0 < a.2 && a.1 < b.3 && b.1 < a.3 {
                bad.push((boxes[i].0.clone(), boxes[j].0.clone()));
            }
        }
    }
    bad
}

/// Points of every polyline drawn in `color` (hex as the SVG writes it), in viewBox units.
fn polylines(svg: &str, color: &str) -> Vec<Vec<(f64, f64)>> {
    let doc = roxmltree::Document::parse(svg).unwrap();
    doc.descendants()
        .filter(|n| n.tag_name().name() == "polyline" && n.attribute("stroke") == Some(color))
        .map(|n| {
            n.attribute("points")
                .unwrap_or("")
                .split_whitespace()
                .filter_map(|p| p.split_once(',').and_then(|(a, b)| Some((a.parse().ok()?, b.parse().ok()?))))
                .collect()
        })
        .collect()
}

fn hex(c: plotters::style::RGBColor) -> String {
    format!("#{:02X}{:02X}{:02X}", c.0, c.1, c.2)
}

/// The legend's box: the white, nearly opaque rectangle.
fn legend_box(svg: &str) -> Option<(f64, f64, f64, f64)> {
    let doc = roxmltree::Document::parse(svg).unwrap();
    doc.descendants()
        .filter(|n| n.tag_name().name() == "rect" && n.attribute("fill") == Some("#FFFFFF"))
        .filter(|n| n.attribute("opacity") == Some(&format!("{}", svg::LEGEND_ALPHA)[..]))
        .filter_map(|n| {
            let f = |k: &str| n.attribute(k).and_then(|v| v.parse::<f64>().ok());
            Some((f("x")?, f("y")?, f("x")? + f("width")?, f("y")? + f("height")?))
        })
        .next()
}

/// Whether segment a–b meets the box (sampled finely: boxes are tens of pixels wide).
fn crosses(a: (f64, f64), b: (f64, f64), r: (f64, f64, f64, f64)) -> bool {
    (0..=64).any(|k| {
        let t = k as f64 / 64.0;
        let (x, y) = (a.0 + t * (b.0 - a.0), a.1 + t * (b.1 - a.1));
        x > r.0 && x < r.2 && y > r.1 && y < r.3
    })
}

#[test]
fn shallow_lines_have_sub_pixel_coordinates() {
    // A line rising 4 pixels over the whole width: on whole pixels it would be five flat
    // steps; at a tenth of a pixel it takes dozens of distinct heights.
    let x: Vec<f64> = (0..200).map(|k| k as f64 / 199.0).collect();
    let mut p = line(x.clone(), x.iter().map(|_| 0.0).collect());
    p.ys.push(x.iter().map(|_| 1.0).collect());
    p.ys.push(x.iter().map(|t| 0.5 + 0.01 * t).collect());
    let s = svg::render(&p).unwrap();
    assert!(s.contains("width=\"800\" height=\"500\" viewBox=\"0 0 8000 5000\""), "{}", &s[..200]);
    let runs = polylines(&s, &hex(PALETTE[2]));
    let mut ys: Vec<i64> = runs.iter().flatten().map(|p| p.1 as i64).collect();
    ys.sort();
    ys.dedup();
    assert!(ys.len() >= 25, "only {} distinct heights", ys.len());
}

#[test]
fn the_legend_sits_where_the_data_are_not() {
    // Two curves through every corner region: a sine over two periods and its mirror. No
    // corner is free, so the figure makes room above the data for the legend.
    let x: Vec<f64> = (0..400).map(|k| k as f64 / 399.0).collect();
    let a: Vec<f64> = x.iter().map(|t| (t * 4.0 * std::f64::consts::PI).sin()).collect();
    let b: Vec<f64> = a.iter().map(|v| -v).collect();
    let mut p = line(x, a);
    p.ys.push(b);
    p.names = vec!["node A".into(), "node B".into()];
    p.y_unit = "V".into();
    let s = svg::render(&p).unwrap();
    let r = legend_box(&s).expect("a legend");
    for color in [hex(PALETTE[0]), hex(PALETTE[1])] {
        let runs = polylines(&s, &color);
        assert!(runs.iter().any(|r| r.len() > 10), "no {color} curve");
        // (Two-point paths are the legend's own samples.)
        for run in runs.iter().filter(|r| r.len() > 2) {
            for w in run.windows(2) {
                assert!(!crosses(w[0], w[1], r), "legend {r:?} covers the {color} line at {:?}", w[0]);
            }
        }
    }
    assert!(overlapping_texts(&s).is_empty(), "{:?}", overlapping_texts(&s));
}

#[test]
fn no_label_overlaps_another() {
    // A waterfall whose first contribution is a large negative one, ending near the left
    // edge: its value label must stay clear of the category labels.
    let mut b = Plot::new(Kind::Bar);
    b.title = "Period error budget".into();
    b.labels = vec!["comparator delay".into(), "switch leakage".into(), "charge injection".into()];
    b.ys = vec![vec![-2.5e-9, 0.4e-9, -0.1e-9]];
    b.y_label = "period error".into();
    b.y_unit = "s".into();
    b.waterfall = true;
    let s = svg::render(&b).unwrap();
    assert!(overlapping_texts(&s).is_empty(), "{:?}", overlapping_texts(&s));
    // A waveform with labelled thresholds, a spec band, a marked event and a right axis.
    let x: Vec<f64> = (0..300).map(|k| k as f64 * 1e-7).collect();
    let mut p = line(x.clone(), x.iter().map(|t| 0.6 + 0.3 * (t * 2e5).sin()).collect());
    p.y_unit = "V".into();
    p.y_lines = vec![
        RefLine { at: 0.9, label: "v_hi".into() },
        RefLine { at: 0.88, label: "v_hi − hysteresis".into() },
        RefLine { at: 0.3, label: "v_lo".into() },
    ];
    p.x_lines = vec![RefLine { at: 1e-5, label: "trim".into() }, RefLine { at: 1.02e-5, label: "settled".into() }];
    p.bands = vec![Band { min: Some(0.5), max: Some(0.7), label: "spec".into() }];
    p.y2 = vec![x.iter().map(|t| 1e-6 + t * 0.01).collect()];
    p.y2_label = "supply current".into();
    p.y2_unit = "A".into();
    p.names = vec!["node".into(), "current".into()];
    let s = svg::render(&p).unwrap();
    assert!(overlapping_texts(&s).is_empty(), "{:?}", overlapping_texts(&s));
    let t = texts(&s);
    for want in ["v_hi", "v_lo", "trim", "settled", "spec", "supply current (A)", "current (right axis)"] {
        assert!(t.iter().any(|s| s == want), "no '{want}' in {t:?}");
    }
}

#[test]
fn histogram_marks_mean_and_sigma_apart_from_the_bars() {
    // Samples 1 … 9: mean 5, sample σ = sqrt(7.5) = 2.74 (by hand).
    let mut h = Plot::new(Kind::Histogram);
    h.ys = vec![(1..=9).map(|k| k as f64).collect()];
    h.x_unit = "V".into();
    h.stats = true;
    let s = svg::render(&h).unwrap();
    let t = texts(&s);
    for want in ["μ", "−σ", "+σ", "μ 5.00 V, σ 2.74 V"] {
        assert!(t.iter().any(|x| x == want), "no '{want}' in {t:?}");
    }
    // The marks are drawn in the mark colour, not a series colour.
    assert!(s.contains(&format!("stroke=\"{}\"", hex(svg::MARK))));
    assert!(overlapping_texts(&s).is_empty(), "{:?}", overlapping_texts(&s));
}

#[test]
fn axis_limits_clip_the_data_at_the_frame() {
    let x: Vec<f64> = (0..=100).map(|k| k as f64 / 50.0).collect();
    let mut p = line(x.clone(), x.clone());
    p.x_unit = String::new();
    p.y_unit = String::new();
    p.x_max = Some(1.0);
    p.y_min = Some(0.25);
    let s = svg::render(&p).unwrap();
    let doc = roxmltree::Document::parse(&s).unwrap();
    // The tick label "1" of the x axis marks the right end of the frame.
    let right = doc
        .descendants()
        .filter(|n| n.tag_name().name() == "text" && n.text().map(str::trim) == Some("1"))
        .filter_map(|n| n.attribute("x").and_then(|v| v.parse::<f64>().ok()))
        .fold(f64::MIN, f64::max);
    let pts: Vec<(f64, f64)> = polylines(&s, &hex(PALETTE[0])).into_iter().flatten().collect();
    assert!(!pts.is_empty());
    assert!(pts.iter().all(|p| p.0 <= right + 1.0), "a point beyond x = 1 at {right}");
}

#[test]
fn events_of_a_transient_are_marked_by_kind() {
    let code = r#"
        let o = osc("window", #{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2, vdd: 1.8});
        let s = o.simulate(3);
        plot(#{title: "events", x: s.t, y: s.v, events: s.events, x_unit: "s", y_unit: "V"})
    "#;
    let svg_of = |code: &str| {
        let dir = tempfile::tempdir().unwrap();
        let sandbox = tickwork::engine::sandbox::Sandbox::new(dir.path(), &dir.path().join("out"), dir.path()).unwrap();
        let mut s = tickwork::engine::session::Session::new("t", sandbox);
        s.echo = false;
        let shared = tickwork::engine::session::Shared::new(s);
        let e = tickwork::engine::build(&shared, tickwork::engine::DEFAULT_MAX_OPS);
        tickwork::engine::script::run_source(&e, &shared, "t.rhai", code, tickwork::engine::DEFAULT_MAX_OPS).unwrap();
        let g = shared.lock();
        g.report.figures().next().map(|f| f.svg.clone()).unwrap()
    };
    let s = svg_of(code);
    let t = texts(&s);
    assert!(t.iter().any(|x| x == "crossing") && t.iter().any(|x| x == "decision"), "{t:?}");
    assert!(overlapping_texts(&s).is_empty(), "{:?}", overlapping_texts(&s));
}
