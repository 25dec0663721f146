//! Event-driven behavioural transient simulation of an oscillator: the node equations
//! dV/dt = I(V)/C(V) of each phase integrated with an adaptive Dormand–Prince 5(4) method, each
//! threshold crossing located exactly inside its step, then the delay chain (comparator delay
//! at the actual slope, latch, logic, switch) run in time while the node keeps moving, then the
//! switch action. Same parts and parasitics as the period model, so its steady state is a
//! cross-check of `Osc::period`.
//!
//! Defined start (t = 0): window and Schmitt at the low threshold (with offset), charging;
//! reset at the reset level, charging; ping-pong with both capacitors at the reset level, A
//! charging; RC inverter pair with the timing capacitor discharged and B high (X = vdd),
//! falling. `Options::v0` (and `v0_b` for ping-pong's B) replace the start voltage.
//!
//! Step errors are measured against rtol·max(|V|, vdd). An idle ping-pong capacitor that has
//! decayed to within that absolute tolerance of its reset level is set onto it (its rate is
//! then exactly zero), so the stiff tail of a fast reset costs no steps. Waveform samples are
//! cubic Hermite interpolants between accepted steps, for plots; events, periods and voltage
//! extremes come from the integrator's own points.
pub mod circuit;
pub mod noisy;
pub mod stepper;

use circuit::{Circuit, End, Phase};
use stepper::{Rates, State, Tol, advance, crossing, hermite};

use super::osc::{Osc, View};
use super::parasitic::Mask;

/// Most cycles one run may simulate.
pub const MAX_CYCLES: usize = 100_000;
/// Most waveform points one run may return (all nodes share the time axis).
pub const MAX_POINTS: usize = 2_000_000;
/// Most waveform points per phase.
pub const MAX_POINTS_PER_PHASE: usize = 10_000;
/// Default relative tolerance of the integrator.
pub const RTOL: f64 = 1e-10;
/// Relative band within which a cycle counts as settled onto the steady-state period.
pub const SETTLE_RTOL: f64 = 1e-6;
/// Relative tolerances the integrator accepts.
pub const RTOL_RANGE: std::ops::RangeInclusive<f64> = 1e-13..=1e-4;

/// Options of a run.
#[derive(Clone, Debug, Default)]
pub struct Options {
    /// Waveform samples per phase, evenly spaced in time, both ends included; 0 for none.
    /// Default: 64, fewer for long runs so that the total stays within 1e6 points.
    pub points_per_phase: Option<usize>,
    /// Start voltage of the node (capacitor A for ping-pong, X for the RC inverter pair), V.
    pub v0: Option<f64>,
    /// Start voltage of ping-pong capacitor B, V.
    pub v0_b: Option<f64>,
    /// Relative tolerance of the integrator (default `RTOL`).
    pub rtol: Option<f64>,
    /// With the white noise sources of the oscillator's noise keys, drawn from this seed
    /// (`noisy.rs`); None for the noiseless run.
    pub noise_seed: Option<u64>,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum EventKind {
    /// The watched node reaches the threshold.
    Crossing,
    /// The comparator output switches (crossing plus comparator delay at the actual slope).
    Decision,
    /// The latch, logic and switches act (decision plus the chain); or a timed pulse ends.
    Switch,
}

impl EventKind {
    pub fn name(self) -> &'static str {
        match self {
            EventKind::Crossing => "crossing",
            EventKind::Decision => "decision",
            EventKind::Switch => "switch",
        }
    }
}

#[derive(Clone, Debug, PartialEq)]
pub struct Event {
    /// Time, s.
    pub t: f64,
    pub kind: EventKind,
    /// The phase the event belongs to (it ends that phase).
    pub phase: &'static str,
    /// Voltage of the phase's watched node (node 0 for a timed phase), V.
    pub v: f64,
}

