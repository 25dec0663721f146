//! Elementary functions that give the same bits on every machine.
//!
//! Reported numbers (reports diffed between colleagues, shards merged from several machines) must
//! not depend on the platform's maths library, whose `exp`, `ln` and `pow` differ in the last bits
//! between libraries and versions. Scalar code calls the functions here, which are the pure-Rust
//! port of musl's libm (`libm` crate). Whole-series code calls [`exp_slice`] and [`ln_slice`]:
//! branch-free range reduction and polynomials written in basic IEEE operations only (Rust never
//! fuses or reorders floating-point operations), so the compiler can vectorise them and the
//! result is still the same everywhere; arguments outside their range go to the scalar functions.

/// e^x (musl libm).
#[inline]
pub fn exp(x: f64) -> f64 {
    libm::exp(x)
}

/// Natural logarithm (musl libm).
#[inline]
pub fn ln(x: f64) -> f64 {
    libm::log(x)
}

/// Base-10 logarithm (musl libm).
#[inline]
pub fn log10(x: f64) -> f64 {
    libm::log10(x)
}

/// x^y (musl libm).
#[inline]
pub fn pow(x: f64, y: f64) -> f64 {
    libm::pow(x, y)
}

/// e^x − 1, accurate near 0 (musl libm).
#[inline]
pub fn exp_m1(x: f64) -> f64 {
    libm::expm1(x)
}

/// ln(1 + x), accurate near 0 (musl libm).
#[inline]
pub fn ln_1p(x: f64) -> f64 {
    libm::log1p(x)
}

/// Hyperbolic tangent (musl libm).
#[inline]
pub fn tanh(x: f64) -> f64 {
    libm::tanh(x)
}

/// Inverse hyperbolic sine (musl libm).
#[inline]
pub fn asinh(x: f64) -> f64 {
    libm::asinh(x)
}

/// Base-2 logarithm (musl libm).
#[inline]
pub fn log2(x: f64) -> f64 {
    libm::log2(x)
}

/// Sine and cosine (musl libm).
#[inline]
pub fn sin(x: f64) -> f64 {
    libm::sin(x)
}
#[inline]
pub fn cos(x: f64) -> f64 {
    libm::cos(x)
}
/// Tangent (musl libm).
#[inline]
pub fn tan(x: f64) -> f64 {
    libm::tan(x)
}
#[inline]
pub fn atan(x: f64) -> f64 {
    libm::atan(x)
}

/// ln 2 split as fdlibm does: the upper part has its low 32 bits zero, so k·LN2_HI is exact.
const LN2_HI: f64 = f64::from_bits(0x3fe6_2e42_fee0_0000);
const LN2_LO: f64 = f64::from_bits(0x3dea_39ef_3579_3c76);
const INV_LN2: f64 = std::f64::consts::LOG2_E;
/// 1.5·2^52: adding it rounds to an integer held in the low mantissa bits (round to even).
const SHIFT: f64 = 6_755_399_441_055_744.0;

/// e^x for one element in the normal range |x| < 708, by Cody–Waite reduction x = k·ln2 + r
/// (|r| ≤ ln2/2) and the Taylor polynomial of e^r to degree 13 (truncation below 5e-18 of the
/// result); 2^k is built in the exponent bits. Cody & Waite, "Software Manual for the Elementary
/// Functions", 1980.
#[inline(always)]
fn exp_core(x: f64) -> f64 {
    let kd = x * INV_LN2 + SHIFT;
    let k = kd - SHIFT;
    let r = (x - k * LN2_HI) - k * LN2_LO;
    // Horner form of Σ r^n/n!, n = 0..13.
    let mut p = 1.0 / 6_227_020_800.0;
    p = p * r + 1.0 / 479_001_600.0;
    p = p * r + 1.0 / 39_916_800.0;
    p = p * r + 1.0 / 3_628_800.0;
    p = p * r + 1.0 / 362_880.0;
    p = p * r + 1.0 / 40_320.0;
    p = p * r + 1.0 / 5_040.0;
    p = p * r + 1.0 / 720.0;
    p = p * r + 1.0 / 120.0;
    p = p * r + 1.0 / 24.0;
    p = p * r + 1.0 / 6.0;
    p = p * r + 0.5;
    p = p * r + 1.0;
    p = p * r + 1.0;
    // kd's low bits hold k (two's complement); 2^k has exponent field k + 1023.
    let scale = f64::from_bits(kd.to_bits().wrapping_add(1023) << 52);
    p * scale
}

/// e^x of every element, in place. Same bits on every machine; within 1 ulp of libm's exp
/// (tested).
pub fn exp_slice(v: &mut [f64]) {
    map_fast(v, |a| a.abs() < 708.0, exp_core, exp);
}

/// Apply `core` to every element when all are `inside` its range (one branch-free loop the
/// compiler can vectorise), else element by element with `scalar` for the ones outside.
fn map_fast(v: &mut [f64], inside: impl Fn(f64) -> bool, core: impl Fn(f64) -> f64, scalar: impl Fn(f64) -> f64) {
    if v.iter().fold(true, |all, &a| all & inside(a)) {
        for x in v.iter_mut() {
            *x = core(*x);
        }
    } else {
        for x in v.iter_mut() {
            *x = if inside(*x) { core(*x) } else { scalar(*x) };
        }
    }
}

