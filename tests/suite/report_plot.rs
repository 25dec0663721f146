//! Plots rendered through the library: every kind gives well-formed SVG with its title, axis
//! descriptions and SI-prefixed tick labels as text; bad descriptions fail naming the key.
use tickwork::report::plot::{Kind, Plot, svg};

fn texts(svg: &str) -> Vec<String> {
    let doc = roxmltree::Document::parse(svg).expect("well-formed SVG");
    assert_eq!(doc.root_element().tag_name().name(), "svg");
    doc.descendants()
        .filter(|n| n.tag_name().name() == "text")
        .map(|n| n.text().unwrap_or("").trim().to_string())
        .collect()
}

fn sweep(kind: Kind) -> Plot {
    let mut p = Plot::new(kind);
    p.title = "Period vs C <demo & test>".into();
    p.x = (1..=10).map(|k| k as f64 * 1e-12).collect();
    p.ys = vec![p.x.iter().map(|c| c * 0.9 / 1e-6).collect()];
    p.x_label = "timing capacitor".into();
    p.x_unit = "F".into();
    p.y_label = "period".into();
    p.y_unit = "s".into();
    p
}

#[test]
fn every_kind_renders_with_title_and_axis_text() {
    for kind in [Kind::Line, Kind::Scatter, Kind::Step] {
        let svg = svg::render(&sweep(kind)).unwrap();
        let doc = roxmltree::Document::parse(&svg).unwrap();
        let title = doc.root_element().children().find(|n| n.tag_name().name() == "title").and_then(|n| n.text());
        assert_eq!(title, Some("Period vs C <demo & test>"));
        let t = texts(&svg);
        for want in ["Period vs C <demo & test>", "timing capacitor (F)", "period (s)", "2p", "10p"] {
            assert!(t.iter().any(|s| s == want), "{kind:?}: no '{want}' in {t:?}");
        }
    }
    let mut h = Plot::new(Kind::Histogram);
    h.title = "Spread".into();
    h.ys = vec![(0..100).map(|k| 250e-9 + (k % 10) as f64 * 1e-9).collect()];
    h.x_label = "period".into();
    h.x_unit = "s".into();
    let t = texts(&svg::render(&h).unwrap());
    for want in ["Spread", "period (s)", "count", "250n"] {
        assert!(t.iter().any(|s| s == want), "histogram: no '{want}' in {t:?}");
    }
    let mut b = Plot::new(Kind::Bar);
    b.title = "Budget".into();
    b.labels = vec!["delay".into(), "leakage".into()];
    b.ys = vec![vec![1.5, -0.25]];
    b.y_label = "period error".into();
    b.y_unit = "%".into();
    b.waterfall = true;
    let t = texts(&svg::render(&b).unwrap());
    for want in ["Budget", "period error (%)", "delay", "leakage", "total", "+1.50 %", "-0.250 %", "1.25 %"] {
        assert!(t.iter().any(|s| s == want), "bar: no '{want}' in {t:?}");
    }
}

#[test]
fn log_axes_tick_on_decades_with_prefixes() {
    let mut p = sweep(Kind::Line);
    p.x = vec![1e-12, 1e-11, 1e-10, 1e-9];
    p.ys = vec![vec![1e-6, 1e-5, 1e-4, 1e-3]];
    p.log_x = true;
    p.log_y = true;
    let t = texts(&svg::render(&p).unwrap());
    for want in ["1p", "10p", "100p", "1n", "1µ", "10µ", "100µ", "1m"] {
        assert!(t.iter().any(|s| s == want), "no tick '{want}' in {t:?}");
    }
}

#[test]
fn legend_names_appear() {
    let mut p = sweep(Kind::Line);
    p.ys.push(p.ys[0].iter().map(|y| y * 1.1).collect());
    p.names = vec!["typical".into(), "slow".into()];
    let t = texts(&svg::render(&p).unwrap());
    assert!(t.iter().any(|s| s == "typical") && t.iter().any(|s| s == "slow"), "{t:?}");
}

#[test]
fn rendering_is_deterministic() {
    assert_eq!(svg::render(&sweep(Kind::Line)).unwrap(), svg::render(&sweep(Kind::Line)).unwrap());
}

#[test]
fn bad_descriptions_name_the_key() {
    let mut p = sweep(Kind::Line);
    p.ys[0].pop();
    assert!(svg::render(&p).unwrap_err().contains("'x' has 10 values"));
    let mut p = sweep(Kind::Line);
    p.x[0] = -1e-12;
    p.log_x = true;
    assert!(svg::render(&p).unwrap_err().contains("log_x needs x > 0"));
    let mut p = sweep(Kind::Line);
    p.names = vec!["a".into(), "b".into()];
    assert!(svg::render(&p).unwrap_err().contains("'names' has 2 entries for 1 series"));
    let mut b = Plot::new(Kind::Bar);
    b.ys = vec![vec![1.0, 2.0]];
    b.labels = vec!["one".into()];
    assert!(svg::render(&b).unwrap_err().contains("'labels' has 1 entries for 2 bars"));
    assert!(Kind::parse("pie").unwrap_err().contains("line, scatter, step, histogram, bar"));
}

#[test]
fn histogram_stats_give_mean_and_sample_sigma() {
    let mut h = Plot::new(Kind::Histogram);
    // Samples 1, 2, 3: mean 2, sample standard deviation (n − 1) exactly 1 (by hand).
    h.ys = vec![vec![1.0, 2.0, 3.0]];
    h.x_unit = "V".into();
    h.stats = true;
    let t = texts(&svg::render(&h).unwrap());
    assert!(t.iter().any(|s| s == "μ 2.00 V, σ 1.00 V"), "{t:?}");
}
