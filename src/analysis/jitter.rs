//! Period jitter of a relaxation oscillator from white noise of its charging currents and of
//! its threshold decisions (comparator input noise, reference noise), in the ramp-integrated
//! treatment of Abidi and Meyer (IEEE JSSC 1983): the charge noise integrated over a ramp
//! moves its end by δQ/I, a threshold error δV moves the decision by δV/slope.
//!
//! Each ramp k of the cycle has an independent timing error w_k (current noise) and an
//! independent threshold error e_k at its decision. Where the node keeps the voltage it
//! reached (window, Schmitt), e_k also lengthens the next ramp by e_k/|slope_{k+1}|; where the
//! node is reset (reset, ping-pong), it does not. Periods are linear in these variables, so
//! the period variance, the cycle-to-cycle variance and the variance accumulated over N
//! cycles follow exactly from their coefficients.
use crate::num::math;
use crate::num::quad::integrate;
use crate::timing::noise::{Noise, carries_over};
use crate::timing::osc::View;
use crate::timing::{Mask, Osc};

/// One ramp's noise: timing σ from the current, and the threshold error's coefficients.
#[derive(Clone, Debug, PartialEq)]
pub struct RampNoise {
    pub name: &'static str,
    /// Ramp time, s; current at the threshold, A; slope there, V/s.
    pub ramp: f64,
    pub current: f64,
    pub slope: f64,
    /// σ of the ramp time from the current noise, s.
    pub sigma_current: f64,
    /// Timing error per volt of threshold error at this decision: in this ramp (1/|slope|)
    /// and carried into the next ramp (0 when the node is reset), s/V.
    pub own: f64,
    pub carry: f64,
    /// RMS threshold error of the decision that ends this ramp, V.
    pub sigma_v: f64,
}

/// The jitter of one oscillator.
#[derive(Clone, Debug, PartialEq)]
pub struct Jitter {
    pub period: f64,
    pub ramps: Vec<RampNoise>,
    /// σ of one period, s.
    pub sigma_period: f64,
    /// σ of the difference of consecutive periods, s.
    pub sigma_c2c: f64,
    /// σ of the period from each source alone (current, threshold), s.
    pub sigma_current: f64,
    pub sigma_threshold: f64,
    /// Threshold error σ at a decision (the largest where the comparators differ), V.
    pub sigma_v: f64,
    /// Long-run growth of the timing variance, s²/s (Demir's c): Var(τ_N)/(N·T) as N → ∞.
    pub diffusion: f64,
    pub noise: Noise,
}

/// σ of a ramp's end from white current noise: √(S_i·t/2)/I (common practice: the charge
/// ∫i_n dt of one-sided density S_i is a Wiener process of variance S_i·t/2).
pub fn sigma_ramp(s_i: f64, t_ramp: f64, current: f64) -> f64 {
    (s_i * t_ramp / 2.0).sqrt() / current
}

/// Timing error of a threshold error δV on a ramp of slope s: δV/|s| (Abidi and Meyer 1983).
pub fn threshold_to_time(sigma_v: f64, slope: f64) -> f64 {
    sigma_v / slope.abs()
}

/// The ramps of `o`'s cycle with their currents at the threshold and noise coefficients.
pub fn ramps(o: &Osc, noise: &Noise) -> Result<(f64, Vec<RampNoise>), String> {
    if o.params.has("r") {
        return Err(format!(
            "{}: jitter covers current-charged oscillators (key 'i'); an RC-charged one has no current-noise model here",
            o.caller()
        ));
    }
    let cy = o.cycle(Mask::ALL)?;
    let view = View { o, m: Mask::ALL, env: &o.env };
    let carry = carries_over(o.kind());
    let timed: Vec<_> = cy.phases.iter().filter(|p| p.ramp > 0.0 && p.slope != 0.0).collect();
    let n = timed.len();
    let mut out = Vec::with_capacity(n);
    for (k, p) in timed.iter().enumerate() {
        let current = if p.slope > 0.0 { view.i_ch(p.v_threshold) } else { view.i_dis(p.v_threshold) };
        let next = timed[(k + 1) % n];
        out.push(RampNoise {
            name: p.name,
            ramp: p.ramp,
            current,
            slope: p.slope,
            sigma_current: sigma_ramp(noise.current_psd(p.slope > 0.0), p.ramp, current),
            own: 1.0 / p.slope.abs(),
            carry: if carry { 1.0 / next.slope.abs() } else { 0.0 },
            sigma_v: noise.sigma_threshold(p.slope > 0.0),
        });
    }
    Ok((cy.period, out))
}

