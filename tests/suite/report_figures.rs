//! Figures fit for a design review, checked on the rendered SVG as a reader would see them:
//! distinct tick labels on narrow ranges, small files for long transients, a colour-blind-safe
//! palette of our own.
use tickwork::report::plot::svg::{self, PALETTE};
use tickwork::report::plot::{Kind, Plot};

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
    // the frequency by hertz around 32.76 kHz (both ranges as in the plots).
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
