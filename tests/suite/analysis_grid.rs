//! The PVT grid and the key value for a target period at the script level, each against an
//! independent computation: the oscillator evaluated point by point through `o.at`, and the
//! ideal formulas of the topologies.
use crate::cli_util::{eval, eval_f64};

/// The invented demo window of the wake-up clock, from the demo process.
const DEMO_WINDOW: &str = r#"osc_from("demo180", "window", #{c: 250f, i: 1.2u, v_lo: 0.5, v_hi: 1.1,
    cmp_itail: 1u, t_latch: 0.3n, t_logic: 0.3n, t_sw: 0.2n})"#;

#[test]
fn grid_size_order_and_worst_case_match_the_points_evaluated_one_by_one() {
    // Independent computation: each point through o.at(#{corner, vdd, temp}).period(), in the
    // documented order (corner-major, temperature fastest), and the largest |error| found by a
    // plain loop.
    let script = format!(
        r#"let o = {DEMO_WINDOW};
        let cs = ["ss", "ff"]; let vs = [1.6, 2.0]; let ts = [-40.0, 27.0, 125.0];
        let g = o.pvt(#{{corners: cs, vdd: vs, temp: ts}});
        let k = 0; let worst = 0.0; let worst_k = -1; let bad = 0;
        for c in cs {{ for v in vs {{ for t in ts {{
            let p = o.at(#{{corner: c, vdd: v, temp: t}}).period();
            if g.period[k] != p || g.corner[k] != c || g.vdd[k] != v || g.temp[k] != t {{ bad += 1; }}
            let e = (p / o.period() - 1.0) * 100.0;
            if abs(e) > abs(worst) {{ worst = e; worst_k = k; }}
            k += 1;
        }} }} }}
        [g.period.len(), bad, g.worst.error_pct.abs.value - worst, g.worst.error_pct.abs.index - worst_k,
         g.nominal - o.period(), g.worst.period.max.value - g.period.max(), g.worst.frequency.min.value - 1.0 / g.period.max()]"#
    );
    let r = eval(&script).unwrap().into_array().unwrap();
    let f: Vec<f64> = r.iter().map(|x| x.as_float().unwrap_or_else(|_| x.as_int().unwrap() as f64)).collect();
    assert_eq!(f[0], 12.0, "2 corners × 2 supplies × 3 temperatures");
    assert_eq!(f[1], 0.0, "every point equals the one-by-one evaluation");
    assert_eq!(f[2], 0.0);
    assert_eq!(f[3], 0.0);
    assert_eq!(f[4], 0.0);
    assert_eq!(f[5], 0.0);
    assert!(f[6].abs() < 1e-6, "{}", f[6]);
}

#[test]
fn default_corners_are_the_process_corners_that_fix_neither_supply_nor_temperature() {
    // demo180 has tt, ff, ss, fs, sf and two combined corners that fix their own supply and
    // temperature (src/physics/demo180.toml); the grid sets supply and temperature itself.
    let r = eval(&format!("let g = {DEMO_WINDOW}.pvt(#{{}}); g.corner")).unwrap().into_array().unwrap();
    let names: Vec<String> = r.into_iter().map(|x| x.into_string().unwrap()).collect();
    assert_eq!(names, ["ff", "fs", "sf", "ss", "tt"]);
    // Explicit numbers have the one corner "typical".
    let r = eval(r#"osc("window", #{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2}).pvt(#{temp: [0, 50]}).corner.len()"#);
    assert_eq!(r.unwrap().as_int().unwrap(), 2);
}

#[test]
fn slow_corner_is_slower_than_fast_at_every_point() {
    // The ss corner has the larger capacitor and weaker devices (demo180.toml: cap 1.10 vs 0.90),
    // so its period is the longer one at every supply and temperature (common practice).
    let r = eval_f64(&format!(
        r#"let g = {DEMO_WINDOW}.pvt(#{{corners: ["ss", "ff"], vdd: [1.6, 2.0], temp: [-40, 125]}});
        let n = 0; for k in 0..4 {{ if g.period[k] > g.period[k + 4] {{ n += 1; }} }} n.to_float()"#
    ));
    assert_eq!(r, 4.0);
}

#[test]
fn solve_gives_the_ideal_formula_on_ideal_oscillators() {
    // Window: T = 2·C·(v_hi − v_lo)/I; ping-pong: T = 2·C·v_hi/I (charge balance, the ideal
    // formulas of the topologies, as in timing_references).
    let c = eval_f64(r#"osc("window", #{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2}).solve("c", #{period: 250n})"#);
    assert!((c / (250e-9 * 1e-6 / (2.0 * 0.6)) - 1.0).abs() < 1e-12, "{c}");
    let i = eval_f64(r#"osc("pingpong", #{c: 250f, i: 1u, v_hi: 0.6}).solve("i", #{frequency: 4M})"#);
    assert!((i / (2.0 * 250e-15 * 0.6 * 4e6) - 1.0).abs() < 1e-12, "{i}");
    // Thresholds: v_hi = v_lo + T·I/(2·C) = 0.6 + 1.5 µs·1 µA/2 pF = 1.35 V.
    let v = eval_f64(r#"osc("window", #{c: 1p, i: 1u, v_lo: 0.6, v_hi: 1.2}).solve("v_hi", #{period: 1.5u})"#);
    assert!((v - 1.35).abs() < 1e-12, "{v}");
}

#[test]
fn solve_with_every_parasitic_hits_the_target_on_the_real_model() {
    // With the process parasitics the ideal formula is off; the solved value must give the
    // target when the oscillator is rebuilt with it (an independent evaluation).
    let r = eval(&format!(
        r#"let o = {DEMO_WINDOW};
        let c = o.solve("c", #{{frequency: 4M}});
        let i = o.solve("i", #{{period: 300n}});
        [o.modified(#{{c: c}}).frequency() / 4M - 1.0, o.modified(#{{i: i}}).period() / 300n - 1.0,
         c / (0.25u * 1.2u / (2.0 * 0.6)) - 1.0]"#
    ))
    .unwrap()
    .into_array()
    .unwrap();
    let f: Vec<f64> = r.iter().map(|x| x.as_float().unwrap()).collect();
    assert!(f[0].abs() < 1e-10 && f[1].abs() < 1e-10, "{f:?}");
    // The parasitics (switch junctions, input capacitance, delay chain) take part of the period,
    // so the solved capacitor is smaller than the ideal one.
    assert!(f[2] < -0.01, "{f:?}");
}