/// Variances of one period, of consecutive-period differences, and the per-cycle growth of
/// the accumulated timing variance, for current σ's `w` and the ramps' threshold σ's times `sv`
/// (1 with the threshold noise, 0 without).
fn variances(r: &[RampNoise], w: &[f64], sv: f64) -> (f64, f64, f64) {
    let n = r.len();
    let last = n - 1;
    let (mut var_t, mut var_d, mut grow) = (0.0, 0.0, 0.0);
    for k in 0..n {
        let wk = w[k] * w[k];
        // A ramp's own current error is in one period only: Var(T) gets it once, T2 − T1 twice.
        var_t += wk;
        var_d += 2.0 * wk;
        grow += wk;
        let (a, b) = (r[k].own * r[k].sigma_v * sv, r[k].carry * r[k].sigma_v * sv);
        if k < last {
            // Decision inside the cycle: both effects land in the same period.
            var_t += (a + b).powi(2);
            var_d += 2.0 * (a + b).powi(2);
        } else {
            // Last decision of a cycle: its own effect in this period, the carried one in the
            // next. T1 holds b (from cycle 0) and a (own); T2 − T1 has −b₀, (b₁ − a₁), a₂.
            var_t += a * a + b * b;
            var_d += b * b + (b - a).powi(2) + a * a;
        }
        grow += (a + b).powi(2);
    }
    (var_t, var_d, grow)
}

/// The jitter of `o` with the noise of its keys.
pub fn jitter(o: &Osc) -> Result<Jitter, String> {
    let noise = Noise::of(o)?;
    if noise.is_silent() {
        return Err(format!(
            "{}: no noise source is given; set 'i_noise' (A/√Hz), 'vn_cmp' (V/√Hz, with 'cmp_nbw') or 'vn_ref' (V)",
            o.caller()
        ));
    }
    jitter_with(o, noise)
}

/// The jitter of `o` with the given noise sources.
pub fn jitter_with(o: &Osc, noise: Noise) -> Result<Jitter, String> {
    let (period, r) = ramps(o, &noise)?;
    if r.is_empty() {
        return Err(format!("{}: the cycle has no ramp to carry noise", o.caller()));
    }
    let sv = r.iter().map(|x| x.sigma_v).fold(0.0, f64::max);
    let w: Vec<f64> = r.iter().map(|x| x.sigma_current).collect();
    let zero = vec![0.0; r.len()];
    let (var_t, var_d, grow) = variances(&r, &w, 1.0);
    let (var_i, _, _) = variances(&r, &w, 0.0);
    let (var_v, _, _) = variances(&r, &zero, 1.0);
    Ok(Jitter {
        period,
        sigma_period: var_t.sqrt(),
        sigma_c2c: var_d.sqrt(),
        sigma_current: var_i.sqrt(),
        sigma_threshold: var_v.sqrt(),
        sigma_v: sv,
        diffusion: grow / period,
        ramps: r,
        noise,
    })
}