/// ln x for one element that is positive, finite and normal: x = (1+f)·2^k with 1+f in
/// [√½, √2), s = f/(2+f), ln(1+f) = 2·atanh(s) = f − (f²/2 − s(f²/2 + R)) with
/// R = Σ 2z^n/(2n+1), z = s², n = 1..11 (truncation below 2e-19 for |s| ≤ 0.1716), and
/// ln x = k·ln2 + ln(1+f) with ln 2 split in two parts. The arrangement is fdlibm's e_log.c
/// (Sun Microsystems, 1993); the series is Abramowitz & Stegun 4.1.27.
#[inline(always)]
fn ln_core(x: f64) -> f64 {
    let bits = x.to_bits();
    // Offset by the bits of √½ so that the mantissa lands in [√½, √2).
    let t = bits.wrapping_sub(0x3fe6_a09e_667f_3bcd);
    let k = (t as i64 >> 52) as f64;
    let f = f64::from_bits(bits.wrapping_sub(t & 0xfff0_0000_0000_0000)) - 1.0;
    let s = f / (2.0 + f);
    let z = s * s;
    let mut p = 2.0 / 23.0;
    p = p * z + 2.0 / 21.0;
    p = p * z + 2.0 / 19.0;
    p = p * z + 2.0 / 17.0;
    p = p * z + 2.0 / 15.0;
    p = p * z + 2.0 / 13.0;
    p = p * z + 2.0 / 11.0;
    p = p * z + 2.0 / 9.0;
    p = p * z + 2.0 / 7.0;
    p = p * z + 2.0 / 5.0;
    p = p * z + 2.0 / 3.0;
    let r = z * p;
    let hfsq = 0.5 * f * f;
    k * LN2_HI - ((hfsq - (s * (hfsq + r) + k * LN2_LO)) - f)
}

/// ln x of every element, in place. Same bits on every machine; within 1 ulp of libm's log
/// (tested).
pub fn ln_slice(v: &mut [f64]) {
    map_fast(v, |a| (f64::MIN_POSITIVE..f64::INFINITY).contains(&a), ln_core, ln);
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Distance in units in the last place.
    fn ulps(a: f64, b: f64) -> u64 {
        (a.to_bits() as i64 - b.to_bits() as i64).unsigned_abs()
    }

    #[test]
    fn results_do_not_depend_on_the_platform_library() {
        // Arguments where glibc 2.36 (Debian 12) and musl give neighbouring doubles, found by
        // comparing the two over a sweep: glibc's exp(-4.999959999) is 0.0067382165290940784,
        // ln(0.039729999999999994) is -3.2256487091556294, pow(0.50011, -0.513) is
        // 1.4268534796598515. These must be musl's on every machine.
        assert_eq!(exp(-4.999959999), 0.006738216529094079);
        assert_eq!(ln(0.039729999999999994), -3.22564870915563);
        assert_eq!(pow(0.50011, -0.513), 1.4268534796598518);
    }

    #[test]
    fn exp_slice_is_within_one_ulp_of_libm() {
        let xs: Vec<f64> = (0..200_001).map(|i| -707.0 + 1414.0 * i as f64 / 200_000.0).collect();
        let mut v = xs.clone();
        exp_slice(&mut v);
        let worst = xs.iter().zip(&v).map(|(x, y)| ulps(exp(*x), *y)).max().unwrap();
        assert!(worst <= 1, "worst {worst} ulp");
        // Fine steps near 0, where the reduction does nothing.
        let xs: Vec<f64> = (0..20_001).map(|i| -1.0 + 2.0 * i as f64 / 20_000.0).collect();
        let mut v = xs.clone();
        exp_slice(&mut v);
        assert!(xs.iter().zip(&v).all(|(x, y)| ulps(exp(*x), *y) <= 1));
    }

    #[test]
    fn exp_slice_handles_the_edges_with_the_scalar_function() {
        let mut v = vec![800.0, -800.0, -740.0, f64::NAN, 0.0, f64::NEG_INFINITY, 709.5];
        exp_slice(&mut v);
        assert_eq!(v[0], f64::INFINITY);
        assert_eq!(v[1], 0.0);
        assert_eq!(v[2], exp(-740.0));
        assert!(v[2] > 0.0, "subnormal kept");
        assert!(v[3].is_nan());
        assert_eq!(v[4], 1.0);
        assert_eq!(v[5], 0.0);
        assert_eq!(v[6], exp(709.5));
    }

    #[test]
    fn ln_slice_is_within_one_ulp_of_libm() {
        let xs: Vec<f64> = (0..200_001).map(|i| 10f64.powf(-300.0 + 600.0 * i as f64 / 200_000.0)).collect();
        let mut v = xs.clone();
        ln_slice(&mut v);
        let worst = xs.iter().zip(&v).map(|(x, y)| ulps(ln(*x), *y)).max().unwrap();
        assert!(worst <= 1, "worst {worst} ulp");
        let xs: Vec<f64> = (1..20_001).map(|i| 0.5 + 1.5 * i as f64 / 20_000.0).collect();
        let mut v = xs.clone();
        ln_slice(&mut v);
        let worst = xs.iter().zip(&v).map(|(x, y)| ulps(ln(*x), *y)).max().unwrap();
        assert!(worst <= 1, "worst {worst} ulp near 1");
    }

    #[test]
    fn ln_slice_edges() {
        let mut v = vec![0.0, -1.0, f64::INFINITY, 1e-310, f64::NAN, 1.0];
        ln_slice(&mut v);
        assert_eq!(v[0], f64::NEG_INFINITY);
        assert!(v[1].is_nan());
        assert_eq!(v[2], f64::INFINITY);
        assert_eq!(v[3], ln(1e-310));
        assert!(v[4].is_nan());
        assert_eq!(v[5], 0.0);
    }
}
