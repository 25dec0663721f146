//! Random mismatch of matched devices.

/// σ of the difference of a matched pair of area W·L: A/√(WL) (Pelgrom, Duinmaijer, Welbers,
/// IEEE JSSC 1989). A is A_VT in V·m (gives V) or A_β in m (gives a fraction).
pub fn pelgrom(a: f64, w: f64, l: f64) -> f64 {
    a / (w * l).sqrt()
}

/// σ of the difference of two devices of unequal areas a1, a2 (m²): each device carries
/// variance A²/(2·area) (Pelgrom 1989, split per device; common practice for ratioed pairs).
pub fn pelgrom_unequal(a: f64, area1: f64, area2: f64) -> f64 {
    a * (0.5 * (1.0 / area1 + 1.0 / area2)).sqrt()
}

/// σ of a current ratio of a mirror pair from σ(ΔVT) and σ(Δβ/β) at a given gm/Id (1/V):
/// (σI/I)² = (gm/Id)²σ²(ΔVT) + σ²(Δβ/β) (Pelgrom 1989; Kinget, JSSC 2005).
pub fn current_sigma(gm_id: f64, sigma_vt: f64, sigma_beta: f64) -> f64 {
    ((gm_id * sigma_vt).powi(2) + sigma_beta.powi(2)).sqrt()
}

/// σ of the input offset of a differential pair: σ²(Vos) = σ²(ΔVT) + (Id/gm)²σ²(Δβ/β)
/// (Pelgrom 1989; Kinget, JSSC 2005).
pub fn offset_sigma(gm_id: f64, sigma_vt: f64, sigma_beta: f64) -> f64 {
    (sigma_vt.powi(2) + (sigma_beta / gm_id).powi(2)).sqrt()
}