/// The result of a run.
#[derive(Clone, Debug)]
pub struct Transient {
    /// Sample times, s (a switch with a jump appears as two samples at the same time).
    pub t: Vec<f64>,
    /// Node voltages at those times, one vector per node, V.
    pub v: Vec<Vec<f64>>,
    pub node_names: Vec<&'static str>,
    pub events: Vec<Event>,
    /// Length of each cycle, s (cycle k runs from the k-th start of phase 0 to the next).
    pub periods: Vec<f64>,
    /// Duty of each cycle (as `Cycle::duty`).
    pub duties: Vec<f64>,
    /// Steady-state period: mean of the last quarter of the cycles (at least one), s.
    pub period: f64,
    pub duty: f64,
    /// Leading cycles whose period is more than `SETTLE_RTOL` away from `period`.
    pub settle_cycles: usize,
    /// Lowest and highest voltage of any node over the run (at every integrator step), V.
    pub v_min: f64,
    pub v_max: f64,
    /// Accepted integrator steps.
    pub steps: usize,
}

/// Simulate `cycles` cycles of `o` with every parasitic.
pub fn simulate(o: &Osc, cycles: usize, opts: &Options) -> Result<Transient, String> {
    simulate_masked(o, Mask::ALL, cycles, opts)
}

/// Simulate `cycles` cycles of `o` with the parasitics of `mask`.
pub fn simulate_masked(o: &Osc, mask: Mask, cycles: usize, opts: &Options) -> Result<Transient, String> {
    let kind = o.kind().name();
    if !(1..=MAX_CYCLES).contains(&cycles) {
        return Err(format!("simulate: 'cycles' must be an integer in 1..={MAX_CYCLES}, got {cycles}"));
    }
    let view = View { o, m: mask, env: &o.env };
    let mut c = o.kind().topology().circuit(&view).map_err(|e| format!("{}: {e}", o.caller()))?;
    let n_ph = c.phases.len();
    let ppp = match opts.points_per_phase {
        Some(n) => {
            if n > MAX_POINTS_PER_PHASE {
                return Err(format!("simulate: 'points_per_phase' must be in 0..={MAX_POINTS_PER_PHASE}, got {n}"));
            }
            if n.saturating_mul(n_ph).saturating_mul(cycles) > MAX_POINTS {
                return Err(format!(
                    "simulate: 'points_per_phase' = {n} with {cycles} cycles of {n_ph} phases gives more than {MAX_POINTS} waveform points; lower points_per_phase or cycles"
                ));
            }
            n
        }
        None => (1_000_000 / (n_ph * cycles)).clamp(2, 64),
    };
    let rtol = opts.rtol.unwrap_or(RTOL);
    if !RTOL_RANGE.contains(&rtol) {
        return Err(format!(
            "simulate: 'rtol' must be in {:e}..={:e}, got {rtol}",
            RTOL_RANGE.start(),
            RTOL_RANGE.end()
        ));
    }
    let vdd = o.env.vdd;
    for (key, val, node) in [("v0", opts.v0, 0), ("v0_b", opts.v0_b, 1)] {
        let Some(x) = val else { continue };
        if node >= c.nodes {
            return Err(format!("simulate: option '{key}' applies to \"pingpong\" only (this is \"{kind}\")"));
        }
        let (lo, hi) = c.rails.unwrap_or((-vdd, 2.0 * vdd));
        if !(x >= lo && x <= hi) {
            return Err(format!("simulate: option '{key}' = {x} V must lie in [{lo}, {hi}] V for \"{kind}\""));
        }
        c.start[node] = x;
    }
    // Errors measured against the supply: a node near 0 V needs no more absolute accuracy
    // than one near the top.
    let tol = Tol { rtol, atol: rtol * vdd };
    let mut run = Run::new(&c, tol, ppp, cycles);
    if let Some(seed) = opts.noise_seed {
        let noise = super::noise::Noise::of(o)?;
        if noise.is_silent() {
            return Err(format!(
                "simulate(\"{kind}\"): noise: true needs a noise source: set 'i_noise' (A/√Hz), 'vn_cmp' (V/√Hz, with 'cmp_nbw') or 'vn_ref' (V)"
            ));
        }
        run.noise = Some(noisy::Draws::new(&noise, &view, &c, seed));
    }
    for k in 0..cycles {
        let t_cycle = run.t;
        let mut duty_len = 0.0;
        if let Some(d) = run.noise.as_mut() {
            d.start_cycle(k);
        }
        for (n_ph, ph) in c.phases.iter().enumerate() {
            let t0 = run.t;
            run.phase(n_ph, ph)
                .map_err(|e| format!("simulate(\"{kind}\"), phase '{}' at t = {:.6e} s: {e}", ph.name, run.t))?;
            if std::ptr::eq(ph, &c.phases[c.duty_phase]) {
                duty_len = run.t - t0;
            }
        }
        let p = run.t - t_cycle;
        run.periods.push(p);
        run.duties.push(duty_len / p);
    }
    if let Some((lo, hi)) = c.rails {
        // A margin of the integrator's own tolerance, for a node resting at a rail.
        let m = 10.0 * tol.atol;
        if run.v_max > hi + m || run.v_min < lo - m {
            return Err(format!(
                "simulate(\"{kind}\"): the nodes swing from {:.4} V to {:.4} V, outside the supply {lo}…{hi} V: the current sources would saturate (the delay chain is too slow for this ramp, or the thresholds sit too close to a rail)",
                run.v_min, run.v_max
            ));
        }
    }
    let tail = cycles.div_ceil(4);
    let mean = |x: &[f64]| x[x.len() - tail..].iter().sum::<f64>() / tail as f64;
    let period = mean(&run.periods);
    let duty = mean(&run.duties);
    let settle_cycles =
        run.periods.iter().rposition(|p| (p - period).abs() > SETTLE_RTOL * period).map_or(0, |k| k + 1);
    if !(period > 0.0 && period.is_finite()) {
        return Err(format!("simulate(\"{kind}\"): the period came out as {period} s"));
    }
    let nodes = c.nodes;
    Ok(Transient {
        t: run.ts,
        v: run.vs.into_iter().take(nodes).collect(),
        node_names: c.node_names[..nodes].to_vec(),
        events: run.events,
        periods: run.periods,
        duties: run.duties,
        period,
        duty,
        settle_cycles,
        v_min: run.v_min,
        v_max: run.v_max,
        steps: run.steps,
    })
}