/// σ of the time of the N-th edge after a given one, white sources only: Var(τ_N) from the
/// coefficients (the last decision of the run carries into a period not counted).
pub fn accumulated_white(j: &Jitter, n: usize) -> f64 {
    if n == 0 {
        return 0.0;
    }
    let last = j.ramps.len() - 1;
    let mut var = 0.0;
    for (k, r) in j.ramps.iter().enumerate() {
        var += n as f64 * r.sigma_current.powi(2);
        let (a, b) = (r.own * r.sigma_v, r.carry * r.sigma_v);
        var += if k < last { n as f64 * (a + b).powi(2) } else { (n as f64 - 1.0) * (a + b).powi(2) + a * a + b * b };
    }
    var.sqrt()
}

/// Cosine integral Ci(x) = γ + ln x + Σ (−x²)^k / (2k·(2k)!) for x ≤ 20, and the asymptotic
/// auxiliary-function series beyond (Abramowitz and Stegun 5.2.16, 5.2.34, 5.2.35).
pub fn cosine_integral(x: f64) -> f64 {
    const EULER: f64 = 0.577_215_664_901_532_9;
    if x <= 20.0 {
        let (mut term, mut sum) = (1.0, 0.0);
        for k in 1..200 {
            let kk = k as f64;
            term *= -x * x / ((2.0 * kk - 1.0) * (2.0 * kk));
            let add = term / (2.0 * kk);
            sum += add;
            if add.abs() < 1e-17 * sum.abs().max(1e-300) {
                break;
            }
        }
        EULER + math::ln(x) + sum
    } else {
        // f(x) ~ (1/x)·Σ (−1)^k (2k)!/x^{2k}, g(x) ~ (1/x²)·Σ (−1)^k (2k+1)!/x^{2k}; Ci = f·sin − g·cos.
        let (mut f, mut g, mut tf, mut tg) = (0.0, 0.0, 1.0, 1.0);
        for k in 0..12 {
            let kk = k as f64;
            if k > 0 {
                tf *= -(2.0 * kk - 1.0) * (2.0 * kk) / (x * x);
                tg *= -(2.0 * kk) * (2.0 * kk + 1.0) / (x * x);
            }
            f += tf;
            g += tg;
        }
        (f / x) * math::sin(x) - (g / (x * x)) * math::cos(x)
    }
}

/// ∫_a^∞ sin²u / u³ du = sin²a/(2a²) + sin(2a)/(2a) − Ci(2a) (integration by parts twice).
pub fn sin2_over_u3(a: f64) -> f64 {
    math::sin(a).powi(2) / (2.0 * a * a) + math::sin(2.0 * a) / (2.0 * a) - cosine_integral(2.0 * a)
}

/// Timing variance accumulated over τ from fractional frequency noise S_y(f):
/// σ²(τ) = ∫ S_y(f)·sin²(πfτ)/(πf)² df (common practice, e.g. Rutman, Proc. IEEE 1978). For
/// flicker S_y = h₋₁/f above f_min this is h₋₁·τ²·∫_{πf_min·τ}^∞ sin²u/u³ du.
pub fn flicker_variance(h_m1: f64, tau: f64, f_min: f64) -> f64 {
    h_m1 * tau * tau * sin2_over_u3(std::f64::consts::PI * f_min * tau)
}

/// The same integral by quadrature, for a white level h₀ (check: h₀·τ/2).
pub fn white_variance_by_quadrature(h0: f64, tau: f64) -> Result<f64, String> {
    // Substituting u = πfτ: h₀·τ/π · ∫_0^∞ sin²u/u² du, and ∫_0^∞ sin²u/u² du = π/2.
    let inner = |u: f64| if u == 0.0 { 1.0 } else { (math::sin(u) / u).powi(2) };
    // One lobe [kπ, (k+1)π] at a time: each is smooth, so the rule converges on it.
    let pi = std::f64::consts::PI;
    let mut body = 0.0;
    for k in 0..2000 {
        body += integrate(inner, k as f64 * pi, (k + 1) as f64 * pi, 1e-10)?;
    }
    Ok(h0 * tau / std::f64::consts::PI * (body + 1.0 / (4000.0 * std::f64::consts::PI)))
}

