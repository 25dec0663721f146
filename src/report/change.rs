//! What counts as a regression, for both the digest and `compare`: a metric that left its spec
//! window, or that moved more than the threshold toward (or further past) a spec limit.
//! Movement away from every limit, or of a metric without a spec, is a change but never a
//! regression.
use super::metric::Spec;

/// How one metric moved between two runs.
#[derive(Clone, Debug, PartialEq)]
pub struct Change {
    pub old: f64,
    pub new: f64,
    /// Relative change in percent of |old|; None when old is 0 and new is not.
    pub pct: Option<f64>,
    /// Why it is a regression; None when it is not.
    pub regression: Option<String>,
}

/// Signed distance from `v` to the nearest limit of `spec`: positive inside the window,
/// negative outside; None for an open spec.
pub fn margin(v: f64, spec: &Spec) -> Option<f64> {
    match (spec.min, spec.max) {
        (Some(a), Some(b)) => Some((v - a).min(b - v)),
        (Some(a), None) => Some(v - a),
        (None, Some(b)) => Some(b - v),
        (None, None) => None,
    }
}

/// Relative change (new − old)/|old| in percent; 0 when both are 0, None when only old is.
pub fn pct(old: f64, new: f64) -> Option<f64> {
    if old == new {
        Some(0.0)
    } else if old == 0.0 {
        None
    } else {
        Some((new - old) / old.abs() * 100.0)
    }
}

/// Judge the move from `old` to `new` against `spec` (the new run's) with a threshold in percent.
pub fn judge(old: f64, new: f64, spec: &Spec, threshold_pct: f64) -> Change {
    let p = pct(old, new);
    let beyond = p.is_none_or(|p| p.abs() > threshold_pct);
    let regression = match (margin(old, spec), margin(new, spec)) {
        (Some(mo), Some(mn)) if mo >= 0.0 && mn < 0.0 => Some("left its spec".to_string()),
        (Some(mo), Some(mn)) if mn < mo && beyond => Some(if mn < 0.0 {
            "moved further past a spec limit".to_string()
        } else {
            "moved toward a spec limit".to_string()
        }),
        _ => None,
    };
    Change { old, new, pct: p, regression }
}

/// A change in percent as table text: `+1.25 %`, `−0.40 %`, `0 %`, `new` (from zero).
pub fn pct_text(p: Option<f64>) -> String {
    match p {
        None => "from 0".to_string(),
        Some(0.0) => "0 %".to_string(),
        Some(x) if x > 0.0 => format!("+{x:.2} %"),
        Some(x) => format!("−{:.2} %", -x),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    const MAX2: Spec = Spec { min: None, max: Some(2.0) };
    const WIN: Spec = Spec { min: Some(1.0), max: Some(3.0) };
    #[test]
    fn regressions_move_toward_or_past_a_limit() {
        // Toward the max by 10 % (> 5 %): a regression; by 1 % (< 5 %): not.
        assert_eq!(judge(1.0, 1.1, &MAX2, 5.0).regression.as_deref(), Some("moved toward a spec limit"));
        assert_eq!(judge(1.0, 1.01, &MAX2, 5.0).regression, None);
        // Away from the max: never a regression.
        assert_eq!(judge(1.0, 0.5, &MAX2, 5.0).regression, None);
        // Leaving the window counts whatever the size of the step.
        assert_eq!(judge(1.999, 2.001, &MAX2, 5.0).regression.as_deref(), Some("left its spec"));
        assert_eq!(judge(2.5, 3.0, &MAX2, 5.0).regression.as_deref(), Some("moved further past a spec limit"));
        // Two-sided: toward the nearer end; from the middle either way is toward a limit.
        assert!(judge(2.0, 1.5, &WIN, 5.0).regression.is_some());
        assert!(judge(1.5, 1.8, &WIN, 5.0).regression.is_none());
        assert!(judge(1.0, 5.0, &Spec::default(), 5.0).regression.is_none());
        assert_eq!(judge(2.0, 2.5, &MAX2, 1.0).pct, Some(25.0));
        assert_eq!(judge(0.0, 0.5, &MAX2, 1.0).pct, None);
        assert_eq!(pct_text(Some(-0.4)), "−0.40 %");
        assert_eq!(pct_text(Some(1.25)), "+1.25 %");
    }
}