/// A node relaxing onto a level is set there once this many absolute tolerances away.
const REST_BAND: f64 = 1.0;

/// Steps per phase before a ramp that does not reach its threshold is given up.
const MAX_STEPS_PER_PHASE: usize = 200_000;

/// The state of a run.
struct Run {
    t: f64,
    y: State,
    /// Node rates at `y` under the current phase, V/s.
    f: State,
    h: f64,
    tol: Tol,
    nodes: usize,
    ppp: usize,
    /// Accepted points of the current phase with their rates (for the waveform samples).
    buf: Vec<(f64, State, State)>,
    ts: Vec<f64>,
    vs: [Vec<f64>; 2],
    events: Vec<Event>,
    periods: Vec<f64>,
    duties: Vec<f64>,
    v_min: f64,
    v_max: f64,
    steps: usize,
    /// Noise draws of a noisy run.
    noise: Option<noisy::Draws>,
}

impl Run {
    fn new(c: &Circuit, tol: Tol, ppp: usize, cycles: usize) -> Run {
        let n = ppp * c.phases.len() * cycles;
        let mut r = Run {
            t: 0.0,
            y: c.start,
            f: [0.0; 2],
            h: 0.0,
            tol,
            nodes: c.nodes,
            ppp,
            buf: Vec::with_capacity(64),
            ts: Vec::with_capacity(n),
            vs: [Vec::with_capacity(n), if c.nodes > 1 { Vec::with_capacity(n) } else { Vec::new() }],
            events: Vec::with_capacity(3 * c.phases.len() * cycles),
            periods: Vec::with_capacity(cycles),
            duties: Vec::with_capacity(cycles),
            v_min: f64::INFINITY,
            v_max: f64::NEG_INFINITY,
            steps: 0,
            noise: None,
        };
        r.track();
        r
    }