/// σ of the time of the N-th edge with white and flicker current noise (flicker of the shared
/// charging current, fractional h₋₁ = S_i·f_c/I², seen below `f_min` as absent).
pub fn accumulated(j: &Jitter, n: usize, f_min: f64) -> f64 {
    let white = accumulated_white(j, n);
    if j.noise.i_flicker_fc == 0.0 || n == 0 {
        return white;
    }
    let i = j.ramps.iter().map(|r| r.current).sum::<f64>() / j.ramps.len() as f64;
    let h_m1 = j.noise.i_noise.powi(2) * j.noise.i_flicker_fc / (i * i);
    (white * white + flicker_variance(h_m1, n as f64 * j.period, f_min)).sqrt()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::timing::Kind;

    fn osc(kind: Kind, extra: &[(&str, f64)]) -> Osc {
        crate::analysis::test_osc(kind, extra)
    }

    #[test]
    fn one_ramp_with_white_current_noise_is_the_wiener_result() {
        // Reset oscillator, one ramp of C·ΔV/I = 600 ns: σ = √(S_i·t/2)/I (common practice).
        let j = jitter(&osc(Kind::Reset, &[("i_noise", 1e-12)])).unwrap();
        let t: f64 = 1e-12 * 0.6 / 1e-6;
        let want = (1e-24 * t / 2.0).sqrt() / 1e-6;
        assert!((j.sigma_period / want - 1.0).abs() < 1e-9, "{} vs {want}", j.sigma_period);
        // Independent periods: T2 − T1 has twice the variance.
        assert!((j.sigma_c2c / (want * 2f64.sqrt()) - 1.0).abs() < 1e-9);
    }

    #[test]
    fn window_threshold_noise_counts_each_decision_in_two_ramps() {
        // Symmetric window: both slopes s = I/C; each decision error e moves its own ramp and the
        // next by e/s, so T = (2e_h + e_l0 + e_l1)/s: Var(T) = 6·σ_v²/s².
        let j = jitter(&osc(Kind::Window, &[("vn_ref", 1e-3)])).unwrap();
        let s = 1e-6 / 1e-12;
        assert!((j.sigma_period / (6f64.sqrt() * 1e-3 / s) - 1.0).abs() < 1e-9, "{}", j.sigma_period);
    }

    #[test]
    fn cosine_integral_matches_tables() {
        // scipy.special.sici(x)[1] (run once; A&S Table 5.1 agrees to its printed digits).
        assert!((cosine_integral(1.0) - 0.337_403_922_900_968_16).abs() < 1e-12);
        assert!((cosine_integral(10.0) - (-0.045_456_433_004_455_37)).abs() < 1e-9);
        assert!((cosine_integral(25.0) - (-0.006_848_597_179_702_591)).abs() < 1e-8);
        assert!((cosine_integral(40.0) - 0.019_020_007_896_208_77).abs() < 1e-8);
    }

    #[test]
    fn flicker_closed_form_matches_quadrature() {
        // ∫_a^∞ sin²u/u³ du by adaptive Gauss–Kronrod on [a, 400] plus the tail ≈ 1/(4·400²)
        // (the oscillating part of the tail is below 1e-8), against the closed form.
        for a in [std::f64::consts::PI * 1e-3, 0.3, 2.0] {
            let body = integrate(|u: f64| math::sin(u).powi(2) / u.powi(3), a, 400.0, 1e-12).unwrap();
            let want = body + 1.0 / (4.0 * 400.0 * 400.0);
            assert!((sin2_over_u3(a) - want).abs() < 1e-7, "a = {a}: {} vs {want}", sin2_over_u3(a));
        }
    }

    #[test]
    fn white_quadrature_is_half_h0_tau() {
        let v = white_variance_by_quadrature(2.0, 3.0).unwrap();
        assert!((v / 3.0 - 1.0).abs() < 1e-4, "{v}");
    }
}