    fn track(&mut self) {
        for &x in &self.y[..self.nodes] {
            self.v_min = self.v_min.min(x);
            self.v_max = self.v_max.max(x);
        }
    }

    fn accept(&mut self, ph: &Phase, t: f64, mut y: State, mut f: State) {
        // A node relaxing onto a level it cannot pass (the idle ping-pong capacitor) is taken to
        // be there once within the absolute tolerance: its rate is then exactly zero, and the
        // stiff remainder of the decay (far below the tolerance) costs no steps.
        if let Some((n, level)) = ph.rest
            && y[n] != level
            && (y[n] - level).abs() <= REST_BAND * self.tol.atol
        {
            y[n] = level;
            f = ph.rates(&y);
        }
        self.t = t;
        self.y = y;
        self.f = f;
        self.steps += 1;
        self.buf.push((t, y, f));
        self.track();
    }

    /// Integrate the phase's equations up to time `t_end` exactly.
    fn run_to(&mut self, ph: &Phase, t_end: f64) -> Result<(), String> {
        let mut n = 0;
        while self.t < t_end {
            let left = t_end - self.t;
            let a = advance(ph, &self.y, &self.f, self.h.max(1e-3 * left), left, self.tol)?;
            let last = a.h >= left;
            // A step shortened to land on t_end says nothing about the next step's size.
            if !last || a.next_h > self.h {
                self.h = a.next_h;
            }
            self.accept(ph, if last { t_end } else { self.t + a.h }, a.y, a.f);
            n += 1;
            if n > MAX_STEPS_PER_PHASE {
                return Err(format!("more than {MAX_STEPS_PER_PHASE} integrator steps for a delay of {:.3e} s", left));
            }
        }
        Ok(())
    }

    /// One phase: ramp to the threshold (or a timed pulse), delay chain, switch action.
    fn phase(&mut self, k: usize, ph: &Phase) -> Result<(), String> {
        let t0 = self.t;
        self.f = ph.rates(&self.y);
        self.buf.clear();
        self.buf.push((self.t, self.y, self.f));
        match &ph.end {
            End::Timed(d) => {
                self.run_to(ph, t0 + d)?;
                self.event(EventKind::Switch, ph, self.y[0]);
            }
            End::Threshold { node, level, rising, cmp, chain } => {
                let (node, rising) = (*node, *rising);
                let level = match self.noise.as_mut() {
                    Some(d) => d.level(*level, rising),
                    None => *level,
                };
                let past = |x: f64| if rising { x >= level } else { x <= level };
                let g = |y: &State| (ph.rate[node])(y[node]);
                let v_cross = if past(self.y[node]) {
                    if let Some(msg) = ph.no_early_trip {
                        return Err(format!(
                            "{msg} (the node is at {:.6} V, the threshold {level:.6} V)",
                            self.y[node]
                        ));
                    }
                    self.y[node]
                } else {
                    let dist = (level - self.y[node]).abs();
                    let r0 = g(&self.y);
                    if self.h == 0.0 || t0 == 0.0 {
                        self.h = 0.05 * dist / r0.abs().max(f64::MIN_POSITIVE);
                    }
                    // A ramp creeping toward a level short of the threshold (a source losing its
                    // compliance) is given up after 1e4 times its linear time estimate.
                    let t_give_up = 1e4 * dist / r0.abs();
                    let mut n = 0;
                    loop {
                        let r = g(&self.y);
                        if r.is_nan() || (r > 0.0) != rising || r == 0.0 {
                            return Err(format!(
                                "the ramp stops at {:.4} V (rate {r:.3e} V/s) before the threshold {level:.4} V: the node never reaches it",
                                self.y[node]
                            ));
                        }
                        // No step longer than twice the linear estimate of the time left, so that a
                        // step never lands far beyond the threshold where the parts are unphysical.
                        let h_max = 2.0 * (level - self.y[node]).abs() / r.abs();
                        let a = advance(ph, &self.y, &self.f, self.h, h_max.max(1e-6 * self.h), self.tol)?;
                        if past(a.y[node]) {
                            let (s, ys) = crossing(ph, &self.y, &self.f, &a, node, level, self.t)?;
                            let fs = ph.rates(&ys);
                            self.accept(ph, self.t + s, ys, fs);
                            // The current noise moves the first passage only (the node is at
                            // the threshold either way).
                            if let Some(d) = self.noise.as_mut() {
                                self.t = t0 + d.ramp_time(k, self.t - t0);
                                if let Some(last) = self.buf.last_mut() {
                                    last.0 = self.t;
                                }
                            }
                            break;
                        }
                        self.h = a.next_h;
                        self.accept(ph, self.t + a.h, a.y, a.f);
                        n += 1;
                        if n > MAX_STEPS_PER_PHASE || self.t - t0 > t_give_up {
                            return Err(format!(
                                "the node creeps toward the threshold {level:.4} V without reaching it (at {:.6} V after {:.3e} s, rate {:.3e} V/s)",
                                self.y[node],
                                self.t - t0,
                                g(&self.y)
                            ));
                        }
                    }
                    level
                };
                self.event(EventKind::Crossing, ph, self.y[node]);
                let slope = (ph.rate[node])(v_cross);
                let t_cross = self.t;
                let d_cmp = cmp(slope);
                if !(d_cmp >= 0.0 && d_cmp.is_finite()) {
                    return Err(format!("the comparator delay at a slope of {slope:.3e} V/s is {d_cmp} s"));
                }
                self.run_to(ph, t_cross + d_cmp)?;
                self.event(EventKind::Decision, ph, self.y[node]);
                self.run_to(ph, t_cross + d_cmp + chain)?;
                self.event(EventKind::Switch, ph, self.y[node]);
            }
        }
        self.sample(t0);
        if let Some(j) = &ph.jump {
            self.y = j(self.y);
            self.track();
        }
        Ok(())
    }

    fn event(&mut self, kind: EventKind, ph: &Phase, v: f64) {
        self.events.push(Event { t: self.t, kind, phase: ph.name, v });
    }

    /// Waveform samples of the phase just run, evenly spaced over [t0, now]: cubic Hermite
    /// interpolation between the accepted points around each (values and rates there). For the
    /// plots only; events, periods and extremes come from the integrator's own points.
    fn sample(&mut self, t0: f64) {
        let t1 = self.t;
        if self.ppp == 0 || t1 <= t0 {
            return;
        }
        let n = self.ppp;
        let mut i = 0;
        for k in 0..n {
            let ts = if n == 1 {
                t0
            } else if k == n - 1 {
                t1
            } else {
                t0 + (t1 - t0) * k as f64 / (n - 1) as f64
            };
            while i + 1 < self.buf.len() && self.buf[i + 1].0 <= ts {
                i += 1;
            }
            let (ta, ya, fa) = self.buf[i];
            self.ts.push(ts);
            for (node, vs) in self.vs.iter_mut().enumerate().take(self.nodes) {
                let x = match self.buf.get(i + 1) {
                    Some(&(tb, yb, fb)) if ts > ta => {
                        let h = tb - ta;
                        hermite(ya[node], fa[node] * h, yb[node], fb[node] * h, (ts - ta) / h)
                    }
                    _ => ya[node],
                };
                vs.push(x);
            }
        }
    }
}
